package engine

import (
	"math"
	"slices"
	"strings"
	"testing"
)

func TestLookup(t *testing.T) {
	tb := dtReal(t)
	tests := []struct {
		in   string
		want string // formula; "" when nothing should match
	}{
		{"NaOCl", "NaOCl"},
		{"  NaOCl ", "NaOCl"},
		{"naocl", "NaOCl"}, // formula ignoring case, unambiguous
		{"NAOCL", "NaOCl"},
		{"Co", "Co"}, // cobalt
		{"CO", "CO"}, // carbon monoxide
		{"co", ""},   // Co or CO: ambiguous
		{"bleach", "NaOCl"},
		{"Bleach", "NaOCl"},
		{"  sodium   Hypochlorite ", "NaOCl"},
		{"hypo", "NaOCl"},
		{"muriatic acid", "HCl"},
		{"caustic soda", "NaOH"},
		{"lye", "NaOH"},
		{"copperas", "FeSO4.7H2O"},
		{"cooling water", "H2O"}, // plant words for water (common practice)
		{"rinse water", "H2O"},
		{"lime slurry", "Ca(OH)2"},
		{"zinc sulfate", "ZnSO4.7H2O"}, // the crystals the trade sells (common practice)
		{"magnesium sulfate", "MgSO4.7H2O"},
		{"anhydrous magnesium sulfate", "MgSO4"},
		{"potassium peroxymonosulfate", "K5H3(SO4)2(SO5)2"}, // the triple salt the trade sells
		{"sodium sulfide nonahydrate", "Na2S.9H2O"},
		{"ferrous sulfate", "FeSO4.7H2O"}, // copperas, the crystal the trade sells (common practice, no source)
		{"iron(II) sulfate", "FeSO4.7H2O"},
		{"anhydrous ferrous sulfate", "FeSO4"},
		{"trisodium phosphate", "Na3PO4.12H2O"}, // TSP crystals (common practice, no source)
		{"anhydrous trisodium phosphate", "Na3PO4"},
		{"CuSO4·5H2O", "CuSO4.5H2O"},
		{"CuSO4*5H2O", "CuSO4.5H2O"},
		{"cuso4.5h2o", "CuSO4.5H2O"},
		{"papermaker’s alum", "Al2(SO4)3.14H2O"}, // curly apostrophe
		{"sodium metabisulfite", "Na2S2O5"},
		{"chromic acid", "CrO3"},
		{"Cu", "Cu"},
		{"H2O2", "H2O2"},
		{"unobtainium", ""},
		{"", ""},
		{"   ", ""},
	}
	for _, tc := range tests {
		c, ok := tb.Lookup(tc.in)
		switch {
		case tc.want == "" && ok:
			t.Errorf("Lookup(%q) = %s, want no match", tc.in, c.Formula)
		case tc.want != "" && !ok:
			t.Errorf("Lookup(%q) found nothing, want %s", tc.in, tc.want)
		case ok && c.Formula != tc.want:
			t.Errorf("Lookup(%q) = %s, want %s", tc.in, c.Formula, tc.want)
		}
	}
	// Every formula and every name finds its own chemical.
	for _, c := range tb.Chemicals {
		if got, ok := tb.Lookup(c.Formula); !ok || got != c {
			t.Errorf("Lookup(%q) does not find its own chemical", c.Formula)
		}
		for _, n := range c.Names {
			if got, ok := tb.Lookup(strings.ToUpper(n)); !ok || got != c {
				t.Errorf("Lookup(%q) does not find %s", strings.ToUpper(n), c.Formula)
			}
		}
	}
}

