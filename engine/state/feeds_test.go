package state

import (
	"io/fs"
	"testing"

	"mixward/data"
	"mixward/engine/thermo"
)

func dataFS() fs.FS { return data.FS }

// item is a shorthand for one species of a feed.
func item(t testing.TB, m *Model, text string, mol float64) Item {
	t.Helper()
	sp, ok := m.DB.Get(text)
	if !ok {
		t.Fatalf("no species data for %s", text)
	}
	return Item{Species: sp, Mol: mol}
}

func get(t testing.TB, m *Model, text string) *thermo.Species {
	t.Helper()
	sp, ok := m.DB.Get(text)
	if !ok {
		t.Fatalf("no species data for %s", text)
	}
	return sp
}

// water is the mol of water in v litres of a dilute solution.
func water(v float64) float64 { return v * 997 / 18.015 }

// sampleFeeds are plant mixes in invented tanks.
func sampleFeeds(t testing.TB, m *Model) map[string]Feed {
	f := func(sts ...Stream) Feed { return Feed{Streams: sts, TempK: 298.15, PressureBar: 1.01325} }
	return map[string]Feed{
		"ferrous-permanganate": f(
			Stream{Label: "T-1", Items: []Item{item(t, m, "Fe^2+", 0.1), item(t, m, "SO4^2-", 0.1)}, WaterMol: water(1), VolumeL: 1},
			Stream{Label: "T-2", Items: []Item{item(t, m, "K+", 0.02), item(t, m, "MnO4-", 0.02), item(t, m, "H+", 1), item(t, m, "HSO4-", 1)}, WaterMol: water(1), VolumeL: 1}),
		"copper-sulfate": f(
			Stream{Label: "T-3", Items: []Item{item(t, m, "Cu^2+", 1), item(t, m, "SO4^2-", 1)}, WaterMol: water(1), VolumeL: 1}),
		"zinc-copper": f(
			Stream{Label: "T-6", Items: []Item{{Species: get(t, m, "Zn(s)"), Excess: true}}},
			Stream{Label: "T-3", Items: []Item{item(t, m, "Cu^2+", 1), item(t, m, "SO4^2-", 1)}, WaterMol: water(1), VolumeL: 1}),
		"ferrous-alone": f(
			Stream{Label: "T-1", Items: []Item{item(t, m, "Fe^2+", 0.1), item(t, m, "SO4^2-", 0.1)}, WaterMol: water(1), VolumeL: 1}),
		"cyanide-hypochlorite": f(
			Stream{Label: "T-7", Items: []Item{item(t, m, "Na+", 0.12), item(t, m, "CN-", 0.02), item(t, m, "OH-", 0.1)}, WaterMol: water(1000), VolumeL: 1000},
			Stream{Label: "T-8", Items: []Item{item(t, m, "Na+", 95), item(t, m, "OCl-", 95)}, WaterMol: water(50), VolumeL: 50}),
		"iron-pickle": f(
			Stream{Label: "T-9", Items: []Item{{Species: get(t, m, "Fe(s)"), Excess: true}}},
			Stream{Label: "T-10", Items: []Item{item(t, m, "H+", 107), item(t, m, "HSO4-", 107)}, WaterMol: water(100), VolumeL: 100}),
		"aluminium-caustic": f(
			Stream{Label: "T-11", Items: []Item{item(t, m, "Al(s)", 185)}},
			Stream{Label: "T-12", Items: []Item{item(t, m, "Na+", 530), item(t, m, "OH-", 530)}, WaterMol: water(400), VolumeL: 400}),
		"zinc-strong-caustic": f(
			Stream{Label: "T-13", Items: []Item{{Species: get(t, m, "Zn(s)"), Excess: true}}},
			Stream{Label: "T-14", Items: []Item{item(t, m, "Na+", 20.3), item(t, m, "OH-", 20.3)}, WaterMol: water(0.6), VolumeL: 1}),
		"zinc-acid-hot": {TempK: 423.15, PressureBar: 1.01325, Streams: []Stream{
			{Label: "T-15", Items: []Item{{Species: get(t, m, "Zn(s)"), Excess: true}}},
			{Label: "T-16", Items: []Item{item(t, m, "H+", 1), item(t, m, "Cl-", 1)}, WaterMol: water(1), VolumeL: 1}}},
		"cyanide-strike": f(
			Stream{Label: "T-17", Items: []Item{item(t, m, "Na+", 122.4), item(t, m, "CN-", 122.4)}, WaterMol: water(300), VolumeL: 300},
			Stream{Label: "T-18", Items: []Item{item(t, m, "H+", 143.6), item(t, m, "Cl-", 143.6)}, WaterMol: water(50), VolumeL: 50}),
		"bleach-acid": f(
			Stream{Label: "T-4", Items: []Item{item(t, m, "Na+", 3.8), item(t, m, "OCl-", 3.8)}, WaterMol: water(2), VolumeL: 2},
			Stream{Label: "T-5", Items: []Item{item(t, m, "H+", 1.4), item(t, m, "Cl-", 1.4)}, WaterMol: water(0.5), VolumeL: 0.5}),
	}
}
