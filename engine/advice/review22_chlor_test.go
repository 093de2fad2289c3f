package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
	"mixward/engine/advice"
)

// TestReview22Chlor holds the chlorine oxyanion and peroxide–chloride pours
// a plant-chemist review would not sign, with the hand figure and its
// source beside each. The tanks are those of the invented Harrowgate
// Finishing Works.
func TestReview22Chlor(t *testing.T) {
	a := mustAdvisor(t)

	t.Run("solid chlorite on concentrated sulfuric acid", func(t *testing.T) {
		// Solid chlorite on concentrated sulfuric acid gives chlorine
		// dioxide at once (Bretherick's Handbook of Reactive Chemical
		// Hazards, sodium chlorite, from memory). 1 kg NaClO2 = 1000 /
		// 90.44 = 11.1 mol; 1 L of 98 % acid (1.84 kg/L: CRC Handbook,
		// from memory) holds 18.4 mol H2SO4, acid ample: 5 ClO2- + 4 H+ →
		// 4 ClO2 + Cl- + 2 H2O gives 11.1 × 4/5 = 8.9 mol ClO2. The acid
		// allowance used to count nothing: 37 mol of protons in 1 L is
		// beyond the 20 mol/L the titration reached.
		for _, acid := range []string{"98 %", "50 %", "20 %"} {
			r := ask(t, a, "mix 1 kg sodium chlorite + 1 L sulfuric acid "+acid)
			if r.Decision == nil || r.Decision.Level != engine.DoNotMix {
				t.Errorf("%s: %+v, want do-not-mix", acid, r.Decision)
			}
			if acid == "98 %" {
				if n := finalMol(r, "ClO2", "ClO2(g)"); n < 8.0 || n > 9.0 {
					t.Errorf("98 %%: ClO2 %.2f mol, want about 8.9", n)
				}
			}
		}
	})

	t.Run("chlorate reduced by sulfur dioxide gives chlorine dioxide", func(t *testing.T) {
		// 2 ClO3- + SO2 → 2 ClO2 + SO4^2- in sulfuric acid, chlorate in
		// excess (Kirk-Othmer, chlorine oxides, Mathieson process, from
		// memory). 20 L of 38 % bisulfite (1.36 kg/L, from memory) hold
		// about 20 × 1.36 × 0.38 / 104.06 = 99 mol S(IV): about 190 mol
		// ClO2 against 400 mol chlorate, no chlorine worth the name.
		r := ask(t, a, "mix 100 L sodium chlorate 40 % + 50 L sulfuric acid 30 % + 20 L sodium bisulfite 38 %")
		if n := finalMol(r, "ClO2", "ClO2(g)"); n < 150 || n > 210 {
			t.Errorf("ClO2 %.1f mol, want about 190", n)
		}
		if n := finalMol(r, "Cl2", "Cl2(g)"); n > 1 {
			t.Errorf("Cl2 %.2f mol, want next to none", n)
		}
		// Chlorate with methanol in strong sulfuric acid is the methanol
		// generator (Kirk-Othmer, chlorine oxides, R8/Solvay processes,
		// from memory): the equation on paper names chlorine dioxide.
		r = ask(t, a, "mix sodium chlorate + sulfuric acid + methanol")
		if r.Reaction == nil || !strings.Contains(r.Reaction.Text, "ClO2") || strings.Contains(r.Reaction.Text, "Cl2") {
			t.Errorf("chlorate + sulfuric + methanol: reaction %v, want chlorine dioxide", r.Reaction)
		}
	})

	t.Run("acid made by the reaction breaks down the chlorite left", func(t *testing.T) {
		// ClO2- + 2 HSO3- → Cl- + 2 SO4^2- + 2 H+ makes the acid, and
		// chlorous acid at pH 2 goes to ClO2 within minutes (White's
		// Handbook of Chlorination, chlorite, from memory). 100 L of 25 %
		// chlorite (about 1.2 kg/L, from memory) = 332 mol; 200 L of 10 %
		// metabisulfite (1.00 kg/L as the tool assumes without a density
		// table) = 105 mol S2O5^2- = 210 mol HSO3-: 105 mol chlorite taken
		// to chloride, 210 mol H+ made, 227 mol chlorite left, 4/5 of it →
		// about 180 mol ClO2 (acid ample: 180 protons needed). Before, only
		// 0.3 mol and 150 mol chlorous acid left.
		r := ask(t, a, "mix 100 L sodium chlorite 25 % + 200 L sodium metabisulfite 10 %")
		if n := finalMol(r, "ClO2", "ClO2(g)"); n < 100 {
			t.Errorf("ClO2 %.1f mol, want over 100 (about 180)", n)
		}
		if n := finalMol(r, "HClO2", "ClO2-"); n > 10 {
			t.Errorf("chlorite left %.1f mol at pH %.2f, want next to none", n, r.Conditions.PH)
		}
		// Neutral chlorite with sulfite (no acid made beyond what the
		// sulfite's own base takes up) stays chlorite: no chlorine
		// dioxide (common practice, no source: sulfite dechlorination of
		// chlorite).
		r = ask(t, a, "mix 100 L sodium chlorite 7.5 % + 10 L sodium sulfite 10 %")
		if n := finalMol(r, "ClO2", "ClO2(g)"); n > 0.01 {
			t.Errorf("chlorite + sulfite: ClO2 %.3f mol, want none", n)
		}
		// Chlorite in caustic keeps (White's Handbook, sodium chlorite,
		// from memory).
		r = ask(t, a, "mix 100 L sodium chlorite 25 % + 10 L sodium bisulfite 38 % + 20 L sodium hydroxide 50 %")
		if n := finalMol(r, "ClO2", "ClO2(g)"); n > 0.01 {
			t.Errorf("chlorite + bisulfite in caustic: ClO2 %.3f mol, want none", n)
		}
	})

	t.Run("the redox line names the change that runs", func(t *testing.T) {
		// 5 ClO2- + 4 H+ → 4 ClO2 + Cl- + 2 H2O is what citric acid does
		// to chlorite (White's Handbook, acid–chlorite generation, from
		// memory); perchlorate does not form (common practice, no source).
		r := ask(t, a, "mix 100 L sodium chlorite 7.5 % + 10 L citric acid 50 % at headspace 0.5 m3")
		short := advice.RenderShort(r)
		line := ""
		for _, l := range strings.Split(short, "\n") {
			if strings.HasPrefix(l, "Redox:") {
				line = l
			}
		}
		if !strings.Contains(line, "4 ClO2") || strings.Contains(line, "ClO4-") {
			t.Errorf("redox line %q, want the chlorine dioxide equation", line)
		}
	})

	t.Run("peroxide with concentrated hydrochloric acid", func(t *testing.T) {
		// H2O2 + 2 H+ + 2 Cl- → Cl2 + 2 H2O (E° 1.78 against 1.36 V: CRC
		// Handbook, Electrochemical Series, from memory) runs in
		// concentrated hydrochloric acid; the 1:1 concentrates hold 6.0
		// mol/L chloride (5 L × 1.18 kg/L × 0.37 / 36.46 = 59.9 mol in
		// 10 L). Chlorine from the etchants: common practice, no source.
		r := ask(t, a, "mix 5 L hydrochloric acid 37 % + 5 L hydrogen peroxide 30 %")
		if r.Decision == nil || r.Decision.Level != engine.DoNotMix {
			t.Errorf("concentrates: %+v, want do-not-mix", r.Decision)
		}
		if judgedGas(r, "Cl2") == 0 && pourGasMax(r, "Cl2") == 0 {
			t.Errorf("concentrates: no chlorine named")
		}
		// SC-2 made up water first, 1:1:6 (common practice, no source):
		// the dilute bath (1.5 mol/L chloride) stays quiet, and the advice
		// starts with the water, never the two concentrates together.
		for _, req := range []string{
			"mix 5 L hydrochloric acid 37 % + 5 L hydrogen peroxide 30 % + 30 L water at 70 C",
			"mix 30 L water + 5 L hydrochloric acid 37 % + 5 L hydrogen peroxide 30 %",
		} {
			r := ask(t, a, req)
			if n := finalMol(r, "Cl2", "Cl2(g)"); n > 0.01 {
				t.Errorf("%s: Cl2 %.3f mol in the bath, want none", req, n)
			}
			if r.Decision == nil || r.Decision.Level == engine.DoNotMix {
				t.Errorf("%s: %+v, want the water-first make-up allowed", req, r.Decision)
			}
			adv := r.Addition.Advice
			if !strings.Contains(adv, "start with H2O") || strings.Contains(adv, "start with HCl") || strings.Contains(adv, "start with H2O2") {
				t.Errorf("%s: advice %q, want water first", req, adv)
			}
		}
	})
}
