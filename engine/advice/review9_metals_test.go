package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
)

// molOf sums the final composition of r over the species texts.
func molOf(r *engine.Result, texts ...string) float64 {
	tot := 0.0
	for _, a := range r.FinalComposition {
		for _, t := range texts {
			if a.Text == t {
				tot += a.Mol
			}
		}
	}
	return tot
}

// hazardCodes lists the codes of the answer's hazards.
func hazardCodes(r *engine.Result) []string {
	var out []string
	for _, h := range r.Hazards {
		out = append(out, h.Code)
	}
	return out
}

// TestActiveMetalsNeverDeposit: lithium, sodium, potassium, magnesium,
// calcium, strontium, barium and aluminium are never formed as metal from
// water or their salts in water (Pourbaix, Atlas of Electrochemical
// Equilibria (1974), from memory): magnesium in caustic soda does not turn
// the sodium into metal (review 9, U05), it corrodes slowly, giving hydrogen
// and magnesium hydroxide (Bretherick's Handbook, magnesium with water, from
// memory), and a metal brought as metal never grows.
func TestActiveMetalsNeverDeposit(t *testing.T) {
	a := mustAdvisor(t)
	metals := []string{"Li(s)", "Na(s)", "K(s)", "Mg(s)", "Ca(s)", "Sr(s)", "Ba(s)", "Al(s)"}
	for _, c := range []struct {
		req     string
		brought map[string]float64 // metal → mol brought (5 kg Mg = 205.7 mol)
	}{
		{"mix 100 L NaOH 20 % + 5 kg Mg", map[string]float64{"Mg(s)": 205.8}},
		{"mix 100 L CaCl2 20 % + 5 kg Mg", map[string]float64{"Mg(s)": 205.8}},
		{"mix 100 L BaCl2 10 % + 1 kg Mg", map[string]float64{"Mg(s)": 41.2}},
		{"mix 100 L MgCl2 20 % + 5 kg Al", map[string]float64{"Al(s)": 185.4}},
		{"mix 100 L water + 1 kg Na", map[string]float64{"Na(s)": 43.5}},
	} {
		r := ask(t, a, c.req)
		for _, m := range metals {
			if got := molOf(r, m); got > c.brought[m]+1e-6 {
				t.Errorf("%s: %s %.4g mol in the tank, brought %g: these metals never form in water", c.req, m, got, c.brought[m])
			}
		}
		if r.Reaction != nil && strings.Contains(r.Reaction.Text, "→") {
			right := r.Reaction.Text[strings.Index(r.Reaction.Text, "→"):]
			for _, m := range metals {
				if strings.Contains(right, " "+m) {
					t.Errorf("%s: equation %q forms %s", c.req, r.Reaction.Text, m)
				}
			}
		}
	}
	r := ask(t, a, "mix 100 L NaOH 20 % + 5 kg Mg")
	if r.Decision.Level != engine.WithPrecautions || !strings.Contains(strings.Join(hazardCodes(r), " "), "slow-hydrogen") {
		t.Errorf("magnesium in caustic: %s %v, want with-precautions, slow-hydrogen", r.Decision.Level, hazardCodes(r))
	}
	found := false
	for _, h := range r.HeldBack {
		found = found || h.Reaction != nil && strings.Contains(h.Reaction.Text, "Mg(OH)2(s)") && strings.Contains(h.Reaction.Text, "H2(g)")
	}
	if !found {
		t.Errorf("magnesium in caustic: held back %v, want magnesium to hydroxide and hydrogen (the slow change)", r.HeldBack)
	}
}

