package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
)

// TestOwnHazardsNoWorse holds mixes whose alarm came from a hazard a stream
// already has by itself, as stored: not a reason to refuse or to order the
// pour unless the mix, or a point of the pour, makes it worse than the
// stream alone; and beside them the real alarms that must stay.
func TestOwnHazardsNoWorse(t *testing.T) {
	a := mustAdvisor(t)
	for _, tc := range []struct {
		name, req string
		level     engine.Level
		title     string // the decision's title contains it ("" for any)
		want      string // a hazard code of the final mix ("" for none)
		not       string // a hazard code that must not be there, final or along the pour
		noAction  string // no action of the decision contains it
		written   bool   // the request writes the order, and it is not the worse one
	}{
		{
			// Lime neutralisation is the standard treatment of HF waste
			// (common practice, no source): 500 L of 5 % acid holds about
			// 1275 mol HF, 20 kg Ca(OH)2 takes up 540 mol, and the HF over
			// the liquid falls. The mix warms to about 45 °C adiabatically,
			// which moved the Henry constant; at the streams' temperature
			// the headspace holds less than over the acid alone.
			name: "HF 5 % neutralised with lime", req: "mix 500 L HF 5 % + 20 kg calcium hydroxide",
			level: engine.WithPrecautions, title: "as over HF 5 % alone", want: "hf-release",
			noAction: "add the acid into the water",
		},
		{
			// Acid into four volumes of water, slowly with cooling and
			// stirring, is a routine make-up (common practice, no source):
			// about 60 MJ, a mean of about 81 °C if poured in one go.
			name: "sulfuric 98 % into 4 volumes of water", req: "pour 50 L sulfuric acid 98 % into 200 L water at 20 C",
			level: engine.WithPrecautions, title: "add H2SO4 98 % into H2O", want: "near-boiling", written: true,
		},
		{
			// Fluoridation make-up: Na2SiF6 solution is about pH 3.5 with
			// a few mmol/L HF, far below burn strength (AWWA fluoridation
			// practice, from memory; EU CLP Annex VI limits for
			// hydrofluoric acid begin at 0.1 %, from memory).
			name: "fluoridation make-up", req: "mix 1000 L water + 5 kg sodium fluoride + 2 kg sodium silicofluoride",
			level: engine.NoConcern, not: "hf-burns",
		},
		{
			// Water into bisulfite gives no more SO2 than the drum itself
			// gives off under the same headspace: no acid is added (common
			// practice, no source).
			name: "bisulfite 38 % with water", req: "mix 1000 L water pH 7 + 10 L sodium bisulfite 38 %",
			level: engine.NoConcern, not: "so2-release",
		},
		{
			// 10 % acid with lime warms to about 63 °C adiabatically; dosed
			// slowly with cooling (the heat's own action) the HF over the
			// liquid stays below the acid's own (common practice, no
			// source).
			name: "HF 10 % neutralised with lime", req: "mix 500 L HF 10 % + 40 kg calcium hydroxide",
			level: engine.WithPrecautions, title: "as over HF 10 % alone", want: "hf-release",
		},
		{
			// Caustic flakes dissolved slowly into four times their mass
			// of water, with cooling: a routine make-up (common practice,
			// no source); about 51 MJ, a mean of about 81 °C in one go.
			name: "caustic flakes into water", req: "mix 200 L water + 50 kg sodium hydroxide",
			level: engine.WithPrecautions, title: "add NaOH into H2O", want: "near-boiling",
		},
		// The real alarms stay.
		{
			// Twice their mass of water: the mean boils.
			name: "caustic flakes into little water", req: "mix 100 L water + 50 kg sodium hydroxide",
			level: engine.DoNotMix, want: "boils",
		},
		{
			// The trade's fluorosilicic acid (20–25 %) fumes hydrogen
			// fluoride; its data sheets treat splashes as HF burns
			// (suppliers' safety data sheets, from memory).
			name: "fluorosilicic acid diluted", req: "mix 100 L fluorosilicic acid 25 % + 100 L water",
			level: engine.WithPrecautions, want: "hf-burns",
		},
		{
			// Bisulfite with a strong acid gives off sulfur dioxide
			// (Bretherick's Handbook of Reactive Chemical Hazards, sodium
			// hydrogen sulfite, from memory).
			name: "bisulfite into acid", req: "pour 10 L sodium bisulfite 38 % into 1000 L sulfuric acid 10 %",
			level: engine.DoNotMix, want: "so2-release",
		},
		{
			// Diluting 40 % HF is routine work with its precautions; the
			// fumes are the acid's own (NIOSH Pocket Guide, hydrogen
			// fluoride, IDLH 30 ppm, from memory).
			name: "HF 40 % diluted", req: "pour 100 L HF 40 % into 100 L water",
			level: engine.WithPrecautions, title: "as over HF 40 % alone", want: "hf-burns",
		},
		{
			// Concentrated acid into one or two volumes of water boils as a
			// whole (adiabatic mean at 100 °C; common practice, no source).
			name: "sulfuric 98 % into 1 volume of water", req: "pour 50 L sulfuric acid 98 % into 50 L water",
			level: engine.DoNotMix, want: "boils",
		},
		{
			name: "sulfuric 98 % into 2 volumes of water", req: "pour 50 L sulfuric acid 98 % into 100 L water",
			level: engine.DoNotMix, want: "boils",
		},
		{
			// Bromide with concentrated sulfuric acid gives bromine and
			// sulfur dioxide and boils (Bretherick's Handbook, from memory).
			name: "bromide with strong sulfuric", req: "mix 100 L sodium bromide 40 % + 100 L sulfuric acid 98 %",
			level: engine.DoNotMix, want: "bromine-release",
		},
		{
			// Bifluoride etch at about 1 % is still a burn hazard (about
			// 0.16 mol/L of bound HF; common practice, no source).
			name: "bifluoride etch diluted", req: "mix 10 L ammonium bifluoride 10 % + 100 L water",
			level: engine.WithPrecautions, want: "hf-burns",
		},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r := ask(t, a, tc.req)
			if r.Decision == nil || r.Decision.Level != tc.level {
				t.Fatalf("decision %+v, want %s", r.Decision, tc.level)
			}
			if !strings.Contains(r.Decision.Title, tc.title) {
				t.Errorf("title %q, want it to contain %q", r.Decision.Title, tc.title)
			}
			codes := map[string]bool{}
			for _, h := range r.Hazards {
				codes[h.Code] = true
			}
			if tc.want != "" && !codes[tc.want] {
				t.Errorf("no %s among %v", tc.want, hazardCodes(r))
			}
			for _, o := range r.Addition.Orders {
				for _, h := range o.Hazards {
					codes[h.Code] = true
				}
			}
			if tc.not != "" && codes[tc.not] {
				t.Errorf("%s fires (final or along the pour)", tc.not)
			}
			for _, act := range r.Decision.Actions {
				if tc.noAction != "" && strings.Contains(act, tc.noAction) {
					t.Errorf("action %q contains %q", act, tc.noAction)
				}
			}
			if tc.written && (r.Addition.Written == nil || r.Addition.Written.Worse) {
				t.Errorf("written order %+v, want the better one", r.Addition.Written)
			}
		})
	}
}

// TestWaterIntoConcentrateStillBoils: the pour that runs water onto
// concentrated acid boils where it lands, whatever the final mix (Bretherick's
// Handbook of Reactive Chemical Hazards, sulfuric acid, from memory).
func TestWaterIntoConcentrateStillBoils(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "pour 200 L water into 50 L sulfuric acid 98 %")
	if !strings.Contains(r.Decision.Title, "not in the order written") {
		t.Errorf("title %q, want the written order called the worse one", r.Decision.Title)
	}
	for _, o := range r.Addition.Orders {
		if strings.HasPrefix(o.Added, "H2O") {
			boils := false
			for _, h := range o.Hazards {
				boils = boils || h.Code == "boils" && h.Worst == engine.Danger
			}
			if !boils {
				t.Errorf("water into the acid: %+v, want boils as a danger", o.Hazards)
			}
		}
	}
}
