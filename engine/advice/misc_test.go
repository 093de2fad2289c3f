package advice_test

import (
	"math"
	"strings"
	"testing"

	"mixward/engine"
	"mixward/engine/advice"
)

// TestMiscPours checks the decision and the hazard codes of pours whose
// chemistry was missing: each case names its source.
func TestMiscPours(t *testing.T) {
	a := mustAdvisor(t)
	for _, tc := range []struct {
		name, req string
		level     engine.Level
		want      []string // codes that must be raised
		never     []string // codes that must not appear, in the mix or along the pour
	}{
		{
			// Two concentrated acids give little heat (the whole mix 28 kJ;
			// NBS Tables 1982, heat of mixing small): no landing warning.
			name: "two concentrated acids", req: "mix 100 L HNO3 60 % + 100 L H3PO4 75 %",
			level: engine.NoConcern, never: []string{"scalding-heat", "boils"},
		},
		{
			// 2 HBr + H2SO4 → Br2 + SO2 + 2 H2O (Vogel, bromides with
			// concentrated sulfuric acid).
			name: "bromide with concentrated sulfuric", req: "mix 100 L NaBr 40 % + 100 L H2SO4 98 %",
			level: engine.DoNotMix, want: []string{"halogen-fumes"},
		},
		{
			// Iodide goes on to I2, SO2 and H2S (Vogel, iodides).
			name: "iodide with concentrated sulfuric", req: "mix 10 L KI 10 % + 10 L H2SO4 98 %",
			level: engine.DoNotMix, want: []string{"halogen-fumes"},
		},
		{
			// 3 HClO3 → 2 ClO2 + HClO4 + H2O in concentrated sulfuric acid
			// (Bretherick's Handbook, sodium chlorate: sulfuric acid, from
			// memory); dilute acid leaves chlorate alone above pH 3.
			name: "chlorate with concentrated sulfuric", req: "mix 100 L NaClO3 40 % + 100 L H2SO4 98 %",
			level: engine.DoNotMix, want: []string{"clo2-release"},
		},
		{
			name: "chlorate with dilute sulfuric", req: "mix 100 L NaClO3 10 % + 100 L H2SO4 1 %",
			level: engine.NoConcern, never: []string{"clo2-release"},
		},
		{
			// Borohydride's half-life at 25 °C is about two months at pH 10
			// (log t½ in days = pH − (0.034 T − 1.92): Kreevoy and Jacobson
			// 1979, from memory): its caustic concentrate goes into the
			// water like any caustic, never water onto it (common practice).
			name: "borohydride concentrate into water", req: "mix 10 L NaBH4 12 %, NaOH 40 % + 100 L water",
			level: engine.WithPrecautions, never: []string{"hydrogen-release"},
		},
		{
			// Dilute sulfuric acid does not oxidize bromide (Vogel).
			name: "bromide with dilute sulfuric", req: "mix 100 L NaBr 10 % + 100 L H2SO4 10 %",
			level: engine.NoConcern, never: []string{"halogen-fumes"},
		},
		{
			// Alkaline chlorination of a silver cyanide rinse: the labile
			// complex is oxidized as free cyanide is (common practice, no
			// source); a controlled step at pH 10.5 or more.
			name: "silver cyanide rinse with bleach", req: "mix 100 L KAg(CN)2 0.2 M, NaOH 1 % + 100 L NaOCl 12.5 %",
			level: engine.WithPrecautions, want: []string{"cyanide-oxidation"},
		},
		{
			// Neat bromine (named without a strength: 10 L × 3.12 kg/L =
			// 195 mol) into caustic: Br2 + 2 OH- → Br- + OBr- + H2O,
			// about −41 kJ/mol (NBS Tables 1982, from memory), some 8 MJ;
			// never "no concern" for neat bromine (NIOSH Pocket Guide,
			// bromine: IDLH 3 ppm; Bretherick's Handbook, bromine: alkalis,
			// from memory).
			name: "neat bromine into caustic", req: "mix 10 L Br2 + 100 L NaOH 20 %",
			level: engine.WithPrecautions, want: []string{"warms"},
		},
		{
			// Neat hydrazine (5 L × 1.004 kg/L = 157 mol) with 198 mol
			// hypochlorite: 2 OCl- + N2H4 → N2 + 2 Cl- + 2 H2O on 99 mol,
			// about −726 kJ each (NBS Tables 1982, from memory), 72 MJ in
			// 105 L: it boils (Bretherick's Handbook, hydrazine:
			// hypochlorites, from memory).
			name: "neat hydrazine with bleach", req: "mix 5 L N2H4 + 100 L NaOCl 12.5 %",
			level: engine.DoNotMix, want: []string{"boils"},
		},
		{
			// 1 L of neat bromine (19.5 mol) over water: its vapour, at
			// the precautions of bromine itself.
			name: "neat bromine into water", req: "mix 1 L Br2 + 100 L water",
			level: engine.WithPrecautions, want: []string{"bromine-release"},
		},
		{
			// Lye dosed by weight: 1 t of 50 % NaOH is 656 L of it; the
			// heat is that of diluting it (≈ 20 kJ/mol, NBS Tables 1982),
			// not of dissolving 12,500 mol of solid NaOH (44.5 kJ/mol).
			name: "lye by weight into water", req: "mix 1 t NaOH 50 % + 5 m3 water",
			level: engine.WithPrecautions, want: []string{"warms"},
		},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r := ask(t, a, tc.req)
			if r.Decision == nil || r.Decision.Level != tc.level {
				t.Fatalf("decision %+v, want %s", r.Decision, tc.level)
			}
			codes := map[string]bool{}
			for _, h := range r.Hazards {
				codes[h.Code] = true
			}
			for _, o := range r.Addition.Orders {
				for _, h := range o.Hazards {
					codes[h.Code] = true
				}
			}
			for _, c := range tc.want {
				if !codes[c] {
					t.Errorf("no %s among %v", c, codes)
				}
			}
			for _, c := range tc.never {
				if codes[c] {
					t.Errorf("%s raised: %v", c, codes)
				}
			}
		})
	}
}

