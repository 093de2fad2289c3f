package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
)

// TestReview5Levels checks the level and the hazard codes of pours from a
// plant chemist's fifth review, each with its basis:
//   - baking soda dissolved in water gives about 2 mol CO2 (0.05 m³): in
//     a 25 m³ room about 1,800 ppm, under a tenth of the NIOSH IDLH
//     (40,000 ppm), and the mix stays at bicarbonate's pH (8.3), where no
//     acid drives the gas out: no concern; acid on soda ash gives about 100 mol
//     (2.4 m³): a warning.
//   - chloramination at Cl2:NH3-N about 1.5:1 by weight, ammonia first, is
//     routine below 5:1 (White's Handbook of Chlorination): with
//     precautions, and the action says to dose ammonia first.
//   - acid on 30 % silicate warms (protonation about −26 kJ per mol H+,
//     data/species.txt) and gels: with precautions.
//   - 35 % peroxide made alkaline by 1 % caustic or ammonia decomposes
//     (Bretherick, hydrogen peroxide with bases): do not mix.
func TestReview5Levels(t *testing.T) {
	a := mustAdvisor(t)
	cases := []struct {
		req    string
		level  engine.Level
		has    string // a hazard code of the final mix ("" none required)
		hasNot string // a hazard code that must not be raised by the final mix
		action string // text one action must hold
	}{
		{"mix 1000 L water + 10 kg NaHCO3", engine.NoConcern, "", "co2-release", ""},
		{"mix 100 L Na2CO3 10 % + 100 L HCl 10 %", engine.WithPrecautions, "co2-release", "", ""},
		{"mix 1000 L water + 0.5 L NH3 25 % + 1 L NaOCl 12.5 %", engine.WithPrecautions, "chloramine-release", "", "order of the site's chloramination practice"},
		{"mix 100 L Na2SiO3 30 % + 100 L H2SO4 10 %", engine.WithPrecautions, "silica-gel", "", ""},
		{"mix 100 L H2O2 35 % + 1 L NaOH 1 %", engine.DoNotMix, "alkaline-peroxide", "", ""},
		{"mix 100 L H2O2 35 % + 10 L NH3 25 %", engine.DoNotMix, "alkaline-peroxide", "", ""},
		{"mix 10 L H2O2 50 % + 10 L water", engine.NoConcern, "", "alkaline-peroxide", ""},
	}
	for _, tc := range cases {
		r := ask(t, a, tc.req)
		if tc.level != "" && r.Decision.Level != tc.level {
			t.Errorf("%s: level %s, want %s", tc.req, r.Decision.Level, tc.level)
		}
		codes := map[string]bool{}
		for _, h := range r.Hazards {
			codes[h.Code] = true
		}
		if tc.has != "" && !codes[tc.has] {
			t.Errorf("%s: no %s among %v", tc.req, tc.has, codes)
		}
		if tc.hasNot != "" && codes[tc.hasNot] {
			t.Errorf("%s: %s raised", tc.req, tc.hasNot)
		}
		if tc.action != "" && !strings.Contains(strings.Join(r.Decision.Actions, "\n"), tc.action) {
			t.Errorf("%s: no action with %q in %q", tc.req, tc.action, r.Decision.Actions)
		}
	}
	if h := ask(t, a, "mix 100 L Na2SiO3 30 % + 100 L H2SO4 10 %").Decision.Heat; h == nil || h.ReleasedkJ <= 0 {
		t.Errorf("acid on silicate: heat %+v, want released (exothermic)", h)
	}
}
