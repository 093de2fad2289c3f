package engine_test

import (
	"strings"
	"testing"

	"mixward/engine"
)

// mixOutcome is what a kinetic-lock case asserts about an answer: amounts in
// the final composition (summed over the listed species texts), gases, the
// pH as combined and the locks listed as held back.
type mixOutcome struct {
	atLeast map[string]float64 // species text list ("A|B") → at least this many mol
	atMost  map[string]float64 // species text list → at most this many mol
	phMin   float64            // pH as combined at least this (0: not checked)
	held    []string           // locks that must be listed as held back
	notHeld []string           // locks that must not be listed
}

// finalMol sums the final composition over a "|"-separated list of species
// texts; a gas counts both in the final composition and the gas list.
func finalMol(r *engine.Result, list string) float64 {
	tot := 0.0
	for _, text := range strings.Split(list, "|") {
		for _, a := range r.FinalComposition {
			if a.Text == text {
				tot += a.Mol
			}
		}
	}
	return tot
}

func heldIDs(r *engine.Result) []string {
	var out []string
	for _, h := range r.HeldBack {
		out = append(out, h.Lock)
	}
	return out
}

func checkOutcome(t *testing.T, req string, want mixOutcome) {
	t.Helper()
	r := ask(t, req)
	for list, min := range want.atLeast {
		if got := finalMol(r, list); got < min {
			t.Errorf("%s: %s = %.4g mol, want at least %g", req, list, got, min)
		}
	}
	for list, max := range want.atMost {
		if got := finalMol(r, list); got > max {
			t.Errorf("%s: %s = %.4g mol, want at most %g", req, list, got, max)
		}
	}
	if want.phMin != 0 && r.Conditions.PH < want.phMin {
		t.Errorf("%s: pH as combined %.2f, want at least %g", req, r.Conditions.PH, want.phMin)
	}
	held := strings.Join(heldIDs(r), " ")
	for _, id := range want.held {
		if !strings.Contains(" "+held+" ", " "+id+" ") {
			t.Errorf("%s: held back [%s], want %s listed", req, held, id)
		}
	}
	for _, id := range want.notHeld {
		if strings.Contains(" "+held+" ", " "+id+" ") {
			t.Errorf("%s: held back [%s], want %s not listed", req, held, id)
		}
	}
}

// TestStatedPHKeepsCyanide: a stream of cyanide at a stated alkaline pH is
// fitted with the same locks as the mix as combined, so the fit does not
// "hydrolyse" cyanide to carbon monoxide and ammonia and add a mole of acid
// per mole of cyanide (pKa of HCN 9.2, CRC Dissociation constants of
// inorganic acids and bases; from memory).
func TestStatedPHKeepsCyanide(t *testing.T) {
	cases := []struct {
		req  string
		want mixOutcome
	}{
		{"mix 100 L NaCN 0.5 %, pH 11 + 100 L water", mixOutcome{phMin: 10.5, atLeast: map[string]float64{"CN-": 8}, atMost: map[string]float64{"HCN": 2}}},
		{"mix 100 L NaCN 0.5 %, pH 12 + 100 L water", mixOutcome{phMin: 11.5, atLeast: map[string]float64{"CN-": 9.5}}},
	}
	for _, c := range cases {
		t.Run(c.req, func(t *testing.T) { checkOutcome(t, c.req, c.want) })
	}
}
