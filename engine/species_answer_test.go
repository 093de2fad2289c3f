package engine_test

import (
	"strings"
	"testing"

	"mixward/engine"
)

// TestCyanideBoundByIron: iron(II) binds cyanide as ferrocyanide, log β6
// 35 (Smith & Martell, Critical Stability Constants; from memory), and the
// free hydrogen cyanide is what is left. Hand check for 100 L NaCN 1 %, pH
// 11 + 100 L FeSO4 0.5 M: 1000 g / 49.0 g/mol = 20.4 mol cyanide gives
// 20.4 / 6 = 3.40 mol Fe(CN)6^4-; Fe^2+ left about 46.6 mol in 200 L =
// 0.233 mol/L, so [CN-]^6 = 0.017 / (1e35 × 0.233) and [CN-] ≈ 1e-6 mol/L;
// at pH about 6.2, HCN = CN- × 10^(9.21 − 6.2) ≈ 1e-3 mol/L (pKa 9.21, CRC
// Dissociation constants; from memory), about 0.2 mol in 200 L against the
// 20.4 mol of a mix without the complex.
func TestCyanideBoundByIron(t *testing.T) {
	checkOutcome(t, "mix 100 L NaCN 1 %, pH 11 + 100 L FeSO4 0.5 M", mixOutcome{
		atLeast: map[string]float64{"Fe(CN)6^4-": 3.3, "HCN|HCN(g)": 0.02},
		atMost:  map[string]float64{"HCN|HCN(g)|CN-": 0.5},
	})
}

// TestHexacyanoferrateHoldsCyanide: ferrocyanide gives hydrogen cyanide off
// dilute acid only when warmed (Vogel's Textbook of Macro and Semimicro
// Qualitative Inorganic Analysis, hexacyanoferrates; from memory), though
// by its stability constant (log β6 35 against 6 × pKa 9.21 = 55) it would
// fall apart in acid at equilibrium: the hexacyanoferrate-inert lock holds
// it, in the mix as combined too. A silver cyanide complex is no organic compound and does give HCN.
func TestHexacyanoferrateHoldsCyanide(t *testing.T) {
	checkOutcome(t, "mix 10 L K4Fe(CN)6 5 % + 10 L HCl 10 %", mixOutcome{
		atLeast: map[string]float64{"Fe(CN)6^4-": 1.1},
		atMost:  map[string]float64{"HCN|HCN(g)": 1e-3},
	})
	if r := ask(t, "mix 10 L K4Fe(CN)6 5 % + 10 L HCl 10 %"); len(r.Gases) > 0 {
		for _, g := range r.Gases {
			if g.Text == "HCN(g)" && g.Mol > 1e-3 {
				t.Errorf("ferrocyanide with cold dilute acid gives %.3g mol HCN(g)", g.Mol)
			}
		}
	}
	checkOutcome(t, "mix 10 L KAg(CN)2 5 % + 10 L HCl 10 %", mixOutcome{
		atLeast: map[string]float64{"HCN|HCN(g)": 1},
	})
}

// TestDiluteNitricWithZinc: zinc in very dilute nitric acid gives mainly
// ammonium nitrate, 4 Zn + 10 H+ + NO3- → 4 Zn2+ + NH4+ + 3 H2O (Vogel's
// Textbook of Macro and Semimicro Qualitative Inorganic Analysis, nitric
// acid with zinc; from memory); stronger acid gives nitric oxide. Hand
// check for 1 kg Zn + 100 L HNO3 2 %: 100 L × 1.009 kg/L × 0.02 / 63.01 =
// 32.0 mol HNO3 (density: CRC Handbook, Concentrative properties; from
// memory); 10 H+ per NH4+ gives 3.2 mol NH4+ from 12.8 mol zinc.
func TestDiluteNitricWithZinc(t *testing.T) {
	checkOutcome(t, "mix 1 kg Zn + 100 L HNO3 2 %", mixOutcome{
		atLeast: map[string]float64{"NH4+|NH3": 3.0, "Zn^2+": 12},
		atMost:  map[string]float64{"NO(g)|NO|NO2(g)|N2O(g)": 0.01},
		held:    []string{"nitric-dilute-ammonium"},
	})
	// 10 % nitric acid (1.6 mol/L) with zinc gives nitric oxide: the lock
	// stops at 1 mol/L.
	checkOutcome(t, "mix 100 g Zn + 10 L HNO3 10 %", mixOutcome{
		atLeast: map[string]float64{"NO(g)|NO": 0.5},
		notHeld: []string{"nitric-dilute-ammonium"},
	})
}

// TestMonochloramineBelowBreakpoint: below one hypochlorite per ammonium
// the mix holds monochloramine, NH4+ + OCl- → NH2Cl + H2O (White's Handbook
// of Chlorination, breakpoint curve; formation log K 10.6; from memory).
// Hand check: 100 L NaOCl 5 % at 1.07 kg/L holds 107 × 0.05 / 74.44 kg/kmol
// = 71.9 mol OCl- (density: CRC Handbook; from memory) against 100 mol
// NH4+: 71.9 mol NH2Cl, 28 mol NH4+ left (0.14 mol/L, pH about
// (9.25 − log 0.14) / 2 = 5.0), no nitrogen.
func TestMonochloramineBelowBreakpoint(t *testing.T) {
	req := "mix 100 L NaOCl 5 % + 100 L NH4Cl 1 M"
	checkOutcome(t, req, mixOutcome{
		atLeast: map[string]float64{"NH2Cl": 70, "NH4+": 25},
		atMost:  map[string]float64{"N2(g)|N2": 0.01, "HOCl|OCl-": 0.1},
		held:    []string{"nitrogen-gas"},
	})
	r := ask(t, req)
	if ph := r.Conditions.PHFinal; ph == nil || *ph < 4.5 || *ph > 7.5 {
		t.Errorf("%s: final pH %v, want about 5 (hand check above)", req, ph)
	}
}