// TestBaseMetalsNeedStrongReducer: iron(III) is taken to iron(II), never
// to the metal, by hydroxylamine and hydrazine (review 9, U01; Vogel's
// Textbook of Macro and Semimicro Qualitative Inorganic Analysis, iron(III)
// with reducing agents, from memory); a more active metal still cements a
// nobler one (copper on iron, nickel on zinc). Iron salts catalyse the
// violent decomposition of concentrated hydroxylamine (Bretherick's
// Handbook, hydroxylamine: metal salts, from memory).
func TestBaseMetalsNeedStrongReducer(t *testing.T) {
	a := mustAdvisor(t)
	for _, req := range []string{
		"mix 20 L hydroxylamine 50 % + 20 L FeCl3 40 %",
		"mix 20 L N2H4 35 % + 20 L FeCl3 40 %",
		"mix 20 L N2H4 35 % + 20 L NiSO4 10 %",
	} {
		r := ask(t, a, req)
		if got := molOf(r, "Fe(s)", "Ni(s)"); got > 1e-6 {
			t.Errorf("%s: %.4g mol of metal deposited; mild reducers stop at the lower ion", req, got)
		}
		if r.Reaction != nil && (strings.Contains(r.Reaction.Text, "Fe(s)") || strings.Contains(r.Reaction.Text, "Ni(s)")) {
			t.Errorf("%s: equation %q deposits the metal", req, r.Reaction.Text)
		}
	}
	r := ask(t, a, "mix 20 L hydroxylamine 50 % + 20 L FeCl3 40 %")
	if r.Reaction == nil || !strings.Contains(r.Reaction.Text, "Fe^2+") {
		t.Errorf("hydroxylamine with iron(III): equation %v, want iron(II)", r.Reaction)
	}
	if r.Decision.Level != engine.DoNotMix || !strings.Contains(r.Decision.Title, "hydroxylamine") {
		t.Errorf("hydroxylamine with iron(III): %s %q, want do-not-mix naming the hydroxylamine decomposition", r.Decision.Level, r.Decision.Title)
	}
	for req, metal := range map[string]string{
		"mix 100 L CuSO4 10 % + 5 kg Fe": "Cu(s)",
		"mix 100 L NiSO4 10 % + 5 kg Zn": "Ni(s)",
	} {
		if got := molOf(ask(t, a, req), metal); got < 10 {
			t.Errorf("%s: %s %.4g mol, want it cemented by the more active metal", req, metal, got)
		}
	}
}

// TestSlowMetalsInAcid: nickel, cobalt, tin and lead dissolve only slowly in
// dilute non-oxidizing acids (Vogel's Textbook of Macro and Semimicro
// Qualitative Inorganic Analysis, from memory; nickel anodes in hydrochloric
// strike baths: common practice, no source): slow hydrogen, vent, no closed
// vessel (review 9, U06), not a refusal; iron, zinc, aluminium, magnesium,
// cadmium and manganese give their hydrogen at once and stay refused, also
// when a slow metal comes with them.
func TestSlowMetalsInAcid(t *testing.T) {
	a := mustAdvisor(t)
	for _, req := range []string{
		"mix 100 L HCl 10 % + 5 kg Ni",
		"mix 100 L H2SO4 10 % + 5 kg Ni",
		"mix 100 L HCl 10 % + 5 kg Co",
		"mix 100 L HCl 10 % + 5 kg Sn",
		"mix 100 L HCl 10 % + 5 kg Pb",
	} {
		r := ask(t, a, req)
		if r.Decision.Level != engine.WithPrecautions || !strings.Contains(strings.Join(hazardCodes(r), " "), "slow-hydrogen") {
			t.Errorf("%s: %s %q %v, want with-precautions, slow-hydrogen", req, r.Decision.Level, r.Decision.Title, hazardCodes(r))
		}
		// The Forms line names the slow hydrogen the hazard warns of
		// (review 11, N04), not "no gas of concern".
		if got := formsOf(t, r); !strings.Contains(got, "Forms: hydrogen, slowly") {
			t.Errorf("%s: %s, want Forms naming the slow hydrogen", req, got)
		}
		if !strings.Contains(strings.Join(r.Decision.Actions, "\n"), "closed vessel") {
			t.Errorf("%s: actions %q, want no closed vessel", req, r.Decision.Actions)
		}
	}
	// Lead in sulfuric acid is held by its sulfate film: lead-lined tanks
	// carry sulfuric acid (common practice, no source; Vogel's Textbook,
	// lead with dilute sulfuric acid, from memory; review 11, N03).
	if r := ask(t, a, "mix 100 L H2SO4 10 % + 5 kg Pb"); strings.Contains(strings.Join(hazardCodes(r), " "), "slow-hydrogen") {
		t.Errorf("lead in sulfuric acid: %v, want no slow hydrogen", hazardCodes(r))
	}
	for _, req := range []string{
		"mix 100 L HCl 10 % + 5 kg Fe",
		"mix 100 L H2SO4 10 % + 5 kg Zn",
		"mix 100 L HCl 10 % + 5 kg Al",
		"mix 100 L HCl 10 % + 5 kg Mg",
		"mix 100 L HCl 10 % + 5 kg Cd",
		"mix 100 L HCl 10 % + 5 kg Mn",
		"mix 100 L HCl 10 % + 5 kg Ni + 5 kg Fe",
	} {
		r := ask(t, a, req)
		if r.Decision.Level != engine.DoNotMix || !strings.Contains(strings.Join(hazardCodes(r), " "), "hydrogen-release") {
			t.Errorf("%s: %s %q %v, want do-not-mix, hydrogen-release", req, r.Decision.Level, r.Decision.Title, hazardCodes(r))
		}
	}
}

