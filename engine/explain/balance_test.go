package explain

import (
	"math"
	"testing"

	"mixward/data"
	"mixward/engine/thermo"
)

func loadDB(t testing.TB) *thermo.DB {
	t.Helper()
	db, err := thermo.Load(data.FS)
	if err != nil {
		t.Fatal(err)
	}
	return db
}

// TestReductionBalances writes half-reactions from two species and checks
// them against the published form and potential (CRC Handbook,
// Electrochemical Series; from memory).
func TestReductionBalances(t *testing.T) {
	db := loadDB(t)
	partners := map[string]string{"Cl": "Cl-", "N": "NH3", "S": "SO4^2-"}
	b, err := newBalancer(db, func(el, _ string, _ ...*thermo.Species) *thermo.Species {
		sp, _ := db.Get(partners[el])
		return sp
	})
	if err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		ox, red string
		key     string
		med     Medium
		want    string
		n       int
		e0, tol float64
	}{
		{"MnO4-", "Mn^2+", "Mn", Acid, "MnO4- + 8 H+ + 5 e- -> Mn^2+ + 4 H2O", 5, 1.507, 0.03},
		{"MnO4-", "MnO2(s)", "Mn", Base, "MnO4- + 2 H2O + 3 e- -> MnO2(s) + 4 OH-", 3, 0.595, 0.03},
		// Tables disagree: CRC 1.232 V, Bard–Parsons–Jordan 1985 1.36 V (from memory).
		{"Cr2O7^2-", "Cr^3+", "Cr", Acid, "Cr2O7^2- + 14 H+ + 6 e- -> 2 Cr^3+ + 7 H2O", 6, 1.30, 0.07},
		{"Fe^3+", "Fe^2+", "Fe", Acid, "Fe^3+ + e- -> Fe^2+", 1, 0.771, 0.02},
		{"Cu^2+", "Cu(s)", "Cu", Acid, "Cu^2+ + 2 e- -> Cu(s)", 2, 0.3419, 0.02},
		{"AgCl(s)", "Ag(s)", "Ag", Acid, "AgCl(s) + e- -> Ag(s) + Cl-", 1, 0.2223, 0.02},
		{"OCl-", "Cl-", "Cl", Base, "OCl- + H2O + 2 e- -> Cl- + 2 OH-", 2, 0.81, 0.1},
		{"H+", "H2(g)", "H", Acid, "2 H+ + 2 e- -> H2(g)", 2, 0, 1e-9},
		{"H2O2", "H2O", "O", Acid, "H2O2 + 2 H+ + 2 e- -> 2 H2O", 2, 1.776, 0.03},
		{"O2(g)", "H2O2", "O", Acid, "O2(g) + 2 H+ + 2 e- -> H2O2", 2, 0.695, 0.03},
	}
	for _, c := range cases {
		ox, ok1 := db.Get(c.ox)
		red, ok2 := db.Get(c.red)
		if !ok1 || !ok2 {
			t.Errorf("%s / %s: no species data", c.ox, c.red)
			continue
		}
		r, err := b.Reduction(ox, red, c.key, c.med)
		if err != nil {
			t.Errorf("Reduction(%s, %s): %v", c.ox, c.red, err)
			continue
		}
		want, err := thermo.ParseReaction(db, c.want)
		if err != nil {
			t.Fatalf("%s: %v", c.want, err)
		}
		if !sameTerms(reductionKeyOf(r), reductionKeyOf(want)) || r.Electrons != c.n {
			t.Errorf("Reduction(%s, %s) = %s, want %s", c.ox, c.red, r, c.want)
		}
		if e0 := r.E0(298.15); math.Abs(e0-c.e0) > c.tol {
			t.Errorf("E°(%s) = %.4f V, published %.4f V ±%g", r, e0, c.e0, c.tol)
		}
	}
}

func reductionKeyOf(r thermo.Reaction) map[string]float64 {
	m := map[string]float64{}
	for _, t := range r.Terms {
		m[t.Species.Text] = t.Nu / float64(r.Electrons)
	}
	return m
}

// TestCombine checks the net equation of iron(III) with copper: the least
// common multiple of electrons, nothing left on both sides.
func TestCombine(t *testing.T) {
	db := loadDB(t)
	red, _ := thermo.ParseReaction(db, "Fe^3+ + e- -> Fe^2+")
	ox, _ := thermo.ParseReaction(db, "Cu^2+ + 2 e- -> Cu(s)")
	net, n := Combine(red, ox)
	want, _ := thermo.ParseReaction(db, "2 Fe^3+ + Cu(s) -> 2 Fe^2+ + Cu^2+")
	if n != 2 || len(net.Terms) != 4 {
		t.Fatalf("Combine = %s (n %d), want %s (n 2)", net, n, want)
	}
	got, w := map[string]float64{}, map[string]float64{}
	for _, t := range net.Terms {
		got[t.Species.Text] = t.Nu
	}
	for _, t := range want.Terms {
		w[t.Species.Text] = t.Nu
	}
	for k, v := range w {
		if got[k] != v {
			t.Errorf("Combine: %s has %g, want %g (%s)", k, got[k], v, net)
		}
	}
}

func sameTerms(a, b map[string]float64) bool {
	if len(a) != len(b) {
		return false
	}
	for k, v := range a {
		if math.Abs(b[k]-v) > 1e-9 {
			return false
		}
	}
	return true
}
