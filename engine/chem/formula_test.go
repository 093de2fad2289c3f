package chem

import (
	"fmt"
	"maps"
	"strings"
	"testing"
)

func TestParseFormula(t *testing.T) {
	tests := []struct {
		in      string
		want    Atoms
		wantErr string // substring of the error; "" when the formula is good
	}{
		{in: "H2O", want: Atoms{"H": 2, "O": 1}},
		{in: "NaCl", want: Atoms{"Na": 1, "Cl": 1}},
		{in: "Co", want: Atoms{"Co": 1}},
		{in: "CO", want: Atoms{"C": 1, "O": 1}},
		{in: "Fe2(SO4)3", want: Atoms{"Fe": 2, "S": 3, "O": 12}},
		{in: "Ca(OH)2", want: Atoms{"Ca": 1, "O": 2, "H": 2}},
		{in: "(NH4)2SO4", want: Atoms{"N": 2, "H": 8, "S": 1, "O": 4}},
		{in: "CH3COOH", want: Atoms{"C": 2, "H": 4, "O": 2}},
		{in: "K4[Fe(CN)6]", want: Atoms{"K": 4, "Fe": 1, "C": 6, "N": 6}},
		{in: "CuSO4.5H2O", want: Atoms{"Cu": 1, "S": 1, "O": 9, "H": 10}},
		{in: "CuSO4·5H2O", want: Atoms{"Cu": 1, "S": 1, "O": 9, "H": 10}},
		{in: "CuSO4*5H2O", want: Atoms{"Cu": 1, "S": 1, "O": 9, "H": 10}},
		{in: "N2H4.H2O", want: Atoms{"N": 2, "H": 6, "O": 1}},
		{in: "Fe(NH4)2(SO4)2.6H2O", want: Atoms{"Fe": 1, "N": 2, "H": 20, "S": 2, "O": 14}},
		{in: "(Na2CO3)2(H2O2)3", want: Atoms{"Na": 4, "C": 2, "O": 12, "H": 6}},
		{in: "C10H16N2O8", want: Atoms{"C": 10, "H": 16, "N": 2, "O": 8}},
		{in: "", wantErr: "empty formula"},
		{in: "h2o", wantErr: `unexpected "h"`},
		{in: "H2O)", wantErr: "unmatched"},
		{in: "(H2O", wantErr: "missing"},
		{in: "Ca(OH]2", wantErr: "missing"},
		{in: "()", wantErr: "empty parentheses"},
		{in: "H0", wantErr: "zero"},
		{in: "(OH)0", wantErr: "zero"},
		{in: "CuSO4.0H2O", wantErr: "zero"},
		{in: "2H2O", wantErr: "starts with a number"},
		{in: "CuSO4..5H2O", wantErr: "separator"},
		{in: ".H2O", wantErr: "separator"},
		{in: "CuSO4.", wantErr: "separator"},
		{in: "CuSO4.5", wantErr: "no atoms"},
		{in: "Abcd", wantErr: "not an element symbol"},
		{in: "Fe^3+", wantErr: `unexpected "^"`},
		{in: "Na Cl", wantErr: `unexpected " "`},
		{in: "((((((((((H))))))))))", wantErr: "nested too deep"},
		{in: "((((H999999)999999)999999)999999)", wantErr: "more than"},
		{in: "H999999999999", wantErr: "more than"},
	}
	for _, tc := range tests {
		t.Run(tc.in, func(t *testing.T) {
			got, err := ParseFormula(tc.in)
			if tc.wantErr != "" {
				if err == nil {
					t.Fatalf("ParseFormula(%q) = %v, want an error containing %q", tc.in, got, tc.wantErr)
				}
				if !strings.Contains(err.Error(), tc.wantErr) {
					t.Fatalf("ParseFormula(%q) error = %q, want it to contain %q", tc.in, err, tc.wantErr)
				}
				return
			}
			if err != nil {
				t.Fatalf("ParseFormula(%q): %v", tc.in, err)
			}
			if !maps.Equal(got, tc.want) {
				t.Errorf("ParseFormula(%q) = %v, want %v", tc.in, got, tc.want)
			}
		})
	}
}

