package state

import (
	"testing"
)

// TestOneWayRules: a one-way rule is spelt out for each oxidation state the
// mix brings the element in with species of the mix on both sides, and for
// no other (hydrazine: one pair; nitrate alone: none, nothing lies above
// nitrogen(V); nitrite: one pair). Oxidation states by the usual rules (common
// practice, no source).
func TestOneWayRules(t *testing.T) {
	m, err := NewModel(loadDB(t), dataFS())
	if err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name  string
		items []Item
		want  []string // "below|above" group texts of each pair
	}{
		{"hydrazine", []Item{item(t, m, "N2H4", 1)}, []string{"N(<-2)|N(>-2)"}},
		{"nitrate", []Item{item(t, m, "Na+", 1), item(t, m, "NO3-", 1)}, nil},
		{"nitrite", []Item{item(t, m, "Na+", 1), item(t, m, "NO2-", 1)}, []string{"N(<3)|N(>3)"}},
	}
	for _, c := range cases {
		mx, err := m.Solve(Feed{TempK: 298.15, PressureBar: 1.01325,
			Streams: []Stream{{Label: "T-1", Items: c.items, WaterMol: water(1), VolumeL: 1}}})
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		var got []string
		for _, p := range oneWayRules(mx, "N", mx.Initial) {
			got = append(got, p[0].Group.String()+"|"+p[1].Group.String())
		}
		if len(got) != len(c.want) {
			t.Errorf("%s: pairs %v, want %v", c.name, got, c.want)
			continue
		}
		for i := range got {
			if got[i] != c.want[i] {
				t.Errorf("%s: pair %d = %s, want %s", c.name, i, got[i], c.want[i])
			}
		}
	}
}

// TestOneWayKeepsNitrite: sodium nitrite alone in water stays nitrite. Two
// locks hold it: nitrous-acid-needs-acid (no nitric oxide above pH 4) and the
// one-way nitrogen lock; lifting either alone still keeps it, so each stands
// for the other, while the equilibrium with no lock would take it to nitric
// oxide and nitrate (3 NO2- + H2O → 2 NO + NO3- + 2 OH-) (nitrite solutions are stable in
// neutral and alkaline solution: Vogel's Textbook of Macro and Semimicro
// Qualitative Inorganic Analysis, nitrites, from memory).
func TestOneWayKeepsNitrite(t *testing.T) {
	m, err := NewModel(loadDB(t), dataFS())
	if err != nil {
		t.Fatal(err)
	}
	mx, err := m.Solve(Feed{TempK: 298.15, PressureBar: 1.01325,
		Streams: []Stream{{Label: "T-1", Items: []Item{item(t, m, "Na+", 1.5), item(t, m, "NO2-", 1.5)}, WaterMol: water(1), VolumeL: 1}}})
	if err != nil {
		t.Fatal(err)
	}
	sum := func(amount []float64, texts ...string) float64 {
		tot := 0.0
		for i, sp := range mx.Species {
			for _, x := range texts {
				if sp.Text == x {
					tot += amount[i]
				}
			}
		}
		return tot
	}
	if kept := sum(mx.Final.Amount, "NO2-", "HNO2"); kept < 1.5*(1-1e-6) {
		t.Errorf("nitrite kept %.6g mol of 1.5", kept)
	}
	if no := sum(mx.Final.Amount, "NO", "NO(g)"); no > 1e-9 {
		t.Errorf("nitric oxide %.3g mol beside nitrite kept", no)
	}
	for _, id := range []string{"nitrogen-own-change", "nitrous-acid-needs-acid"} {
		lifted, err := m.Without(mx, id)
		if err != nil {
			t.Fatal(err)
		}
		if no := sum(lifted.Amount, "NO", "NO(g)"); no > 1e-9 {
			t.Errorf("without %s alone nitric oxide %.3g mol: the other lock no longer keeps nitrite", id, no)
		}
	}
}
