package advice_test

import (
	"testing"

	"mixward/engine"
)

// TestOxidizerWithAnyOrganicLiquid: every strong solid oxidizer poured on
// any organic liquid of the dictionary, not only the alcohols and glycerol,
// is a fire (Bretherick's Handbook of Reactive Chemical Hazards, sodium
// chlorate, nitrates, perchlorates and persulfates with organic materials,
// from memory); a concentrated chlorate solution is too (its residues dry
// to the same mixture). Each oxidizer and each organic alone in water stay
// quiet, and a dilute rinse is no fuel.
func TestOxidizerWithAnyOrganicLiquid(t *testing.T) {
	a := mustAdvisor(t)
	cases := []struct {
		req   string
		level engine.Level
		fire  bool
	}{
		{"mix 1 kg NaClO3 + 1 L acetone", engine.DoNotMix, true},
		{"mix 1 kg KMnO4 + 1 L acetone", engine.DoNotMix, true},
		{"mix 1 kg NaNO3 + 1 L ethanol", engine.DoNotMix, true},
		{"mix 1 kg Na2S2O8 + 10 L monoethanolamine", engine.DoNotMix, true},
		{"mix 1 kg KClO4 + 5 L triethanolamine", engine.DoNotMix, true},
		{"mix 100 L NaClO3 40 % + 10 L acetone", engine.DoNotMix, true},
		{"mix 100 L NaClO3 40 % + 100 L water", engine.NoConcern, false},
		{"mix 100 L water + 1 kg NaNO3", engine.NoConcern, false},
		{"mix 1000 L water + 1 kg KMnO4", engine.NoConcern, false},
		{"mix 1000 L water + 1 L ethanol + 1 kg NaNO3", "", false},
	}
	for _, tc := range cases {
		r := ask(t, a, tc.req)
		if tc.level != "" && r.Decision.Level != tc.level {
			t.Errorf("%s: level %s, want %s", tc.req, r.Decision.Level, tc.level)
		}
		fire := false
		for _, h := range r.Hazards {
			fire = fire || h.Code == "oxidizer-organic-fire"
		}
		if fire != tc.fire {
			t.Errorf("%s: oxidizer-organic-fire raised %v, want %v", tc.req, fire, tc.fire)
		}
	}
	// A slow oxidizer's fire heat is what burning would give, not a heat of
	// the mix: chlorate solution with acetone does not warm the tank.
	if h := ask(t, a, "mix 100 L NaClO3 40 % + 10 L acetone").Decision.Heat; h != nil && h.ReleasedkJ > 1000 {
		t.Errorf("chlorate solution with acetone: %.0f kJ counted as released, want the fire heat left out", h.ReleasedkJ)
	}
}

// TestNitricWithOrganicGivesNO2: concentrated nitric acid with ethanol
// gives nitrogen dioxide, one per electron taken from the ethanol (4 per
// ethanol, as far as the acid goes: Bretherick's Handbook, nitric acid with
// ethanol, from memory): 10 L ethanol (171 mol) under 100 L of 68 % acid
// (1520 mol) gives 4 × 171 = 685 mol; a 1 % acid rinse gives none.
func TestNitricWithOrganicGivesNO2(t *testing.T) {
	a := mustAdvisor(t)
	no2 := func(req string) float64 {
		for _, h := range ask(t, a, req).Hazards {
			if h.Code == "no2-release" && h.Gas != nil {
				return h.Gas.Mol
			}
		}
		return 0
	}
	if got := no2("mix 100 L HNO3 68 % + 10 L ethanol"); got < 600 || got > 760 {
		t.Errorf("nitric 68 %% with 10 L ethanol: NO2 %.0f mol, want about 685", got)
	}
	if got := no2("mix 1000 L water, HNO3 1 % + 1 L ethanol"); got != 0 {
		t.Errorf("a 1 %% nitric rinse with ethanol: NO2 %.3g mol, want none", got)
	}
}
