package advice_test

import (
	"slices"
	"strings"
	"testing"

	"mixward/engine"
	"mixward/engine/advice"
)

// decisionGas is the moles of a gas the decision counts.
func decisionGas(r *engine.Result, text string) float64 {
	if r.Decision == nil {
		return 0
	}
	for _, g := range r.Decision.Gases {
		if g.Text == text {
			return g.Mol
		}
	}
	return 0
}

// TestBorohydrideKeptUntilAcid: a borohydride liquor is kept as borohydride
// by itself, diluted with water or with caustic (it is sold stabilised in
// caustic soda; unstabilised, its own metaborate holds it near pH 10–11,
// where its half-life is hours: log t½ in minutes = pH − (0.034 T − 1.92),
// Kreevoy and Jacobson 1979, from memory); acid takes it to boric acid and
// hydrogen at once, BH4- + H+ + 3 H2O → H3BO3 + 4 H2 (Bretherick's Handbook
// of Reactive Chemical Hazards, sodium tetrahydroborate, from memory), and
// the boric acid so made buffers the rest near pH 9, where the half-life is
// minutes (same rate law), so in an acid mix all of it goes to hydrogen, not
// only what the acid reaches.
//
// Hand checks: 100 L of 12 % NaBH4 at 1.00 g/mL (no density row) is
// 12000/37.83 = 317 mol: 4 × 317 = 1268 mol H2 with any of the acids below
// (50 L of 10 % HCl, 144 mol H+; 50 L of 5 % HCl; 20 L of 80 % acetic
// acid); ΔrH ≈ −263 kJ/mol (NBS Tables 1982: BH4- +48, H3BO3(aq) −1072
// kJ/mol, from memory) gives ≈ 83 MJ.
func TestBorohydrideKeptUntilAcid(t *testing.T) {
	a := mustAdvisor(t)
	cases := []struct {
		name, req        string
		level            engine.Level
		h2Min, h2Max     float64
		heatMin, heatMax float64 // kJ released (0, 0: not checked)
	}{
		{"diluted with water", "mix 100 L NaBH4 12 % + 100 L water", engine.NoConcern, 0, 1, 0, 0},
		{"stream alone, larger", "mix 500 L NaBH4 12 % + 10 L water", engine.NoConcern, 0, 1, 0, 0},
		{"with caustic", "mix 100 L NaBH4 12 % + 50 L NaOH 20 %", engine.NoConcern, 0, 1, 0, 0},
		{"into hydrochloric acid", "mix 100 L NaBH4 12 % + 50 L HCl 10 %", engine.DoNotMix, 1200, 1300, 75000, 90000},
		{"acid listed first, weaker", "mix 50 L HCl 5 % + 100 L NaBH4 12 %", engine.DoNotMix, 1200, 1300, 0, 0},
		{"acetic acid reaches it too", "mix 100 L NaBH4 12 % + 20 L acetic acid 80 %", engine.DoNotMix, 1200, 1300, 0, 0},
		// The caustic keeps the hydrolysis back, never an oxidizer: BH4- +
		// 4 OCl- → B(OH)4- + 4 Cl-, about −1630 kJ per BH4- (NBS Tables 1982:
		// BH4- +48, OCl- −107.1, B(OH)4- −1344, Cl- −167.2, from memory);
		// 50 L of 12.5 % hypochlorite (≈ 90 mol) takes ≈ 22 mol BH4-: ≈ 37 MJ
		// into 100 L, boils (Bretherick's Handbook, sodium tetrahydroborate:
		// oxidants, from memory). The borohydride left over is still kept.
		{"with hypochlorite", "mix 50 L NaBH4 12 % + 50 L NaOCl 12.5 %", engine.DoNotMix, 0, 1, 32000, 45000},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			r := ask(t, a, c.req)
			if r.Decision == nil || r.Decision.Level != c.level {
				t.Fatalf("%s: decision %+v, want %s", c.req, r.Decision, c.level)
			}
			if h2 := decisionGas(r, "H2(g)"); h2 < c.h2Min || h2 > c.h2Max {
				t.Errorf("%s: H2 %.1f mol, want %.0f–%.0f", c.req, h2, c.h2Min, c.h2Max)
			}
			if c.heatMax > 0 {
				h := r.Decision.Heat
				if h == nil || h.ReleasedkJ < c.heatMin || h.ReleasedkJ > c.heatMax {
					t.Errorf("%s: heat %+v, want %.0f–%.0f kJ released", c.req, h, c.heatMin, c.heatMax)
				}
			}
			if c.level == engine.NoConcern && !strings.Contains(strings.ToLower(strings.Join(r.Decision.Held, " ")), "borohydride") {
				t.Errorf("%s: the kept hydrolysis is not listed as held back: %q", c.req, r.Decision.Held)
			}
		})
	}
}

