package engine_test

import (
	"errors"
	"strings"
	"testing"

	"mixward/engine"
)

// TestNoStrengthHeavySolute: a solution named by volume without a strength
// is read at 1 mol/L, which for polyaluminium chloride (1071 g/mol) would be
// more solute than a litre holds and no water left: the solver then failed
// inside with "would use up the solvent". Tried as a new user would. Such a
// request is refused at the stream, naming what to add; a light solute keeps
// the 1 mol/L reading, and the heavy one answers once its strength is given.
func TestNoStrengthHeavySolute(t *testing.T) {
	e := mustEngine(t)
	_, err := e.Ask("mix 10 L polyaluminium chloride + 5000 L water", engine.AskOptions{})
	var pe *engine.ParseError
	if !errors.As(err, &pe) || pe.Code != "no-strength" || !strings.Contains(pe.Message, "state the strength") {
		t.Fatalf("no strength for PAC: %v, want a no-strength refusal", err)
	}
	if pe.Position != 10 {
		t.Errorf("refused at %d, want 10 (the chemical's name)", pe.Position)
	}
	for _, req := range []string{
		"mix 10 L polyaluminium chloride 10 % + 5000 L water",
		"mix 10 L NaCl + 100 L water",
	} {
		if _, err := e.Ask(req, engine.AskOptions{}); err != nil {
			t.Errorf("%s: %v", req, err)
		}
	}
}
