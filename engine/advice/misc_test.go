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
		{"mix 100 L HCHO 37 % + 100 L NaOH 50 %", "formaldehyde-caustic-heat", 80e3, 95e3, true},
		{"mix 100 L HCHO 37 % + 100 L NaOCl 12.5 %", "formaldehyde-oxidation", 70e3, 85e3, true},
		{"mix 100 L acetone + 100 L NaOCl 12.5 %", "chloroform-formation", 30e3, 37e3, false},
		{"mix 100 L CrO3 250 g/L + 10 L ethanol", "oxidizer-organic-fire", 60e3, 80e3, true},
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
