package advice_test

import (
	"math"
	"testing"
)

// TestAquaRegiaFumes: 3 HCl + HNO3 → NOCl + Cl2 + 2 H2O (Vogel's Textbook of
// Macro and Semimicro Qualitative Inorganic Analysis, aqua regia; from
// memory). Hand check for 3 L HCl 37 % + 1 L HNO3 65 %: HCl 1.18 g/mL and
// HNO3 1.39 g/mL (CRC Handbook, Concentrative properties of aqueous
// solutions; from memory) give 3 × 1180 × 0.37 / 36.46 = 35.9 mol HCl and
// 1390 × 0.65 / 63.01 = 14.3 mol HNO3; the chloride allows 35.9 / 3 = 12.0
// mol of each gas, the nitrate 14.3: 12.0 mol NOCl and 12.0 mol Cl2, far
// more than a 4 L headspace holds.
func TestAquaRegiaFumes(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 3 L HCl 37 % + 1 L HNO3 65 %")
	for _, c := range []struct {
		code string
		mol  float64
	}{{"nocl-release", 12.0}, {"chlorine-release", 12.0}} {
		h, ok := hazardOf(r, c.code)
		if !ok || h.Gas == nil {
			t.Fatalf("no %s gas hazard among %v", c.code, codesOf(r))
		}
		if math.Abs(h.Gas.Mol-c.mol)/c.mol > 0.05 {
			t.Errorf("%s: %.3g mol, want about %.3g (hand check above)", c.code, h.Gas.Mol, c.mol)
		}
		if h.Gas.HeadspacePPM < 1e5 {
			t.Errorf("%s: headspace %.3g ppm, want the headspace filled", c.code, h.Gas.HeadspacePPM)
		}
	}
	if r.Decision == nil || r.Decision.Level != "do-not-mix" {
		t.Errorf("aqua regia: decision %+v, want do-not-mix", r.Decision)
	}
}

// TestChloramineBelowBreakpoint: hypochlorite with more ammonium than
// itself stops at monochloramine (White's Handbook of Chlorination,
// breakpoint curve; from memory): the chloramine hazard stays, no nitrogen
// is counted and the mix does not turn strongly acid.
func TestChloramineBelowBreakpoint(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 100 L NaOCl 5 % + 100 L NH4Cl 1 M")
	if _, ok := hazardOf(r, "chloramine-release"); !ok {
		t.Errorf("no chloramine-release among %v", codesOf(r))
	}
	for _, g := range r.Gases {
		if g.Text == "N2(g)" && g.Mol > 0.01 {
			t.Errorf("N2(g) %.3g mol below breakpoint, want none", g.Mol)
		}
	}
	if r.Conditions.PHFinal == nil || *r.Conditions.PHFinal < 4.5 {
		t.Errorf("final pH %v, want near neutral (about 5 from the ammonium left over)", r.Conditions.PHFinal)
	}
}
