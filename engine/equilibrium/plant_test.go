package equilibrium

// NOTE FROM THE LEAD: these problems are built by package engine/state from real
// plant feeds (each stream alone and the mix; "frozentrue" = every element in
// each oxidation state is its own component, "frozenfalse" = full problem under
// kinetic locks). They must all solve. Typical difficulty: a lock shuts out O2
// and H2 is absent, so nothing anchors the electron potential from above: every
// species at a lower oxidation state tends to zero and the potentials run off
// to infinity along that direction. The minimum of G is still well defined (on
// the boundary nᵢ = 0); the solver must converge there (e.g. detect directions
// where only vanishing species depend on the potential, or cap potentials so
// the amounts fall below ~1e-300 of the totals and accept the balance
// residual of the rest). Merit ~1e-25 with "200 Newton iterations" is the
// symptom today.

import (
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"testing"
)

// usesUpWater lists plant problems whose totals have no aqueous
// equilibrium: 70 mol of zinc against 55 mol of water (zinc-copper-12), or
// 619 mol against 33 (zinc-strong-caustic-8), with nothing locking hydrogen
// evolution, turn all the water into Zn(OH)2(s) and H2(g). The solver must
// say so (ErrInfeasible, naming the solvent), not return a state.
var usesUpWater = map[string]bool{
	"zinc-copper-12-frozenfalse.json":        true,
	"zinc-strong-caustic-8-frozenfalse.json": true,
}

func TestPlantProblems(t *testing.T) {
	files, _ := filepath.Glob("testdata/plant/*.json")
	if len(files) == 0 {
		t.Skip("no plant problems")
	}
	for _, f := range files {
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		var p Problem
		if err := json.Unmarshal(b, &p); err != nil {
			t.Fatalf("%s: %v", f, err)
		}
		st, err := Solve(p)
		if usesUpWater[filepath.Base(f)] {
			if !errors.Is(err, ErrInfeasible) {
				t.Errorf("%s: err = %v, want ErrInfeasible (the water is used up)", filepath.Base(f), err)
			}
			continue
		}
		if err != nil {
			t.Errorf("%s: %v", filepath.Base(f), err)
			continue
		}
		t.Logf("%s: %d iterations, I = %.3g", filepath.Base(f), st.Iterations, st.IonicStrength)
	}
}
