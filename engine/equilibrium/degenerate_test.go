package equilibrium

import (
	"encoding/json"
	"errors"
	"os"
	"testing"
)

// readProblem reads a problem written by package engine/state's dump.
func readProblem(t *testing.T, f string) Problem {
	t.Helper()
	b, err := os.ReadFile(f)
	if err != nil {
		t.Fatal(err)
	}
	var p Problem
	if err := json.Unmarshal(b, &p); err != nil {
		t.Fatal(err)
	}
	return p
}

// TestInequalitiesContradictoryAsEqualities solves a problem built by
// package engine/state for an invented mix (200 L of nitric acid 53 % with
// 100 L of ammonia 25 %, acid in excess), with three no-gain locks on the
// nitrogen: A = N(−III) ≤ a, B = N(II..V) ≤ b and C = N(−III..IV) ≤ c, where
// a + b is the nitrogen total and c > a (the warm start, from the solve
// without C's allowance, has B and C active). A and B together pin
// N(−III) at a and N(II..V) at b; B and C as equalities would ask
// N(II..IV) = b + c − total > 0 out of nitrate with nothing to reduce it.
// The active set used to add B and C together, the linear program then
// found no composition with both as equalities, and the solve reported the
// problem infeasible, though every constraint holds at the start. Each
// constraint must hold, and the pinned amounts stay at their bounds.
func TestInequalitiesContradictoryAsEqualities(t *testing.T) {
	p := readProblem(t, "testdata/degenerate/nitric-ammonia-acid-allowance.json")
	for _, warm := range []bool{true, false} {
		q := p
		if !warm {
			q.Start, q.StartActive = nil, nil
		}
		st, err := Solve(q)
		if err != nil {
			t.Fatalf("warm start %v: %v", warm, err)
		}
		checkTotals(t, q, st)
		checkConstraints(t, q, st)
		for _, c := range q.Constraints[:2] { // A and B: held at their bounds
			v := 0.0
			for i, a := range c.Coef {
				v += a * st.Amount[i]
			}
			if v < c.Bound*(1-1e-9) {
				t.Errorf("warm start %v: %s = %.12g, want its bound %.12g", warm, c.Name, v, c.Bound)
			}
		}
	}
}

// TestContradictoryInequalitiesStillInfeasible: the same problem with the
// bounds of A and B summing below the nitrogen total has no composition;
// the solve must say so (ErrInfeasible), not loop or answer.
func TestContradictoryInequalitiesStillInfeasible(t *testing.T) {
	p := readProblem(t, "testdata/degenerate/nitric-ammonia-acid-allowance.json")
	cons := append([]Constraint(nil), p.Constraints...)
	cons[1].Bound -= 10 // N(II..V) ≤ b − 10: A and B now ask for 10 mol of nitrogen less than there is
	p.Constraints = cons
	for _, warm := range []bool{true, false} {
		q := p
		if !warm {
			q.Start, q.StartActive = nil, nil
		}
		_, err := Solve(q)
		if !errors.Is(err, ErrInfeasible) {
			t.Errorf("warm start %v: %v, want ErrInfeasible", warm, err)
		}
	}
}
