package chem

import (
	"strings"
	"testing"
)

func TestParseSpecies(t *testing.T) {
	tests := []struct {
		in      string
		want    Species
		text    string // Text(); "" when wantErr is set
		wantErr string
	}{
		{in: "H+", want: Species{"H", 1, Aqueous}, text: "H+"},
		{in: "OH-", want: Species{"OH", -1, Aqueous}, text: "OH-"},
		{in: "MnO4-", want: Species{"MnO4", -1, Aqueous}, text: "MnO4-"},
		{in: "Fe^3+", want: Species{"Fe", 3, Aqueous}, text: "Fe^3+"},
		{in: "SO4^2-", want: Species{"SO4", -2, Aqueous}, text: "SO4^2-"},
		{in: "Zn(OH)4^2-", want: Species{"Zn(OH)4", -2, Aqueous}, text: "Zn(OH)4^2-"},
		{in: "Hg2^2+", want: Species{"Hg2", 2, Aqueous}, text: "Hg2^2+"},
		{in: "Fe^3+(aq)", want: Species{"Fe", 3, Aqueous}, text: "Fe^3+"},
		{in: "Fe^1+", want: Species{"Fe", 1, Aqueous}, text: "Fe+"},
		{in: "Cu(s)", want: Species{"Cu", 0, Solid}, text: "Cu(s)"},
		{in: "Cr(OH)3(s)", want: Species{"Cr(OH)3", 0, Solid}, text: "Cr(OH)3(s)"},
		{in: "Cl2(g)", want: Species{"Cl2", 0, Gas}, text: "Cl2(g)"},
		{in: "Cl2(aq)", want: Species{"Cl2", 0, Aqueous}, text: "Cl2"},
		{in: "Cl2", want: Species{"Cl2", 0, Aqueous}, text: "Cl2"},
		{in: "Hg(l)", want: Species{"Hg", 0, Liquid}, text: "Hg(l)"},
		{in: "H2O", want: Species{"H2O", 0, Liquid}, text: "H2O(l)"},
		{in: "H2O(l)", want: Species{"H2O", 0, Liquid}, text: "H2O(l)"},
		{in: "H2O(aq)", want: Species{"H2O", 0, Liquid}, text: "H2O(l)"},
		{in: "H2O(g)", want: Species{"H2O", 0, Gas}, text: "H2O(g)"},
		{in: " NH4+ ", want: Species{"NH4", 1, Aqueous}, text: "NH4+"},
		{in: "e-", want: Species{"e", -1, Aqueous}, text: "e-"},
		{in: "", wantErr: "empty species"},
		{in: "Fe^3", wantErr: "digits and a sign"},
		{in: "Fe^+", wantErr: "digits and a sign"},
		{in: "Fe^0+", wantErr: "digits and a sign"},
		{in: "Fe^-3", wantErr: "digits and a sign"},
		{in: "Fe^3+x", wantErr: "digits and a sign"},
		{in: "^2+", wantErr: "no formula"},
		{in: "+", wantErr: "no formula"},
		{in: "(s)", wantErr: "no formula"},
		{in: "e", wantErr: "electron is written e-"},
		{in: "e+", wantErr: "electron is written e-"},
		{in: "Fe++", wantErr: "unexpected"},
		{in: "fe^2+", wantErr: "unexpected"},
		{in: "Cu(s)^2+", wantErr: "unexpected"},
		{in: "Cl2(aq)(g)", wantErr: "unexpected"},
	}
	for _, tc := range tests {
		t.Run(tc.in, func(t *testing.T) {
			got, err := ParseSpecies(tc.in)
			if tc.wantErr != "" {
				if err == nil {
					t.Fatalf("ParseSpecies(%q) = %+v, want an error containing %q", tc.in, got, tc.wantErr)
				}
				if !strings.Contains(err.Error(), tc.wantErr) {
					t.Fatalf("ParseSpecies(%q) error = %q, want it to contain %q", tc.in, err, tc.wantErr)
				}
				return
			}
			if err != nil {
				t.Fatalf("ParseSpecies(%q): %v", tc.in, err)
			}
			if got != tc.want {
				t.Errorf("ParseSpecies(%q) = %+v, want %+v", tc.in, got, tc.want)
			}
			if s := got.Text(); s != tc.text {
				t.Errorf("ParseSpecies(%q).Text() = %q, want %q", tc.in, s, tc.text)
			}
		})
	}
}

func TestSpeciesPredicates(t *testing.T) {
	must := func(s string) Species {
		sp, err := ParseSpecies(s)
		if err != nil {
			t.Fatal(err)
		}
		return sp
	}
	if !must("H+").IsProton() || must("H2").IsProton() || must("H-").IsProton() {
		t.Error("IsProton: want true for H+ only")
	}
	if !must("OH-").IsHydroxide() || must("OH").IsHydroxide() {
		t.Error("IsHydroxide: want true for OH- only")
	}
	if !must("H2O").IsWater() || !must("H2O(g)").IsWater() || must("H2O2").IsWater() {
		t.Error("IsWater: want true for H2O in any phase, false for H2O2")
	}
	if !must("e-").IsElectron() || must("Fe").IsElectron() {
		t.Error("IsElectron: want true for e- only")
	}
	if k1, k2 := must("Cl2(g)").Key(), must("Cl2").Key(); k1 == k2 {
		t.Errorf("Key of Cl2(g) and Cl2(aq) are both %q; the phase must tell them apart", k1)
	}
	if k1, k2 := must("H2O").Key(), must("H2O(aq)").Key(); k1 != k2 {
		t.Errorf("Key of H2O is %q but of H2O(aq) %q; both are the solvent", k1, k2)
	}
	if got := must("Fe^3+(aq)").Ion(); got != "Fe^3+" {
		t.Errorf("Ion() = %q, want Fe^3+", got)
	}
}

// FuzzParseSpecies checks that ParseSpecies never panics and that the text of
// every species it accepts parses back to the same species.
func FuzzParseSpecies(f *testing.F) {
	for _, s := range []string{"H+", "OH-", "MnO4-", "Fe^3+", "SO4^2-", "Cu(s)", "Cl2(g)", "H2O(l)", "H2O(aq)",
		"Cl2(aq)", "e-", "e^1-", "Fe^+5+", "Fe^05+", "Zn(OH)4^2-", "(s)", "^2+", "Fe^", "CuSO4.5H2O(s)", "\x00"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		sp, err := ParseSpecies(s)
		if err != nil {
			return
		}
		text := sp.Text()
		back, err := ParseSpecies(text)
		if err != nil {
			t.Fatalf("ParseSpecies(%q) = %+v, but its text %q does not parse: %v", s, sp, text, err)
		}
		if back != sp {
			t.Fatalf("round trip of %q: %+v -> %q -> %+v", s, sp, text, back)
		}
	})
}
