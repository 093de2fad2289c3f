package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
)

// TestDilutePeroxidePour: dilute alkaline peroxide keeps for hours (ammonia–
// peroxide cleaning baths, percarbonate dissolved in water: common practice,
// no source), and so does the peroxide where a little of one stream lands in
// the other. Percarbonate dissolves only to about 140 g/L at 20 °C
// (suppliers' safety data sheets, from memory), so water run onto it gives a
// saturated solution of about 2.5 mol/L peroxide at pH 10–11, not a
// concentrate. Tried as a new user would: ammonia poured into 6 % peroxide
// was refused in that order ("gets hot enough to scald", "oxygen-release"),
// and water into percarbonate read "boils". The truly dangerous mixes stay
// refused: concentrated peroxide made alkaline, a peracid concentrate with
// strong caustic (Bretherick's Handbook of Reactive Chemical Hazards,
// hydrogen peroxide with bases, peracetic acid; from memory).
func TestDilutePeroxidePour(t *testing.T) {
	a := mustAdvisor(t)
	for _, req := range []string{
		"pour 200 L ammonia 5 % into 200 L H2O2 6 %",
		"mix 200 L ammonia 5 % + 200 L H2O2 6 % + 1000 L water",
		"mix 200 L H2O2 6 % + 4 L ammonia 5 %",
		"mix 1000 L water + 30 kg sodium percarbonate",
		"mix 500 L water + 5 kg sodium percarbonate + 2 kg sodium carbonate at 40 C",
	} {
		r := ask(t, a, req)
		text := r.Decision.Title + " " + strings.Join(r.Decision.Reasons, " ")
		if r.Addition != nil {
			text += " " + r.Addition.Advice
		}
		for _, bad := range []string{"oxygen", "scald", "boils"} {
			if strings.Contains(text, bad) {
				t.Errorf("%s: %q names %q", req, text, bad)
			}
		}
		if r.Decision.Level == engine.DoNotMix {
			t.Errorf("%s: do-not-mix %v", req, hazardCodes(r))
		}
	}
	for _, req := range []string{
		"mix 100 L H2O2 35 % + 10 L NaOH 50 %",
		"mix 100 L H2O2 50 % + 5 L NaOH 50 %",
		"mix 100 L H2O2 35 % + 2 L ammonia 25 %",
		"mix 100 L NaOH 50 % + 20 L peracetic acid 15 %",
		"mix 100 L KMnO4 5 % + 20 L H2O2 35 %",
		"mix 100 L NaOCl 12.5 % + 20 L H2O2 35 %",
		"mix 100 L H2O2 35 % + 5 L copper sulfate 10 %",
	} {
		if r := ask(t, a, req); r.Decision.Level != engine.DoNotMix {
			t.Errorf("%s: %s %v, want do-not-mix", req, r.Decision.Level, hazardCodes(r))
		}
	}
}