// TestNitrogenDioxideInWater: nitrogen dioxide dissolving in water gives
// nitric acid and nitric oxide, 3 NO2 + H2O → 2 HNO3 + NO (the nitrous acid
// breaks down the same way in the acid it makes; Vogel's Textbook of Macro
// and Semimicro Qualitative Inorganic Analysis, from memory): 5 kg (108.7
// mol) gives about 36 mol NO in a 0.14 M nitric acid mix (review 9, U04),
// so the equation carries no hydroxide and nitric oxide is judged against
// its limit (NIOSH Pocket Guide, NO IDLH 100 ppm). In strong caustic the
// same gas gives nitrite and nitrate and no nitric oxide.
func TestNitrogenDioxideInWater(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 5 kg NO2 + 500 L water")
	if r.Reaction == nil || strings.Contains(r.Reaction.Text, "OH-") || !strings.Contains(r.Reaction.Text, "NO(g)") {
		t.Errorf("NO2 into water: equation %v, want NO in acid medium (no OH-)", r.Reaction)
	}
	if r.Conditions.Medium != engine.Acid {
		t.Errorf("NO2 into water: medium %s, want acid (the mix ends near pH 1)", r.Conditions.Medium)
	}
	no := 0.0
	for _, g := range r.Decision.Gases {
		if strings.HasPrefix(g.Text, "NO ") || g.Text == "NO" || strings.HasPrefix(g.Text, "NO(g)") {
			no += g.Mol
		}
	}
	if no < 25 || no > 40 {
		t.Errorf("NO2 into water: NO %.3g mol among the gases %v, want about 36", no, r.Decision.Gases)
	}
	if !strings.Contains(strings.Join(hazardCodes(r), " "), "no-release") {
		t.Errorf("NO2 into water: hazards %v, want no-release", hazardCodes(r))
	}
	s := ask(t, a, "mix 1 kg NO2 + 200 L NaOH 20 %")
	if got := molOf(s, "NO(g)", "NO"); got > 1e-3 {
		t.Errorf("NO2 into strong caustic: %.3g mol NO, want nitrite and nitrate only", got)
	}
	if got := molOf(s, "NO2-"); got < 5 {
		t.Errorf("NO2 into strong caustic: nitrite %.3g mol, want about 10 (half the 21.7 mol NO2)", got)
	}
}
