package state

import (
	"testing"

	"mixward/engine/chem"
)

// TestCyanideComplexesInorganic: metal cyanide complexes and cyanogen are
// inorganic by the usual convention (their carbon is cyanide's), so the
// organic-carbon lock does not keep cyanide out of them; acetate, EDTA and
// urea stay organic, bicarbonate and HCN inorganic (common practice, no
// source).
func TestCyanideComplexesInorganic(t *testing.T) {
	for _, c := range []struct {
		formula, ion string
		organic      bool
	}{
		{"Fe(CN)6", "Fe(CN)6^4-", false},
		{"Fe(CN)6", "Fe(CN)6^3-", false},
		{"Ag(CN)2", "Ag(CN)2-", false},
		{"Cu(CN)4", "Cu(CN)4^3-", false},
		{"C2N2", "C2N2", false},
		{"HCN", "HCN", false},
		{"HCO3", "HCO3-", false},
		{"CH3COO", "CH3COO-", true},
		{"C10H12N2O8", "C10H12N2O8^4-", true},
		{"CO(NH2)2", "CO(NH2)2", true},
		{"SCN", "SCN-", false},
	} {
		a, err := chem.ParseFormula(c.formula)
		if err != nil {
			t.Fatal(err)
		}
		if got := IsOrganic(a, c.ion); got != c.organic {
			t.Errorf("IsOrganic(%s) = %v, want %v", c.ion, got, c.organic)
		}
	}
}

// TestRatioCondition: ratio(A / B)<N compares the groups' mol/L; a missing
// denominator counts as an infinite ratio. Breakpoint: hypochlorite over
// ammonia below 1 stops at monochloramine (White's Handbook of
// Chlorination, breakpoint curve; from memory).
func TestRatioCondition(t *testing.T) {
	c, err := parseCond("ratio(Cl(1), Br(1) / NH4+, NH3, NH2Cl)<1 and ph<10")
	if err != nil {
		t.Fatal(err)
	}
	molar := func(cl, nh4 float64) func(Group) float64 {
		return func(g Group) float64 {
			switch {
			case g.Element == "Cl":
				return cl
			case len(g.Species) == 1 && g.Species[0] == "NH4+":
				return nh4
			}
			return 0
		}
	}
	for _, x := range []struct {
		cl, nh4 float64
		holds   bool
	}{
		{0.36, 0.5, true}, // 0.72 per ammonia: below breakpoint
		{0.5, 0.5, false}, // 1.0: not below
		{1.7, 0.5, false}, // well past breakpoint
		{0.36, 0, false},  // no ammonia at all: infinite ratio
		{0, 0.5, true},    // no hypochlorite: ratio 0
	} {
		if got := c.Holds(Env{PH: 8, Molar: molar(x.cl, x.nh4)}); got != x.holds {
			t.Errorf("%s at Cl(1) %g, NH4+ %g mol/L: %v, want %v", c, x.cl, x.nh4, got, x.holds)
		}
	}
	if got := c.String(); got != "(ratio(Cl(1), Br(1) / {NH4+}, {NH3}, {NH2Cl})<1) and (ph<10)" {
		t.Errorf("String() = %q", got)
	}
	for _, bad := range []string{"ratio(Cl(1) NH4+)<1", "ratio(Cl(1) / NH4+)=1", "ratio(Cl(1) / NH4+)<x", "ratio(Cl(1) / NH4+)>=-1"} {
		if _, err := parseCond(bad); err == nil {
			t.Errorf("parseCond(%q) parsed", bad)
		}
	}
}
