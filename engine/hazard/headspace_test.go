package hazard

import (
	"math"
	"testing"

	"mixward/data"
)

// TestShareByHand checks the headspace against a hand calculation from
// Henry's-law constants (Sander 2015, recalled from memory; the same values
// as data/gases.txt) and the ideal gas.
func TestShareByHand(t *testing.T) {
	const rt = 0.0831446 * 298.15 // L·bar/mol, CODATA 2018 R
	for _, tc := range []struct {
		name                       string
		total, molecular, kH       float64
		liquidL, headspaceL, wantP float64 // wantP in bar, worked by hand
		vents                      bool
	}{
		// 1 L of 0.01 mol/L HCN (all molecular), 1 L headspace:
		// p = 0.01 / (9·1 + 1/24.79) = 0.01 / 9.0403 = 1.106e-3 bar = 1092 ppm at 1.01325 bar.
		{"HCN 0.01 M", 0.01, 1, 9, 1, 1, 0.01 / (9 + 1/rt), false},
		// The same cyanide at pH 11.2, two units above the HCN pKa 9.2,
		// with 1 % of it as HCN: the liquid holds 100 times more.
		{"HCN as 1 % of cyanide", 0.01, 0.01, 9, 1, 1, 0.01 / (900 + 1/rt), false},
		// Chlorine 0.001 mol in 10 L, 10 L headspace: 0.001/(0.062·10 + 10/24.79) = 9.77e-4 bar.
		{"Cl2 dilute", 0.001, 1, 0.062, 10, 10, 0.001 / (0.62 + 10/rt), false},
		// Hydrogen 1 mol in 1 L over 1 L: far beyond 1 atm, so it fills the headspace.
		{"H2 vents", 1, 1, 0.00078, 1, 1, 1.01325, true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			h := Share(tc.total, tc.molecular, tc.kH, tc.liquidL, tc.headspaceL, 298.15, 101.325)
			if math.Abs(h.PartialBar-tc.wantP) > 1e-4*tc.wantP {
				t.Errorf("partial pressure %g bar, want %g by hand", h.PartialBar, tc.wantP)
			}
			if ppm := tc.wantP / 1.01325 * 1e6; math.Abs(h.PPM-ppm) > 1e-3*ppm {
				t.Errorf("headspace %g ppm, want %g", h.PPM, ppm)
			}
			if h.Vents != tc.vents {
				t.Errorf("vents %v, want %v", h.Vents, tc.vents)
			}
		})
	}
	if h := Share(0, 1, 9, 1, 1, 298.15, 101.325); h.PPM != 0 {
		t.Errorf("nothing to share gives %g ppm", h.PPM)
	}
}

// TestGasTable reads the embedded gas table: every gas has a limit with its
// source and a Henry's constant with its source.
func TestGasTable(t *testing.T) {
	d, err := Load(data.FS)
	if err != nil {
		t.Fatal(err)
	}
	for f, g := range d.Gases {
		if gasCodes[f] == "" {
			t.Errorf("gas %s has no hazard code", f)
		}
		if _, ok := gasActions[f]; !ok {
			t.Errorf("gas %s has no actions", f)
		}
		if g.LimitSource == "" || g.HenrySource == "" {
			t.Errorf("gas %s lacks a source", f)
		}
	}
	// NIOSH Pocket Guide IDLH values (1994), from memory.
	for f, want := range map[string]float64{"Cl2": 10, "HCN": 50, "H2S": 100, "SO2": 100, "ClO2": 5, "NH3": 300} {
		if got := d.Gases[f].LimitPPM; got != want {
			t.Errorf("%s IDLH %g ppm, want %g (NIOSH Pocket Guide)", f, got, want)
		}
	}
	// Hydrogen against its lower flammable limit, 4 % (US Bureau of Mines).
	if g := d.Gases["H2"]; g.LimitName != "LFL" || g.LimitPPM != 40000 {
		t.Errorf("hydrogen limit %s %g, want LFL 40000 ppm", g.LimitName, g.LimitPPM)
	}
	for _, bad := range []string{
		"Cl2 | Cl2 | Cl2 | 0.062 | IDLH | 10 | src | src",
		"Cl2 | Cl2 | Cl2 | x | IDLH | 10 | src | src | chlorine",
		"Cl2 | Cl2 | Cl2 | 0.062 | TWA | 10 | src | src | chlorine",
		"Cl2 | Cl2 | Cl2 | 0.062 | IDLH | 0 | src | src | chlorine",
		"Cl- | Cl2 | Cl2 | 0.062 | IDLH | 10 | src | src | chlorine",
	} {
		if _, err := parseGases([]byte(bad + "\n")); err == nil {
			t.Errorf("parseGases(%q) accepted a bad row", bad)
		}
	}
}

// TestEquivalent: a new code finds its older aliases and an old code the
// codes that replace it.
func TestEquivalent(t *testing.T) {
	for _, tc := range []struct {
		code string
		want []string
	}{
		{"hcn-release", []string{"hcn-release", "acid-cyanide", "cyanide-low-ph", "toxic-gas"}},
		{"HYPOCHLORITE-ACID", []string{"hypochlorite-acid", "chlorine-release"}},
		{"boiling", []string{"boiling", "boils"}},
		{"nothing-like-it", []string{"nothing-like-it"}},
	} {
		got := Equivalent(tc.code)
		set := map[string]bool{}
		for _, g := range got {
			set[g] = true
		}
		for _, w := range tc.want {
			if !set[w] {
				t.Errorf("Equivalent(%q) = %v, lacks %q", tc.code, got, w)
			}
		}
		if got[0] != tc.want[0] {
			t.Errorf("Equivalent(%q) starts with %q, want the code itself", tc.code, got[0])
		}
	}
	if a := Aliases(); len(a["toxic-gas"]) < 10 {
		t.Errorf("toxic-gas maps to %v; every toxic gas code should be listed", a["toxic-gas"])
	}
}

// FuzzParseGases: the gas table parser never panics and accepts only rows
// that read back with a positive limit and a source.
func FuzzParseGases(f *testing.F) {
	f.Add([]byte("Cl2 | Cl2 | Cl2 | 0.062 | IDLH | 10 | NIOSH | Sander 2015 | chlorine\n"))
	f.Add([]byte("# comment\n\nH2 | - | - | 0.00078 | LFL | 40000 | USBM | Sander | hydrogen\n"))
	f.Add([]byte("X | | | | | | | |\n"))
	f.Fuzz(func(t *testing.T, b []byte) {
		d, err := parseGases(b)
		if err != nil {
			return
		}
		for f, g := range d.Gases {
			if !(g.LimitPPM > 0) || g.KH < 0 || g.LimitSource == "" || g.HenrySource == "" || f != g.Formula {
				t.Fatalf("accepted a bad row: %+v", g)
			}
		}
	})
}
