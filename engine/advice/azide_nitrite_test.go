package advice_test

import (
	"math"
	"strings"
	"testing"

	"mixward/engine"
)

// gasMolOf is the amount of the gas whose text starts with formula.
func gasMolOf(r *engine.Result, formula string) float64 {
	for _, g := range r.Gases {
		if strings.HasPrefix(g.Text, formula+"(g)") || strings.HasPrefix(g.Text, formula+" ") {
			return g.Mol
		}
	}
	return 0
}

// TestAzideDestructionNeedsAcid: nitrite destroys azide as nitrous acid
// meets hydrazoic acid, HNO2 + HN3 → N2 + N2O + H2O, two protons per pair
// from the sodium salts (Greenwood & Earnshaw, Chemistry of the Elements,
// hydrazoic acid, from memory; azide destruction with nitrite and then
// acid: common practice, no source). The tank of the destruction at the
// invented plant (T-AZ1): 100 L of 2 % sodium azide (100 × 1.01 × 0.02 /
// 65.01 = 31.1 mol), 20 L of 10 % nitrite (20 × 1.07 × 0.10 / 69.0 = 31.0
// mol) and 20 L of 10 % sulfuric acid (20 × 1.066 × 0.10 / 98.08 = 21.7 mol,
// 43.5 mol H+): the acid is short, about 21.7 pairs react, 21.7 mol N2 and
// 21.7 mol N2O come off and about 9.4 mol of azide stays.
func TestAzideDestructionNeedsAcid(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 100 L sodium azide 2 % + 20 L sodium nitrite 10 % + 20 L sulfuric acid 10 %")
	n2, n2o := gasMolOf(r, "N2"), gasMolOf(r, "N2O")
	if math.Abs(n2-21.7) > 3 || math.Abs(n2o-21.7) > 3 {
		t.Errorf("N2 %.1f mol and N2O %.1f mol, want about 21.7 each (one pair per two protons, nitrogen and nitrous oxide alike)", n2, n2o)
	}
	h, ok := hazardOf(r, "azide-left")
	if !ok {
		t.Fatalf("no azide-left hazard with the acid short; hazards %v", hazardCodes(r))
	}
	if !strings.Contains(h.Message, "the acid ran short") || !strings.Contains(h.Message, "9.") {
		t.Errorf("azide-left message %q, want about 9 mol left because the acid ran short", h.Message)
	}

	// Without acid the two keep: nothing is destroyed, nothing is left
	// over from a destruction.
	r = ask(t, a, "mix 100 L sodium azide 2 % + 20 L sodium nitrite 10 %")
	if g := gasMolOf(r, "N2") + gasMolOf(r, "N2O"); g > 0.01 {
		t.Errorf("azide with nitrite and no acid gives %.3g mol of nitrogen gases, want none", g)
	}
	if _, ok := hazardOf(r, "azide-left"); ok {
		t.Error("azide-left fired where no destruction ran")
	}

	// Nitrite and acid in excess destroy it all: 46.5 mol nitrite for
	// 31.1 mol azide, 108 mol H+ for the 62 the pairs need.
	r = ask(t, a, "mix 100 L sodium azide 2 % + 30 L sodium nitrite 10 % + 50 L sulfuric acid 10 %")
	if _, ok := hazardOf(r, "azide-left"); ok {
		t.Error("azide-left fired with nitrite and acid in excess")
	}
	if n2 := gasMolOf(r, "N2"); math.Abs(n2-31.1) > 3 {
		t.Errorf("N2 %.1f mol with everything in excess, want about 31.1 (one per azide)", n2)
	}
}
