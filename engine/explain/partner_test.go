package explain

import (
	"strings"
	"testing"

	"mixward/engine/thermo"
)

// TestReductionOnePartnerForTwoElements: the partner that carries one
// element the couple lacks may carry another too; a second carrier of the
// same atoms (OCN- beside HOCN) would make the balance singular. Thiocyanate
// taken to sulfate keeps its C–N as cyanic acid: HSO4- + HOCN + 8 H+ + 8 e-
// → SCN- + 5 H2O (balanced by hand).
func TestReductionOnePartnerForTwoElements(t *testing.T) {
	db := loadDB(t)
	// the mix's carriers, main one first, as explainer.partner offers them
	carriers := map[string][]string{"C": {"HOCN", "OCN-"}, "N": {"HOCN", "OCN-"}}
	b, err := newBalancer(db, func(el, _ string, not ...*thermo.Species) *thermo.Species {
		for _, c := range carriers[el] {
			sp, _ := db.Get(c)
			if !contains(not, sp) {
				return sp
			}
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	ox, _ := db.Get("HSO4-")
	red, _ := db.Get("SCN-")
	r, err := b.Reduction(ox, red, "S", Acid)
	if err != nil {
		t.Fatalf("HSO4- → SCN-: %v", err)
	}
	if got, want := strings.ReplaceAll(r.String(), "→", "->"), "HSO4- + HOCN + 8 H+ + 8 e- -> SCN- + 5 H2O"; got != want {
		t.Errorf("got %s, want %s", got, want)
	}
}
