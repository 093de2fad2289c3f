package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
)

// TestSolidMakeUps: dissolving solids in water is routine (common practice,
// no source: run the solid into the water, stirring). A make-up whose final
// mix hardly warms is no concern, even though a litre of water run onto the
// heap would warm for a moment; caustic flakes, which make the water boil
// where it lands on them, keep the order; and a third stream run into a
// tank of two is not judged as its whole heat set free in a hundredth of
// the tank (caustic then ferrous sulfate into water read "near boiling in
// every sequence").
func TestSolidMakeUps(t *testing.T) {
	a := mustAdvisor(t)
	for _, req := range []string{
		"mix 1000 L water + 2 kg Na3PO4",
		"mix 1000 L water + 5 kg Na2CO3 + 2 kg Na3PO4",
		"mix 1000 L water + 10 kg Na2SO3",
	} {
		if r := ask(t, a, req); r.Decision.Level != engine.NoConcern {
			t.Errorf("%s: %s %q, want no-concern", req, r.Decision.Level, r.Decision.Title)
		}
	}
	r := ask(t, a, "mix 200 L water + 20 kg NaOH + 5 kg FeSO4")
	if r.Decision.Level != engine.WithPrecautions || strings.Contains(r.Decision.Title, "boil") {
		t.Errorf("caustic and ferrous sulfate make-up: %s %q, want with-precautions without boiling", r.Decision.Level, r.Decision.Title)
	}
	var flakes *engine.PourOrder
	for i, o := range r.Addition.Orders {
		if o.Added == "H2O" && o.Into == "NaOH" {
			flakes = &r.Addition.Orders[i]
		}
	}
	if flakes == nil || len(flakes.Hazards) == 0 || flakes.Hazards[0].Code != "boils" || !strings.Contains(flakes.Hazards[0].Message, "onto solid NaOH") {
		t.Errorf("water run onto caustic flakes: %+v, want it to boil where it lands", flakes)
	}
}
