package engine_test

import (
	"strings"
	"testing"
)

// TestHeldBackIsTheLocksOwnChange: a lock is listed as holding back only a
// change that moves its own group, never a knock-on that the mix runs and
// counts. Bleach with iron(III) chloride (r10-T34) gives off chlorine,
// counted; lifting the crystalline-oxides lock would let hematite form,
// free acid and make more of the same chlorine, which is not what the lock
// holds back (it was listed as "HOCl + H+ + Cl- → Cl2(g) + H2O(l) held
// back" beside the counted chlorine). A lock that stops a counted change
// part of the way (hydrogen from aluminium until the acid is spent, T07)
// still lists it, with its own product in it.
func TestHeldBackIsTheLocksOwnChange(t *testing.T) {
	for _, tc := range []struct {
		name, req, lock string
		listed          bool
		product         string // a product the listed change holds back
	}{
		{"r10-T34 bleach with iron(III) chloride", "mix 50 L NaOCl 12.5 % + 50 L FeCl3 40 %", "crystalline-oxides", false, ""},
		{"r10-T34 chlorate from the chlorine", "mix 50 L NaOCl 12.5 % + 50 L FeCl3 40 %", "chlorate-formation", true, "ClO3-"},
		{"T07 aluminium in hydrochloric acid", "mix 10 kg Al + 200 L HCl 15 %", "hydrogen-from-acid", true, "H2(g)"},
		{"T19 cyanide stops at cyanogen chloride in acid", "mix 50 L HCl 32 % + 50 L NaOCl 12.5 % + 50 L NaCN 10 % + 500 L water", "cyanide-chlorination-acid", true, "CO2(g)"},
	} {
		r := ask(t, tc.req)
		found := false
		for _, h := range r.HeldBack {
			if h.Lock != tc.lock {
				continue
			}
			found = true
			if h.Reaction == nil {
				t.Errorf("%s: %s listed without a reaction", tc.name, tc.lock)
				continue
			}
			if !strings.Contains(h.Reaction.Text, tc.product) {
				t.Errorf("%s: %s holds back %q, want a change giving %s", tc.name, tc.lock, h.Reaction.Text, tc.product)
			}
		}
		if found != tc.listed {
			t.Errorf("%s: %s listed %v, want %v", tc.name, tc.lock, found, tc.listed)
		}
	}
}