// TestSilverCyanideOxidized: the equation of the silver cyanide rinse is
// hypochlorite taking the complexed cyanide to cyanate, silver to the
// chloride (NBS Tables 1982 ΔfG° of Ag(CN)2-, OCN-, AgCl: ΔG about
// -670 kJ per mol of complex; from memory).
func TestSilverCyanideOxidized(t *testing.T) {
	r := ask(t, mustAdvisor(t), "mix 100 L KAg(CN)2 0.2 M, NaOH 1 % + 100 L NaOCl 12.5 %")
	if r.Reaction == nil || !strings.Contains(r.Reaction.Text, "Ag(CN)2-") || !strings.Contains(r.Reaction.Text, "OCN-") || !r.Spontaneous {
		t.Errorf("reaction %+v, want Ag(CN)2- oxidized to OCN-", r.Reaction)
	}
}

// TestFamilyHeatCounted: a reaction judged as a family (the equilibrium
// state does not run it) adds its heat, from its stoichiometry and reaction
// enthalpy limited by the reagent that runs out first, to the decision's
// heat, so the Heat line agrees with the reason. Hand checks (NBS Tables
// 1982 ΔfH°, from memory; the formaldehyde, acetone and hexamine values are
// in engine/hazard/familyheat.go):
//   - Cannizzaro −141.5 kJ per 2 HCHO: 1232 mol HCHO (37 kg in 100 L read
//     at 1.00 g/mL) → 616 × 141.5 = 87.2 MJ, boils.
//   - HCHO + OCl- + OH-: −391.5 kJ, 198 mol OCl- → 77.5 MJ, boils.
//   - haloform −501 kJ per acetone, 198 mol OCl- / 3 → 33 MJ.
//   - chromic acid with ethanol, Thornton's rule 104.5 kJ per electron,
//     163 mol ethanol × 4 e (fewer than 250 mol Cr × 3 e) → 68 MJ, boils.
//   - nitric acid with ethanol to acetic acid and NO2: −92.8 kJ per
//     ethanol × 163 mol → 15 MJ.
//
// A neutralisation names no family and adds nothing.
func TestFamilyHeatCounted(t *testing.T) {
	a := mustAdvisor(t)
	cases := []struct {
		req      string
		code     string
		min, max float64 // kJ of the family reaction
		boils    bool
	}{
		{"mix 100 L HCHO 37 % + 100 L NaOH 50 %", "formaldehyde-caustic-heat", 85e3, 105e3, true}, // 37 % formalin at 1.09 kg/L
		{"mix 100 L HCHO 37 % + 100 L NaOCl 12.5 %", "formaldehyde-oxidation", 70e3, 85e3, true},
		{"mix 100 L acetone + 100 L NaOCl 12.5 %", "chloroform-formation", 30e3, 37e3, false},
		// 100 L of 12.5 % hypochlorite (about 200 mol, 400 mol of
		// electrons) with 10 L of methanol (247 mol, 988): 400 × 134.5 kJ,
		// Thornton's rule 104.5 (from memory) and 30 more per electron for
		// hypochlorite's reduction (OCl- + 2 H+ + 2 e- → Cl- + H2O, 172.9 kJ
		// per electron) against oxygen's (142.9), ΔfH° NBS Tables 1982, from
		// memory.
		{"mix 100 L NaOCl 12.5 % + 10 L methanol", "oxidizer-organic-fire", 49e3, 58e3, true},
		{"mix 100 L HNO3 68 % + 10 L ethanol", "nitric-organic-runaway", 12e3, 18e3, false},
		{"mix 100 L HCHO 37 % + 100 L ammonia 25 %", "formaldehyde-ammonia-heat", 40e3, 120e3, true},
		{"mix 100 L NaOH 10 % + 100 L HCl 10 %", "", 0, 0, false},
	}
	for _, tc := range cases {
		r := ask(t, a, tc.req)
		h := r.Decision.Heat
		if h == nil {
			t.Errorf("%s: no heat", tc.req)
			continue
		}
		got := 0.0
		for _, x := range h.Reactions {
			if x.Code == tc.code && x.Counted {
				got += x.ReleasedkJ
			}
		}
		if tc.code == "" {
			if len(h.Reactions) > 0 {
				t.Errorf("%s: family heat %+v, want none", tc.req, h.Reactions)
			}
			continue
		}
		if got < tc.min || got > tc.max {
			t.Errorf("%s: %s heat %.0f kJ, want %.0f–%.0f", tc.req, tc.code, got, tc.min, tc.max)
		}
		if h.StatekJ == nil || math.Abs(h.ReleasedkJ-*h.StatekJ-got) > 1 {
			t.Errorf("%s: released %.0f kJ is not the state's %v plus the family's %.0f", tc.req, h.ReleasedkJ, h.StatekJ, got)
		}
		if h.Boils != tc.boils {
			t.Errorf("%s: boils %v, want %v", tc.req, h.Boils, tc.boils)
		}
		if sh := advice.RenderShort(r); !strings.Contains(sh, "kJ of it from") {
			t.Errorf("%s: the Heat line does not name the family's part:\n%s", tc.req, sh)
		}
	}
}

