package advice_test

import (
	"slices"
	"testing"

	"mixward/engine"
)

// TestPeracidRunaway: concentrated hydrogen peroxide with formic acid forms
// performic acid within the hour, which decomposes violently and has
// exploded; with acetic acid and a mineral acid as catalyst peracetic acid
// forms within minutes (Bretherick's Handbook of Reactive Chemical
// Hazards, peroxyformic acid, hydrogen peroxide with carboxylic acids; from
// memory). Tried as a new user would: 50 % peroxide with 85 % formic acid
// read "no concern". Acetic acid alone keeps its slow-forming note;
// dilute mixes and formate at neutral pH stay quiet.
func TestPeracidRunaway(t *testing.T) {
	a := mustAdvisor(t)
	cases := []struct {
		req     string
		level   engine.Level
		runaway bool
	}{
		{"mix 200 L H2O2 50 % + 5 L formic acid 85 %", engine.DoNotMix, true},
		{"mix 50 L formic acid 85 % + 100 L H2O2 35 %", engine.DoNotMix, true},
		{"mix 100 L H2O2 35 % + 50 L acetic acid 80 % + 2 L H2SO4 98 %", engine.DoNotMix, true},
		{"mix 100 L H2O2 35 % + 50 L acetic acid 80 %", engine.WithPrecautions, false},
		{"mix 1000 L water + 1 L H2O2 35 % + 1 L formic acid 85 %", "", false},
		{"mix 100 L H2O2 50 % + 100 L sodium formate 20 %", "", false},
	}
	for _, c := range cases {
		r := ask(t, a, c.req)
		if c.level != "" && r.Decision.Level != c.level {
			t.Errorf("%s: %s (%s), want %s", c.req, r.Decision.Level, r.Decision.Title, c.level)
		}
		if got := slices.Contains(hazardCodes(r), "peracid-runaway"); got != c.runaway {
			t.Errorf("%s: peracid-runaway %v, want %v (%v)", c.req, got, c.runaway, hazardCodes(r))
		}
	}
}
