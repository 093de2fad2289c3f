package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
	"mixward/engine/advice"
)

// TestReview22Reduce holds reducers, metals and oxidizers with organics that
// a plant-chemist review would not sign, with the hand figure and its source
// beside each. Tank contents are those of the invented Harrowgate Finishing
// Works.
func TestReview22Reduce(t *testing.T) {
	a := mustAdvisor(t)

	t.Run("borohydride does not take sulfite to sulfide", func(t *testing.T) {
		// Stabilised borohydride liquor (12 % NaBH4 in 40 % caustic)
		// into 38 % bisulfite: in the caustic the bisulfite is only
		// neutralised (HSO3- + OH- → SO3^2- + H2O); borohydride reduces
		// sulfur(IV) only as bisulfite at about pH 5–7, and then to
		// dithionite, never to sulfide (BH4- + 8 HSO3- → 4 S2O4^2- +
		// B(OH)4- + 4 H2O; Kirk-Othmer Encyclopedia of Chemical
		// Technology, dithionites, from memory).
		r := ask(t, a, "mix 200 L sodium borohydride 12 %, NaOH 40 % + 200 L sodium bisulfite 38 % at 10 C")
		if n := finalMol(r, "S^2-", "HS-", "H2S"); n > 0.1 {
			t.Errorf("caustic borohydride with bisulfite: sulfide %.1f mol, want none", n)
		}
		if n := finalMol(r, "S2O4^2-", "HS2O4-"); n > 0.1 {
			t.Errorf("caustic borohydride with bisulfite: dithionite %.1f mol, want none in caustic", n)
		}
		// 200 L × 1.30 kg/L × 0.38 / 104.06 = 950 mol bisulfite (density
		// of 38 % bisulfite liquor about 1.30, from memory): all of it
		// sulfite in the caustic.
		if n := finalMol(r, "SO3^2-"); n < 850 || n > 1050 {
			t.Errorf("sulfite %.0f mol, want about 950 (only neutralised)", n)
		}
		// Excess bisulfite (pH about 6 as combined): dithionite, not
		// sulfide (the dithionite process, source as above).
		r = ask(t, a, "mix 20 L sodium borohydride 12 %, NaOH 40 % + 200 L sodium bisulfite 38 %")
		if n := finalMol(r, "S^2-", "HS-", "H2S"); n > 0.1 {
			t.Errorf("borohydride into excess bisulfite: sulfide %.1f mol, want none", n)
		}
		if n := finalMol(r, "S2O4^2-", "HS2O4-"); n < 50 {
			t.Errorf("borohydride into excess bisulfite: dithionite %.1f mol, want some (the borohydride process)", n)
		}
	})

	t.Run("borohydride in acid goes to hydrogen, all of it", func(t *testing.T) {
		// 5 kg NaBH4 = 132 mol; 10 L of 10 % sulfuric acid (1.066 kg/L)
		// hold 10.9 mol H2SO4, 21.7 mol H+. The acid takes 21.7 mol
		// borohydride at once; the boric acid it makes buffers the rest
		// near pH 9, where the half-life is minutes (log t½ in minutes =
		// pH − (0.034 T − 1.92); Kreevoy and Jacobson 1979, from memory),
		// so all 132 mol go: 4 × 132 = 528 mol H2 (BH4- + H+ + 3 H2O →
		// H3BO3 + 4 H2), not the 87 mol the acid alone reaches.
		r := ask(t, a, "mix 5 kg sodium borohydride + 10 L sulfuric acid 10 %")
		if n := judgedGas(r, "H2"); n < 450 || n > 560 {
			t.Errorf("H2 %.0f mol, want about 528", n)
		}
		// The heat of dissolving has no figure with so little water, but
		// the reaction alone (about 250 kJ per mol borohydride from ΔfH°,
		// NBS Tables 1982, from memory: 33 MJ) boils the 10 L.
		if r.Heat == nil || !strings.Contains(r.Heat.Withheld, "enough to boil") {
			t.Errorf("heat %+v, want the reaction heat named as boiling the mix", r.Heat)
		}
		// Caustic-stabilised liquor keeps (t½ weeks at pH 13–14, same
		// source): diluted with water it gives no hydrogen.
		r = ask(t, a, "mix 100 L sodium borohydride 12 %, NaOH 40 % + 100 L water")
		if n := judgedGas(r, "H2"); n > 0.1 {
			t.Errorf("stabilised borohydride with water: H2 %.1f mol, want none", n)
		}
	})

	t.Run("dilute permanganate with glycerol reacts", func(t *testing.T) {
		// 100 L of 3 % permanganate (0.19 mol/L, 19 mol) with 100 L
		// glycerol: permanganate oxidizes glycerol in the cold, warming the
		// mix and leaving manganese dioxide sludge (Vogel's Textbook of
		// Practical Organic Chemistry, oxidation of glycerol, from
		// memory): with precautions, not no concern and not a fire.
		r := ask(t, a, "mix 100 L potassium permanganate 3 % + 100 L glycerol")
		if r.Decision == nil || r.Decision.Level != engine.WithPrecautions {
			t.Errorf("permanganate 3 %% with glycerol: %+v, want with precautions", r.Decision)
		}
		if !hasCode(r, "oxidizer-organic-heat") {
			t.Errorf("permanganate 3 %% with glycerol: no oxidizer-organic-heat hazard")
		}
	})

	t.Run("dry oxidizer-fuel blends say so on the redox line", func(t *testing.T) {
		// Persulfate with hypophosphite, chlorate with sugar: classic
		// oxidizer–fuel blends (Bretherick's Handbook of Reactive Chemical
		// Hazards, sodium chlorate with organic matter, peroxodisulfates
		// with reducing agents, from memory).
		for _, req := range []string{
			"mix 20 kg sodium persulfate + 5 kg sodium hypophosphite",
			"mix 10 kg sodium chlorate + 10 kg sucrose",
		} {
			r := ask(t, a, req)
			text := advice.RenderShort(r)
			if strings.Contains(text, "no oxidizing and reducing agent pair") || !strings.Contains(text, "oxidizer–fuel dry blend") {
				t.Errorf("%s: redox line does not name the dry blend:\n%s", req, text)
			}
		}
	})

	t.Run("excess dithionite in acid gives sulfur dioxide", func(t *testing.T) {
		// 300 L of 1 % dichromate (10.3 mol, 61.8 mol of electrons) with
		// 20 L of 30 % sulfuric acid and 10 kg dithionite (57.4 mol):
		// the dithionite beyond the chromium(VI) breaks down in the acid
		// into thiosulfate and bisulfite, then sulfur and sulfur dioxide
		// (2 S2O4^2- + H2O → S2O3^2- + 2 HSO3-; S2O3^2- + 2 H+ → S + SO2
		// + H2O; Bretherick's Handbook of Reactive Chemical Hazards,
		// sodium dithionite, from memory): sulfur dioxide over the mix
		// (hand about 0.16 atm), no tetrathionate, no thiosulfate left.
		r := ask(t, a, "mix 300 L potassium dichromate 1 % + 20 L sulfuric acid 30 % + 10 kg sodium dithionite")
		if n := judgedGas(r, "SO2"); n < 0.1 {
			t.Errorf("SO2 %.3f mol in the final mix, want some (excess dithionite in acid)", n)
		}
		if n := finalMol(r, "S4O6^2-"); n > 0.1 {
			t.Errorf("tetrathionate %.1f mol, want none from dithionite", n)
		}
	})

	t.Run("titanium in HF-HNO3 goes to titanium(IV)", func(t *testing.T) {
		// 2 kg titanium (41.8 mol) in an HF–HNO3 pickle dissolves as
		// titanium(IV), four electrons per titanium: 41.8 × 4 / 3 = 55.7
		// mol NO (Greenwood & Earnshaw, Chemistry of the Elements,
		// titanium, from memory), not Ti^2+.
		r := ask(t, a, "mix 200 L ammonium bifluoride 10 % + 50 L nitric acid 40 % + 2 kg titanium")
		if n := finalMol(r, "Ti^2+"); n > 0.1 {
			t.Errorf("Ti^2+ %.1f mol in nitric acid, want none", n)
		}
		if n := judgedGas(r, "NO"); n < 48 || n > 62 {
			t.Errorf("NO %.1f mol, want about 56", n)
		}
	})

	t.Run("ceric ammonium nitrate oxidizes ethanol in solution", func(t *testing.T) {
		// Cerium(IV) stays in solution as its nitrato complex and
		// oxidizes ethanol in the cold (Greenwood & Earnshaw, cerium(IV),
		// from memory); the nitrate of a neutral salt does not attack
		// ethanol at 25 °C (common practice, no source). 200 L of 20 %
		// CAN hold about 73 mol Ce(IV): heat of the order of 9 MJ (NBS
		// Tables 1982, from memory).
		r := ask(t, a, "mix 200 L ceric ammonium nitrate 20 % + 20 L ethanol")
		if n := finalMol(r, "CeO2(s)") + combinedMol(r, "CeO2(s)"); n > 0.1 {
			t.Errorf("CeO2(s) %.1f mol, want cerium(IV) in solution", n)
		}
		if n := finalMol(r, "Ce^3+"); n < 60 {
			t.Errorf("Ce^3+ %.1f mol, want about 73 (ethanol oxidized by cerium(IV))", n)
		}
		if n := judgedGas(r, "NO2"); n > 1 {
			t.Errorf("NO2 %.1f mol, want none (nitrate not the oxidizer)", n)
		}
		if r.Heat == nil || r.Heat.HeatReleasedkJ == nil || *r.Heat.HeatReleasedkJ < 4000 {
			t.Errorf("heat %+v, want several MJ", r.Heat)
		}
	})
}
