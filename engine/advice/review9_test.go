package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
)

// TestReview9Pours checks pours from a plant chemist's ninth review, each
// with its basis:
//   - bisulfite stock (38 %) keeps sulfur dioxide above its IDLH over the
//     diluted mix too (Sander 2015 Henry constant; NIOSH Pocket Guide, SO2
//     IDLH 100 ppm; from memory): never "no concern" beside that figure,
//     although the dilution does not make it worse;
//   - concentrated chlorate with bisulfite reacts slowly at first but makes
//     its own acid, which speeds it up (Bretherick's Handbook, chlorates:
//     reducing agents, from memory): do not mix; with alkaline sulfite no
//     acid forms and the pair stays slow (the chlorate lock);
//   - anhydrous hydrogen fluoride run into a caustic scrubber is taken up,
//     but the operator handles HF on the way in: HF-rated protective
//     equipment, calcium gluconate and closed transfer in the answer, and
//     the request read as the liquefied gas (NIOSH Pocket Guide, hydrogen
//     fluoride; common practice, no source).
func TestReview9Pours(t *testing.T) {
	a := mustAdvisor(t)
	cases := []struct {
		req    string
		level  engine.Level
		code   string // a hazard the decision must carry
		action string // a fragment of its actions
	}{
		{"mix 50 L NaHSO3 38 % + 100 L water", engine.WithPrecautions, "so2-release", "extraction"},
		{"mix 100 L NaClO3 40 % + 50 L NaHSO3 38 %", engine.DoNotMix, "chlorate-sulfite", "store and dose chlorate and sulfite or bisulfite apart"},
		{"mix 100 L NaClO3 40 % + 100 L Na2SO3 10 %", engine.NoConcern, "", "Never acidify"},
		{"mix 2 kg HF + 200 L NaOH 5 %", engine.WithPrecautions, "hf-burns", "calcium gluconate"},
	}
	for _, c := range cases {
		r := ask(t, a, c.req)
		if r.Decision.Level != c.level {
			t.Errorf("%s: %s %q, want %s", c.req, r.Decision.Level, r.Decision.Title, c.level)
		}
		if c.code != "" && !hasCode(r, c.code) {
			t.Errorf("%s: no %s hazard", c.req, c.code)
		}
		if !strings.Contains(strings.Join(r.Decision.Actions, "\n"), c.action) {
			t.Errorf("%s: actions %q, want %q", c.req, r.Decision.Actions, c.action)
		}
	}
	r := ask(t, a, "mix 2 kg HF + 200 L NaOH 5 %")
	if !strings.Contains(strings.Join(r.Notes, "\n"), "no strength given for HF: read as the anhydrous, liquefied gas") {
		t.Errorf("anhydrous HF: notes %q, want it read as the liquefied gas", r.Notes)
	}
}

func hasCode(r *engine.Result, code string) bool {
	for _, h := range r.Hazards {
		if h.Code == code && h.Severity != engine.Info {
			return true
		}
	}
	return false
}
