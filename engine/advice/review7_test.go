package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
)

// TestReview7Pours checks pours from a plant chemist's seventh review,
// each with its basis:
//   - chloramination with chlorine gas and ammonia gas at Cl2:NH3-N about
//     2.4:1 by weight, ammonia first, is routine below 5:1 (White's Handbook
//     of Chlorination, from memory): with precautions, not refused because
//     the liquefied gases give off what they are where they land;
//   - chlorate in concentrated sulfuric acid gives chlorine dioxide,
//     3 HClO3 → 2 ClO2 + HClO4 + H2O (Bretherick's Handbook, sodium
//     chlorate: sulfuric acid, from memory): 100 L of 40 % (about 500 mol)
//     gives up to about 333 mol, and the gas figure says so;
//   - hydrazine with 68 % nitric acid is oxidized violently and leaves
//     hydrazinium nitrate, explosive when dry (Bretherick's Handbook,
//     hydrazine: nitric acid, from memory): do not mix; 200 ppm hydrazine
//     boiler water with a little dilute acid is no concern;
//   - solid sodium cyanide dissolved in plain water smells of HCN (pKa 9.2)
//     but is the routine bath make-up: with precautions, the water made
//     alkaline first (common practice, no source); cyanide with acid, or
//     cyanide formed by a reaction, stays do-not-mix.
func TestReview7Pours(t *testing.T) {
	a := mustAdvisor(t)
	r0 := ask(t, a, "mix 10 kg NaCN + 200 L water")
	if r0.Decision.Level != engine.WithPrecautions || !strings.Contains(strings.Join(r0.Decision.Actions, "\n"), "alkaline first") {
		t.Errorf("cyanide make-up: level %s, actions %q; want with-precautions, the water made alkaline first", r0.Decision.Level, r0.Decision.Actions)
	}
	// Bleach into acidic water releases chlorine where it lands; the safe
	// order would run 1000 L into 5 L, so the answer says to neutralise the
	// water first (White's Handbook of Chlorination, pH of hypochlorite
	// dosing, from memory; common practice).
	if r := ask(t, a, "mix 1000 L water, pH 2.5 + 5 L NaOCl 12.5 %"); !strings.Contains(strings.Join(r.Decision.Actions, "\n"), "to neutral first") {
		t.Errorf("bleach into acidic water: actions %q, want the water brought to neutral first", r.Decision.Actions)
	}
	// Dichromate catalyses the decomposition of the peroxide it does not
	// use up (Bretherick's Handbook, hydrogen peroxide: chromium compounds,
	// from memory): 38 mol Cr2O7 take 114 mol H2O2 to O2 by reduction and
	// about 490 mol more come off the excess, not 114 alone.
	o2 := 0.0
	for _, g := range ask(t, a, "mix 100 L Na2Cr2O7 10 % + 100 L H2O2 35 %").Decision.Gases {
		if strings.HasPrefix(g.Text, "O2") {
			o2 = g.Mol
		}
	}
	if o2 < 450 {
		t.Errorf("dichromate with 35 %% peroxide: O2 %.0f mol, want the excess decomposed too (about 600)", o2)
	}
	// Sodium dithionite dissolves to about 182 g/L (CRC Handbook, from
	// memory); 50 kg in 100 L leaves about 30 kg wet, which heats itself
	// and gives off SO2 (Bretherick's Handbook, sodium dithionite, from
	// memory); 5 kg in 1000 L dissolves.
	if r := ask(t, a, "mix 50 kg Na2S2O4 + 100 L water"); r.Decision.Level != engine.DoNotMix {
		t.Errorf("50 kg dithionite in 100 L water: level %s, want do-not-mix", r.Decision.Level)
	}
	if r := ask(t, a, "mix 5 kg Na2S2O4 + 1000 L water"); r.Decision.Level == engine.DoNotMix {
		t.Errorf("5 kg dithionite in 1000 L water: do-not-mix (%s)", r.Decision.Title)
	}
	// Copper in 68 % nitric acid gives two NO2 per copper (Vogel's
	// Textbook, from memory): 5 kg (78.7 mol) gives about 157 mol, part of
	// it paired as N2O4 in the state, counted as NO2.
	no2 := 0.0
	for _, h := range ask(t, a, "mix 50 L HNO3 68 % + 5 kg Cu").Hazards {
		if h.Code == "no2-release" && h.Gas != nil {
			no2 = h.Gas.Mol
		}
	}
	if no2 < 140 || no2 > 175 {
		t.Errorf("copper in 68 %% nitric acid: NO2 %.0f mol, want about 157 with N2O4 counted", no2)
	}
	if r := ask(t, a, "mix 200 L NaCN 5 % + 20 L HCl 36 %"); r.Decision.Level != engine.DoNotMix {
		t.Errorf("cyanide with hydrochloric acid: level %s, want do-not-mix", r.Decision.Level)
	}
	if r := ask(t, a, "mix 100 L N2H4 35 % + 10 L HNO3 68 %"); r.Decision.Level != engine.DoNotMix {
		t.Errorf("hydrazine with nitric acid: level %s, want do-not-mix (%s)", r.Decision.Level, r.Decision.Title)
	}
	if r := ask(t, a, "mix 1000 L water, N2H4 200 ppm + 1 L HNO3 10 %"); r.Decision.Level != engine.NoConcern {
		t.Errorf("hydrazine boiler water with dilute acid: level %s, want no-concern (%s)", r.Decision.Level, r.Decision.Title)
	}
	if r := ask(t, a, "mix 1000 L water + 0.2 kg Cl2 + 0.1 kg NH3"); r.Decision.Level != engine.WithPrecautions {
		t.Errorf("chloramination with the gases: level %s, want with-precautions (%s)", r.Decision.Level, r.Decision.Title)
	}
	r := ask(t, a, "mix 100 L NaClO3 40 % + 100 L H2SO4 98 %")
	mol := 0.0
	for _, h := range r.Hazards {
		if h.Code == "clo2-release" && h.Gas != nil {
			mol = h.Gas.Mol
		}
	}
	if mol < 300 || mol > 360 {
		t.Errorf("chlorate with 98 %% sulfuric acid: ClO2 %.0f mol, want about 333", mol)
	}
}
