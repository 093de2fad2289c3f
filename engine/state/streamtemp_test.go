package state

import (
	"math"
	"testing"
)

// TestStreamSolvedAtItsOwnTemperature: a stream alone is solved at its own
// temperature (Stream.TempK), not at the mix's, and 0 means the feed's.
// Water alone is at pH 7.00 at 25 °C and about 6.3 at 80 °C (pKw 12.6 at
// 80 °C, CRC Handbook, ionization constant of water, from memory; the
// species data give about 6.24 by van 't Hoff at constant ΔrH, hence the
// 0.1 tolerance, still far from 7.00). A drum of
// 35 % peroxide (58 mol in 5 L) at 25 °C keeps every mole, while the hot
// caustic it goes into (80 °C, pH above 9.5) takes it to oxygen
// (Bretherick's Handbook, hydrogen peroxide with bases, from memory).
func TestStreamSolvedAtItsOwnTemperature(t *testing.T) {
	m, err := NewModel(loadDB(t), dataFS())
	if err != nil {
		t.Fatal(err)
	}
	rinse := Stream{Label: "T-20", WaterMol: water(100), VolumeL: 100}
	for _, c := range []struct {
		streamK, feedK, ph float64
	}{
		{298.15, 353.15, 7.00},
		{0, 353.15, 6.3},
		{353.15, 298.15, 6.3},
	} {
		st := rinse
		st.TempK = c.streamK
		mx, err := m.Solve(Feed{TempK: c.feedK, PressureBar: 1.01325, Streams: []Stream{st}})
		if err != nil {
			t.Fatal(err)
		}
		if got := mx.Streams[0].PH; math.Abs(got-c.ph) > 0.1 {
			t.Errorf("water stream at %g K in a feed at %g K: pH %.2f, want %.2f", c.streamK, c.feedK, got, c.ph)
		}
	}

	caustic := Stream{Label: "T-21", Items: []Item{item(t, m, "Na+", 50), item(t, m, "OH-", 50)}, WaterMol: water(100), VolumeL: 100, TempK: 353.15}
	peroxide := Stream{Label: "T-22", Items: []Item{item(t, m, "H2O2", 58)}, WaterMol: water(3.2), VolumeL: 5, TempK: 298.15}
	mx, err := m.Solve(Feed{TempK: 350.5, PressureBar: 1.01325, Streams: []Stream{caustic, peroxide}})
	if err != nil {
		t.Fatal(err)
	}
	at := map[string]int{}
	for i, sp := range mx.Species {
		at[sp.Text] = i
	}
	if got := mx.Streams[1].Amount[at["H2O2"]]; got < 57 {
		t.Errorf("peroxide stream alone at 25 °C keeps %.3g mol H2O2, want all 58", got)
	}
	if got := mx.Streams[1].Amount[at["O2(g)"]] + mx.Streams[1].Amount[at["O2"]]; got > 1e-6 {
		t.Errorf("peroxide stream alone at 25 °C gives off %.3g mol O2, want none", got)
	}
	if got := mx.Final.Amount[at["O2(g)"]] + mx.Final.Amount[at["O2"]]; got < 28 {
		t.Errorf("hot caustic mix gives off %.3g mol O2, want about 29", got)
	}
}
