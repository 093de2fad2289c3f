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
		{"the reaction takes the mix across neutral", engine.Conditions{PH: 7, PHStated: true, PHFinal: f(5.92), VolumeL: 120, TemperatureC: 25, Medium: "base", MediumFinal: "acid"},
			"Conditions: pH 5.92 at equilibrium (7.00 as combined, before any reaction, stated), 25.0 °C, 120 L mixed, acid medium after the reaction (equations written in base medium, as combined)"},
		{"no change", engine.Conditions{PH: 12.5, PHFinal: f(12.5), VolumeL: 10, TemperatureC: 25, Medium: "base", MediumFinal: "base"},
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

// TestMediumAfterReaction: the medium beside the pH after the reaction is
// the medium at that pH (acid below neutral pH at the mix temperature,
// pKw/2 from the species data), not the one as combined; the JSON field
// medium keeps its meaning (the medium the equations are written in) and
// medium_final gives the other. Tried as a new user would: dilute bleach
// with a little thiosulfate goes from pH 9.3 to about 6 (the reduction of
// hypochlorite by thiosulfate gives acid: 4 OCl- + S2O3^2- + H2O → 4 Cl- +
// 2 SO4^2- + 2 H+, White's Handbook of Chlorination, from memory).
func TestMediumAfterReaction(t *testing.T) {
	r := ask(t, "mix 100 L NaOCl 0.01 % + 0.35 L Na2S2O3 1 %")
	c := r.Conditions
	if c.PHFinal == nil || !(*c.PHFinal < 7) || !(c.PH > 7) {
		t.Fatalf("pH %v as combined, %v after: want base as combined, acid after", c.PH, c.PHFinal)
	}
	if c.Medium != engine.Base || c.MediumFinal != engine.Acid {
		t.Errorf("medium %q, medium_final %q: want base (equations, as combined) and acid (after)", c.Medium, c.MediumFinal)
	}
	if out := engine.RenderText(r); !strings.Contains(out, "acid medium after the reaction") {
		t.Errorf("the Conditions line does not give the medium after the reaction:\n%s", out)
	}
	for _, req := range []string{"mix 100 L NaOH 2 % + 100 L HCl 10 %", "mix 100 L water + 10 L NaOH 10 %"} {
		r := ask(t, req)
		if r.Conditions.PHFinal == nil {
			continue
		}
		want := engine.Acid
		if *r.Conditions.PHFinal >= 7 {
			want = engine.Base
		}
		if r.Conditions.MediumFinal != want {
			t.Errorf("%s: medium_final %q at pH %.2f, want %q", req, r.Conditions.MediumFinal, *r.Conditions.PHFinal, want)
		}
	}
}
