package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
)

// TestDryOxidizerFuelBlend: a solid strong oxidizer blended dry with a solid
// fuel burns fiercely or explodes from friction, impact or a spark, with no
// liquid at all (Bretherick's Handbook of Reactive Chemical Hazards,
// chlorates with sugar and sulfur, permanganate with sulfur, nitrates with
// aluminium powder, persulfates with organic matter; from memory). Tried as
// a new user would: chlorate with sugar read "no concern: solids alone do
// not react". Blends without a fuel or without a strong oxidizer stay as
// they were.
func TestDryOxidizerFuelBlend(t *testing.T) {
	a := mustAdvisor(t)
	for _, req := range []string{
		"mix 5 kg NaClO3 + 20 kg sucrose",
		"mix 5 kg KClO3 + 1 kg sulfur",
		"mix 5 kg KMnO4 + 5 kg sulfur",
		"mix 5 kg NaNO3 + 5 kg Al",
		"mix 5 kg Na2S2O8 + 5 kg citric acid",
		"mix 2 kg NaClO3 + 2 kg Na2S2O5",
		"mix 2 kg KNO3 + 2 kg NH4Cl",
	} {
		r := ask(t, a, req)
		if r.Decision.Level != engine.DoNotMix || !strings.Contains(strings.Join(hazardCodes(r), " "), "oxidizer-fuel-blend") {
			t.Errorf("%s: %s %v, want do-not-mix, oxidizer-fuel-blend", req, r.Decision.Level, hazardCodes(r))
		}
	}
	for _, req := range []string{
		"mix 5 kg NaCl + 5 kg sucrose",
		"mix 5 kg KNO3 + 5 kg NaCl",
		"mix 5 kg NaClO3 + 5 kg Na2SO4",
		"mix 5 kg KMnO4 + 5 kg Na2CO3",
		"mix 5 kg FeSO4.7H2O + 5 kg NaCl",
	} {
		r := ask(t, a, req)
		if strings.Contains(strings.Join(hazardCodes(r), " "), "oxidizer-fuel-blend") {
			t.Errorf("%s: %v, want no oxidizer-fuel-blend", req, hazardCodes(r))
		}
	}
	// With water the solutions are judged as such (the oxidizer–organic
	// rule), not as a dry blend.
	r := ask(t, a, "mix 5 kg KNO3 + 5 kg Na2S2O3 + 100 L water")
	if strings.Contains(strings.Join(hazardCodes(r), " "), "oxidizer-fuel-blend") {
		t.Errorf("nitrate and thiosulfate in water: %v", hazardCodes(r))
	}
}
