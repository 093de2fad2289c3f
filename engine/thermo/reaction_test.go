package thermo

import (
	"math"
	"strings"
	"testing"
)

func TestParseReaction(t *testing.T) {
	db := mustLoad(t, testSpecies)
	tests := []struct {
		in        string
		electrons int
		terms     int
		str       string
		wantErr   string
	}{
		{in: "Fe^3+ + e- -> Fe^2+", electrons: 1, terms: 2, str: "Fe^3+ + e- -> Fe^2+"},
		{in: "2 H+ + 2 e- -> H2(g)", electrons: 2, terms: 2, str: "2 H+ + 2 e- -> H2(g)"},
		{in: "H2O2 + 2 H+ + 2 e- → 2 H2O", electrons: 2, terms: 3, str: "H2O2 + 2 H+ + 2 e- -> 2 H2O"},
		{in: "0.5 O2(g) + H2(g) -> H2O(l)", terms: 3, str: "0.5 O2(g) + H2(g) -> H2O"},
		{in: "NaCl(s) -> Na+ + Cl-", terms: 3, str: "NaCl(s) -> Na+ + Cl-"},
		{in: "Cl2(aq) -> Cl2(g)", terms: 2, str: "Cl2 -> Cl2(g)"},
		{in: "Fe^3+ + e- - Fe^2+", wantErr: "exactly one ->"},
		{in: "Fe^3+ -> Fe^2+ -> Fe", wantErr: "exactly one ->"},
		{in: "Fe^2+ -> Fe^3+ + e-", wantErr: "electrons on the left"},
		{in: "Fe^3+ + 2 e- -> Fe^2+", wantErr: "charge +1"},
		{in: "Fe^3+ + e- -> Fe(s)", wantErr: "no species row for Fe(s)"},
		{in: "Fe^^3+ + e- -> Fe^2+", wantErr: "write species like"},
		{in: "H2(g) -> H2O", wantErr: "O +1"},
		{in: "-> H2O", wantErr: "one side is empty"},
		{in: "0 H2O -> H2O", wantErr: "above 0"},
		{in: "2.5 e- + Fe^3+ -> Fe^2+", wantErr: "whole number"},
		{in: "2 3 H2O -> H2O", wantErr: "is not `species`"},
		{in: "", wantErr: "exactly one ->"},
	}
	for _, tc := range tests {
		t.Run(tc.in, func(t *testing.T) {
			r, err := ParseReaction(db, tc.in)
			if tc.wantErr != "" {
				if err == nil || !strings.Contains(err.Error(), tc.wantErr) {
					t.Fatalf("ParseReaction(%q) = %v, %v; want an error containing %q", tc.in, r, err, tc.wantErr)
				}
				return
			}
			if err != nil {
				t.Fatalf("ParseReaction(%q): %v", tc.in, err)
			}
			if r.Electrons != tc.electrons || len(r.Terms) != tc.terms || r.String() != tc.str {
				t.Errorf("ParseReaction(%q) = %q with %d e-, %d terms", tc.in, r.String(), r.Electrons, len(r.Terms))
			}
		})
	}
}

// The expected values follow from the rows of testSpecies by hand; the
// published ones they approximate are named beside them.
func TestDerivedQuantities(t *testing.T) {
	db := mustLoad(t, testSpecies)
	parse := func(s string) Reaction {
		r, err := ParseReaction(db, s)
		if err != nil {
			t.Fatal(err)
		}
		return r
	}
	fe := parse("Fe^3+ + e- -> Fe^2+")
	// E° = −(−78.90 + 4.7) kJ/mol / F = 0.769 V (CRC Electrochemical Series 0.771 V).
	if got, want := fe.E0(T0), 74.2e3/F; math.Abs(got-want) > 1e-12 {
		t.Errorf("E°(Fe3+/Fe2+) = %.6f V, want %.6f", got, want)
	}
	if h, ok := fe.DeltaH(); !ok || math.Abs(h-(-40.6)) > 1e-9 {
		t.Errorf("ΔrH°(Fe3+/Fe2+) = %g, %v; want -40.6", h, ok)
	}
	w := parse("H2O -> H+ + OH-")
	// pKw from the rows: 79.885 kJ/mol / (RT ln 10) = 13.995 (CRC Handbook 13.995).
	if got := -w.LogK(T0); math.Abs(got-79.885e3/(R*T0*math.Ln10)) > 1e-9 || math.Abs(got-13.995) > 0.01 {
		t.Errorf("pKw = %.4f, want 13.995", got)
	}
	// A reaction whose ΔrG° is ΔrH° − TΔrS° at every T: van 't Hoff with
	// constant ΔrH°, so log K is linear in 1/T.
	h, _ := w.DeltaH()
	for _, T := range []float64{273.15, 323.15, 373.15} {
		want := -(h - T*(h-w.DeltaG(T0))/T0) * 1000 / (R * T * math.Ln10)
		if got := w.LogK(T); math.Abs(got-want) > 1e-9 {
			t.Errorf("log Kw(%g K) = %g, want %g", T, got, want)
		}
	}
	if _, ok := parse("FeOH^2+ + H+ -> Fe^3+ + H2O").DeltaH(); ok {
		t.Error("ΔrH° of a reaction with a species without ΔfH° reported as known")
	}
	defer func() {
		if recover() == nil {
			t.Error("E0 of a reaction without electrons did not panic")
		}
	}()
	w.E0(T0)
}

func FuzzParseReaction(f *testing.F) {
	db := mustLoad(f, testSpecies)
	for _, s := range []string{"Fe^3+ + e- -> Fe^2+", "2 H+ + 2 e- -> H2(g)", "0.5 O2(g) + H2(g) -> H2O", "NaCl(s) → Na+ + Cl-", "1e3 H+ -> H2(g)", " -> "} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		r, err := ParseReaction(db, s)
		if err != nil {
			return
		}
		if err := r.balance(); err != nil {
			t.Fatalf("ParseReaction(%q) accepted an unbalanced reaction: %v", s, err)
		}
		back, err := ParseReaction(db, r.String())
		if err != nil || back.String() != r.String() {
			t.Fatalf("ParseReaction(%q).String() = %q does not read back: %v", s, r.String(), err)
		}
		if g := r.DeltaG(T0); math.IsNaN(g) || math.IsInf(g, 0) {
			t.Fatalf("ΔrG° of %q = %g", s, g)
		}
	})
}

func FuzzParseRow(f *testing.F) {
	for _, s := range strings.Split(testSpecies, "\n")[1:] {
		f.Add(s)
	}
	f.Add("X | 1 | 2 | 3 | O=-1 Cl=+1 inert minor | s")
	f.Fuzz(func(t *testing.T, row string) {
		sp, err := parseRow(row)
		if err != nil {
			if sp != nil {
				t.Fatalf("parseRow(%q) returned a species with an error", row)
			}
			return
		}
		if sp.Text == "" || len(sp.Atoms) == 0 || math.IsNaN(sp.DfG) || math.IsInf(sp.DfG, 0) {
			t.Fatalf("parseRow(%q) = %+v", row, sp)
		}
		if (sp.Ox == nil) == (sp.oxErr == nil) {
			t.Fatalf("parseRow(%q): Ox %v and its error %v", row, sp.Ox, sp.oxErr)
		}
		for el := range sp.Override {
			if sp.Atoms[el] == 0 {
				t.Fatalf("parseRow(%q) kept an override of absent %s", row, el)
			}
		}
	})
}
