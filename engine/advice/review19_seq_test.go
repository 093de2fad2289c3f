package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
)

// TestReview19Sequences holds make-ups of three streams that a plant-chemist
// review would not sign as "with precautions: hazard along the pour in other
// sequences" (or with "never H2O into <solid> (scalding-heat)"): water goes
// in first and each reagent is dissolved or diluted into it, which the
// answer's own sequence line says is safe (common practice, no source). What
// the other sequences meet stays in the advice as an action line. Heats of
// solution from the NBS tables, from memory: soda ash about -27 kJ/mol,
// sodium sulfate about -2 kJ/mol; they cannot scald water that was not
// already that hot. The dangerous controls keep their warning.
func TestReview19Sequences(t *testing.T) {
	a := mustAdvisor(t)
	for _, tc := range []struct {
		req    string
		level  engine.Level
		advice string // text the advice must hold ("" for none)
		not    string // a hazard code no order or sequence may meet ("" for none)
		order  string // "added>into": an order that must still meet a danger ("" for none)
	}{
		// A dry blend of percarbonate and citric acid only fizzes once
		// wetted (effervescent cleaners: common practice, no source).
		{req: "mix 1000 L water + 2 kg sodium percarbonate + 1 kg citric acid", level: engine.NoConcern, advice: "In sequence: start with H2O"},
		// Soda ash and alum dosed into water: the CO2 of alum meeting the
		// carbonate stays in the liquid as bicarbonate at these strengths
		// (water-treatment practice: common practice, no source).
		{req: "mix 1000 L water + 10 kg sodium carbonate + 5 kg aluminium sulfate", level: engine.NoConcern, advice: "In sequence: start with H2O"},
		// Permanganate and ferrous sulfate each dissolved into a tonne of
		// water: a blend wetted dry warms, which only the dry blend meets
		// (the anhydrous salt; "ferrous sulfate" alone is now copperas).
		{req: "mix 1000 L water + 2 kg potassium permanganate + 5 kg anhydrous ferrous sulfate", level: engine.NoConcern, advice: "In sequence: start with H2O"},
		// Dechlorination: thiosulfate and a litre of bleach into a tonne of
		// water (common practice, no source); the two must never meet neat.
		{req: "mix 1000 L water pH 6.5 + 2 kg sodium thiosulfate + 1 L NaOCl 12.5 %", level: engine.NoConcern, advice: "Never let NaOCl 12.5 % and Na2S2O3 meet neat"},
		// Ferric chloride and caustic each into the water (coagulant and pH
		// correction: common practice, no source); caustic never the
		// other way.
		{req: "mix 1000 L water + 10 L ferric chloride 40 % + 5 L sodium hydroxide 50 %", level: engine.NoConcern, advice: "never H2O into NaOH 50 %"},
		// Hot water already scalds; soda ash adds a few degrees to it.
		{req: "mix 500 L water + 25 kg sodium sulfate + 5 kg sodium carbonate at 70 C", level: engine.NoConcern, not: "scalding-heat"},
		// Peroxide and caustic each into two tonnes of water (alkaline
		// peroxide bleaching: common practice, no source); never neat.
		{req: "mix 2000 L water + 2 L H2O2 35 % + 1 L sodium hydroxide 50 %", level: engine.NoConcern, advice: "Never let NaOH 50 % and H2O2 35 % meet neat"},
		{req: "mix 1000 L water, 60 C + 10 kg sodium carbonate + 5 kg sodium metasilicate", level: engine.NoConcern, not: "scalding-heat"},

		// Dangerous controls.
		// Water onto caustic flakes boils where it lands (common practice,
		// no source), in a pair and in a sequence that starts with them.
		{req: "mix 100 L water + 50 kg sodium hydroxide", level: engine.DoNotMix, order: "H2O>NaOH"},
		{req: "mix 1000 L water + 20 kg NaOH + 5 kg Na2CO3", level: engine.WithPrecautions, order: "H2O>NaOH"},
		{req: "mix 100 L water, 70 C + 20 kg sodium hydroxide", level: engine.DoNotMix},
		// Water onto concentrated sulfuric acid boils and throws acid out
		// (Bretherick's Handbook of Reactive Chemical Hazards, sulfuric
		// acid, from memory).
		{req: "pour 10 L water into 100 L sulfuric acid 96 %", level: engine.DoNotMix, order: "H2O>H2SO4 96 %"},
		// Ammonium salts blended dry with caustic give ammonia and heat
		// once damp; a solid nitrite blended dry with an ammonium salt
		// makes ammonium nitrite (Bretherick's Handbook, from memory): a
		// make-up that may be blended dry keeps the warning.
		{req: "mix 5 kg ammonium sulfate + 5 kg NaOH", level: engine.DoNotMix, order: "NaOH>(NH4)2SO4"},
		{req: "mix 2000 L water + 1 kg sodium nitrite + 1 kg ammonium chloride", level: engine.WithPrecautions, order: "NaNO2>NH4Cl"},
		// Bleach run into water already acidified gives chlorine (common
		// practice, no source: never add acid to a tank containing
		// hypochlorite, nor hypochlorite to acid): with the water first,
		// the order of the reagents into it still matters.
		{req: "mix 2000 L water + 20 L NaOH 50 % + 5 L NaOCl 12.5 % + 2 L HCl 33 %", level: engine.WithPrecautions, advice: "Never let HCl 33 % and NaOCl 12.5 % meet neat"},
		// A solid chlorinator with a solid acid gives chlorine (Bretherick's
		// Handbook, calcium hypochlorite: acids, from memory).
		{req: "mix 10 kg Ca(OCl)2 + 10 kg NaHSO4", level: engine.DoNotMix, order: "NaHSO4>Ca(OCl)2"},
	} {
		t.Run(tc.req, func(t *testing.T) {
			r := ask(t, a, tc.req)
			if r.Decision.Level != tc.level {
				t.Errorf("%s %q, want %s", r.Decision.Level, r.Decision.Title, tc.level)
			}
			if tc.advice != "" && !strings.Contains(strings.Join(r.Decision.Actions, " "), tc.advice) {
				t.Errorf("actions %q, want %q", r.Decision.Actions, tc.advice)
			}
			if tc.not != "" {
				for _, o := range r.Addition.Orders {
					for _, h := range o.Hazards {
						if h.Code == tc.not {
							t.Errorf("%s into %s meets %s", o.Added, o.Into, h.Code)
						}
					}
				}
				for _, s := range r.Addition.Sequences {
					for _, st := range s.Steps {
						for _, h := range st.Hazards {
							if h.Code == tc.not {
								t.Errorf("sequence %v: %s into %s meets %s", s.Streams, st.Added, st.Into, h.Code)
							}
						}
					}
				}
				if strings.Contains(r.Addition.Advice, tc.not) {
					t.Errorf("advice names %s: %q", tc.not, r.Addition.Advice)
				}
			}
			if tc.order != "" {
				added, into, _ := strings.Cut(tc.order, ">")
				found := false
				for _, o := range r.Addition.Orders {
					if o.Added != added || o.Into != into {
						continue
					}
					for _, h := range o.Hazards {
						found = found || h.Worst == engine.Danger
					}
				}
				if !found {
					t.Errorf("%s run into %s meets no danger: %+v", added, into, r.Addition.Orders)
				}
			}
		})
	}
}
