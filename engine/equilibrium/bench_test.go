package equilibrium

import (
	"fmt"
	"testing"
)

// BenchmarkSolve times a cold solve of the synthetic complexation systems
// (random_test.go) by species count.
func BenchmarkSolve(b *testing.B) {
	for _, n := range []int{20, 40, 60, 80, 160} {
		p := complexProblem(n, 1)
		if _, err := Solve(p); err != nil {
			b.Fatalf("%d species: %v", n, err)
		}
		b.Run(fmt.Sprintf("species=%d", len(p.Species)), func(b *testing.B) {
			b.ReportAllocs()
			for i := 0; i < b.N; i++ {
				if _, err := Solve(p); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkWarm times a solve started from the state of a nearby problem
// (the totals moved by 1 %, as between two points of a pour).
func BenchmarkWarm(b *testing.B) {
	for _, n := range []int{20, 40, 60, 80, 160} {
		p := complexProblem(n, 1)
		st, err := Solve(p)
		if err != nil {
			b.Fatal(err)
		}
		q := nearby(p)
		q.Start = st.Amount
		if _, err := Solve(q); err != nil {
			b.Fatalf("%d species warm: %v", n, err)
		}
		b.Run(fmt.Sprintf("species=%d", len(p.Species)), func(b *testing.B) {
			b.ReportAllocs()
			for i := 0; i < b.N; i++ {
				if _, err := Solve(q); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// nearby returns p with 1 % more chloride, added as NaCl.
func nearby(p Problem) Problem {
	q := p
	q.Totals = append([]float64(nil), p.Totals...)
	var na, cl int
	for j, c := range p.Components {
		switch c {
		case "Na":
			na = j
		case "Cl":
			cl = j
		}
	}
	d := 0.01 * p.Totals[cl]
	q.Totals[na] += d
	q.Totals[cl] += d
	return q
}

// TestGrowth checks, on deterministic measures, that the cost of a solve
// grows no worse than quadratically with the species count: allocations and
// Newton iterations from 20 to 160 species (8×) must grow by less than 8².
func TestGrowth(t *testing.T) {
	small, large := complexProblem(20, 1), complexProblem(160, 1)
	allocs := func(p Problem) float64 {
		return testing.AllocsPerRun(5, func() {
			if _, err := Solve(p); err != nil {
				t.Fatal(err)
			}
		})
	}
	a20, a160 := allocs(small), allocs(large)
	s20, _ := Solve(small)
	s160, _ := Solve(large)
	t.Logf("allocations %v → %v, iterations %d → %d", a20, a160, s20.Iterations, s160.Iterations)
	if a160/a20 >= 64 {
		t.Errorf("allocations grow %.1f× for 8× the species", a160/a20)
	}
	if s160.Iterations > 8*s20.Iterations {
		t.Errorf("iterations grow from %d to %d", s20.Iterations, s160.Iterations)
	}
}
