package engine

import (
	"math"
	"strings"
	"testing"

	"mixward/data"
)

func loadForTest(t testing.TB) *Engine {
	t.Helper()
	e, err := New(data.FS)
	if err != nil {
		t.Fatalf("New(data.FS): %v", err)
	}
	return e
}

// TestEveryPairBalances is a property test: for every ordered pair of table
// rows, the generated net equation conserves every element and charge, has
// whole-number coefficients and no electrons.
func TestEveryPairBalances(t *testing.T) {
	e := loadForTest(t)
	n := 0
	for i, ox := range e.Tables.Half {
		for j, red := range e.Tables.Half {
			if i == j {
				continue
			}
			for _, med := range []Medium{Acid, Base} {
				rx, err := combine(ox, red, med)
				if err != nil {
					t.Fatalf("combine(%s, %s): %v", ox.ID, red.ID, err)
				}
				if len(rx.reactants) == 0 {
					continue // the same couple twice cancels out
				}
				if err := BalanceError(rx.reactants, rx.products, 0); err != nil {
					t.Fatalf("%s with %s reversed in %s: %s does not balance: %v", ox.ID, red.ID, med, rx.text(), err)
				}
				for _, tm := range append(append([]Term{}, rx.reactants...), rx.products...) {
					if tm.Coef <= 0 || tm.IsElectron() {
						t.Fatalf("%s: bad term %+v", rx.text(), tm)
					}
					if med == Acid && tm.IsHydroxide() || med == Base && tm.IsProton() {
						t.Fatalf("%s: %s left in %s medium", rx.text(), tm.Text(), med)
					}
				}
				n++
			}
		}
	}
	if n < 10000 {
		t.Errorf("only %d combinations checked; is the table loaded?", n)
	}
}

// TestWaterPotentialsAtPH7 checks the Nernst potentials of water's couples:
// −0.414 V for H+/H2 and +0.815 V for O2/H2O at pH 7 and 25 °C
// (CRC Handbook, Electrochemical Series; E° 0 and 1.229 V with
// 0.05916 V per pH unit; from memory).
func TestWaterPotentialsAtPH7(t *testing.T) {
	e := loadForTest(t)
	m := &mixture{species: map[string]*inMix{}, tempK: StandardTemperatureK, pH: 7, aqueous: true, volumeL: 1}
	// H+/H2 (acid form) and H2O/H2 (base form) share one signature.
	want := map[string]float64{"H2O/H2": -0.414, "O2/H2O": 0.815}
	seen := map[string]int{}
	for _, h := range e.Tables.Half {
		sig := signature(h)
		w, ok := want[sig]
		if !ok {
			continue
		}
		// Only the water couples proper (gaseous O2 and H2).
		got := m.potential(h)
		if math.Abs(got-w) > 0.005 {
			t.Errorf("%s (%s): E at pH 7 = %.4f V, want %.3f V", h.ID, sig, got, w)
		}
		seen[sig]++
	}
	for sig := range want {
		if seen[sig] == 0 {
			t.Errorf("no %s couple in the table", sig)
		}
	}
}

// TestAcidAndBaseFormsAgree: the acid and base forms of one couple must give
// the same potential once Nernst is applied (they differ by the ionic product
// of water), tested at pH 7 where both are sensible. A disagreement means a
// wrong E° in one of the rows.
func TestAcidAndBaseFormsAgree(t *testing.T) {
	e := loadForTest(t)
	m := &mixture{species: map[string]*inMix{}, tempK: StandardTemperatureK, pH: 7, aqueous: true, volumeL: 1}
	bySig := map[string][]*HalfReaction{}
	for _, h := range e.Tables.Half {
		bySig[signature(h)] = append(bySig[signature(h)], h)
	}
	checked := 0
	for sig, rows := range bySig {
		for _, a := range rows {
			for _, b := range rows {
				if a.Medium != Acid || b.Medium != Base {
					continue
				}
				ea, eb := m.potential(a), m.potential(b)
				checked++
				if math.Abs(ea-eb) > 0.06 {
					t.Errorf("%s: acid form %s gives %.3f V and base form %s gives %.3f V at pH 7; one E° is wrong", sig, a.ID, ea, b.ID, eb)
				}
			}
		}
	}
	if checked < 5 {
		t.Errorf("only %d acid/base couple pairs compared", checked)
	}
}

// TestConstants checks the constants taken from gonum against CODATA 2018:
// F = 96485.33212 C/mol and R = 8.314462618 J/(mol·K) (CODATA 2018, via
// NIST), and the Nernst slope RT ln10/F = 0.05916 V at 25 °C.
func TestConstants(t *testing.T) {
	if math.Abs(faraday-96485.33212) > 1e-6 {
		t.Errorf("F = %v", faraday)
	}
	if math.Abs(gasConstant-8.314462618) > 1e-8 {
		t.Errorf("R = %v", gasConstant)
	}
	if s := nernstSlope(StandardTemperatureK); math.Abs(s-0.05916) > 0.00001 {
		t.Errorf("slope = %v", s)
	}
}

// TestPKw: pKw = 14.00 at 25 °C and about 13.26 at 50 °C (CRC Handbook, Ion
// Product of Water Substance; from memory).
func TestPKw(t *testing.T) {
	for _, tc := range []struct{ c, want, tol float64 }{{25, 14.00, 0.01}, {50, 13.26, 0.05}, {0, 14.94, 0.06}} {
		if got := pKw(tc.c + 273.15); math.Abs(got-tc.want) > tc.tol {
			t.Errorf("pKw(%g °C) = %.3f, want %.2f ±%.2f", tc.c, got, tc.want, tc.tol)
		}
	}
}

// signature writes a half-reaction's couple as OX/RED without water, H+ and
// OH- ("O2/H2O" for both forms of the oxygen couple).
func signature(h *HalfReaction) string {
	form := func(ts []Term) string {
		var parts []string
		for _, t := range ts {
			if !isSolvent(t.Species) {
				parts = append(parts, t.Species.Ion())
			}
		}
		if len(parts) == 0 {
			return "H2O"
		}
		return strings.Join(parts, "+")
	}
	return form(h.Reactants) + "/" + form(h.Products)
}
