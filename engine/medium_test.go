package engine_test

import (
	"testing"

	"mixward/engine"
)

// TestStepsWrittenInTheirMedium: when the pH passes neutral on the way to
// the mixed state, the smaller changes are written in the medium of the
// mixed state. Metabisulfite with an excess of bleach starts alkaline (pH
// about 7.6 as combined) and ends acid (pH about 4); the chlorine it forms
// on the way must not be written beside hydroxide ("Cl2 + 2 OH-" cannot
// exist together: Cl2 hydrolyses in base; Vogel's Textbook of Macro and
// Semimicro Qualitative Inorganic Analysis, hypochlorites, from memory).
func TestStepsWrittenInTheirMedium(t *testing.T) {
	e := mustEngine(t)
	r, err := e.Ask("mix 100 L sodium metabisulfite 10 % + 100 L NaOCl 12.5 %", engine.AskOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if r.Conditions.PHFinal == nil || *r.Conditions.PHFinal >= 7 {
		t.Fatalf("final pH %v, want acid (the case assumes the pH passes neutral)", r.Conditions.PHFinal)
	}
	for _, a := range r.Alternatives {
		side := map[string]bool{}
		for _, p := range a.Reaction.Products {
			side[p.Formula] = true
		}
		if side["Cl2"] && side["OH"] {
			t.Errorf("alternative %q writes chlorine beside hydroxide", a.Reaction.Text)
		}
	}
}

// TestCrossReactionHeadsTheAnswer: iron(II) with an excess of strong
// peroxide oxidizes the iron first (Fenton; Vogel's Textbook, iron(II) with
// hydrogen peroxide, from memory); the iron then catalyses the peroxide's
// own breakdown, which moves more electrons but is not what reacts with
// what. The headline is the iron oxidation; the breakdown follows.
func TestCrossReactionHeadsTheAnswer(t *testing.T) {
	e := mustEngine(t)
	r, err := e.Ask("mix 100 L FeSO4 0.5 M + 100 L H2O2 35 %", engine.AskOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if r.Reducer == nil || r.Reducer.Species != "Fe^2+" {
		t.Fatalf("headline %v, reducer %+v; want iron(II) oxidized", r.Reaction, r.Reducer)
	}
	found := false
	for _, a := range r.Alternatives {
		found = found || a.Oxidizer != nil && a.Reducer != nil && a.Oxidizer.Species == "H2O2" && a.Reducer.Species == "H2O2"
	}
	if !found {
		t.Errorf("the peroxide's own breakdown is not among the other changes: %+v", r.Alternatives)
	}
}
