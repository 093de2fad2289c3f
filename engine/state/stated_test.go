package state

import (
	"math"
	"strings"
	"testing"
)

// A stream with a stated pH holds that pH in the state the mix starts from:
// the acid or base the pH stands for is fitted on the same chemistry the
// stream is then solved with. (Cyanide once fitted its pH as carbon monoxide
// and ammonia, and a cyanide liquor stated at pH 11 became hydrogen cyanide
// at pH 2.6.)
func TestStatedPHHolds(t *testing.T) {
	m, err := NewModel(loadDB(t), dataFS())
	if err != nil {
		t.Fatal(err)
	}
	type sp struct {
		text string
		mol  float64
	}
	cases := []struct {
		name  string
		items []sp
		ph    []float64
	}{
		{"cyanide", []sp{{"Na+", 0.2}, {"CN-", 0.2}}, []float64{9, 10.5, 11, 12}},
		{"ammonia", []sp{{"NH3", 0.5}}, []float64{8, 10, 11.5}},
		{"carbonate", []sp{{"Na+", 0.4}, {"CO3^2-", 0.2}}, []float64{8.5, 10, 11.8}},
		{"sulfide", []sp{{"Na+", 0.2}, {"HS-", 0.1}, {"OH-", 0.1}}, []float64{9.5, 12.5}},
		{"hypochlorite", []sp{{"Na+", 1}, {"OCl-", 0.5}, {"Cl-", 0.5}}, []float64{9, 11, 12.5}},
	}
	for _, c := range cases {
		for _, ph := range c.ph {
			p := ph
			st := Stream{Label: c.name, WaterMol: water(1), VolumeL: 1, PH: &p}
			for _, it := range c.items {
				st.Items = append(st.Items, item(t, m, it.text, it.mol))
			}
			mx, err := m.Solve(Feed{TempK: 298.15, PressureBar: 1.01325, Streams: []Stream{st}})
			if err != nil {
				t.Fatalf("%s at pH %g: %v", c.name, ph, err)
			}
			if got := mx.Streams[0].PH; math.Abs(got-ph) > 0.05 {
				t.Errorf("%s stated at pH %g holds pH %.2f", c.name, ph, got)
			}
		}
	}
}

// A stream alone is solved for one litre and scaled: its state per litre is
// the same whatever volume of it was solved first, so an answer does not
// depend on what was asked before it (the cache of streams alone).
func TestStreamAloneDoesNotDependOnHistory(t *testing.T) {
	solve := func(m *Model, volL float64) []float64 {
		ph := 11.0
		st := Stream{Label: "cyanide", WaterMol: water(volL), VolumeL: volL, PH: &ph,
			Items: []Item{item(t, m, "Na+", 0.2*volL), item(t, m, "CN-", 0.2*volL)}}
		mx, err := m.Solve(Feed{TempK: 298.15, PressureBar: 1.01325, Streams: []Stream{st}})
		if err != nil {
			t.Fatal(err)
		}
		return scaleAll(mx.Streams[0].Amount, 1/volL)
	}
	fresh := func() *Model {
		m, err := NewModel(loadDB(t), dataFS())
		if err != nil {
			t.Fatal(err)
		}
		return m
	}
	a := fresh()
	first := solve(a, 600)
	solve(a, 0.6)
	again := solve(a, 600)
	b := fresh()
	solve(b, 0.6)
	other := solve(b, 600)
	for i := range first {
		if first[i] != again[i] || math.Abs(first[i]-other[i]) > 1e-9*math.Abs(first[i]) {
			t.Fatalf("species %d per litre: %g, then %g, after another volume first %g", i, first[i], again[i], other[i])
		}
	}
}

// A stated pH that stands for acid or base the request does not name (rinse
// water "at pH 12" holds about 0.01 mol/L of hydroxide) is said in the notes;
// a cyanide liquor brought from its own pH 11.3 to 11 by a trace of acid is
// not (pH arithmetic: 10^-2 mol/L of OH- at pH 12, 25 °C).
func TestStatedPHNamesWhatItAdds(t *testing.T) {
	m, err := NewModel(loadDB(t), dataFS())
	if err != nil {
		t.Fatal(err)
	}
	notes := func(ph float64, items ...Item) string {
		st := Stream{Label: "s", WaterMol: water(1), VolumeL: 1, PH: &ph, Items: items}
		mx, err := m.Solve(Feed{TempK: 298.15, PressureBar: 1.01325, Streams: []Stream{st}})
		if err != nil {
			t.Fatal(err)
		}
		return strings.Join(mx.Notes, "; ")
	}
	if n := notes(12); !strings.Contains(n, "strong base that the request does not name") {
		t.Errorf("water at pH 12: notes %q", n)
	}
	if n := notes(11, item(t, m, "Na+", 0.2), item(t, m, "CN-", 0.2)); strings.Contains(n, "does not name") {
		t.Errorf("cyanide at pH 11: notes %q", n)
	}
}

// The note on how much a solid in excess is counted as belongs only to mixes
// that hold such a solid: two dissolved salts never print it, zinc given
// without an amount into a small volume of acid does.
func TestExcessNoteOnlyWithExcessSolid(t *testing.T) {
	m, err := NewModel(loadDB(t), dataFS())
	if err != nil {
		t.Fatal(err)
	}
	notes := func(items ...Item) string {
		st := Stream{Label: "s", WaterMol: water(0.01), VolumeL: 0.01, Items: items}
		mx, err := m.Solve(Feed{TempK: 298.15, PressureBar: 1.01325, Streams: []Stream{st}})
		if err != nil {
			t.Fatal(err)
		}
		return strings.Join(mx.Notes, "; ")
	}
	const note = "a solid in excess is counted"
	if n := notes(item(t, m, "Na+", 5), item(t, m, "HCO3-", 5)); strings.Contains(n, note) {
		t.Errorf("dissolved salts: notes %q", n)
	}
	zn := item(t, m, "Zn(s)", 0)
	zn.Excess = true
	if n := notes(zn, item(t, m, "H+", 0.01), item(t, m, "Cl-", 0.01)); !strings.Contains(n, note) {
		t.Errorf("zinc in excess: notes %q", n)
	}
}