// TestHeadlineAgentsInTheirField: the headline names the agents as they are
// in the mix, not as a solid or gas that exists only at the moment the
// streams meet, and the change that drives the others comes first.
// Sources: Vogel's Textbook of Macro and Semimicro Qualitative Inorganic
// Analysis (iron(III) with hydrogen sulfide; iron(II) with peroxide;
// sulfite with peroxide), from memory.
func TestHeadlineAgentsInTheirField(t *testing.T) {
	for _, c := range []struct {
		req, ox, red string
		has, hasNot  []string // formulas the headline equation must, and must not, hold
	}{
		// 2 Fe3+ + H2S → 2 Fe2+ + S + 2 H+ at pH 1.9 (no Fe(OH)3, no H2S(g))
		{"mix 100 L Na2S 5 % + 100 L FeCl3 40 %", "Fe^3+", "H2S", []string{"Fe^2+", "S(s)"}, []string{"Fe(OH)3(s)", "H2S(g)"}},
		// 2 Fe2+ + H2O2 + 2 H+ → 2 Fe3+ + 2 H2O before the peroxide's breakdown
		{"mix 100 L FeSO4 0.5 M + 10 L H2O2 35 %", "H2O2", "Fe^2+", []string{"Fe^3+"}, []string{"Fe(OH)3(s)", "O2(g)"}},
		// bisulfite oxidation heads, peroxide breakdown follows
		{"mix 100 L sodium metabisulfite 20 % + 100 L H2O2 35 %", "H2O2", "HSO3-", []string{"HSO4-"}, []string{"O2(g)"}},
		// ferric sulfate stays dissolved: MnO4- + 3 Fe2+ + 4 H+ → MnO2 + 3 Fe3+
		{"mix 100 L KMnO4 0.2 M + 100 L FeSO4 0.5 M", "MnO4-", "Fe^2+", []string{"Fe^3+", "MnO2(s)"}, []string{"Fe(OH)3(s)"}},
	} {
		t.Run(c.req, func(t *testing.T) {
			r := ask(t, c.req)
			if r.Oxidizer == nil || r.Reducer == nil || r.Reaction == nil {
				t.Fatalf("no headline pair")
			}
			if r.Oxidizer.Species != c.ox || r.Reducer.Species != c.red {
				t.Errorf("headline %s with %s, want %s with %s (%s)", r.Oxidizer.Species, r.Reducer.Species, c.ox, c.red, r.Reaction.Text)
			}
			for _, f := range c.has {
				if !strings.Contains(r.Reaction.Text, f) {
					t.Errorf("headline %q lacks %s", r.Reaction.Text, f)
				}
			}
			for _, f := range c.hasNot {
				if strings.Contains(r.Reaction.Text, f) {
					t.Errorf("headline %q holds %s", r.Reaction.Text, f)
				}
			}
		})
	}
}

// TestNoChromiumIIFromSulfite: sulfite and bisulfite stop chromium(VI) at
// chromium(III); chromium(II) needs zinc (CRC Handbook, Electrochemical
// Series, Cr3+/Cr2+ −0.41 V; Vogel, chromium(II); from memory).
func TestNoChromiumIIFromSulfite(t *testing.T) {
	for _, req := range []string{
		"mix 200 L CrO3 10 g/L + 20 L sodium metabisulfite 20 %",
		"mix 100 L Na2Cr2O7 0.1 M, pH 2.5 + 20 L NaHSO3 38 %",
	} {
		checkOutcome(t, req, mixOutcome{atMost: map[string]float64{"Cr^2+": 1e-6}, atLeast: map[string]float64{"Cr^3+|CrOH^2+|Cr(OH)3(s)": 19}})
	}
}

// TestOnPaperPairsMarked: a pair that does not run (hydrogen and chlorine
// from hydrochloric acid) is shown in the details only as on paper.
func TestOnPaperPairsMarked(t *testing.T) {
	for _, req := range []string{"mix 50 L HCl 36 % + 450 L water", "mix 100 L HCl 36 % + 100 L H2SO4 98 %"} {
		r := ask(t, req)
		if r.Verdict == engine.Spontaneous && !r.Hindered {
			t.Fatalf("%s: verdict %s", req, r.Verdict)
		}
		txt := engine.RenderText(r)
		if strings.Contains(txt, "Net ionic equation (") {
			t.Errorf("%s: a pair that does not run is printed as a net ionic equation:\n%s", req, txt)
		}
		if r.Reaction != nil && !strings.Contains(txt, "does not run") {
			t.Errorf("%s: the pair on paper is not marked as not running:\n%s", req, txt)
		}
	}
}
