package equilibrium

import (
	"errors"
	"math/rand/v2"
	"testing"
)

// TestPropertyManyProblems runs 3000 seeded random problems of both
// families. Every state conserves its totals; every failure is one of the
// package's errors; and failures stay rare. (At this writing 24 of 3000 end
// in ErrNoConvergence — strongly redox-degenerate feeds where the phase
// assemblage or a vanishing oxidation state keeps Newton from the
// tolerance. The bound below is a regression guard, not a goal.)
func TestPropertyManyProblems(t *testing.T) {
	if testing.Short() {
		t.Skip("3000 solves")
	}
	r := rand.New(rand.NewPCG(99, 1))
	const count = 3000
	fails := 0
	for k := 0; k < count; k++ {
		p := randomFeedProblem(r)
		if k%5 == 0 {
			p = complexProblem(20+r.IntN(140), uint64(k))
		}
		st, err := Solve(p)
		if err != nil {
			if !errors.Is(err, ErrNoConvergence) && !errors.Is(err, ErrInfeasible) {
				t.Errorf("problem %d: error outside the contract: %v", k, err)
			}
			fails++
			continue
		}
		checkTotals(t, p, st)
	}
	t.Logf("%d of %d problems did not converge", fails, count)
	if fails > count/100 {
		t.Errorf("%d of %d problems did not converge (guard: 1 %%)", fails, count)
	}
}