// TestAcidDichromateOxidizesAlcohols: dichromate in strong acid (chromic
// acid, or dichromate with sulfuric acid below about pH 1) oxidizes
// alcohols and glycols within minutes in the cold (Vogel's Textbook of
// Practical Organic Chemistry, oxidation of alcohols, from memory): the
// mixed state runs it, to the usual products (ethanol to acetic acid,
// isopropanol to acetone; never propane, oxalic or glycolic acid from
// them), and its heat is the state's. Hand check for the chromic acid
// bath: 25 kg CrO3 (250 mol, 750 mol of electrons) with 10 L of ethanol
// (171 mol, 685 mol of electrons to acetic acid): about 685 × 104.5 kJ =
// 72 MJ by Thornton's rule (from memory), and 110 L boil.
func TestAcidDichromateOxidizesAlcohols(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 100 L CrO3 250 g/L + 10 L ethanol")
	if h := r.Decision.Heat; h == nil || h.ReleasedkJ < 60e3 || h.ReleasedkJ > 85e3 || !h.Boils {
		t.Errorf("chromic acid with ethanol: heat %+v, want 60–85 MJ counted and boiling", h)
	}
	for _, tc := range []struct{ req, want string }{
		{"mix 100 L sodium dichromate 10 %, H2SO4 20 % + 2 L ethanol", "CH3COOH"},
		{"mix 200 L chromic acid 250 g/L + 20 L isopropanol", "CH3COCH3"},
		{"mix 100 L sodium dichromate 10 %, H2SO4 20 % + 2 L ethylene glycol", "CO2"},
	} {
		r := ask(t, a, tc.req)
		short := advice.RenderShort(r)
		if !strings.Contains(short, "Redox: ") || !strings.Contains(short, tc.want) || strings.Contains(short, "held back") {
			t.Errorf("%s: want the oxidation to %s running:\n%s", tc.req, tc.want, short)
		}
		for _, bad := range []string{"C3H8", "H2C2O4", "HOCH2COOH"} {
			if strings.Contains(short, bad) && tc.want != "CO2" {
				t.Errorf("%s: forms %s:\n%s", tc.req, bad, short)
			}
		}
	}
	// Dilute chromic acid rinse above pH 1 keeps the alcohol (slow).
	r = ask(t, a, "mix 1000 L chromic acid 1 g/L, pH 2.5 + 1 L ethanol")
	if r.Decision.Level == engine.DoNotMix {
		t.Errorf("a dilute chromic rinse at pH 2.5 with a litre of ethanol: do-not-mix, want the slow oxidation held back")
	}
}

// TestGlycolsAnswered: ethylene and propylene glycol have species rows
// (estimated from their liquids, data/species.txt), so a coolant make-up
// is answered, not withheld, and permanganate takes propylene glycol's
// primary alcohol group to lactate (as ethylene glycol's to glycolate),
// never to glycerol: oxidizing agents do not add hydroxyl groups to a
// methyl group (Vogel's Textbook of Practical Organic Chemistry, from
// memory).
func TestGlycolsAnswered(t *testing.T) {
	a := mustAdvisor(t)
	for _, req := range []string{"mix 500 L water + 100 L propylene glycol", "mix 500 L water + 100 L ethylene glycol"} {
		r, err := askErr(a, req)
		if err != nil {
			t.Fatalf("%s: %v, want an answer", req, err)
		}
		if r.Decision.Level != engine.NoConcern {
			t.Errorf("%s: level %v, want no concern", req, r.Decision.Level)
		}
	}
	short := advice.RenderShort(ask(t, a, "mix 100 L KMnO4 5 % + 10 L propylene glycol"))
	if strings.Contains(short, "C3H5(OH)3") || !strings.Contains(short, "CH3CH(OH)COO-") {
		t.Errorf("permanganate with propylene glycol: want lactate, no glycerol:\n%s", short)
	}
}
