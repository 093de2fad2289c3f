package engine_test

import (
	"strings"
	"testing"
)

// TestNitricAcidSpentOnceWithMetals: a metal in nitric acid reduces the
// nitrate and spends the acid on it; hydrogen does not come off beside the
// nitrogen oxides (T06 listed NO 70 mol and H2 140 mol, the acid counted
// twice). The nitrogen oxides stay within what the acid pays for: about four
// protons per nitric oxide, 3 M + 8 H+ + 2 NO3- → 3 M2+ + 2 NO + 4 H2O
// (Vogel's Textbook of Macro and Semimicro Qualitative Inorganic Analysis,
// nitric acid with metals, from memory). Heat for aluminium: Al + 4 H+ +
// NO3- → Al3+ + NO + 2 H2O, about −807 kJ per mol Al from NBS Tables 1982
// (Al3+ −531, NO +90.3, H2O −285.8, NO3- −205, from memory), × 70 mol
// ≈ 57 MJ.
func TestNitricAcidSpentOnceWithMetals(t *testing.T) {
	// 50 L HNO3 30 %: 1.18 kg/L (CRC Handbook, density of aqueous
	// solutions, from memory) × 50 × 0.30 / 63.01 ≈ 281 mol acid.
	const acidMol = 281.0
	for _, tc := range []struct {
		name, req string
		h2        bool
		heatLo    float64 // kJ, when > 0
		heatHi    float64
	}{
		{"T06 aluminium", "mix 5 kg Al + 50 L HNO3 30 %", false, 50000, 65000},
		{"zinc", "mix 5 kg Zn + 50 L HNO3 30 %", false, 0, 0},
		{"iron", "mix 5 kg Fe + 50 L HNO3 30 %", false, 0, 0},
	} {
		r := ask(t, tc.req)
		var h2, nox float64
		for _, g := range r.Gases {
			switch {
			case strings.HasPrefix(g.Text, "H2") && !strings.HasPrefix(g.Text, "H2O") && !strings.HasPrefix(g.Text, "H2S"):
				h2 += g.Mol
			case strings.HasPrefix(g.Text, "NO"):
				nox += g.Mol
			}
		}
		if (h2 > 0.5) != tc.h2 {
			t.Errorf("%s: H2 %.3g mol, want hydrogen %v", tc.name, h2, tc.h2)
		}
		if !tc.h2 && nox > acidMol/4*1.05 && !strings.Contains(tc.req, "HCl") {
			t.Errorf("%s: nitrogen oxides %.3g mol, more than the acid pays for (%.3g mol at four protons each)", tc.name, nox, acidMol/4)
		}
		if tc.heatHi > 0 {
			if r.Heat == nil || r.Heat.HeatReleasedkJ == nil {
				t.Errorf("%s: no heat counted", tc.name)
			} else if q := *r.Heat.HeatReleasedkJ; q < tc.heatLo || q > tc.heatHi {
				t.Errorf("%s: heat %.0f kJ, want %.0f–%.0f kJ", tc.name, q, tc.heatLo, tc.heatHi)
			}
		}
	}
}
