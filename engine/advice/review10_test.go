package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
	"mixward/engine/advice"
)

// TestReview10Pours checks pours from a plant chemist's tenth review:
//   - sodium chlorite with an organic liquid is a strong oxidizer with fuel,
//     as chlorate is (Bretherick's Handbook, sodium chlorite, from memory);
//     chlorite dosed into water is no concern;
//   - concentrated hydrazine with hypochlorite reacts violently and the hot
//     mix gives off hydrazine (Bretherick's Handbook, hydrazine: oxidants;
//     NIOSH Pocket Guide, hydrazine IDLH 50 ppm; from memory); a boiler-water
//     dose of hydrazine with a little bleach is no concern;
//   - hydrofluoric and hydrochloric acid fumes over the mix are judged
//     against their IDLH (30 and 50 ppm, NIOSH Pocket Guide, from memory):
//     named in "Forms" and never no-concern above the limit, but as the
//     acid's own fumes a warning, not a refusal;
//   - a solve that ran for ever (aluminium in strong potassium hydroxide)
//     answers.
func TestReview10Pours(t *testing.T) {
	a := mustAdvisor(t)
	cases := []struct {
		req   string
		level engine.Level
		code  string
		forms string // a fragment of the short answer's Forms line
	}{
		{"mix 50 L NaClO2 25 % + 5 L methanol", engine.DoNotMix, "oxidizer-organic-fire", ""},
		{"mix 1000 L water + 2 L NaClO2 25 %", engine.NoConcern, "", ""},
		{"mix 100 L hydrazine 35 % + 50 L NaOCl 12.5 %", engine.DoNotMix, "hydrazine-oxidizer", ""},
		{"mix 1000 L N2H4 200 ppm + 1 L NaOCl 12.5 %", engine.NoConcern, "", ""},
		{"mix 500 L water + 10 L HF 48 %", engine.WithPrecautions, "hf-release", "Forms: HF "},
		{"mix 5 kg Cu + 100 L HCl 32 %", engine.WithPrecautions, "hcl-release", "Forms: HCl "},
		{"mix 100 L KOH 20 % + 5 kg Al", engine.DoNotMix, "hydrogen-release", "Forms: H2 "},
	}
	for _, c := range cases {
		r := ask(t, a, c.req)
		if r.Decision.Level != c.level {
			t.Errorf("%s: %s %q, want %s", c.req, r.Decision.Level, r.Decision.Title, c.level)
		}
		if c.code != "" && !hasCode(r, c.code) {
			t.Errorf("%s: no %s hazard", c.req, c.code)
		}
		if c.forms != "" && !strings.Contains(advice.RenderShort(r), c.forms) {
			t.Errorf("%s: short answer lacks %q:\n%s", c.req, c.forms, advice.RenderShort(r))
		}
	}
}

// TestRedoxLineAgreesWithForms: a change whose gas the answer counts is not
// printed as held back and not counted, although a lock stops it part of
// the way (aluminium left once the acid is spent: an eleventh review).
func TestRedoxLineAgreesWithForms(t *testing.T) {
	a := mustAdvisor(t)
	for _, req := range []string{"mix 10 kg Al + 200 L HCl 15 %", "mix 50 L NaOCl 12.5 % + 50 L FeCl3 40 %"} {
		short := advice.RenderShort(ask(t, a, req))
		if strings.Contains(short, "held back (not counted") || !strings.Contains(short, "(spontaneous, E cell") {
			t.Errorf("%s: the Redox line disagrees with the gas counted:\n%s", req, short)
		}
	}
}

// TestGasDrivenOffByTheBoil: strong ammonia (1336 mol in 100 L of 25 %)
// half neutralised by 60 % nitric acid (652 mol) reaches about 99 °C by its
// own heat, and the free ammonia (about 680 mol) boils off with the steam
// (NBS Tables 1982 neutralisation and dilution heats; common practice, no
// source), not the 0.75 mol its equilibrium at the starting temperature
// gives a closed headspace.
func TestGasDrivenOffByTheBoil(t *testing.T) {
	r := ask(t, mustAdvisor(t), "mix 100 L ammonia 25 % + 50 L HNO3 60 %")
	nh3 := 0.0
	for _, h := range r.Hazards {
		if h.Code == "ammonia-release" && h.Gas != nil {
			nh3 = h.Gas.Mol
		}
	}
	if r.Decision.Level != engine.DoNotMix || nh3 < 500 || nh3 > 800 {
		t.Errorf("ammonia neutralised to the boil: %s, NH3 %.1f mol; want do-not-mix and about 680 mol driven off", r.Decision.Level, nh3)
	}
}