func TestSuggest(t *testing.T) {
	tb := dtReal(t)
	tests := []struct {
		in   string
		want string // formula of the first suggestion; "" for none
	}{
		{"bleech", "NaOCl"},
		{"sodium hypochlorate", "NaOCl"},
		{"caustik soda", "NaOH"},
		{"hydrocloric acid", "HCl"},
		{"sulphuric aicd", "H2SO4"},
		{"permanganat", "KMnO4"},
		{"peroxyde", "H2O2"},
		{"thiosulphat", "Na2S2O3"},
		{"NaOCI", "NaOCl"}, // capital i for l
		{"xqzzv", ""},
		{"", ""},
	}
	for _, tc := range tests {
		got := tb.Suggest(tc.in, 5)
		if tc.want == "" {
			if len(got) != 0 {
				t.Errorf("Suggest(%q) = %q, want nothing", tc.in, got)
			}
			continue
		}
		if len(got) == 0 {
			t.Errorf("Suggest(%q) = nothing, want a name of %s first", tc.in, tc.want)
			continue
		}
		c, ok := tb.Lookup(got[0])
		if !ok || c.Formula != tc.want {
			t.Errorf("Suggest(%q) = %q; the first does not name %s", tc.in, got, tc.want)
		}
		if len(got) > 5 {
			t.Errorf("Suggest(%q, 5) gave %d suggestions", tc.in, len(got))
		}
		// One suggestion per chemical.
		seen := map[*Chemical]bool{}
		for _, s := range got {
			c, ok := tb.Lookup(s)
			if !ok {
				t.Errorf("Suggest(%q) gave %q, which Lookup does not find", tc.in, s)
				continue
			}
			if seen[c] {
				t.Errorf("Suggest(%q) = %q names %s twice", tc.in, got, c.Formula)
			}
			seen[c] = true
		}
	}
	if a, b := tb.Suggest("sodium", 5), tb.Suggest("sodium", 5); !slices.Equal(a, b) || len(a) != 5 {
		t.Errorf("Suggest(sodium) = %q then %q; want the same five each time", a, b)
	}
	if got := tb.Suggest("bleech", 0); len(got) != 0 {
		t.Errorf("Suggest(bleech, 0) = %q, want nothing", got)
	}
	if got := tb.Suggest("sodium", 5); got[0] != "sodium" {
		t.Errorf("Suggest(sodium)[0] = %q, want the exact name first", got[0])
	}
}

func TestBoundedOSA(t *testing.T) {
	tests := []struct {
		a, b string
		max  int
		want int
	}{
		{"bleach", "bleach", 3, 0},
		{"bleech", "bleach", 3, 1},    // substitution
		{"aicd", "acid", 3, 1},        // transposition
		{"caustc", "caustic", 3, 1},   // insertion
		{"causstic", "caustic", 3, 1}, // deletion
		{"kitten", "sitting", 3, 3},
		{"kitten", "sitting", 2, 3}, // over the bound: max+1
		{"a", "abcdef", 2, 3},       // length difference alone exceeds the bound
		{"", "", 0, 0},
		{"über", "uber", 2, 1}, // runes, not bytes
	}
	for _, tc := range tests {
		if got := boundedOSA([]rune(tc.a), []rune(tc.b), tc.max); got != tc.want {
			t.Errorf("boundedOSA(%q, %q, %d) = %d, want %d", tc.a, tc.b, tc.max, got, tc.want)
		}
	}
}

func TestMolarMass(t *testing.T) {
	tb := dtReal(t)
	// Expected values: sums of IUPAC CIAAW abridged standard atomic weights
	// (from memory), rounded as the CRC Handbook prints molar masses.
	tests := []struct {
		in   string
		want float64
		tol  float64
	}{
		{"H2O", 18.015, 0.001},
		{"NaCl", 58.44, 0.01},
		{"NaOCl", 74.44, 0.01},
		{"H2SO4", 98.07, 0.01},
		{"KMnO4", 158.03, 0.01},
		{"CuSO4.5H2O", 249.68, 0.01},
		{"CuSO4·5H2O", 249.68, 0.01},
		{"Fe2(SO4)3", 399.86, 0.01},
		{"Ca(OCl)2", 142.98, 0.01},
	}
	for _, tc := range tests {
		got, err := tb.MolarMass(tc.in)
		if err != nil {
			t.Errorf("MolarMass(%q): %v", tc.in, err)
			continue
		}
		if math.Abs(got-tc.want) > tc.tol {
			t.Errorf("MolarMass(%q) = %.4f, want %.4f ±%g", tc.in, got, tc.want, tc.tol)
		}
	}
	for _, c := range tb.Chemicals {
		if got, err := tb.MolarMass(c.Formula); err != nil || got != c.MolarMass {
			t.Errorf("MolarMass(%s) = %v, %v; the chemical says %v", c.Formula, got, err, c.MolarMass)
		}
	}
	for _, bad := range []string{"Xq2O", "Fe(", "", "2H2O"} {
		if _, err := tb.MolarMass(bad); err == nil {
			t.Errorf("MolarMass(%q) gave no error", bad)
		}
	}
	if _, err := tb.MolarMass("Og"); err == nil || !strings.Contains(err.Error(), `element "Og" has no atomic weight`) {
		t.Errorf("MolarMass(Og) error = %v, want it to name the element", err)
	}
}

func TestDensity(t *testing.T) {
	tb := &Tables{Densities: map[string][]DensityPoint{
		"HCl": {{10, 1.0474}, {20, 1.0980}, {30, 1.1492}},
	}}
	tests := []struct {
		f    string
		pct  float64
		want float64
		ok   bool
	}{
		{"HCl", 10, 1.0474, true},
		{"HCl", 30, 1.1492, true},
		{"HCl", 20, 1.0980, true},
		{"HCl", 15, (1.0474 + 1.0980) / 2, true},
		{"HCl", 27.5, 1.0980 + 0.75*(1.1492-1.0980), true},
		{"HCl", 9.99, 0, false},
		{"HCl", 30.01, 0, false},
		{"HCl", math.NaN(), 0, false},
		{"NaOH", 10, 0, false},
	}
	for _, tc := range tests {
		got, ok := tb.Density(tc.f, tc.pct)
		if ok != tc.ok || math.Abs(got-tc.want) > 1e-12 {
			t.Errorf("Density(%s, %g) = %g, %v; want %g, %v", tc.f, tc.pct, got, ok, tc.want, tc.ok)
		}
	}
}

