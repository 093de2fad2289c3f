package equilibrium

import (
	"errors"
	"math"
	"testing"
)

// byteSource hands out values from fuzz input, zero when it runs out.
type byteSource struct {
	b []byte
	i int
}

func (s *byteSource) next() byte {
	if s.i >= len(s.b) {
		return 0
	}
	s.i++
	return s.b[s.i-1]
}

// small returns an integer in [lo, hi].
func (s *byteSource) small(lo, hi int) int { return lo + int(s.next())%(hi-lo+1) }

// problemFrom decodes a Problem from fuzz input: up to 5 components, up to
// 14 species of any phase, μ°/RT in ±300, totals spanning 1e-40…100 (some
// negative), and up to two constraints.
func problemFrom(data []byte) Problem {
	s := &byteSource{b: data}
	nc := s.small(1, 5)
	p := Problem{TemperatureK: 273.15 + float64(s.small(0, 120)), PressureBar: 0.5 + float64(s.small(0, 20))/4}
	for j := 0; j < nc; j++ {
		p.Components = append(p.Components, string(rune('A'+j)))
		t := math.Pow(10, float64(s.small(-40, 2)))
		if s.small(0, 9) == 0 {
			t = -t
		}
		p.Totals = append(p.Totals, t)
	}
	water := Species{Name: "W", Phase: Solvent, Amounts: make([]float64, nc), Mu0: -95.66}
	water.Amounts[0] = 1
	p.Totals[0] += 55.5
	if s.small(0, 15) != 0 {
		p.Species = append(p.Species, water)
	}
	ns := s.small(1, 14)
	for i := 0; i < ns; i++ {
		sp := Species{Name: string(rune('a' + i)), Phase: Phase(s.small(0, 2)), Amounts: make([]float64, nc)}
		if sp.Phase == Aqueous {
			sp.Charge = s.small(-3, 3)
		}
		for j := range sp.Amounts {
			sp.Amounts[j] = float64(s.small(0, 3))
		}
		sp.Mu0 = float64(int(s.next())-128) * 300 / 128
		p.Species = append(p.Species, sp)
	}
	for k := s.small(0, 2); k > 0; k-- {
		c := Constraint{Name: "lock", Coef: make([]float64, len(p.Species)), Rel: Relation(s.small(0, 2)), Bound: float64(s.small(0, 10)) / 10}
		c.Coef[s.small(0, len(p.Species)-1)] = 1
		p.Constraints = append(p.Constraints, c)
	}
	return p
}

func FuzzSolve(f *testing.F) {
	f.Add([]byte{})
	f.Add([]byte{3, 5, 40, 30, 20, 1, 7, 0, 1, 2, 3, 90, 1, 2, 1, 0, 200, 2, 0, 0, 1, 60})
	f.Add([]byte{1, 2, 10, 1, 9, 1, 1, 0, 1, 1, 1, 1, 1, 1, 1, 250, 250})
	f.Add([]byte("the quick brown fox jumps over the lazy dog"))
	f.Fuzz(func(t *testing.T, data []byte) {
		p := problemFrom(data)
		st, err := Solve(p)
		if err != nil {
			if !errors.Is(err, ErrBadInput) && !errors.Is(err, ErrInfeasible) && !errors.Is(err, ErrNoConvergence) {
				t.Fatalf("error outside the contract: %v", err)
			}
			return
		}
		for i, n := range st.Amount {
			if !(n >= 0) || math.IsInf(n, 0) {
				t.Fatalf("amount of %s is %g", p.Species[i].Name, n)
			}
		}
		for j := range p.Components {
			sum, scale := 0.0, math.Abs(p.Totals[j])
			for i, s := range p.Species {
				sum += s.Amounts[j] * st.Amount[i]
				scale += math.Abs(s.Amounts[j] * st.Amount[i])
			}
			if math.Abs(sum-p.Totals[j]) > 1e-8*scale+1e-12 {
				t.Fatalf("component %s: %g in the state, %g fed", p.Components[j], sum, p.Totals[j])
			}
		}
	})
}
