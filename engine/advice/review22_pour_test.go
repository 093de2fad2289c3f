package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
)

// decisionOf answers a request and returns its decision, failing the test
// when there is none.
func decisionOf(t *testing.T, a interface {
	Ask(string, engine.AskOptions) (*engine.Result, error)
}, req string) *engine.Decision {
	t.Helper()
	r, err := a.Ask(req, engine.AskOptions{})
	if err != nil {
		t.Fatalf("%s: %v", req, err)
	}
	if r.Decision == nil {
		t.Fatalf("%s: no decision", req)
	}
	return r.Decision
}

// actionsOf joins a decision's actions into one text.
func actionsOf(d *engine.Decision) string { return strings.Join(d.Actions, "\n") }

// TestReview22Pour holds the pour and sequence judgements a plant-chemist
// review would not sign (false alarms and action wording), at the invented
// Harrowgate Finishing Works, with the source of each fact beside it.
func TestReview22Pour(t *testing.T) {
	a := mustAdvisor(t)

	t.Run("acid dosed into water that already holds the oxidant", func(t *testing.T) {
		// Water first, the oxidant diluted into it, the acid dosed into
		// the diluted water at a separate point with mixing: the acid never
		// meets the concentrate (pool and cooling-water acid dosing:
		// common practice, no source). Acid and hypochlorite run neat
		// into each other give chlorine (Bretherick's Handbook of Reactive
		// Chemical Hazards, hypochlorites with acids, from memory).
		cases := []struct{ name, req, dosed string }{
			{"bleach then acid", "mix 2000 L water + 10 L NaOCl 12.5 % + 5 L HCl 10 %", "HCl 10 %"},
			{"tablets then acid", "mix 50000 L water + 2 kg trichloroisocyanuric acid + 1 L hydrochloric acid 31 %", ""},
			{"listed acid first", "mix 5 L HCl 10 % + 10 L NaOCl 12.5 % + 2000 L water", "HCl 10 %"},
		}
		for _, c := range cases {
			d := decisionOf(t, a, c.req)
			if d.Level != engine.WithPrecautions {
				t.Errorf("%s: %s %q, want with precautions", c.name, d.Level, d.Title)
			}
			if strings.Contains(d.Title, "every sequence") {
				t.Errorf("%s: title %q claims every sequence", c.name, d.Title)
			}
			if !strings.Contains(d.Title, "order of addition matters: H2O, then") {
				t.Errorf("%s: title %q does not name the water-first sequence", c.name, d.Title)
			}
			if c.dosed != "" && !strings.Contains(actionsOf(d), "dose "+c.dosed+" into the diluted water at a separate point") {
				t.Errorf("%s: actions %q do not say where to dose the acid", c.name, actionsOf(d))
			}
			if !strings.Contains(actionsOf(d), "meet neat") {
				t.Errorf("%s: actions %q do not keep the neat pair apart", c.name, actionsOf(d))
			}
		}
		// Acid into a tank of neat bleach and caustic, no water: still the
		// danger where the acid lands (common practice, no source: never
		// add acid to a tank containing hypochlorite).
		d := decisionOf(t, a, "mix 20 L NaOCl 12.5 % + 20 L NaOH 10 % + 10 L HCl 10 %")
		if d.Level == engine.NoConcern {
			t.Errorf("neat bleach, caustic and acid: %s %q, want the order named", d.Level, d.Title)
		}
	})

	t.Run("thiosulfate dosed into bleach", func(t *testing.T) {
		// Thiosulfate dosed into bleach leaves alkaline bleach (final pH
		// about 8.5): the chlorine over it is the equilibrium trace,
		// Cl2 + H2O ⇌ HOCl + H+ + Cl- with K about 4e-4 (CRC Handbook,
		// from memory), about 0.06 mmol, which does not trouble a room.
		// Bleach run into thiosulfate turns it acid on the way and gives
		// chlorine and sulfur dioxide (Bretherick's Handbook, from
		// memory): the order matters.
		for _, req := range []string{
			"mix 2 L sodium thiosulfate 20 % + 50 L NaOCl 12.5 % at 30 C",
			"mix 50 L NaOCl 12.5 % + 2 L sodium thiosulfate 20 %",
		} {
			d := decisionOf(t, a, req)
			if d.Level != engine.WithPrecautions {
				t.Errorf("%s: %s %q, want with precautions", req, d.Level, d.Title)
			}
			if !strings.Contains(actionsOf(d), "Add Na2S2O3 20 % into NaOCl 12.5 %, slowly") {
				t.Errorf("%s: actions %q, want the thiosulfate dosed into the bleach", req, actionsOf(d))
			}
		}
		// Acid on bleach: chlorine in amount, still do not mix
		// (Bretherick's Handbook, hypochlorites with acids, from memory).
		if d := decisionOf(t, a, "mix 1 L NaOCl 12.5 % + 1 L citric acid 10 %"); d.Level != engine.DoNotMix {
			t.Errorf("bleach with citric acid: %s %q, want do not mix", d.Level, d.Title)
		}
	})

	t.Run("the bulk liquid first is a natural sequence", func(t *testing.T) {
		// Hypochlorite, then thiosulfate, dosed into a soda ash wash: the
		// soda ash holds the pH, the thiosulfate meets dilute alkaline
		// hypochlorite (common practice, no source). Neat thiosulfate and
		// bleach never meet in that sequence; whichever order the streams
		// are listed in, the decision is the same.
		for _, req := range []string{
			"mix 200 L sodium carbonate 10 % + 5 L NaOCl 12.5 % + 2 L sodium thiosulfate 20 %",
			"mix 5 L NaOCl 12.5 % + 2 L sodium thiosulfate 20 % + 200 L sodium carbonate 10 %",
		} {
			d := decisionOf(t, a, req)
			if d.Level != engine.NoConcern {
				t.Errorf("%s: %s %q, want no concern", req, d.Level, d.Title)
			}
			if !strings.Contains(actionsOf(d), "meet neat") {
				t.Errorf("%s: actions %q do not keep thiosulfate and bleach apart", req, actionsOf(d))
			}
		}
		// Caustic, acid and bleach of like volumes: acid run into caustic
		// and bleach meets the bleach where it lands, an order an operator
		// may take (common practice, no source): the order is named.
		d := decisionOf(t, a, "mix 120 L NaOH 10 % + 100 L HCl 10 % + 100 L NaOCl 12.5 %")
		if !strings.Contains(d.Title, "order of addition matters") {
			t.Errorf("caustic, acid, bleach: title %q does not name the order", d.Title)
		}
	})

	t.Run("a hot stream's own vapour", func(t *testing.T) {
		// Dilute ammonia dosed into hot feedwater gives off its own
		// vapour (Henry's law falls with temperature: Sander 2015, from
		// memory); no reaction forms more. Dosed closed with the tank
		// vented to a safe place (boiler feedwater dosing: common
		// practice, no source).
		for _, req := range []string{
			"mix 50 L ammonia 1 % + 150 L water at 90 C",
			"mix 50 L ammonia 1 % + 150 L water + 1 L hydrazine 1 % at 90 C",
		} {
			d := decisionOf(t, a, req)
			if d.Level != engine.WithPrecautions {
				t.Errorf("%s: %s %q, want with precautions", req, d.Level, d.Title)
			}
			if !strings.Contains(actionsOf(d), "Dose closed") || !strings.Contains(actionsOf(d), "vent the tank to a safe place") {
				t.Errorf("%s: actions %q, want closed dosing and a vent", req, actionsOf(d))
			}
		}
		// Caustic freeing ammonia from a hot ammonium salt is a reaction:
		// the ammonium salt alone gives none, so it stays a danger
		// (Bretherick's Handbook, ammonium salts with bases, from memory).
		if d := decisionOf(t, a, "mix 50 L ammonium chloride 20 % + 50 L NaOH 30 % at 60 C"); d.Level != engine.DoNotMix {
			t.Errorf("hot caustic on ammonium chloride: %s %q, want do not mix", d.Level, d.Title)
		}
	})

	t.Run("action wording", func(t *testing.T) {
		cases := []struct {
			name, req string
			want, not []string
		}{
			// A pair whose dosed order meets nothing names no blank hazard.
			{"strong acid, bleach, water", "mix 300 L water + 30 L HCl 33 % + 20 L sodium hypochlorite 12.5 %", nil, []string{"meets ,", "meets .", "meets  "}},
			{"chlorite, acid, water", "mix 100 L water + 10 L sodium chlorite 25 % + 10 L HCl 10 %", nil, []string{"meets ,", "meets ."}},
			// No order advised "over less of the pour" for a pair that
			// only warms, beside a pair no order makes safe.
			{"hydrazine, nitrite, acid", "mix 100 L hydrazine 15 % + 50 L sodium nitrite 20 % + 50 L HCl 10 %", nil, []string{"meets warms over less"}},
			// A peroxide–sulfuric acid bath holds no added water: the
			// peroxide goes slowly into the acid, a small batch in an open
			// glass or PTFE vessel, left to cool, organics away (common
			// practice, no source).
			{"piranha", "mix 4 L sulfuric acid 96 % + 1 L hydrogen peroxide 30 %",
				[]string{"add the peroxide slowly to the acid", "glass or PTFE", "let it cool", "organic matter away"}, []string{"use more water"}},
			// Quicklime is a solid: added to the water, and a tank that
			// reaches 80 °C as written is not told it stays below 80 °C
			// (quicklime slaking heat: common practice, no source).
			{"quicklime", "pour 200 L water into 50 kg calcium oxide",
				[]string{"add the solid a little at a time into the water", "use more water or cooling"}, []string{"concentrated liquid", "stays well below"}},
		}
		for _, c := range cases {
			d := decisionOf(t, a, c.req)
			text := d.Title + "\n" + actionsOf(d)
			for _, w := range c.want {
				if !strings.Contains(text, w) {
					t.Errorf("%s: %q lacks %q", c.name, text, w)
				}
			}
			for _, n := range c.not {
				if strings.Contains(text, n) {
					t.Errorf("%s: %q has %q", c.name, text, n)
				}
			}
		}
	})
}
