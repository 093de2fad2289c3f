package advice_test

import "testing"

// TestChlorateHydrochloricAcidSpentOnce: chlorate with hydrochloric acid
// gives chlorine (ClO3- + 6 H+ + 5 Cl- → 3 Cl2 + 3 H2O) and chlorine dioxide
// (2 ClO3- + 4 H+ + 2 Cl- → 2 ClO2 + Cl2 + 2 H2O) from one stock of acid
// (White's Handbook of Chlorination, chlorate–HCl generators, from memory).
// Either way the acid taken is 2 Cl2 + ClO2 (two protons per chlorine, one
// more per chlorine dioxide), which cannot exceed the HCl brought. Tried as a
// new user would (r9-T26): 100 L NaClO3 40 % with 20 L HCl 32 % listed ClO2
// 42.3 mol on top of Cl2 90.7 mol, 224 mol of acid from about 203
// (20 L × 1.16 kg/L × 0.32 / 36.46 g/mol; density: CRC Handbook, aqueous
// solutions, from memory).
func TestChlorateHydrochloricAcidSpentOnce(t *testing.T) {
	a := mustAdvisor(t)
	for _, tc := range []struct {
		req     string
		hclMol  float64
		wantClO bool
	}{
		{"mix 100 L NaClO3 40 % + 20 L HCl 32 %", 203, true},
		{"mix 10 L NaClO3 30 % + 10 L HCl 37 %", 10 * 1.18 * 0.37 / 36.46 * 1000, true},
	} {
		r := ask(t, a, tc.req)
		cl2, clo2 := judgedGas(r, "Cl2"), judgedGas(r, "ClO2")
		if spent := 2*cl2 + clo2; spent > tc.hclMol*1.03 {
			t.Errorf("%s: Cl2 %.1f mol and ClO2 %.1f mol spend %.0f mol acid, more than the %.0f mol brought", tc.req, cl2, clo2, spent, tc.hclMol)
		}
		if (clo2 > 0) != tc.wantClO {
			t.Errorf("%s: ClO2 %.3g mol, want some %v", tc.req, clo2, tc.wantClO)
		}
	}
}