func TestAtomsStringHillOrder(t *testing.T) {
	tests := []struct{ in, want string }{
		{"CH3COOH", "C2H4O2"},     // carbon first, then hydrogen
		{"C2Cl4", "C2Cl4"},        // carbon first even without hydrogen
		{"H2SO4", "H2O4S1"},       // no carbon: all alphabetical
		{"NaHCO3", "C1H1Na1O3"},   // carbon present: C, H, then the rest
		{"KAu(CN)2", "C2Au1K1N2"}, // Au sorts before K
		{"NaCl", "Cl1Na1"},
	}
	for _, tc := range tests {
		a, err := ParseFormula(tc.in)
		if err != nil {
			t.Fatalf("ParseFormula(%q): %v", tc.in, err)
		}
		if got := a.String(); got != tc.want {
			t.Errorf("ParseFormula(%q).String() = %q, want %q", tc.in, got, tc.want)
		}
	}
}

func TestAtomsAdd(t *testing.T) {
	a := Atoms{"H": 2, "O": 1}
	a.Add(Atoms{"H": 1, "O": 1}, 2)
	if want := (Atoms{"H": 4, "O": 3}); !maps.Equal(a, want) {
		t.Fatalf("after adding 2 OH: %v, want %v", a, want)
	}
	a.Add(Atoms{"H": 2, "O": 1}, -2)
	if want := (Atoms{"O": 1}); !maps.Equal(a, want) {
		t.Fatalf("after taking away 2 H2O: %v, want %v (zero counts removed)", a, want)
	}
}

// FuzzParseFormula checks that ParseFormula never panics and that what it
// accepts survives a round trip through Atoms.String.
// TestCheckFormula: CheckFormula agrees with ParseFormula, past the size of
// its small tally too (thirteen elements; H twice over a million).
func TestCheckFormula(t *testing.T) {
	for _, f := range []string{"H2O", "Fe2(SO4)3", "CuSO4.5H2O", "HLiBeBCNOFNaMgAlSiP", "HLiBeBCNOFNaMgAlSiPH999999H999999", "H999999H2", "h2o", ""} {
		_, err := ParseFormula(f)
		if cerr := CheckFormula(f); fmt.Sprint(cerr) != fmt.Sprint(err) {
			t.Errorf("CheckFormula(%q) = %v, ParseFormula error %v", f, cerr, err)
		}
	}
	if n := testing.AllocsPerRun(100, func() { _ = CheckFormula("K4[Fe(CN)6]") }); n != 0 {
		t.Errorf("CheckFormula allocates %g times for a good formula", n)
	}
}

func FuzzParseFormula(f *testing.F) {
	for _, s := range []string{"H2O", "Fe2(SO4)3", "CuSO4.5H2O", "CuSO4·5H2O", "K4[Fe(CN)6]", "(NaPO3)6",
		"Ca(OH", "H0", "2H2O", "((((H9)9)9)9)", "Abc12", "x", "", "..", "C10H16N2O8", "\xff"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		a, err := ParseFormula(s)
		if cerr := CheckFormula(s); fmt.Sprint(cerr) != fmt.Sprint(err) {
			t.Fatalf("CheckFormula(%q) = %v, ParseFormula error %v", s, cerr, err)
		}
		if err != nil {
			return
		}
		if len(a) == 0 {
			t.Fatalf("ParseFormula(%q) accepted a formula without atoms", s)
		}
		text := a.String()
		b, err := ParseFormula(text)
		if err != nil {
			t.Fatalf("ParseFormula(%q) = %v, but its text %q does not parse: %v", s, a, text, err)
		}
		if !maps.Equal(a, b) {
			t.Fatalf("round trip of %q: %v -> %q -> %v", s, a, text, b)
		}
	})
}

// TestMolarMass: the mass is the atom counts times the weights (weights here
// invented round numbers), the same whether the tally spilled into a map.
func TestMolarMass(t *testing.T) {
	w := map[string]float64{"H": 1, "O": 16, "S": 32, "Fe": 56, "C": 12, "N": 14, "K": 39}
	for _, tc := range []struct {
		f    string
		want float64
	}{
		{"H2O", 18}, {"Fe2(SO4)3", 400}, {"K4[Fe(CN)6]", 368}, {"FeSO4.7H2O", 278}, {"Xx", 0},
		{"HLiBeBCNOFNaMgAlSiP", 1 + 12 + 14 + 16},
	} {
		got, err := MolarMass(tc.f, w)
		if err != nil || got != tc.want {
			t.Errorf("MolarMass(%q) = %g, %v; want %g", tc.f, got, err, tc.want)
		}
	}
	if _, err := MolarMass("h2o", w); err == nil {
		t.Error("MolarMass(h2o) gave no error")
	}
	if n := testing.AllocsPerRun(100, func() { _, _ = MolarMass("K4[Fe(CN)6]", w) }); n != 0 {
		t.Errorf("MolarMass allocates %g times", n)
	}
}
