package engine_test

import (
	"math"
	"strings"
	"testing"
)

// A liquid sold neat and named without a concentration is the neat liquid:
// 100 L of acetone is 100 L × 0.7899 kg/L / 58.08 g/mol = 1360 mol, not the
// 100 mol of a 1 mol/L solution (density: CRC Handbook, Physical Constants of
// Organic Compounds, 20 °C; from memory). A chemical without such a row still
// gets 1 mol/L and says so. Neat liquids mix with water in any ratio, so the
// heat is not withheld for "too little water".
func TestNeatLiquidsReadAsNeat(t *testing.T) {
	cases := []struct {
		req, species string
		mol          float64
		note         string
	}{
		{"mix 100 L acetone + 100 L water", "CH3COCH3", 100 * 789.9 / 58.08, "read as the neat liquid"},
		{"mix 10 L ethanol + 10 L water", "C2H5OH", 10 * 789.3 / 46.07, "read as the neat liquid"},
		{"mix 10 L glycerol + 100 L water", "C3H5(OH)3", 10 * 1261.3 / 92.09, "read as the neat liquid"},
		{"mix 10 L ethanol 40 % + 10 L water", "C2H5OH", 10 * 935.2 * 0.40 / 46.07, ""},
	}
	for _, c := range cases {
		r := ask(t, c.req)
		got := 0.0
		for _, a := range r.FinalComposition {
			if a.Text == c.species {
				got += a.Mol
			}
		}
		if math.Abs(got-c.mol) > 0.02*c.mol {
			t.Errorf("%s: %s %.1f mol, want %.1f", c.req, c.species, got, c.mol)
		}
		notes := strings.Join(r.Notes, "; ")
		if c.note != "" && !strings.Contains(notes, c.note) {
			t.Errorf("%s: notes %q lack %q", c.req, notes, c.note)
		}
		if strings.Contains(notes, "1 mol/L assumed") {
			t.Errorf("%s: notes %q still assume 1 mol/L", c.req, notes)
		}
		if r.Heat != nil && strings.Contains(r.Heat.Withheld, "too little water") {
			t.Errorf("%s: heat withheld: %s", c.req, r.Heat.Withheld)
		}
	}
}