// TestConcentratedReagents checks the density tables against the molarities
// of common reagents: mol/L = (% w/w / 100) · density (g/mL) · 1000 / M.
func TestConcentratedReagents(t *testing.T) {
	tb := dtReal(t)
	tests := []struct {
		formula  string
		pct      float64
		min, max float64 // mol/L
		source   string
	}{
		{"HCl", 37, 11.8, 12.2, "37 % HCl ≈ 12.0 M: CRC Concentrative properties; common practice; from memory"},
		{"HNO3", 65, 14.0, 14.8, "65–70 % HNO3 ≈ 14–16 M: CRC Concentrative properties; common practice; from memory"},
		{"HNO3", 70, 15.4, 16.0, "65–70 % HNO3 ≈ 14–16 M: CRC Concentrative properties; common practice; from memory"},
		{"H2SO4", 96, 17.8, 18.2, "96–98 % H2SO4 ≈ 18 M: CRC Concentrative properties; common practice; from memory"},
		{"H2SO4", 98, 18.1, 18.5, "96–98 % H2SO4 ≈ 18 M: CRC Concentrative properties; common practice; from memory"},
		{"NaOH", 50, 18.8, 19.3, "50 % NaOH ≈ 19 M: CRC Concentrative properties; common practice; from memory"},
		{"H2O2", 30, 9.7, 9.9, "30 % H2O2 ≈ 9.8 M: CRC Concentrative properties; common practice; from memory"},
		{"NH3", 28, 14.5, 15.1, "28–30 % ammonia ≈ 15 M: CRC Concentrative properties; common practice; from memory"},
		{"NH3", 30, 15.4, 16.0, "28–30 % ammonia ≈ 15 M: CRC Concentrative properties; common practice; from memory"},
		{"NaOCl", 12.5, 1.9, 2.1, "12.5 % sodium hypochlorite ≈ 2 M (as NaOCl w/w): common practice, no source; from memory"},
		{"H3PO4", 85, 14.5, 14.9, "85 % H3PO4 ≈ 14.7 M: common practice; from memory"},
		{"CH3COOH", 100, 17.3, 17.6, "glacial acetic acid ≈ 17.4 M: common practice; from memory"},
		{"HF", 48, 27.3, 28.9, "48 % HF ≈ 27.6–28.9 M: common practice; from memory"},
		{"KOH", 45, 11.3, 11.9, "45 % KOH ≈ 11.7 M: common practice; from memory"},
		{"FeCl3", 40, 3.4, 3.6, "40 % ferric chloride, density ≈ 1.42 g/mL, ≈ 3.5 M: supplier data sheets, common practice; from memory"},
	}
	for _, tc := range tests {
		rho, ok := tb.Density(tc.formula, tc.pct)
		if !ok {
			t.Errorf("no density for %g %% %s", tc.pct, tc.formula)
			continue
		}
		mm, err := tb.MolarMass(tc.formula)
		if err != nil {
			t.Fatal(err)
		}
		molar := tc.pct / 100 * rho * 1000 / mm
		if molar < tc.min || molar > tc.max {
			t.Errorf("%g %% %s: %.4f g/mL gives %.2f mol/L, want %.1f–%.1f (%s)", tc.pct, tc.formula, rho, molar, tc.min, tc.max, tc.source)
		}
	}
}

func BenchmarkLookup(b *testing.B) {
	tb := dtReal(b)
	for _, q := range []struct{ name, text string }{
		{"formula", "NaOCl"},
		{"name", "sodium hypochlorite"},
		{"last-name", "sugar"},
		{"formula-any-case", "naocl"},
		{"miss", "unobtainium"},
	} {
		b.Run(q.name, func(b *testing.B) {
			for b.Loop() {
				tb.Lookup(q.text)
			}
		})
	}
}

func BenchmarkSuggest(b *testing.B) {
	tb := dtReal(b)
	for b.Loop() {
		tb.Suggest("sodium hypochlorate", 5)
	}
}

func BenchmarkMolarMass(b *testing.B) {
	tb := dtReal(b)
	for b.Loop() {
		if _, err := tb.MolarMass("Fe(NH4)2(SO4)2.6H2O"); err != nil {
			b.Fatal(err)
		}
	}
}