// TestHypophosphiteWithNitricAcid: nitric acid of about 2 mol/L and more
// in the mix oxidizes hypophosphite with brown fumes, and the heat makes it
// run away (Vogel's Textbook of Macro and Semimicro Qualitative Inorganic
// Analysis, hypophosphites; Bretherick's Handbook of Reactive Chemical
// Hazards, hypophosphites with oxidants; both from memory); dilute nitric
// acid leaves it, as the electroless-nickel lock says.
//
// Hand checks: 50 L of 30 % NaH2PO2 at 1.00 g/mL (no density row) is
// 15000/87.98 = 170 mol; 20 L of 68 % HNO3 at 1.41 g/mL (CRC, from memory)
// is 304 mol. 3 H3PO2 + 2 NO3- + 2 H+ → 3 H3PO3 + 2 NO + H2O has
// ΔrH = 3(−964.8) + 2(90.25) − 285.83 − 3(−604.6) − 2(−205.0) = −776 kJ
// (NBS Tables 1982, from memory): the mix releases heat at any starting
// temperature and boils. The acid limit written for metals (four protons
// per nitric oxide) does not hold it back: hypophosphite spends about one.
func TestHypophosphiteWithNitricAcid(t *testing.T) {
	a := mustAdvisor(t)
	for _, req := range []string{
		"mix 50 L NaH2PO2 30 % + 20 L HNO3 68 %",
		"mix 50 L NaH2PO2 30 % + 20 L HNO3 68 % at 80 C",
		"mix 20 L HNO3 68 % + 50 L NaH2PO2 30 %",
	} {
		r := ask(t, a, req)
		if r.Decision == nil || r.Decision.Level != engine.DoNotMix {
			t.Fatalf("%s: decision %+v, want do-not-mix", req, r.Decision)
		}
		// At most all of it to phosphate: 170 × 4/3 = 227 mol NO; at least
		// the first step to phosphite, 170 × 2/3 = 113 mol.
		if no := decisionGas(r, "NO(g)") + decisionGas(r, "NO2(g)"); no < 110 || no > 235 {
			t.Errorf("%s: NO + NO2 %.1f mol, want 110–235", req, no)
		}
		if h := r.Decision.Heat; h == nil || h.ReleasedkJ < 25000 || !h.Boils {
			t.Errorf("%s: heat %+v, want at least 25 MJ released and boiling", req, h)
		}
		if strings.Contains(strings.Join(r.Decision.Held, " "), "electroless") {
			t.Errorf("%s: the oxidation is still held back by the electroless-nickel lock: %q", req, r.Decision.Held)
		}
	}
	r := ask(t, a, "mix 50 L NaH2PO2 30 % + 20 L HNO3 5 %")
	if r.Decision == nil || r.Decision.Level == engine.DoNotMix || decisionGas(r, "NO(g)") > 1 {
		t.Errorf("dilute nitric acid: decision %+v, NO %.1f mol; want the hypophosphite kept", r.Decision, decisionGas(r, "NO(g)"))
	}
}

