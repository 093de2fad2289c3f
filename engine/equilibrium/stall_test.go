package equilibrium

import (
	"encoding/json"
	"os"
	"path/filepath"
	"testing"
)

// TestStalledNewtonGivesUp solves problems built by package engine/state for
// invented plant mixes (permanganate, ferrous sulfate, sulfuric acid, zinc
// and copper sulfate; peroxide in water under its decomposition lock) whose
// Newton solves used to creep: a warm start, or a round after a constraint
// was added, where the line search accepted steps of 1e-12 that left the
// merit where it was for a hundred iterations or more before the solve gave
// up (and the cold start then took 17 iterations) or found its way out. A
// Newton solve now gives up after maxFlat such steps in a row: each problem
// still solves, to its totals and constraints, in fewer than 200 Newton
// iterations (209 to 417 before).
func TestStalledNewtonGivesUp(t *testing.T) {
	files, _ := filepath.Glob("testdata/stall/*.json")
	if len(files) < 3 {
		t.Fatalf("%d stalled problems in testdata/stall, want 3", len(files))
	}
	for _, f := range files {
		t.Run(filepath.Base(f), func(t *testing.T) {
			b, err := os.ReadFile(f)
			if err != nil {
				t.Fatal(err)
			}
			var p Problem
			if err := json.Unmarshal(b, &p); err != nil {
				t.Fatal(err)
			}
			st, err := Solve(p)
			if err != nil {
				t.Fatal(err)
			}
			checkTotals(t, p, st)
			checkConstraints(t, p, st)
			if st.Iterations >= 200 {
				t.Errorf("%d Newton iterations, want fewer than 200", st.Iterations)
			}
		})
	}
}
