package hazard

import (
	"math"
	"testing"

	"mixward/engine"
)

// The heat estimates of the formaldehyde and haloform families, by hand
// from ΔfH° (NBS Tables 1982, from memory; dissolved formaldehyde about
// −150 kJ/mol, from memory): Cannizzaro −141.5 kJ per 2 HCHO; HCHO + OCl-
// + OH- → HCOO- + Cl- + H2O −391.5 kJ (the review's hand check: about −390).
func TestFamilyHeats(t *testing.T) {
	for _, tc := range []struct {
		name      string
		got, want float64
	}{
		{"Cannizzaro per HCHO", cannizzaroKJ, 141.5 / 2},
		{"formaldehyde with hypochlorite", formaldehydeOCl, 391.5},
	} {
		if math.Abs(tc.got-tc.want) > 0.2 {
			t.Errorf("%s: %.2f kJ, want %.2f", tc.name, tc.got, tc.want)
		}
	}
}

// TestFamilyThresholds: each family on an Outcome built by hand, at the
// review's concentrations and at a routine neighbour's.
func TestFamilyThresholds(t *testing.T) {
	sp := func(f string, ch int) engine.Species {
		return engine.Species{Formula: f, Charge: ch, Phase: engine.Aqueous}
	}
	out := func(ph float64, solids []string, xs ...Amount) *Outcome {
		return &Outcome{VolumeL: 200, HeadspaceL: 200, TemperatureC: 25, PressureKPa: 101.325, PH: ph, Before: xs, After: xs, SolidChemicals: solids}
	}
	am := func(f string, ch int, m float64) Amount { return Amount{Species: sp(f, ch), Molar: m, Mol: m * 200} }
	for _, tc := range []struct {
		name string
		rule func(*Outcome) (engine.Hazard, bool)
		o    *Outcome
		want engine.Severity // "" for silent
	}{
		// Bretherick's Handbook, formaldehyde with alkalis: 6 M HCHO in 9 M caustic boils.
		{"Cannizzaro, review pour", cannizzaro, out(14, nil, am("HCHO", 0, 6), am("OH", -1, 9)), engine.Danger},
		{"Cannizzaro, caustic CIP with a trace", cannizzaro, out(13, nil, am("HCHO", 0, 0.005), am("OH", -1, 0.5)), ""},
		// Bretherick's Handbook, sodium hypochlorite with formaldehyde.
		{"formaldehyde and bleach, dilute", formaldehydeHypochlorite, out(9, nil, am("HCHO", 0, 0.001), am("OCl", -1, 0.003)), ""},
		{"formaldehyde and bleach, 0.05 M", formaldehydeHypochlorite, out(11, nil, am("HCHO", 0, 0.05), am("OCl", -1, 0.05)), engine.Warning},
		// Bretherick's Handbook, perchloric acid with alcohols.
		{"perchloric 5.8 M with ethanol", perchlorateEsters, out(-1, nil, am("ClO4", -1, 5.8), am("C2H5OH", 0, 0.5)), engine.Danger},
		{"perchloric 2 M with ethanol", perchlorateEsters, out(-0.3, nil, am("ClO4", -1, 2), am("C2H5OH", 0, 0.5)), engine.Warning},
		{"perchloric 0.5 M with ethanol", perchlorateEsters, out(0.3, nil, am("ClO4", -1, 0.5), am("C2H5OH", 0, 0.5)), ""},
		// Bretherick's Handbook, chromium trioxide with ethanol: heat by Thornton's rule.
		{"chromic acid with a little ethanol", oxidizerOrganic, out(-0.5, nil, am("HCrO4", -1, 2.3), am("C2H5OH", 0, 0.02)), ""},
		{"chromic acid with 10 L ethanol in 110 L", oxidizerOrganic, out(-0.5, nil, am("HCrO4", -1, 2.3), am("C2H5OH", 0, 0.09)), engine.Danger},
		{"chromic acid with neat ethanol", oxidizerOrganic, out(-0.5, nil, am("HCrO4", -1, 2.3), am("C2H5OH", 0, 1.5)), engine.Danger},
		// Bretherick's Handbook, calcium hypochlorite with alcohols: a dilute rinse is quiet.
		{"cal hypo solid on 1 % ethanol", oxidizerOrganic, out(11, []string{"Ca(OCl)2"}, am("OCl", -1, 0.3), am("C2H5OH", 0, 0.17)), ""},
		// Bretherick's Handbook, sodium azide with heavy metals.
		{"azide without heavy metal", heavyMetalAzide, out(9, nil, am("N3", -1, 0.01), am("Na", 1, 0.01)), ""},
		{"azide with zinc", heavyMetalAzide, out(7, nil, am("N3", -1, 0.01), am("Zn", 2, 0.001)), engine.Danger},
	} {
		h, ok := tc.rule(tc.o)
		switch {
		case tc.want == "" && ok:
			t.Errorf("%s: raised %s %s", tc.name, h.Severity, h.Code)
		case tc.want != "" && !ok:
			t.Errorf("%s: silent, want %s", tc.name, tc.want)
		case ok && h.Severity != tc.want:
			t.Errorf("%s: %s, want %s (%s)", tc.name, h.Severity, tc.want, h.Message)
		}
	}
}
