package hazard

import (
	"testing"

	"mixward/engine"
)

// TestHotElectrolessNickel: nickel(II) with hypophosphite is flagged as a
// bath that can crash only when hot (60 °C and more; electroless nickel runs
// at about 85–90 °C: common practice, no source), also when the hot stream
// has already plated its nickel, and never cold or without hypophosphite.
func TestHotElectrolessNickel(t *testing.T) {
	sp := func(f string, z int, ph engine.Phase) engine.Species {
		return engine.Species{Formula: f, Charge: z, Phase: ph}
	}
	bath := func(tempC float64, ni engine.Species, hypo float64) *Outcome {
		return &Outcome{VolumeL: 100, HeadspaceL: 100, TemperatureC: tempC, PH: 5, Before: []Amount{
			{Species: ni, Mol: 10, Molar: 0.1},
			{Species: sp("H2PO2", -1, engine.Aqueous), Mol: 100 * hypo, Molar: hypo},
		}}
	}
	cases := []struct {
		name string
		o    *Outcome
		want bool
	}{
		{"hot bath", bath(90, sp("Ni", 2, engine.Aqueous), 0.3), true},
		{"hot bath already plated", bath(90, sp("Ni", 0, engine.Solid), 0.3), true},
		{"cold bath", bath(25, sp("Ni", 2, engine.Aqueous), 0.3), false},
		{"hot nickel without hypophosphite", bath(90, sp("Ni", 2, engine.Aqueous), 0), false},
	}
	for _, c := range cases {
		h, ok := hotElectrolessNickel(c.o)
		if ok != c.want {
			t.Errorf("%s: flagged %v, want %v", c.name, ok, c.want)
		}
		if ok && (h.Code != "hot-electroless-bath" || h.Severity != engine.Warning) {
			t.Errorf("%s: %s %s, want hot-electroless-bath warning", c.name, h.Code, h.Severity)
		}
	}
}
