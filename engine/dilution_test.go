package engine

import (
	"math"
	"os"
	"strings"
	"testing"

	"mixward/engine/state"
	"mixward/engine/thermo"
)

func loadTestDilution(t testing.TB) map[string][]DilutionPoint {
	t.Helper()
	d, err := loadDilution(os.DirFS("../data"))
	if err != nil {
		t.Fatalf("loadDilution(../data): %v", err)
	}
	return d.Points
}

// TestRelativeEnthalpy interpolates data/dilution.txt by hand. Rows: NBS
// Tables 1982 / CRC Handbook integral heats (from memory), as in the file.
func TestRelativeEnthalpy(t *testing.T) {
	d := loadTestDilution(t)
	cases := []struct {
		solute string
		n      float64
		want   float64
	}{
		{"H2SO4", 0, 73.35},                         // H2SO4(l) -813.989 against H+ + HSO4- -887.34
		{"H2SO4", 0.1111, 73.35 - 27.80*0.1111},     // 98 %: between the liquid and 1 H2O
		{"H2SO4", 2, 31.90},                         // in 2 H2O -855.44
		{"HCl", 3.598, 17.99 + (13.64-17.99)*0.598}, // 36 %
		{"HCl", 1.2, 26.02},                         // below the first row: the first row
		{"NaOH", 2.2203, 23.0 + (15.6-23.0)*0.2203}, // 50 %
		{"NaOH", 150, 0.3 + (0.2-0.3)*0.5},          // halfway between 100 and 200
		{"NaOH", 250, 0},                            // beyond the last row: infinite dilution
		{"H2O2", 1.888, 1.70 + (1.13-1.70)*0.888},   // 50 %
		{"Unknown", 3, 0},                           // no rows
	}
	for _, tc := range cases {
		if got := RelativeEnthalpy(d[tc.solute], tc.n); math.Abs(got-tc.want) > 1e-9 {
			t.Errorf("RelativeEnthalpy(%s, %g) = %.4f, want %.4f", tc.solute, tc.n, got, tc.want)
		}
	}
}

// TestDilutionTableRows checks that every solute is a chemical of the
// dictionary, and that the pure liquid's row (n = 0) agrees with the
// formation enthalpies of data/species.txt: L(0) = ΔfH(liquid) − ΔfH(what
// the chemical gives), within 3 kJ/mol (NBS Tables 1982 for both; HNO3 differs
// by 2.4 because species.txt has NO3- at -205.0 against -207.36 for HNO3 at
// infinite dilution).
func TestDilutionTableRows(t *testing.T) {
	d := loadTestDilution(t)
	tb, err := Load(os.DirFS("../data"))
	if err != nil {
		t.Fatalf("Load(../data): %v", err)
	}
	db, err := thermo.Load(os.DirFS("../data"))
	if err != nil {
		t.Fatalf("thermo.Load(../data): %v", err)
	}
	for solute, pts := range d {
		var ch *Chemical
		for _, c := range tb.Chemicals {
			if c.Formula == solute {
				ch = c
			}
		}
		if ch == nil {
			t.Errorf("dilution.txt: %s is not a chemical of chemicals.txt", solute)
			continue
		}
		top := 80.0 // kJ/mol: the strongest heats of concentrated acids and bases
		if waterTaken(ch) > 0 {
			top = 170 // a pure liquid that takes up water to the acid (SO3: its hydration on top)
		}
		for _, p := range pts {
			if p.L < -2 || p.L > top {
				t.Errorf("dilution.txt: %s at n = %g: L = %g kJ/mol is outside -2..80", solute, p.N, p.L)
			}
		}
		liq, ok := db.Get(solute + "(l)")
		if pts[0].N != 0 || !ok || !liq.HasDfH {
			continue
		}
		ref := 0.0
		for _, g := range ch.Gives {
			sp, ok := db.Get(g.Species.Text())
			if !ok || !sp.HasDfH {
				t.Fatalf("species.txt has no ΔfH° for %s", g.Species.Text())
			}
			ref += float64(g.Coef) * sp.DfH
		}
		if w, ok := db.Get("H2O(l)"); ok && waterTaken(ch) > 0 {
			ref -= waterTaken(ch) * w.DfH // the water it takes up is part of the pure liquid's side
		}
		if want := liq.DfH - ref; math.Abs(pts[0].L-want) > 3 {
			t.Errorf("dilution.txt: %s L(0) = %g, species.txt gives %.2f", solute, pts[0].L, want)
		}
	}
}

