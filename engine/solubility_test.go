package engine_test

import "testing"

// TestSolidChlorinatorsSaturate: trichloroisocyanuric acid and BCDMH
// dissolve only to their solubility, about 12 g/L and 1.5 g/L at 25 °C (from
// memory); the rest stays solid in the mixed state, by the solid's own row
// in species.txt, as a sparingly soluble salt does by its Ksp.
//
// Hand checks: 10 kg TCCA is 10000/232.41 = 43.0 mol; 12 g/L in 100 L is
// 1.2 kg = 5.16 mol dissolved (cyanuric acid and its anion), 37.9 mol left.
// 10 kg BCDMH is 10000/241.47 = 41.4 mol; 0.15 kg = 0.62 mol dissolves.
// 0.5 kg TCCA (2.15 mol) dissolves whole.
func TestSolidChlorinatorsSaturate(t *testing.T) {
	cases := []struct {
		name, req string
		want      mixOutcome
	}{
		{"TCCA beyond its solubility", "mix 10 kg TCCA + 100 L water",
			mixOutcome{atLeast: map[string]float64{"C3Cl3N3O3(s)": 37.5, "C3H3N3O3|C3H2N3O3-": 4.9, "HOCl|OCl-": 14.7},
				atMost: map[string]float64{"C3Cl3N3O3(s)": 38.3, "C3H3N3O3|C3H2N3O3-": 5.4, "HOCl|OCl-": 16.2}}},
		{"BCDMH beyond its solubility", "mix 10 kg BCDMH + 100 L water",
			mixOutcome{atLeast: map[string]float64{"C5H6BrClN2O2(s)": 40.6, "C5H8N2O2": 0.58},
				atMost: map[string]float64{"C5H8N2O2": 0.66, "HOBr|OBr-": 0.66}}},
		{"TCCA below its solubility dissolves whole", "mix 0.5 kg TCCA + 100 L water",
			mixOutcome{atLeast: map[string]float64{"C3H3N3O3|C3H2N3O3-": 2.14}, atMost: map[string]float64{"C3Cl3N3O3(s)": 1e-9}}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) { checkOutcome(t, c.req, c.want) })
	}
}
