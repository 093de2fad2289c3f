package engine_test

import (
	"strings"
	"testing"
)

// TestOutsideAqueous: a solid oxidizing agent poured into a neat organic
// liquid has no water phase; the answer does not give the aqueous equation
// (aqueous Mn²⁺ and acetate in neat glycerol) as what happens but a
// solid–organic ignition with its products, and no heat figure from
// formation enthalpies (Bretherick's Handbook of Reactive Chemical Hazards,
// potassium permanganate: glycerol; from memory). With water in the mix the
// aqueous answer stands.
func TestOutsideAqueous(t *testing.T) {
	cases := []struct {
		req      string
		outside  bool
		products string
	}{
		{"mix 1 kg KMnO4 + 1 L glycerol", true, "Mn2O3"},
		{"mix 1 kg K2Cr2O7 + 1 L ethanol", true, "Cr2O3"},
		{"mix 1 kg KMnO4 + 10 L water + 1 L glycerol", false, ""},
		{"mix 1 L KMnO4 5 % + 1 L glycerol", false, ""},
		{"mix 1 kg KMnO4 + 1 L H2SO4 98 %", false, ""}, // neat, but not organic: its own hazard
	}
	for _, c := range cases {
		r := ask(t, c.req)
		if got := r.OutsideAqueous != ""; got != c.outside {
			t.Errorf("%s: outside the aqueous model %v, want %v (%q)", c.req, got, c.outside, r.OutsideAqueous)
			continue
		}
		if !c.outside {
			continue
		}
		if !strings.Contains(r.OutsideAqueous, c.products) || !strings.Contains(r.OutsideAqueous, "carbon dioxide") {
			t.Errorf("%s: %q does not name carbon dioxide and %s", c.req, r.OutsideAqueous, c.products)
		}
		if r.Heat == nil || r.Heat.HeatReleasedkJ != nil || r.Heat.Withheld == "" {
			t.Errorf("%s: heat %+v: want no figure and a reason", c.req, r.Heat)
		}
	}
}
