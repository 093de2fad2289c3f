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
