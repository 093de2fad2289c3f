package eph

import (
	"math"
	"os"
	"strings"
	"testing"

	"mixward/engine"
)

func half(t *testing.T, e0 float64, n int, reactants, products string) *engine.HalfReaction {
	t.Helper()
	side := func(s string) []engine.Term {
		var out []engine.Term
		for _, part := range strings.Split(s, " + ") {
			f := strings.Fields(part)
			coef, text := 1, f[0]
			if len(f) == 2 {
				coef = int(f[0][0] - '0')
				text = f[1]
			}
			sp, err := engine.ParseSpecies(text)
			if err != nil {
				t.Fatalf("ParseSpecies(%q): %v", text, err)
			}
			out = append(out, engine.Term{Species: sp, Coef: coef})
		}
		return out
	}
	return &engine.HalfReaction{Reactants: side(reactants), Products: side(products), Electrons: n, E0: e0}
}

func TestProtonsAndLabel(t *testing.T) {
	tests := []struct {
		h       *engine.HalfReaction
		protons int
		label   string
	}{
		{half(t, 1.229, 4, "O2(g) + 4 H+", "2 H2O"), 4, "O2(g)/H2O(l)"},
		{half(t, 0.401, 4, "O2(g) + 2 H2O", "4 OH-"), 4, "O2(g)/OH-"},
		{half(t, 1.507, 5, "MnO4- + 8 H+", "Mn^2+ + 4 H2O"), 8, "MnO4-/Mn^2+"},
		{half(t, 0.771, 1, "Fe^3+", "Fe^2+"), 0, "Fe^3+/Fe^2+"},
		{half(t, 0, 2, "2 H+", "H2(g)"), 2, "H+/H2(g)"},
	}
	for _, tc := range tests {
		if got := Protons(tc.h); got != tc.protons {
			t.Errorf("Protons(%s) = %d, want %d", tc.label, got, tc.protons)
		}
		if got := Label(tc.h); got != tc.label {
			t.Errorf("Label = %q, want %q", got, tc.label)
		}
	}
	if Protons(nil) != 0 || Label(nil) != "" || FromHalfReaction(nil, 0, 7, 298.15).E != nil {
		t.Errorf("nil half-reaction not handled")
	}
}

// TestAcidAndBaseOxygenAgree: the acid form O2 + 4 H+ + 4 e- → 2 H2O (1.229 V) carried
// to pH 14 must land on the base form O2 + 2 H2O + 4 e- → 4 OH- (0.401 V), both CRC
// Handbook, Electrochemical Series (from memory); pKw 13.995 at 25 °C (CRC, from memory).
func TestAcidAndBaseOxygenAgree(t *testing.T) {
	acid := FromHalfReaction(half(t, 1.229, 4, "O2(g) + 4 H+", "2 H2O"), 1.229, 0, 298.15)
	base := FromHalfReaction(half(t, 0.401, 4, "O2(g) + 2 H2O", "4 OH-"), 0.401, 13.995, 298.15)
	for _, pH := range []float64{0, 7, 14} {
		if d := math.Abs(acid.E(pH) - base.E(pH)); d > 0.003 {
			t.Errorf("pH %g: acid form %.4f V, base form %.4f V, differ by %.4f", pH, acid.E(pH), base.E(pH), d)
		}
	}
}

// TestTableCouples draws every couple of the project's half-reaction table
// against the hydrogen couple, so that no row trips the picture.
func TestTableCouples(t *testing.T) {
	e, err := engine.New(os.DirFS("../../data"))
	if err != nil {
		t.Skipf("tables do not load yet: %v", err)
	}
	h2 := FromHalfReaction(half(t, 0, 2, "2 H+", "H2(g)"), 0, 0, 298.15)
	for _, h := range e.Tables.Half {
		c := FromHalfReaction(h, h.E0, 0, 298.15)
		if c.Label == "" || strings.Contains(c.Label, "e-") {
			t.Errorf("%s: label %q", h.ID, c.Label)
		}
		if Protons(h) < 0 {
			// Reductions in our table consume acid (or release base), never the other way round.
			t.Errorf("%s: %d protons for %d electrons", h.ID, Protons(h), h.Electrons)
		}
		if math.IsNaN(c.E(7)) {
			t.Errorf("%s: no potential at pH 7", h.ID)
		}
	}
	if len(e.Tables.Half) > 0 {
		if err := Draw(discard{}, FromHalfReaction(e.Tables.Half[0], e.Tables.Half[0].E0, 0, 298.15), h2, 1, "table row"); err != nil {
			t.Errorf("Draw of the first table couple: %v", err)
		}
	}
}

type discard struct{}

func (discard) Write(p []byte) (int, error) { return len(p), nil }
