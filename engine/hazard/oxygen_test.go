package hazard

import (
	"testing"

	"mixward/engine"
)

// TestOxygenSurgeOneRule: a fast oxygen release is judged by its intensity,
// mol O2 per litre of mix, whichever pair of oxidizing agents gives it; a
// catalysed breakdown of one agent stays a precaution.
func TestOxygenSurgeOneRule(t *testing.T) {
	pair := Proceeding{Reactants: []engine.Species{{Formula: "OCl", Charge: -1}, {Formula: "H2O2"}},
		Products: []engine.Species{{Formula: "Cl", Charge: -1}, {Formula: "H2O", Phase: engine.Liquid}, {Formula: "O2", Phase: engine.Gas}}}
	self := Proceeding{Reactants: []engine.Species{{Formula: "OCl", Charge: -1}},
		Products: []engine.Species{{Formula: "Cl", Charge: -1}, {Formula: "O2", Phase: engine.Gas}}}
	base := func(o2, vol float64, r Proceeding) *Outcome {
		return &Outcome{VolumeL: vol, TemperatureC: 25, PressureKPa: 101.325, PH: 9,
			Measured: map[string]MeasuredGas{"O2": {Mol: o2, PPM: 1e6}}, Reactions: []Proceeding{r}}
	}
	for _, tc := range []struct {
		name string
		o    *Outcome
		want engine.Severity // "" for no oxygen-surge hazard
	}{
		// Hand check: 100 L of 12.5 % bleach (1.98 mol/L) with 100 L of 35 % peroxide gives 198 mol O2
		// in 200 L: 0.99 mol/L (Bretherick's Handbook, hydrogen peroxide with sodium hypochlorite, from memory).
		{"bleach with peroxide, 0.99 mol/L", base(198, 200, pair), engine.Danger},
		{"at the threshold, 0.5 mol/L", base(100, 200, pair), engine.Danger},
		// Below it the state's own oxygen is the oxygen-release gas hazard's, not a surge.
		{"dilute pair, 0.1 mol/L", base(20, 200, pair), ""},
		// A catalysed breakdown of one agent is a precaution however much oxygen it gives.
		{"one agent falling apart, 1 mol/L", base(200, 200, self), ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			h, ok := oxygenSurge(tc.o)
			switch {
			case tc.want == "" && ok:
				t.Errorf("oxygen-surge %s, want none", h.Severity)
			case tc.want != "" && (!ok || h.Severity != tc.want):
				t.Errorf("oxygen-surge %v (raised %v), want %s", h.Severity, ok, tc.want)
			}
		})
	}
}

// TestDiluteHypochlorite: a mix with 3 mmol/L of hypochlorite or less and no
// acid raises no chlorine; with a strong acid, or stronger, the numbers
// decide (White's Handbook of Chlorination, dechlorination, from memory).
func TestDiluteHypochlorite(t *testing.T) {
	ocl := func(molar float64) []Amount {
		return []Amount{{Species: engine.Species{Formula: "OCl", Charge: -1}, Molar: molar, Mol: molar * 1000}}
	}
	for _, tc := range []struct {
		name   string
		o      Outcome
		dilute bool
	}{
		{"200 mg/L, alkaline, no acid", Outcome{Before: ocl(0.0027), PH: 9.5}, true},
		{"200 mg/L with a strong acid", Outcome{Before: ocl(0.0027), PH: 9.5, StrongAcid: true}, false},
		{"200 mg/L, combined acid", Outcome{Before: ocl(0.0027), PH: 5}, false},
		{"1 % bleach", Outcome{Before: ocl(0.13), PH: 11}, false},
		{"no hypochlorite", Outcome{PH: 9}, false},
	} {
		if got := diluteHypochlorite(&tc.o); got != tc.dilute {
			t.Errorf("%s: dilute %v, want %v", tc.name, got, tc.dilute)
		}
	}
}
