package advice_test

import (
	"math"
	"strings"
	"testing"

	"mixward/engine"
)

// TestGasOfTheStockAsStored: a hazard is "already in" a stream only if the
// stream gives it off as stored, at its own temperature (25 °C unless
// stated) and without the pH stated for the mix. A drum of 35 % peroxide
// gives off no oxygen, so the 29 mol O2 that hot caustic makes of it belongs
// to the mix (Bretherick's Handbook, hydrogen peroxide with bases, from
// memory); a chlorine dioxide solution does give off its own ClO2 (Henry
// constant about 1 mol/(L·bar), Sander 2015; NIOSH IDLH 5 ppm; both from
// memory): 4.45 mol in 200 L is 22 mmol/L, about 22,000 ppm in a closed
// headspace.
func TestGasOfTheStockAsStored(t *testing.T) {
	a := mustAdvisor(t)
	cases := []struct {
		req        string
		level      engine.Level
		code       string
		own        bool    // the hazard is the stream's own ("Already in ...")
		minPPM     float64 // headspace of the gas at least (0: not checked)
		noPourCode string  // a code no order of the pour may raise
	}{
		{"mix 100 L NaOH 2 %, 80 C + 5 L H2O2 35 %", engine.WithPrecautions, "oxygen-release", false, 0, ""},
		{"mix 100 L NaOH 2 % + 5 L H2O2 35 % at 80 C", engine.WithPrecautions, "oxygen-release", false, 0, ""},
		// Hot water run into the drum: each point of the pour starts at the
		// temperature of what it holds, not at that of the finished mix.
		{"mix 100 L water, 80 C + 5 L H2O2 35 %", engine.NoConcern, "", false, 0, "boils"},
		{"mix 100 L ClO2 0.3 % + 100 L water", engine.WithPrecautions, "clo2-release", true, 20000, ""},
		{"mix 20 L ClO2 0.8 % + 200 L water, pH 7", engine.WithPrecautions, "clo2-release", true, 10000, ""},
	}
	for _, tc := range cases {
		t.Run(tc.req, func(t *testing.T) {
			r := ask(t, a, tc.req)
			if r.Decision == nil || r.Decision.Level != tc.level {
				t.Fatalf("decision %+v, want %s; hazards %v", r.Decision, tc.level, codesOf(r))
			}
			if tc.code != "" {
				h, ok := hazardOf(r, tc.code)
				if !ok {
					t.Fatalf("no %s among %v", tc.code, codesOf(r))
				}
				if own := strings.HasPrefix(h.Message, "Already in"); own != tc.own {
					t.Errorf("%s filed as the stream's own: %v, want %v (%s)", tc.code, own, tc.own, h.Message)
				}
				if tc.minPPM > 0 && (h.Gas == nil || h.Gas.HeadspacePPM < tc.minPPM) {
					t.Errorf("%s headspace %+v, want at least %g ppm", tc.code, h.Gas, tc.minPPM)
				}
			}
			if tc.noPourCode == "" || r.Addition == nil {
				return
			}
			for _, o := range r.Addition.Orders {
				for _, ph := range o.Hazards {
					if ph.Code == tc.noPourCode {
						t.Errorf("%s into %s: %s from %g", o.Added, o.Into, ph.Code, ph.FromFraction)
					}
				}
			}
		})
	}
}

// TestPourPointStartsAtItsOwnTemperature: a point of the pour holds the
// streams in its own shares, so it starts at their temperatures averaged in
// those shares (as water), not at the temperature of the finished mix. The
// first 0.1 % of 80 °C caustic run into a drum of 35 % peroxide at 25 °C
// leaves the drum near 25 °C and barely alkaline: nothing boils there. At 2 %
// (2 L of 0.5 mol/L NaOH into 5 L, about 41 °C) the drum is near pH 9.9
// (1 mol HO2- to 57 mol H2O2, pKa 11.6) with peroxide far above 2.9 mol/L,
// which breaks down at once (Bretherick's Handbook, hydrogen peroxide with
// bases, from memory), and boils. Judged at the 77 °C of the finished mix
// the same point stays below pH 9.5 and the boiling starts only at 7 %.
func TestPourPointStartsAtItsOwnTemperature(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 100 L NaOH 2 %, 80 C + 5 L H2O2 35 %")
	// The first stretch that boils counts: between about 15 and 40 % of
	// the addition the drum holds under 2.9 mol/L peroxide with less than a
	// third of it as the anion, which keeps for a while (as a hot alkaline
	// bleaching bath does), and boils again further on.
	found := false
	for _, o := range r.Addition.Orders {
		if o.Added != "NaOH 2 %" {
			continue
		}
		first := 2.0
		for _, ph := range o.Hazards {
			if ph.Code == "boils" {
				found, first = true, math.Min(first, ph.FromFraction)
			}
		}
		if found && (first < 0.005 || first > 0.03) {
			t.Errorf("%s into %s boils from %g of the addition, want from 0.5 to 3 %%", o.Added, o.Into, first)
		}
	}
	if !found {
		t.Errorf("NaOH 2 %% into H2O2 35 %% does not boil anywhere: %+v", r.Addition.Orders)
	}
}