// TestAluminiumInNitricAcid: concentrated nitric acid passivates aluminium,
// but below about 80 % the metal is still attacked slowly with brown fumes
// (Perry's Chemical Engineers' Handbook, corrosion tables, from memory;
// aluminium tanks carry strong nitric acid, common practice, no source);
// dilute nitric acid attacks it at once.
func TestAluminiumInNitricAcid(t *testing.T) {
	a := mustAdvisor(t)
	cases := []struct {
		req   string
		level engine.Level
		code  string
	}{
		{"mix 50 L HNO3 68 % + 5 kg Al", engine.WithPrecautions, "nitric-slow-attack"},
		{"mix 5 kg Al + 100 L HNO3 65 %", engine.WithPrecautions, "nitric-slow-attack"},
		{"mix 50 L HNO3 98 % + 5 kg Al", engine.NoConcern, ""},
		{"mix 50 L HNO3 30 % + 5 kg Al", engine.DoNotMix, ""},
		// Iron is passivated too, but carbon steel is no nitric-acid
		// material at any strength (Perry's, corrosion tables; Pourbaix
		// Atlas, iron; from memory); chromium stays quiet.
		{"mix 10 kg Fe + 50 L HNO3 68 %", engine.WithPrecautions, "nitric-slow-attack"},
		{"mix 10 kg Fe + 50 L HNO3 98 %", engine.WithPrecautions, "nitric-slow-attack"},
		{"mix 5 kg Cr + 50 L HNO3 68 %", engine.NoConcern, ""},
	}
	for _, c := range cases {
		r := ask(t, a, c.req)
		if r.Decision == nil || r.Decision.Level != c.level {
			t.Errorf("%s: decision %+v, want %s", c.req, r.Decision, c.level)
			continue
		}
		if _, ok := hazardOf(r, c.code); c.code != "" && !ok {
			t.Errorf("%s: no %s hazard among %+v", c.req, c.code, r.Hazards)
		}
	}
}

// TestRunawayHeatIfItRuns: a runaway a hazard names but the mix as made
// does not run (ammonium with nitrite, cold and near neutral) shows the
// heat it would give off, not counted; once warm the state runs it and
// counts it, and nothing is left to show apart.
//
// Hand check: 50 L of 25 % NH4Cl at 1.00 g/mL (no density row) is
// 12500/53.49 = 234 mol; NH4+ + NO2- → N2 + 2 H2O has ΔrH = 2(−285.83) −
// (−132.51) − (−104.6) = −334.6 kJ/mol (NBS Tables 1982, from memory):
// 78 MJ, enough to boil the 100 L many times over.
func TestRunawayHeatIfItRuns(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 50 L NaNO2 40 % + 50 L NH4Cl 25 %")
	if r.Decision == nil || r.Decision.Level != engine.DoNotMix || r.Decision.Heat == nil {
		t.Fatalf("decision %+v, want do-not-mix with a heat figure", r.Decision)
	}
	h := r.Decision.Heat
	if len(h.IfRuns) != 1 || h.IfRuns[0].ReleasedkJ < 74000 || h.IfRuns[0].ReleasedkJ > 82000 || !h.IfRuns[0].Boils || h.IfRuns[0].Counted {
		t.Fatalf("if it runs: %+v, want one uncounted runaway of about 78 MJ that boils", h.IfRuns)
	}
	if h.ReleasedkJ > 1000 {
		t.Errorf("the runaway's heat is counted in the mix's own (%.0f kJ)", h.ReleasedkJ)
	}
	if line := heatLineOf(t, a, "mix 50 L NaNO2 40 % + 50 L NH4Cl 25 %"); !strings.Contains(line, "if it runs:") {
		t.Errorf("short answer heat line %q has no heat if it runs", line)
	}
	r = ask(t, a, "mix 50 L NaNO2 40 % + 50 L NH4Cl 25 % at 50 C")
	if r.Decision == nil || r.Decision.Heat == nil || len(r.Decision.Heat.IfRuns) != 0 || r.Decision.Heat.ReleasedkJ < 40000 {
		t.Errorf("warm mix: heat %+v, want the decomposition counted in the mix's heat and none apart", r.Decision.Heat)
	}
}

// heatLineOf is the Heat line of the short answer.
func heatLineOf(t *testing.T, a *advice.Advisor, req string) string {
	t.Helper()
	for _, l := range strings.Split(advice.RenderShort(ask(t, a, req)), "\n") {
		if strings.HasPrefix(l, "Heat:") {
			return l
		}
	}
	return ""
}

