package engine_test

import (
	"strings"
	"testing"

	"mixward/engine"
)

// TestConditionsLinePH: the details give the pH of the mix at equilibrium,
// where the in-tank list stands, and the pH as combined before any
// reaction (where the species list stands) beside it, labelled, when the
// two differ. Tried as a new user would: thiosulfate with hydrochloric acid
// read "pH 0.10" beside an in-tank list after the reaction.
func TestConditionsLinePH(t *testing.T) {
	f := func(x float64) *float64 { return &x }
	for _, tc := range []struct {
		name string
		c    engine.Conditions
		want string
	}{
		{"reaction moves the pH", engine.Conditions{PH: 0.1, PHFinal: f(1.32), VolumeL: 220, TemperatureC: 25, Medium: "acid"},
			"Conditions: pH 1.32 at equilibrium (0.10 as combined, before any reaction, computed), 25.0 °C, 220 L mixed, acid medium"},
		{"stated pH, then a reaction", engine.Conditions{PH: 7, PHStated: true, PHFinal: f(5.92), VolumeL: 120, TemperatureC: 25, Medium: "base"},
			"Conditions: pH 5.92 at equilibrium (7.00 as combined, before any reaction, stated), 25.0 °C, 120 L mixed, base medium"},
		{"no change", engine.Conditions{PH: 12.5, PHFinal: f(12.5), VolumeL: 10, TemperatureC: 25, Medium: "base"},
			"Conditions: pH 12.50 (computed), 25.0 °C, 10 L mixed, base medium"},
		{"no equilibrium state", engine.Conditions{PH: 3, VolumeL: 10, TemperatureC: 25, Medium: "acid"},
			"Conditions: pH 3.00 (computed), 25.0 °C, 10 L mixed, acid medium"},
	} {
		r := &engine.Result{Request: "mix", Conditions: tc.c, Species: []engine.SpeciesInfo{{Text: "H+"}}}
		out := engine.RenderText(r)
		if !strings.Contains(out, tc.want+"\n") {
			t.Errorf("%s: want line %q in\n%s", tc.name, tc.want, out)
		}
		label := "Species present:\n"
		if strings.Contains(tc.want, "as combined") {
			label = "Species present as combined, before any reaction:\n"
		}
		if !strings.Contains(out, label) {
			t.Errorf("%s: want the species list headed %q", tc.name, label)
		}
	}
}
