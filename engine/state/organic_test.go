package state

import (
	"math"
	"testing"
)

// An organic compound keeps its skeleton and the oxidation states of its
// atoms under the organic-carbon lock: peracetic acid (CH3CO3H) stays a
// peracid beside hypochlorite, and is not turned into its isomer glycolic
// acid (HOCH2COOH), which would lose the peroxide oxygen without any reaction
// that runs in a tank (common practice, no source).
func TestOrganicIsomerKept(t *testing.T) {
	m, err := NewModel(loadDB(t), dataFS())
	if err != nil {
		t.Fatal(err)
	}
	paa := Stream{Label: "PAA", WaterMol: water(1), VolumeL: 1, Items: []Item{item(t, m, "CH3CO3H", 2)}}
	bleach := Stream{Label: "bleach", WaterMol: water(1), VolumeL: 1,
		Items: []Item{item(t, m, "Na+", 3.4), item(t, m, "OCl-", 1.7), item(t, m, "Cl-", 1.7)}}
	for name, sts := range map[string][]Stream{"alone": {paa}, "with hypochlorite": {paa, bleach}} {
		mx, err := m.Solve(Feed{TempK: 298.15, PressureBar: 1.01325, Streams: sts})
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		kept, glycolic := 0.0, 0.0
		for i, sp := range mx.Species {
			switch sp.Text {
			case "CH3CO3H", "CH3CO3-":
				kept += mx.Final.Amount[i]
			case "HOCH2COOH", "HOCH2COO-":
				glycolic += mx.Final.Amount[i]
			}
		}
		if math.Abs(kept-2) > 0.01 || glycolic > 1e-6 {
			t.Errorf("%s: peracetic acid %.4g mol of 2 kept, glycolic acid %.3g mol", name, kept, glycolic)
		}
	}
}
