package advice_test

import (
	"math"
	"strings"
	"testing"
)

// TestNitricOrganicOwnReactions: concentrated nitric acid oxidizes formic
// acid and methanol by reactions of their own, not as ethanol equivalents
// (r9-T24). Hand checks from NBS Tables 1982 ΔfH° (kJ/mol, from memory:
// HCOOH(aq) −425.43, CH3OH(aq) −245.93, NO3- −205.0, NO2(g) +33.18, CO2(g)
// −393.51, H2O(l) −285.83): HCOOH + 2 H+ + 2 NO3- → CO2 + 2 NO2 + 2 H2O,
// −63.4 kJ; CH3OH + 6 H+ + 6 NO3- → CO2 + 6 NO2 + 5 H2O, −147.7 kJ;
// ethanol stays at acetic acid, C2H5OH + 4 H+ + 4 NO3- → CH3COOH + 4 NO2 +
// 3 H2O. 5 L formic acid 85 % (1.1945 kg/L, CRC Handbook) is 110.3 mol,
// giving 110 mol CO2 and 221 mol NO2 (Bretherick's Handbook, nitric acid:
// formic acid, from memory).
func TestNitricOrganicOwnReactions(t *testing.T) {
	a := mustAdvisor(t)
	for _, tc := range []struct {
		name, req, reaction string
		dH, extent          float64 // kJ per mol as written; mol of reaction (0: not checked)
		co2                 float64 // mol counted (0: not checked)
	}{
		{"r9-T24 formic acid", "mix 50 L HNO3 68 % + 5 L formic acid 85 %", "HCOOH + 2 H+ + 2 NO3- → CO2(g) + 2 NO2(g) + 2 H2O", -63.4, 110.3, 110.3},
		{"methanol", "mix 50 L HNO3 68 % + 1 L methanol", "CH3OH + 6 H+ + 6 NO3- → CO2(g) + 6 NO2(g) + 5 H2O", -147.7, 0, 0},
		{"ethanol", "mix 50 L HNO3 68 % + 1 L ethanol", "C2H5OH + 4 H+ + 4 NO3- → CH3COOH", 0, 0, 0},
	} {
		r := ask(t, a, tc.req)
		h, ok := hazardOf(r, "nitric-organic-runaway")
		if !ok || h.ReactionHeat == nil {
			t.Errorf("%s: no nitric-organic heat", tc.name)
			continue
		}
		rh := h.ReactionHeat
		if !strings.Contains(rh.Reaction, tc.reaction) {
			t.Errorf("%s: reaction %q, want %q", tc.name, rh.Reaction, tc.reaction)
		}
		if strings.Contains(rh.Reaction, "ethanol equivalents") {
			t.Errorf("%s: counted as ethanol equivalents: %q", tc.name, rh.Reaction)
		}
		if tc.dH != 0 && math.Abs(rh.DeltaHkJPerMol-tc.dH) > 2 {
			t.Errorf("%s: ΔrH %.1f kJ/mol, hand %.1f ± 2", tc.name, rh.DeltaHkJPerMol, tc.dH)
		}
		if tc.extent != 0 && math.Abs(rh.ExtentMol-tc.extent) > 0.02*tc.extent {
			t.Errorf("%s: extent %.1f mol, hand %.1f", tc.name, rh.ExtentMol, tc.extent)
		}
		if tc.co2 != 0 {
			if n := judgedGas(r, "CO2"); math.Abs(n-tc.co2) > 0.02*tc.co2 {
				t.Errorf("%s: CO2 %.1f mol, hand %.1f", tc.name, n, tc.co2)
			}
		}
	}
}

// TestNitricOrganicGasByOwnEquation: the nitrogen dioxide of a reagent with
// a nitric-acid reaction of its own follows that equation: methanol gives
// six NO2 per CO2 (CH3OH + 6 HNO3 → CO2 + 6 NO2 + 5 H2O; Bretherick's
// Handbook, nitric acid with methanol, from memory), as far as the acid
// goes. Tried as a new user would: 5 L of methanol in 50 L of 68 % nitric
// acid listed CO2 124 mol and NO2 494 mol (four per CO2). Hand: 5 L ×
// 0.7914 kg/L / 32.04 g/mol = 123.5 mol methanol, 741 mol NO2 of the 761
// mol acid (50 L × 1.41 kg/L × 0.68 / 63.01 g/mol).
func TestNitricOrganicGasByOwnEquation(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 50 L HNO3 68 % + 5 L methanol")
	co2, no2 := judgedGas(r, "CO2"), judgedGas(r, "NO2")
	if math.Abs(co2-123.5) > 3 || math.Abs(no2-6*co2) > 0.02*6*co2 {
		t.Errorf("methanol in nitric acid: CO2 %.1f, NO2 %.1f mol; want about 123.5 and six times that", co2, no2)
	}
	r = ask(t, a, "mix 50 L HNO3 68 % + 50 L methanol")
	if no2 := judgedGas(r, "NO2"); no2 > 770 {
		t.Errorf("methanol in excess: NO2 %.1f mol, more than the 761 mol of acid", no2)
	}
}