func TestParseDilutionErrors(t *testing.T) {
	cases := []struct {
		name, text, want string
	}{
		{"fields", "HCl | 3 | 17.99\n", "write SOLUTE | N | L | SOURCE"},
		{"ratio", "HCl | -1 | 17.99 | src\n", "not a water ratio"},
		{"ratio text", "HCl | many | 17.99 | src\n", "not a water ratio"},
		{"enthalpy", "HCl | 3 | hot | src\n", "not a relative enthalpy"},
		{"enthalpy NaN", "HCl | 3 | NaN | src\n", "not a relative enthalpy"},
		{"source", "HCl | 3 | 17.99 | \n", "no source"},
		{"order", "HCl | 3 | 17.99 | src\nHCl | 2 | 26.02 | src\n", "rising n"},
		{"solute", "H Cl | 3 | 17.99 | src\n", "not a solute formula"},
		{"empty", "# nothing\n", "no rows"},
		{"cp range", "HCl | cp | 9 | src\n", "from 0 to 5"},
		{"cp twice", "HCl | cp | 1 | src\nHCl | cp | 1 | src\n", "one `HCl | cp"},
	}
	for _, tc := range cases {
		_, err := parseDilution("dilution.txt", []byte(tc.text))
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: parseDilution error %v, want one containing %q", tc.name, err, tc.want)
		}
	}
	got, err := parseDilution("dilution.txt", []byte("HCl | 2 | 26.02 | a\nHCl | 3 | −1 | b\n"))
	if err != nil || len(got.Points["HCl"]) != 2 || got.Points["HCl"][1].L != -1 {
		t.Errorf("parseDilution of two rows (Unicode minus) = %v, %v", got, err)
	}
}

func FuzzParseDilution(f *testing.F) {
	b, err := os.ReadFile("../data/dilution.txt")
	if err != nil {
		f.Fatal(err)
	}
	f.Add(string(b))
	f.Add("HCl | 3 | 17.99 | src\n")
	f.Add("HCl | 1e400 | 1 | s\n")
	f.Fuzz(func(t *testing.T, s string) {
		d, err := parseDilution("fuzz.txt", []byte(s))
		if err != nil {
			return
		}
		for solute, pts := range d.Points {
			for i, p := range pts {
				if i > 0 && p.N <= pts[i-1].N {
					t.Fatalf("%s: rows not in rising n: %v", solute, pts)
				}
				if l := RelativeEnthalpy(pts, p.N); math.IsNaN(l) || math.IsInf(l, 0) {
					t.Fatalf("%s: RelativeEnthalpy(%g) = %g", solute, p.N, l)
				}
			}
		}
	})
}

// TestUnknownNetChange: species without ΔfH° that only trade protons (the
// forms of citrate) do not withhold the heat; a skeleton made from species
// with ΔfH° (Cr(III) from Cr(VI)) does.
func TestUnknownNetChange(t *testing.T) {
	db, err := thermo.Load(os.DirFS("../data"))
	if err != nil {
		t.Fatalf("thermo.Load(../data): %v", err)
	}
	var sps []*thermo.Species
	for _, name := range []string{"HCrO4-", "Cr^3+", "CrOH^2+", "C6H5O7^3-", "H3C6H5O7"} {
		sp, ok := db.Get(name)
		if !ok {
			t.Fatalf("species.txt has no %s", name)
		}
		sps = append(sps, sp)
	}
	nan := math.NaN()
	dfh := []float64{-878.2, nan, nan, nan, nan}
	cases := []struct {
		name           string
		initial, final []float64
		want           float64
	}{
		{"Cr(VI) to Cr(III), citrate protonated", []float64{10, 0, 0, 5, 0}, []float64{0, 8, 2, 0, 5}, 10},
		{"citrate protonated only", []float64{10, 0, 0, 5, 0}, []float64{10, 0, 0, 1, 4}, 0},
	}
	for _, tc := range cases {
		mx := &state.Mix{Species: sps, Initial: tc.initial, Final: &state.State{Amount: tc.final}}
		if got := unknownNetChange(mx, dfh); math.Abs(got-tc.want) > 1e-9 {
			t.Errorf("%s: unknownNetChange = %g, want %g", tc.name, got, tc.want)
		}
	}
}

// TestHeatCapacityOf checks the mix's heat capacity by hand from the cp rows
// of data/dilution.txt (NBS Tables 1982 Cp°, from memory).
func TestHeatCapacityOf(t *testing.T) {
	d, err := loadDilution(os.DirFS("../data"))
	if err != nil {
		t.Fatal(err)
	}
	tb := &Tables{Dilution: d}
	h2so4 := &Chemical{Formula: "H2SO4", MolarMass: 98.08}
	naoh := &Chemical{Formula: "NaOH", MolarMass: 40.00}
	nacl := &Chemical{Formula: "NaCl", MolarMass: 58.44}
	cases := []struct {
		name    string
		massKg  float64
		solutes []soluteIn
		want    float64
	}{
		// 1 kg of 98 % acid: 0.02 × 4.18 + 0.98 × 1.416 = 1.4713.
		{"98 % H2SO4", 1, []soluteIn{{chem: h2so4, mol: 980 / 98.08}}, 0.02*4.18 + 0.98*1.416},
		// 1 kg of 50 % lye: 0.5 × 4.18 + 0.5 × 1.489 = 2.8345.
		{"50 % NaOH", 1, []soluteIn{{chem: naoh, mol: 500 / 40.00}}, 0.5*4.18 + 0.5*1.489},
		// A solute without a cp row counts as water.
		{"NaCl", 1, []soluteIn{{chem: nacl, mol: 1}}, 4.18},
		{"no mass", 0, nil, 4.18},
	}
	for _, tc := range cases {
		if got := heatCapacityOf(tc.massKg, tc.solutes, tb); math.Abs(got-tc.want) > 1e-9 {
			t.Errorf("%s: heatCapacityOf = %.4f, want %.4f", tc.name, got, tc.want)
		}
	}
}
