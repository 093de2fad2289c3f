package hazard

import (
	"testing"

	"mixward/engine"
)

// TestHydroxylamineMetalSalts: iron and copper salts (dissolved or as fresh
// hydroxide) catalyse the runaway decomposition of concentrated
// hydroxylamine (Bretherick's Handbook of Reactive Chemical Hazards,
// hydroxylamine: metal salts, from memory); dilute hydroxylamine is a
// warning, hydroxylamine without those metals or with iron metal alone is
// silent.
func TestHydroxylamineMetalSalts(t *testing.T) {
	am := func(f string, ch int, ph engine.Phase, molar float64) Amount {
		return Amount{Species: engine.Species{Formula: f, Charge: ch, Phase: ph}, Molar: molar, Mol: molar * 40}
	}
	out := func(xs ...Amount) *Outcome {
		return &Outcome{VolumeL: 40, HeadspaceL: 40, TemperatureC: 25, PressureKPa: 101.325, PH: 6, Before: xs, After: xs}
	}
	aq, solid := engine.Aqueous, engine.Solid
	for _, tc := range []struct {
		name string
		o    *Outcome
		want engine.Severity
	}{
		{"U01 50 % hydroxylamine with 40 % FeCl3", out(am("NH3OH", 1, aq, 5.2), am("NH2OH", 0, aq, 2.3), am("Fe(OH)3", 0, solid, 1.75)), engine.Danger},
		{"hydroxylamine sulfate with copper sulfate", out(am("NH3OH", 1, aq, 1.5), am("Cu", 2, aq, 0.01)), engine.Danger},
		{"dilute hydroxylamine with a ferric trace", out(am("NH3OH", 1, aq, 0.3), am("Fe", 3, aq, 0.001)), engine.Warning},
		{"hydroxylamine alone", out(am("NH2OH", 0, aq, 7.5)), ""},
		{"hydroxylamine with iron metal only", out(am("NH2OH", 0, aq, 7.5), am("Fe", 0, solid, 2)), ""},
		{"iron salt with a trace of hydroxylamine", out(am("NH3OH", 1, aq, 0.01), am("Fe", 3, aq, 1)), ""},
	} {
		h, ok := hydroxylamineMetalSalts(tc.o)
		switch {
		case tc.want == "" && ok:
			t.Errorf("%s: %s (%s), want silent", tc.name, h.Code, h.Severity)
		case tc.want != "" && !ok:
			t.Errorf("%s: silent, want %s", tc.name, tc.want)
		case ok && (h.Severity != tc.want || h.Code != "hydroxylamine-decomposition"):
			t.Errorf("%s: %s %s, want hydroxylamine-decomposition %s", tc.name, h.Code, h.Severity, tc.want)
		}
	}
}
