package advice_test

import (
	"math"
	"testing"
)

// TestHalideWithConcentratedSulfuric: concentrated sulfuric acid oxidizes
// bromide to bromine with sulfur dioxide and iodide to iodine with hydrogen
// sulfide (Vogel's Textbook of Macro and Semimicro Qualitative Inorganic
// Analysis, bromides and iodides, from memory); the decision counts the
// gases. Chloride gives hydrogen chloride only, and dilute acid neither.
//
// Hand checks: 100 L NaBr 40 % (1.41 g/mL, suppliers' data, from memory,
// as the density table has it) holds about 548 mol bromide, so up to
// 548/2 = 274 mol Br2 and as much SO2; 100 L KI 10 % holds about 60–65 mol iodide, so up to
// 60/8 = 7.5 to 8 mol H2S.
func TestHalideWithConcentratedSulfuric(t *testing.T) {
	a := mustAdvisor(t)
	for _, c := range []struct {
		req  string
		want map[string][2]float64 // gas → mol range
		none []string
	}{
		{"mix 100 L NaBr 40 % + 100 L H2SO4 98 %", map[string][2]float64{"Br2": {260, 280}, "SO2": {260, 280}}, nil},
		{"mix 100 L KI 10 % + 100 L H2SO4 98 %", map[string][2]float64{"H2S": {7, 8.3}}, nil},
		{"mix 100 L NaCl 20 % + 100 L H2SO4 98 %", nil, []string{"Cl2", "Br2", "H2S"}},
		{"mix 100 L NaBr 40 % + 100 L H2SO4 10 %", nil, []string{"Br2", "SO2"}},
	} {
		r := ask(t, a, c.req)
		got := map[string]float64{}
		for _, h := range r.Hazards {
			if h.Gas != nil {
				got[h.Gas.Formula] = math.Max(got[h.Gas.Formula], h.Gas.Mol)
			}
		}
		for gas, rng := range c.want {
			if m := got[gas]; !(m >= rng[0] && m <= rng[1]) || math.IsNaN(m) {
				t.Errorf("%s: %s %.4g mol, want %g–%g (gases %v)", c.req, gas, m, rng[0], rng[1], got)
			}
		}
		for _, gas := range c.none {
			if m := got[gas]; m > 1e-3 {
				t.Errorf("%s: %s %.4g mol, want none", c.req, gas, m)
			}
		}
	}
}