// TestChloriteTakesChlorineFirst: chlorite in acid takes hypochlorous acid
// and chlorine to chlorine dioxide first (2 ClO2- + HOCl + H+ → 2 ClO2 +
// Cl- + H2O; White's Handbook of Chlorination, chlorine–chlorite
// generation, from memory): only hypochlorite beyond half the chlorite is
// left to give chlorine.
//
// Hand checks at 1.21 g/mL for 25 % chlorite (suppliers' data, from
// memory, data/densities.txt): 10 L of 25 % NaClO2 is 3025/90.44 = 33.4
// mol; 10 L of 12.5 % NaOCl at 1.18 g/mL (data/densities.txt) is 19.8 mol.
// Chlorite takes 16.7 mol of it to 33.4 mol ClO2; 3.1 mol hypochlorite is
// left, as chlorine in the hydrochloric acid. With 20 L of chlorite (55 mol) none is left: no chlorine.
func TestChloriteTakesChlorineFirst(t *testing.T) {
	a := mustAdvisor(t)
	cases := []struct {
		req                     string
		clo2Min, cl2Min, cl2Max float64
	}{
		{"mix 10 L NaClO2 25 % + 10 L NaOCl 12.5 % + 10 L HCl 32 %", 32, 2.5, 4},
		{"mix 10 L HCl 32 % + 10 L NaOCl 12.5 % + 10 L NaClO2 25 %", 32, 2.5, 4},
		{"mix 20 L NaClO2 25 % + 10 L NaOCl 12.5 % + 10 L HCl 32 %", 39.5, 0, 0.5},
	}
	for _, c := range cases {
		r := ask(t, a, c.req)
		sum := func(texts ...string) float64 {
			tot := 0.0
			for _, x := range r.FinalComposition {
				if slices.Contains(texts, x.Text) {
					tot += x.Mol
				}
			}
			return tot
		}
		clo2, cl2 := sum("ClO2", "ClO2(g)"), sum("Cl2", "Cl2(g)")
		if clo2 < c.clo2Min || cl2 < c.cl2Min || cl2 > c.cl2Max {
			t.Errorf("%s: ClO2 %.1f mol (want at least %.1f), Cl2 %.1f mol (want %.1f–%.1f)", c.req, clo2, c.clo2Min, cl2, c.cl2Min, c.cl2Max)
		}
	}
}

// TestMetalsInNitricAcidGiveNoHydrogen: metals in nitric acid reduce the
// nitrate, not the hydrogen ion (Vogel's Textbook of Macro and Semimicro
// Qualitative Inorganic Analysis, nitric acid with metals, from memory), and
// the acid is spent once. Tried as a new user would: 5 kg of aluminium in
// 50 L of 30 % nitric acid listed 70 mol NO and 140 mol H2 from the same
// 281 mol of acid, 98 MJ. Hand: Al + 4 H+ + NO3- → Al3+ + NO + 2 H2O,
// ΔrH ≈ −807 kJ/mol (NBS Tables 1982: Al3+ −531, NO +90.3, NO3- −205,
// H2O −285.8, from memory); acid-limited 70 mol NO: ≈ 57 MJ. Hydrochloric
// acid with a trace of nitrate still gives hydrogen.
func TestMetalsInNitricAcidGiveNoHydrogen(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 5 kg Al + 50 L HNO3 30 %")
	if h2 := decisionGas(r, "H2(g)"); h2 > 1 {
		t.Errorf("aluminium in 30 %% nitric acid: H2 %.1f mol, want none", h2)
	}
	if no := decisionGas(r, "NO(g)"); no < 60 || no > 75 {
		t.Errorf("aluminium in 30 %% nitric acid: NO %.1f mol, want about 70 (acid-limited)", no)
	}
	if h := r.Decision.Heat; h == nil || h.ReleasedkJ < 50000 || h.ReleasedkJ > 65000 {
		t.Errorf("aluminium in 30 %% nitric acid: heat %+v, want about 57 MJ", h)
	}
	r = ask(t, a, "mix 5 kg Fe + 100 L HCl 10 % + 1 L HNO3 10 %")
	if h2 := decisionGas(r, "H2(g)"); h2 < 50 {
		t.Errorf("iron in hydrochloric acid with a little nitric: H2 %.1f mol, want the hydrogen", h2)
	}
}
