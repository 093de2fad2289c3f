package advice_test

import (
	"math"
	"strings"
	"testing"

	"mixward/engine"
)

// TestReview22Cyan holds cyanide pours a plant-chemist review would not
// sign, with the hand figure and its source beside each.
func TestReview22Cyan(t *testing.T) {
	a := mustAdvisor(t)

	// Hydrogen cyanide in water hydrolyses only slowly, through formamide,
	// to formic acid or formate and ammonium, never to carbon monoxide;
	// carbon monoxide comes off formic or oxalic acid only in hot
	// concentrated sulfuric acid (Greenwood & Earnshaw, Chemistry of the
	// Elements, carbon, from memory). Hexacyanoferrates give hydrogen
	// cyanide with strong acid, faster hot (safety data sheets, EUH032;
	// Vogel's Textbook of Macro and Semimicro Qualitative Inorganic
	// Analysis, hexacyanoferrates with acid; from memory).
	//
	// Hand figures (1.00 g/mL assumed by the answer for 10 %): 50 L of
	// 10 % K3Fe(CN)6 (329.24 g/mol) is 15.19 mol, 91.1 mol cyanide; 50 L of
	// 10 % K4Fe(CN)6 (368.35 g/mol) is 13.57 mol, 81.4 mol cyanide. The
	// carbon-monoxide path gave 10,400 kJ (CO 91 mol); without it the heat
	// is that of diluting the 32 % acid (about 4,400 kJ) and freeing the
	// acid, well below 7,000 kJ.
	for _, tc := range []struct {
		name, req string
		cn        float64
	}{
		{"ferricyanide", "mix 50 L potassium ferricyanide 10 % + 50 L HCl 32 % at 60 C", 91.1},
		{"ferrocyanide", "mix 50 L potassium ferrocyanide 10 % + 50 L HCl 32 % at 60 C", 81.4},
		// Free cyanide in hot acid too: 10 L of 5 % NaCN (49.01 g/mol,
		// 1.00 g/mL taken) is 10.2 mol.
		{"sodium cyanide", "mix 10 L sodium cyanide 5 % + 10 L HCl 10 % at 80 C", 10.2},
	} {
		t.Run("hot acid frees HCN from "+tc.name+", no carbon monoxide", func(t *testing.T) {
			r := ask(t, a, tc.req)
			if r.Decision == nil || r.Decision.Level != engine.DoNotMix {
				t.Fatalf("decision %+v, want do-not-mix", r.Decision)
			}
			if h, ok := hazardOf(r, "hcn-release"); !ok || h.Severity != engine.Danger {
				t.Errorf("hcn-release %+v (ok %v), want a danger; hazards %v", h, ok, codesOf(r))
			}
			if _, ok := hazardOf(r, "co-release"); ok {
				t.Errorf("co-release raised: carbon monoxide does not form from cyanide in water")
			}
			if n := finalMol(r, "CO", "CO(g)"); n > 1e-6 {
				t.Errorf("carbon monoxide %.3g mol, want none", n)
			}
			if n := gasMolOf(r, "CO"); n > 1e-6 {
				t.Errorf("carbon monoxide gas %.3g mol, want none", n)
			}
			if n := finalMol(r, "NH4+", "NH3"); n > 0.01 {
				t.Errorf("ammonium %.3g mol, want none (the cyanide stays hydrogen cyanide)", n)
			}
			if n := finalMol(r, "HCN", "HCN(g)"); n < 0.9*tc.cn || n > 1.05*tc.cn {
				t.Errorf("hydrogen cyanide %.3g mol, want about %.3g (all the cyanide)", n, tc.cn)
			}
			if r.Heat == nil || r.Heat.HeatReleasedkJ == nil || *r.Heat.HeatReleasedkJ > 7000 {
				t.Errorf("heat %+v, want below 7,000 kJ (not the carbon monoxide path)", r.Heat)
			}
		})
	}

	// Cold acid: the state holds the hexacyanoferrate (hexacyanoferrate-
	// inert lock), and the acidification is judged by the rule: a warning
	// in dilute acid, a danger in strong acid (5.1 mol/L H+ from 50 L of
	// 32 % HCl, 1.16 g/mL, into 100 L: 50·1.16·0.32/36.46 = 509 mol).
	for _, tc := range []struct {
		req   string
		sev   engine.Severity
		level engine.Level
	}{
		{"mix 50 L potassium ferricyanide 10 % + 50 L HCl 5 %", engine.Warning, engine.WithPrecautions},
		{"mix 50 L potassium ferrocyanide 10 % + 50 L HCl 1 %", engine.Warning, engine.WithPrecautions},
		{"mix 50 L potassium ferricyanide 10 % + 50 L HCl 32 %", engine.Danger, engine.DoNotMix},
	} {
		t.Run("cold "+tc.req, func(t *testing.T) {
			r := ask(t, a, tc.req)
			h, ok := hazardOf(r, "cyanide-complex-acid")
			if !ok || h.Severity != tc.sev || !strings.Contains(h.Title, "hydrogen cyanide") {
				t.Fatalf("cyanide-complex-acid %+v (ok %v), want %s naming hydrogen cyanide; hazards %v", h, ok, tc.sev, codesOf(r))
			}
			if r.Decision.Level != tc.level {
				t.Errorf("decision %s, want %s", r.Decision.Level, tc.level)
			}
			if n := finalMol(r, "CO", "CO(g)"); n > 1e-6 {
				t.Errorf("carbon monoxide %.3g mol, want none", n)
			}
		})
	}

	// Dicyanoaurate breaks down in acid below about pH 3 to gold(I)
	// cyanide and hydrogen cyanide, slowly cold, fast hot; acid gold baths
	// run at pH 3.5–5 for that reason (common practice, no source;
	// potassium dicyanoaurate safety data sheets, EUH032, from memory).
	// 10 L of 1 % KAu(CN)2 (288.1 g/mol, 1.00 g/mL) is 0.347 mol: up to
	// 0.347 mol HCN, one per gold (Au(CN)2- + H+ → AuCN(s) + HCN).
	for _, tc := range []struct {
		req   string
		sev   engine.Severity
		level engine.Level
		hcn   float64 // mol HCN the acid can free, one per gold
	}{
		// Cold, but 0.347 mol HCN would bring a small room (25 m³) to
		// about 340 ppm, past the IDLH of 50 ppm (NIOSH Pocket Guide,
		// from memory): a danger, as the action ("do not acidify") says.
		{"mix 10 L potassium gold cyanide 1 % + 10 L sulfuric acid 20 %", engine.Danger, engine.DoNotMix, 0.347},
		// A drip of gold bath into an acid rinse: a trace, a warning.
		{"mix 200 L sulfuric acid 2 % + 20 mL potassium gold cyanide 1 %", engine.Warning, engine.WithPrecautions, 0.000694},
		{"mix 10 L potassium gold cyanide 1 % + 10 L sulfuric acid 20 % at 60 C", engine.Danger, engine.DoNotMix, 0.347},
		{"mix 10 L potassium gold cyanide 1 % + 10 L HCl 32 %", engine.Danger, engine.DoNotMix, 0.347},
	} {
		t.Run("gold cyanide "+tc.req, func(t *testing.T) {
			r := ask(t, a, tc.req)
			h, ok := hazardOf(r, "cyanide-complex-acid")
			if !ok || h.Severity != tc.sev {
				t.Fatalf("cyanide-complex-acid %+v (ok %v), want %s; hazards %v", h, ok, tc.sev, codesOf(r))
			}
			if r.Decision.Level != tc.level {
				t.Errorf("decision %s, want %s", r.Decision.Level, tc.level)
			}
			found := false
			for _, c := range h.Counts {
				if c.Formula == "HCN" {
					found = true
					if math.Abs(c.Mol-tc.hcn)/tc.hcn > 0.05 {
						t.Errorf("HCN up to %.3g mol, want about %.3g", c.Mol, tc.hcn)
					}
				}
			}
			if !found {
				t.Errorf("no HCN count on %+v", h)
			}
		})
	}

	// Every cyanide compound the tables know, into strong acid: at least a
	// warning that names hydrogen cyanide (silver, copper, zinc, nickel and
	// cadmium cyanide complexes are weak-acid dissociable, their cyanide
	// freed at pH 4.5: Standard Methods 4500-CN I, from memory; the state
	// shows that hydrogen cyanide itself).
	for _, req := range []string{
		"mix 10 L KAg(CN)2 1 % + 10 L sulfuric acid 20 %",
		"mix 10 L zinc cyanide 1 %, sodium cyanide 2 % + 10 L sulfuric acid 20 %",
		"mix 10 L copper cyanide 2 %, sodium cyanide 3 % + 10 L sulfuric acid 20 %",
		"mix 10 L nickel sulfate 2 %, sodium cyanide 3 % + 10 L sulfuric acid 20 %",
		"mix 10 L cadmium sulfate 2 %, sodium cyanide 3 % + 10 L sulfuric acid 20 %",
		"mix 10 L potassium gold cyanide 1 % + 10 L sulfuric acid 20 %",
		"mix 10 L potassium ferrocyanide 1 % + 10 L sulfuric acid 20 %",
	} {
		t.Run("strong acid "+req, func(t *testing.T) {
			r := ask(t, a, req)
			if r.Decision.Level == engine.NoConcern {
				t.Fatalf("no concern; hazards %v", codesOf(r))
			}
			_, hcn := hazardOf(r, "hcn-release")
			_, cx := hazardOf(r, "cyanide-complex-acid")
			if !hcn && !cx {
				t.Errorf("neither hcn-release nor cyanide-complex-acid: %v", codesOf(r))
			}
			if !strings.Contains(r.Decision.Title, "hydrogen cyanide") {
				t.Errorf("decision %q does not name hydrogen cyanide", r.Decision.Title)
			}
		})
	}

	// An alkaline copper cyanide bath dosed with less hypochlorite than its
	// cyanide: 500 L of 6 % CuCN (89.56 g/mol, 335 mol) and 4 % NaCN
	// (49.01 g/mol, 408 mol), 743 mol cyanide in all, against 100 L of
	// 12.5 % NaOCl (about 200 mol): cyanide in 3.7-fold excess. Hypochlorite
	// takes cyanide to cyanate and the copper stays copper(I) cyanide or a
	// cyanocuprate; the chlorocuprate CuCl2- exists only in strong acid
	// chloride liquors (Greenwood & Earnshaw, Chemistry of the Elements,
	// copper(I) halide complexes, from memory; copper cyanide with
	// hypochlorite: common practice, no source).
	for _, req := range []string{
		"mix 500 L copper cyanide 6 %, sodium cyanide 4 % + 100 L NaOCl 12.5 %",
		"mix 500 L copper cyanide 6 %, sodium cyanide 4 % + 20 L NaOCl 12.5 %",
		"mix 500 L copper cyanide 3 %, sodium cyanide 4 %, NaOH 1 % + 100 L NaOCl 12.5 %",
	} {
		t.Run("copper stays a cyanide "+req, func(t *testing.T) {
			r := ask(t, a, req)
			if r.Reaction == nil {
				t.Fatalf("no headline reaction")
			}
			if strings.Contains(r.Reaction.Text, "CuCl") {
				t.Errorf("headline %q: copper written as a chloro complex in an alkaline cyanide bath", r.Reaction.Text)
			}
			if !strings.Contains(r.Reaction.Text, "OCN-") || !strings.Contains(r.Reaction.Text, "OCl-") {
				t.Errorf("headline %q, want hypochlorite taking cyanide to cyanate", r.Reaction.Text)
			}
			if n := finalMol(r, "CuCl2-", "CuCl(s)"); n > 0.01 {
				t.Errorf("copper(I) chloride %.3g mol in the mixed state, want none", n)
			}
		})
	}
}
