package engine_test

import "testing"

// TestChlorineDioxideKeepsInItsStream: a chlorine dioxide stream is read as
// it is stored, ClO2(aq), not equilibrated to chlorate, chloride and acid
// (6 ClO2 + 3 H2O → 5 ClO3- + Cl- + 6 H+ runs on paper only): the same
// locks hold for the stream alone as for the mix. ClO2 solutions keep for
// days cool and dark; in alkali they give chlorite and chlorate one to one
// (2 ClO2 + 2 OH- → ClO2- + ClO3- + H2O); ClO2 does not take chloride to
// chlorine (White's Handbook of Chlorination, chlorine dioxide, from memory).
//
// Amounts: ClO2 0.3 % (3 g/L, 67.45 g/mol) is 4.45 mol per 100 L; 0.8 % is
// 2.37 mol per 20 L; NaHSO3 1 % is about 9.6 mol per 100 L, which takes
// 9.6 × 2 / 5 = 3.85 mol ClO2 to chloride and leaves about 0.6 mol.
func TestChlorineDioxideKeepsInItsStream(t *testing.T) {
	const trace = 1e-6
	cases := []struct {
		req  string
		want mixOutcome
	}{
		{"mix 100 L ClO2 0.3 % + 100 L water", mixOutcome{
			atLeast: map[string]float64{"ClO2": 4.3},
			atMost:  map[string]float64{"ClO3-": trace, "Cl-": trace, "Cl2|HOCl|OCl-": trace},
			held:    []string{"chlorine-dioxide-keeps"}}},
		{"mix 20 L ClO2 0.8 % + 200 L water, pH 7", mixOutcome{
			atLeast: map[string]float64{"ClO2": 2.3},
			atMost:  map[string]float64{"ClO3-": trace, "Cl-": trace}}},
		{"mix 100 L ClO2 0.3 % + 100 L NaHSO3 1 %", mixOutcome{
			atLeast: map[string]float64{"ClO2": 0.5, "Cl-": 3.7},
			atMost:  map[string]float64{"ClO2": 0.7, "ClO3-": trace, "Cl2|HOCl|OCl-": trace}}},
		{"mix 100 L ClO2 0.3 % + 10 L HCl 10 %", mixOutcome{
			atLeast: map[string]float64{"ClO2": 4.3},
			atMost:  map[string]float64{"ClO3-": trace, "Cl2|HOCl": trace},
			held:    []string{"chlorine-dioxide-keeps"}}},
		// 500 mg/L in 500 L: 3.71 mol ClO2, into 1.85 mol chlorite and 1.85 mol chlorate.
		{"mix 500 L water, ClO2 500 ppm + 5 L NaOH 50 %", mixOutcome{
			atLeast: map[string]float64{"ClO2-": 1.8, "ClO3-": 1.8},
			atMost:  map[string]float64{"ClO2-": 1.9, "ClO3-": 1.9, "ClO2": 1e-3, "Cl-": trace, "OCl-|HOCl": trace}}},
	}
	for _, c := range cases {
		t.Run(c.req, func(t *testing.T) { checkOutcome(t, c.req, c.want) })
	}
}

// TestStreamReadAtItsOwnTemperature: each stream alone is solved at its own
// temperature (25 °C unless stated), not at the temperature of the mix it
// goes into, so that what the mix makes is not filed as already in the
// stock, and the heat of what the mix makes is counted. 5 L of 35 % peroxide
// (1.13 g/mL, 34.01 g/mol) is 58 mol H2O2; at −94.6 kJ per mol H2O2
// (2 H2O2 → 2 H2O + O2, NBS Tables 1982, from memory) its breakdown gives
// 29 mol O2 and about 5.5 MJ. Hot caustic (pH above 9.5) breaks it down at
// once; clean hot neutral water keeps 0.55 mol/L of it (Bretherick's
// Handbook, hydrogen peroxide with bases, from memory; stabilised grades'
// hot stability, suppliers' data, from memory).
func TestStreamReadAtItsOwnTemperature(t *testing.T) {
	cases := []struct {
		req          string
		want         mixOutcome
		minkJ, maxkJ float64
	}{
		{"mix 100 L NaOH 2 %, 80 C + 5 L H2O2 35 %", mixOutcome{
			atLeast: map[string]float64{"O2(g)|O2": 28}, atMost: map[string]float64{"H2O2|HO2-": 0.1}}, 5000, 6000},
		{"mix 100 L water, 80 C + 5 L H2O2 35 %", mixOutcome{
			atLeast: map[string]float64{"H2O2": 57}, atMost: map[string]float64{"O2(g)|O2": 0},
			held: []string{"peroxide-self-decomposition"}}, 0, 200},
		// The stock stated hot itself: still clean and neutral, it keeps.
		{"mix 100 L water + 5 L H2O2 35 %, 80 C", mixOutcome{
			atLeast: map[string]float64{"H2O2": 57}, atMost: map[string]float64{"O2(g)|O2": 0}}, 0, 200},
	}
	for _, c := range cases {
		t.Run(c.req, func(t *testing.T) {
			checkOutcome(t, c.req, c.want)
			r := ask(t, c.req)
			if r.Heat == nil || r.Heat.HeatReleasedkJ == nil {
				t.Fatalf("%s: no heat figure", c.req)
			}
			if q := *r.Heat.HeatReleasedkJ; q < c.minkJ || q > c.maxkJ {
				t.Errorf("%s: heat %.0f kJ released, want %g to %g kJ", c.req, q, c.minkJ, c.maxkJ)
			}
		})
	}
}
