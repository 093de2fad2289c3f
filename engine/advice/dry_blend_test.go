package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
	"mixward/engine/advice"
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

// TestDryChlorinatorAcidBlend: a solid chlorinating agent blended dry with a
// solid acid gives chlorine as soon as it takes up moisture and heats until
// it smoulders (Bretherick's Handbook of Reactive Chemical Hazards, calcium
// hypochlorite: acids, from memory; common practice, no source). Tried as a
// new user would: calcium hypochlorite with sodium bisulfate read "with
// precautions", as calcium hypochlorite alone does. Boric and cyanuric acid
// are too weak to count; salts without acid stay as they were.
func TestDryChlorinatorAcidBlend(t *testing.T) {
	a := mustAdvisor(t)
	for _, req := range []string{
		"mix 10 kg Ca(OCl)2 + 10 kg NaHSO4",
		"mix 5 kg sodium dichloroisocyanurate + 5 kg sulfamic acid",
		"mix 5 kg trichloroisocyanuric acid + 5 kg citric acid",
		"mix 2 kg LiOCl + 2 kg oxalic acid",
	} {
		r := ask(t, a, req)
		if r.Decision.Level != engine.DoNotMix || !strings.Contains(strings.Join(hazardCodes(r), " "), "dry-blend-chlorine") {
			t.Errorf("%s: %s %v, want do-not-mix, dry-blend-chlorine", req, r.Decision.Level, hazardCodes(r))
		}
	}
	for _, req := range []string{
		"mix 10 kg Ca(OCl)2 + 10 kg NaCl",
		"mix 10 kg Ca(OCl)2 + 10 kg boric acid",
		"mix 10 kg trichloroisocyanuric acid + 10 kg cyanuric acid",
		"mix 10 kg NaHSO4 + 10 kg NaCl",
		"mix 10 kg Ca(OCl)2 + 10 kg NaHSO4 + 2000 L water",
	} {
		r := ask(t, a, req)
		if strings.Contains(strings.Join(hazardCodes(r), " "), "dry-blend-chlorine") {
			t.Errorf("%s: %v, want no dry-blend-chlorine", req, hazardCodes(r))
		}
	}
}

// TestDryBlendShortAnswer: solids blended dry have no liquid, so the short
// answer says the heat is not estimated for a dry blend (not that data are
// missing) and gives no headspace basis of "0 L".
func TestDryBlendShortAnswer(t *testing.T) {
	a := mustAdvisor(t)
	s := advice.RenderShort(ask(t, a, "mix 50 kg NaCl + 50 kg Na2CO3"))
	if strings.Contains(s, "formation enthalpies missing") || strings.Contains(s, "(0 L;") || !strings.Contains(s, "solids blended dry") {
		t.Errorf("dry blend short answer:\n%s", s)
	}
}

// TestDryAcidCarbonateNote: a dry acid blended with bicarbonate keeps while
// dry but fizzes once wet (effervescent blends; common practice, no
// source): no concern as a dry blend, with a note in the short answer.
func TestDryAcidCarbonateNote(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 25 kg citric acid + 25 kg NaHCO3")
	if r.Decision.Level != engine.NoConcern {
		t.Errorf("citric acid with bicarbonate, dry: %s", r.Decision.Level)
	}
	if s := advice.RenderShort(r); !strings.Contains(s, "Note: The acid H3C6H5O7 blended dry with NaHCO3") {
		t.Errorf("no note of the gas once wet:\n%s", s)
	}
	if r := ask(t, a, "mix 25 kg NaCl + 25 kg NaHCO3"); strings.Contains(strings.Join(hazardCodes(r), " "), "dry-blend-gas-when-wet") {
		t.Errorf("salt with bicarbonate: %v", hazardCodes(r))
	}
}

// TestDryAmmoniumBlends: ammonium salts whose anion carries oxygen are
// fuels as well (the ammonium burns; with a chlorinator, damp, it gives
// nitrogen trichloride: Bretherick's Handbook, calcium hypochlorite, from
// memory), and a solid nitrite blended dry with any ammonium salt makes
// ammonium nitrite in the first moisture (Bretherick's Handbook, ammonium
// nitrite, from memory). Tried as a new user would: all four read "no
// concern" or only "with precautions". Blends without the pair stay quiet.
func TestDryAmmoniumBlends(t *testing.T) {
	a := mustAdvisor(t)
	for req, code := range map[string]string{
		"mix 25 kg ammonium nitrate + 25 kg sodium nitrite":     "ammonium-nitrite-runaway",
		"mix 10 kg ammonium chloride + 10 kg sodium nitrite":    "ammonium-nitrite-runaway",
		"mix 20 kg sodium nitrite + 20 kg ammonium sulfate":     "ammonium-nitrite-runaway",
		"mix 5 kg calcium hypochlorite + 5 kg ammonium sulfate": "oxidizer-fuel-blend",
	} {
		r := ask(t, a, req)
		if r.Decision.Level != engine.DoNotMix || !strings.Contains(strings.Join(hazardCodes(r), " "), code) {
			t.Errorf("%s: %s %v, want do-not-mix, %s", req, r.Decision.Level, hazardCodes(r), code)
		}
	}
	for _, req := range []string{
		"mix 5 kg sodium nitrite + 5 kg sodium chloride",
		"mix 5 kg ammonium sulfate + 5 kg potassium chloride",
	} {
		if r := ask(t, a, req); r.Decision.Level != engine.NoConcern {
			t.Errorf("%s: %s %v, want no-concern", req, r.Decision.Level, hazardCodes(r))
		}
	}
}

// TestCarbon: activated carbon and charcoal are known as carbon. Dry with
// a solid oxidizer they are the classic fuel (black powder: nitrate with
// charcoal; Bretherick's Handbook, from memory); in water oxidizing agents
// do not burn them at plant temperatures (activated-carbon dechlorination:
// common practice, no source), but carbon breaks strong peroxide down to
// oxygen with heat, and concentrated nitric acid attacks it (Bretherick's
// Handbook, hydrogen peroxide and nitric acid with carbon, from memory).
func TestCarbon(t *testing.T) {
	a := mustAdvisor(t)
	for req, want := range map[string]engine.Level{
		"mix 25 kg potassium nitrate + 5 kg charcoal":             engine.DoNotMix,
		"mix 1000 L water + 10 kg activated carbon":               engine.NoConcern,
		"mix 1000 L water, NaOCl 5 mg/L + 50 kg activated carbon": engine.NoConcern,
		"mix 100 L H2O2 35 % + 5 kg activated carbon":             engine.DoNotMix,
		"mix 100 L HNO3 65 % + 5 kg charcoal":                     engine.DoNotMix,
	} {
		if r := ask(t, a, req); r.Decision.Level != want {
			t.Errorf("%s: %s %v, want %s", req, r.Decision.Level, hazardCodes(r), want)
		}
	}
	r := ask(t, a, "mix 100 L H2O2 35 % + 5 kg activated carbon")
	for _, g := range r.Decision.Gases {
		if strings.HasPrefix(g.Text, "CO2") {
			t.Errorf("carbon burnt by peroxide: %v", r.Decision.Gases)
		}
	}
}