// gasJudged is the mol and headspace ppm of the judged gas of a hazard.
func gasJudged(r *engine.Result, code string) (mol, ppm float64) {
	for _, h := range r.Hazards {
		if h.Code == code && h.Gas != nil {
			return h.Gas.Mol, h.Gas.HeadspacePPM
		}
	}
	return 0, 0
}

// TestDrivenOffCountedOnce: with a stated headspace the closed headspace's
// share is not counted twice. 50 L of 10 % sodium cyanide (about 102 mol at
// 1.00 kg/L) boiled by 98 % sulfuric acid gives off at most its 102 mol of
// HCN, about 2.5 m³, which is about 12 % of a 20 m³ headspace (ideal gas;
// review 12, T26: 174 mol and 1,000,000 ppm before). Likewise ammonia.
func TestDrivenOffCountedOnce(t *testing.T) {
	a := mustAdvisor(t)
	for _, tc := range []struct {
		req, code            string
		maxMol, ppmLo, ppmHi float64
	}{
		{"mix 50 L NaCN 10 % + 20 L H2SO4 98 % at headspace 20 m3", "hcn-release", 108, 9e4, 1.6e5},
		{"mix 100 L ammonia 25 % + 50 L HNO3 60 % at headspace 20 m3", "ammonia-release", 700, 5e5, 1e6},
	} {
		r := ask(t, a, tc.req)
		mol, ppm := gasJudged(r, tc.code)
		if mol <= 0 || mol > tc.maxMol || ppm < tc.ppmLo || ppm > tc.ppmHi {
			t.Errorf("%s: %s %.1f mol, %.0f ppm; want at most %.0f mol, %.0f–%.0f ppm", tc.req, tc.code, mol, ppm, tc.maxMol, tc.ppmLo, tc.ppmHi)
		}
	}
}

// TestGasAtTheTemperatureReached: 38 % bisulfite with 12.5 % hypochlorite
// reaches about 86 °C by its own heat (about 201 mol × 321 kJ; NBS Tables
// 1982, from memory). At 86 °C the Henry constant of sulfur dioxide is about
// 0.21 mol/(L·bar) (1.3 at 25 °C, Sander 2015, moved by van 't Hoff with
// ΔsolH −26.2 kJ/mol from NBS 1982 ΔfH° of SO2(g) and H2SO3): 200 L hold
// about 43 mol at 1 bar, so about 120 of its 165 mol come off, not the
// 5.65 mol of the 25 °C state (review 12, T20).
func TestGasAtTheTemperatureReached(t *testing.T) {
	r := ask(t, mustAdvisor(t), "mix 100 L NaHSO3 38 % + 100 L NaOCl 12.5 %")
	if mol, _ := gasJudged(r, "so2-release"); mol < 80 || mol > 170 {
		t.Errorf("bisulfite with hypochlorite at about 86 °C: SO2 %.1f mol, want about 120 mol driven off", mol)
	}
	// A mix that warms by less than WarmedRiseC keeps its state's figure.
	r = ask(t, mustAdvisor(t), "mix 100 L NaCN 5 % + 2 L HCl 32 %")
	if mol, _ := gasJudged(r, "hcn-release"); mol > 5 {
		t.Errorf("cyanide with a little acid, barely warmed: HCN %.2f mol, want the closed-headspace figure (under 5 mol)", mol)
	}
}

// TestRedoxLineAgreesWithFamilyHeat: when the Heat line counts a reaction
// family the equilibrium holds back (chromic acid or hypochlorite burning an
// alcohol, Thornton's rule), the Redox line names it as running, not "held
// back" or "no redox reaction runs" (review 12, T07 and T18).
func TestRedoxLineAgreesWithFamilyHeat(t *testing.T) {
	a := mustAdvisor(t)
	for _, req := range []string{"mix 100 L NaOCl 12.5 % + 10 L isopropanol", "mix 100 L NaOCl 12.5 % + 10 L methanol"} {
		short := advice.RenderShort(ask(t, a, req))
		if !strings.Contains(short, "oxidizing the organic liquid: runs") || strings.Contains(short, "held back (not counted") || strings.Contains(short, "no redox reaction runs") {
			t.Errorf("%s: the Redox line disagrees with the heat counted:\n%s", req, short)
		}
	}
}
