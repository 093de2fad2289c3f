package engine_test

import (
	"strings"
	"testing"

	"mixward/engine"
)

// largestOrganic names the organic species of the final composition with
// the most carbon atoms (as carbonCount reads them) and that count.
func largestOrganic(r *engine.Result) (string, int) {
	text, most := "", 0
	for _, a := range r.FinalComposition {
		if a.Mol < 1e-6 {
			continue
		}
		n := carbonCount(a.Text)
		if n > most && a.Text != "CO2(g)" && !strings.Contains(a.Text, "CO3") {
			text, most = a.Text, n
		}
	}
	return text, most
}

// carbonCount reads the carbon atoms of the few organic species these cases
// meet.
func carbonCount(text string) int {
	switch strings.TrimSuffix(text, "(g)") {
	case "CH3OH", "HCHO", "HCOOH", "HCOO-":
		return 1
	case "C2H5OH", "CH3COOH", "CH3COO-", "HOCH2COOH", "HOCH2COO-", "H2C2O4", "HC2O4-", "C2O4^2-":
		return 2
	case "CH3COCH3", "(CH3)2CHOH", "C3H5(OH)3", "CH3CH(OH)COOH", "CH3CH(OH)COO-":
		return 3
	}
	return 0
}

// TestPermanganateWithOrganics: permanganate oxidizes alcohols and never
// joins carbon atoms: methanol to formaldehyde, formic acid and carbon
// dioxide, ethanol to acetic acid, isopropanol to acetone; acetic acid
// resists it; glycerol is broken down towards carbon dioxide. In acid it
// is reduced to manganese(II), in alkali to manganese dioxide (Vogel's
// Textbook of Practical Organic Chemistry, oxidation of alcohols; Vogel's
// Textbook of Macro and Semimicro Qualitative Inorganic Analysis,
// permanganate; from memory). 100 L of 4 % KMnO4 hold 25.3 mol
// permanganate: 127 mol of electrons in acid, 76 in alkali.
func TestPermanganateWithOrganics(t *testing.T) {
	acid, alkali := "10 L H2SO4 98 %", "10 L NaOH 50 %"
	cases := []struct {
		organic, medium string
		most            int                // the largest organic carbon count in the final state
		atLeast         map[string]float64 // product amounts
		atMost          map[string]float64
		heat            bool // the heat is estimated
	}{
		{"methanol", acid, 1, map[string]float64{"CO2(g)|H2CO3|HCOOH|HCHO": 20, "Mn^2+": 25},
			map[string]float64{"CH3COOH|CH3COO-|CH3COCH3|(CH3)2CHOH|C2H5OH": 1e-6}, true},
		{"methanol", alkali, 1, map[string]float64{"CO3^2-|HCO3-|HCOO-": 12, "MnO2(s)": 25},
			map[string]float64{"CH3COOH|CH3COO-|CH3COCH3|(CH3)2CHOH|C2H5OH|Mn^2+": 1e-6}, true},
		{"ethanol", acid, 2, map[string]float64{"CH3COOH|CH3COO-": 31, "Mn^2+": 25},
			map[string]float64{"CH3COCH3|(CH3)2CHOH": 1e-6}, true},
		{"ethanol", alkali, 2, map[string]float64{"CH3COO-": 18.9, "MnO2(s)": 25},
			map[string]float64{"CH3COCH3|(CH3)2CHOH|Mn^2+": 1e-6}, true},
		{"isopropanol", acid, 3, map[string]float64{"CH3COCH3": 63, "Mn^2+": 25},
			map[string]float64{"CO2(g)|H2CO3|CH3COOH|CH3COO-": 0.01}, true},
		{"isopropanol", alkali, 3, map[string]float64{"CH3COCH3": 37.9, "MnO2(s)": 25},
			map[string]float64{"CO3^2-|HCO3-|CH3COO-": 0.01}, true},
		{"acetic acid 80 %", acid, 2, map[string]float64{"MnO4-": 25},
			map[string]float64{"CO2(g)|H2CO3|H2C2O4|HC2O4-|Mn^2+": 1e-6}, true},
		{"acetic acid 80 %", alkali, 2, map[string]float64{"MnO4-": 25},
			map[string]float64{"CO3^2-|C2O4^2-|MnO2(s)": 1e-6}, true},
		// glycerol: broken towards carbon dioxide through glycolic acid;
		// glycolic acid has no ΔfH° in the species data: the heat counts
		// it at its ΔfG° (Heat.GibbsStandIn).
		{"glycerol", acid, 3, map[string]float64{"CO2(g)|H2CO3": 10, "Mn^2+": 25},
			map[string]float64{"CH3COOH|CH3COO-|CH3CH(OH)COOH|CH3CH(OH)COO-": 1e-6}, true},
		{"glycerol", alkali, 3, map[string]float64{"MnO2(s)": 25},
			map[string]float64{"CH3COOH|CH3COO-|CH3CH(OH)COOH|CH3CH(OH)COO-|Mn^2+": 1e-6}, true},
	}
	for _, c := range cases {
		req := "mix 100 L KMnO4 4 % + " + c.medium + " + 5 L " + c.organic
		t.Run(req, func(t *testing.T) {
			checkOutcome(t, req, mixOutcome{atLeast: c.atLeast, atMost: c.atMost})
			r := ask(t, req)
			if text, n := largestOrganic(r); n > c.most {
				t.Errorf("%s holds %d carbon atoms, more than the %s brought (%d)", text, n, c.organic, c.most)
			}
			if got := r.Heat != nil && r.Heat.HeatReleasedkJ != nil; got != c.heat {
				t.Errorf("heat estimated %v, want %v (%+v)", got, c.heat, r.Heat)
			}
		})
	}
}
