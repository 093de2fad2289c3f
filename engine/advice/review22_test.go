package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
)

// TestReview22 holds pours a plant-chemist review of the build would not
// sign, with the hand figure and its source beside each.
func TestReview22(t *testing.T) {
	a := mustAdvisor(t)

	t.Run("peroxide takes chlorine dioxide to chlorite", func(t *testing.T) {
		// 2 ClO2 + H2O2 + 2 OH- → 2 ClO2- + O2 + 2 H2O is how sodium
		// chlorite is made (Greenwood & Earnshaw, Chemistry of the
		// Elements, chlorites, from memory). 10 L of 0.3 % ClO2 hold
		// about 0.44 mol: 0.44 mol chlorite and 0.22 mol O2, no chlorate.
		r := ask(t, a, "mix 10 L chlorine dioxide 0.3 % + 10 L H2O2 5 %, NaOH 4 %")
		if n := finalMol(r, "ClO3-"); n > 0.01 {
			t.Errorf("chlorate %.3f mol, want none", n)
		}
		if n := finalMol(r, "ClO2-", "HClO2"); n < 0.4 || n > 0.5 {
			t.Errorf("chlorite %.3f mol, want about 0.44", n)
		}
		// In neutral peroxide too the chlorine dioxide stops at
		// chlorite; peroxide does not take chlorite on to chloride.
		r = ask(t, a, "mix 10 L chlorine dioxide 0.3 % + 10 L H2O2 5 %")
		if n := finalMol(r, "Cl-"); n > 0.01 {
			t.Errorf("chloride %.3f mol, want none (chlorite)", n)
		}
	})

	t.Run("plant chemicals known by name", func(t *testing.T) {
		// Calcium carbide gives acetylene with water (Greenwood &
		// Earnshaw, carbides, from memory): with no acetylene data the
		// answer is withheld by name, not refused as an unknown word.
		if _, err := a.Ask("mix 10 kg calcium carbide + 100 L water", engine.AskOptions{}); err == nil || !strings.Contains(err.Error(), "no thermodynamic data for CaC2") {
			t.Errorf("calcium carbide: err %v, want withheld by name", err)
		}
		// Salts whose ions the tables hold are answered: potassium
		// fluoride in water is a make-up, no concern.
		r := ask(t, a, "mix 5 kg potassium fluoride + 100 L water")
		if r.Decision == nil || r.Decision.Level != engine.NoConcern {
			t.Errorf("KF make-up: %+v, want no concern", r.Decision)
		}
		// "liquor" after a name is the liquid's form.
		r = ask(t, a, "mix 10 L caustic soda liquor 50 % + 10 L water")
		if n := combinedMol(r, "OH-"); n < 150 || n > 200 {
			t.Errorf("OH- %.0f mol, want about 190 (10 L of 50 %% caustic at 1.52 kg/L)", n)
		}
	})

	t.Run("ammonia freed from an ammonium salt is judged by amount", func(t *testing.T) {
		// 5 L of 1 % caustic (1.3 mol) in 50 L of 10 % ammonium chloride
		// frees about 1 mmol of ammonia into the headspace: a smell at the
		// surface, far below 300 ppm (NIOSH IDLH) over a small room, not
		// a reason not to combine (common practice, no source).
		r := ask(t, a, "mix 50 L ammonium chloride 10 % + 5 L NaOH 1 %")
		if r.Decision == nil || r.Decision.Level == engine.DoNotMix {
			t.Errorf("dilute caustic into ammonium chloride: %+v, want not do-not-mix", r.Decision)
		}
		// Strong caustic on a strong ammonium salt frees ammonia in
		// earnest: still do not mix.
		r = ask(t, a, "mix 50 L ammonium chloride 20 % + 50 L NaOH 30 %")
		if r.Decision == nil || r.Decision.Level != engine.DoNotMix {
			t.Errorf("strong caustic into ammonium chloride: %+v, want do-not-mix", r.Decision)
		}
		// Ammonia solution keeps giving off its vapour, however little a
		// closed headspace holds: judged by concentration.
		r = ask(t, a, "mix 5 L AgNO3 5 % + 5 L NH3 10 %")
		if judgedGas(r, "NH3") == 0 {
			t.Errorf("ammonia 10 %%: no ammonia judged")
		}
	})

	t.Run("strong sulfuric acid drives nitric acid out of a nitrate when warm too", func(t *testing.T) {
		// 100 L of 40 % sodium nitrate (621 mol) with 100 L of 96 %
		// sulfuric acid (1800 mol): the old way of making nitric acid
		// (Vogel's Qualitative Inorganic Analysis, nitrates with
		// concentrated sulfuric acid, from memory). Warm, a quarter of
		// the sulfate sits as the NaSO4- ion pair, still the acid's.
		r := ask(t, a, "mix 100 L NaNO3 40 % + 100 L H2SO4 96 % at 60 C")
		if _, ok := hazardOf(r, "acid-fumes"); !ok {
			t.Errorf("no acid-fumes hazard for a nitrate in warm strong sulfuric acid")
		}
	})

	t.Run("bleach with acetone names the chloroform", func(t *testing.T) {
		// 201 mol hypochlorite and 272 mol acetone: 67 mol chloroform
		// by the haloform reaction (Vogel's Practical Organic Chemistry,
		// from memory), in a mix near 90 °C, above chloroform's boiling
		// point of 61 °C (CRC Handbook, from memory).
		r := ask(t, a, "mix 100 L NaOCl 12.5 % + 20 L acetone")
		h, ok := hazardOf(r, "chloroform-formation")
		if !ok {
			t.Fatal("no chloroform-formation hazard")
		}
		var n float64
		for _, c := range h.Counts {
			if c.Formula == "CHCl3" {
				n = c.Mol
			}
		}
		if n < 55 || n > 75 {
			t.Errorf("chloroform %.1f mol, want about 67", n)
		}
	})

	t.Run("copper(II) into cyanide counts the cyanogen", func(t *testing.T) {
		// 100 L of 5 % NaCN (102 mol) with 100 L of 10 % CuSO4 (69 mol):
		// 2 Cu2+ + 4 CN- → 2 CuCN + (CN)2, cyanide-limited, up to 25 mol
		// cyanogen (Greenwood & Earnshaw, cyanogen, from memory), most
		// of the copper first going down as hydroxide.
		r := ask(t, a, "mix 100 L sodium cyanide 5 % + 100 L copper sulfate 10 %")
		h, ok := hazardOf(r, "cyanogen-release")
		if !ok {
			t.Fatal("no cyanogen-release hazard")
		}
		var n float64
		for _, c := range h.Counts {
			if c.Formula == "C2N2" {
				n = c.Mol
			}
		}
		if n < 20 || n > 27 {
			t.Errorf("cyanogen %.1f mol, want about 25", n)
		}
	})

	t.Run("a metal given by mass is said to be counted as chips", func(t *testing.T) {
		// Massive aluminium in cold 20 % sulfuric acid is the anodising
		// bath itself and reacts slowly (common practice, no source):
		// the answer counts it as turnings and says so; named turnings
		// and sodium (which reacts in any form) get no such line.
		has := func(r *engine.Result) bool {
			for _, n := range r.ReadAs {
				if strings.Contains(n, "counted as reacting as far as the mix takes it") {
					return true
				}
			}
			return false
		}
		if r := ask(t, a, "mix 200 L sulfuric acid 20 % + 20 kg aluminium at 20 C"); !has(r) {
			t.Errorf("aluminium by mass: no line on its form in %q", r.ReadAs)
		}
		if r := ask(t, a, "mix 200 L sulfuric acid 20 % + 20 kg aluminium turnings"); has(r) {
			t.Errorf("aluminium turnings: form line although the form is named")
		}
	})

	t.Run("oleum into water names the acid mist", func(t *testing.T) {
		// Oleum is let down into 96–98 % acid, never into water: the SO3
		// gives a sulfuric acid mist (Perry's Handbook, oleum, from
		// memory; common practice, no source).
		r := ask(t, a, "pour 100 L oleum 20 % into 500 L water")
		if _, ok := hazardOf(r, "oleum-mist"); !ok {
			t.Errorf("oleum into water: no oleum-mist hazard")
		}
		r = ask(t, a, "pour 100 L oleum 20 % into 500 L sulfuric acid 96 %")
		if _, ok := hazardOf(r, "oleum-mist"); ok {
			t.Errorf("oleum let down into strong acid: oleum-mist, want none")
		}
	})
}
