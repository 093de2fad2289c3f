package hazard

import (
	"math"
	"testing"

	"mixward/data"
	"mixward/engine/thermo"
)

// TestOxidizerHeatPerElectron: the heat of each strong oxidizer oxidizing
// organic matter, kJ per mol of electrons, is Thornton's rule for oxygen
// (104.5, from memory) plus the difference between the agent's heat of
// reduction and oxygen's (142.9 kJ per electron for O2 + 4 H+ + 4 e- →
// 2 H2O), by hand from ΔfH° (NBS Tables 1982, from memory; Cr^3+ as
// data/species.txt derives it): in an acid mix, and in a neutral one for
// permanganate, whose extra third of a proton per electron then comes
// from water (55.84 kJ per mol back).
func TestOxidizerHeatPerElectron(t *testing.T) {
	d, err := Load(data.FS)
	if err != nil {
		t.Fatal(err)
	}
	db, err := thermo.Load(data.FS)
	if err != nil {
		t.Fatal(err)
	}
	if err := d.UseSpecies(db); err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		reagent string
		ph      float64
		want    float64 // kJ per mol of electrons, by hand
	}{
		{"S2O8^2-", 4, 104.5 + 473.84/2 - 142.9},                        // 198.5
		{"MnO4-", 1, 104.5 + (520.03+571.66-541.4)/3 - 142.9},           // 145.0
		{"MnO4-", 7, 104.5 + (520.03+571.66-541.4)/3 - 142.9 - 55.84/3}, // 126.4
		{"Cr(VI)", 0, 104.5 + (256+1143.32-878.2)/3 - 142.9},            // 135.3
		{"OCl-", 12, 104.5 + (167.16+285.83-107.1)/2 - 142.9},           // 134.5
		{"ClO3-", 7, 104.5 + (167.16+857.49-103.97)/6 - 142.9},          // 115.0
		{"ClO2-", 7, 104.5 + (167.16+571.66-66.5)/4 - 142.9},            // 129.7
		{"BrO3-", 7, 104.5 + (121.55+857.49-67.07)/6 - 142.9},           // 113.6
		{"ClO4-", 1, 104.5 + (167.16+1143.32-129.33)/8 - 142.9},         // 109.2
		{"NO3-", 1, 104.5 + (1714.98-410)/10 - 142.9},                   // 92.1
		{"O2^2-", 4, 104.5 + (571.66-191.17)/2 - 142.9},                 // 151.8
		{"no-such-agent", 7, 104.5},                                     // Thornton's rule alone
	} {
		o := &Outcome{PH: tc.ph, families: d.Families}
		got, basis := o.oxidizerKJPerElectron(tc.reagent)
		if math.Abs(got-tc.want) > 1 {
			t.Errorf("%s at pH %g: %.1f kJ per mol of electrons (%s), want %.1f", tc.reagent, tc.ph, got, basis, tc.want)
		}
	}
	for _, x := range strongOxidizers {
		if _, ok := d.Families["oxidizer-organic-fire:"+x.reagent]; !ok {
			t.Errorf("%s: no row oxidizer-organic-fire:%s in %s", x.name, x.reagent, FamilyHeatFile)
		}
	}
}
