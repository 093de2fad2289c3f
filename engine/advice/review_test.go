package advice_test

import (
	"testing"

	"mixward/engine"
	"mixward/engine/advice"
)

// TestReviewWorstFirst: every pair of a small catalogue (invented tanks of
// the demo site) is judged, the pairs in parallel, and listed worst first:
// bleach with hydrochloric acid must not be combined (chlorine; White's
// Handbook of Chlorination, from memory), rinse water with either is no
// concern.
func TestReviewWorstFirst(t *testing.T) {
	a := mustAdvisor(t)
	ps := a.Review([]advice.Tagged{
		{Tag: "T-901", Stream: "200 L NaOCl 12.5 %"},
		{Tag: "T-902", Stream: "50 L HCl 10 %"},
		{Tag: "T-903", Stream: "500 L water"},
	})
	if len(ps) != 3 {
		t.Fatalf("%d pairs, want 3", len(ps))
	}
	if p := ps[0]; p.A != "T-901" || p.B != "T-902" || p.Level != engine.DoNotMix {
		t.Errorf("first pair %s + %s is %s, want T-901 + T-902 do-not-mix", p.A, p.B, p.Level)
	}
	for _, p := range ps {
		if p.Error != "" {
			t.Errorf("%s + %s: %s", p.A, p.B, p.Error)
		}
	}
	if ps[2].Level == engine.DoNotMix {
		t.Errorf("last pair %s + %s is %s", ps[2].A, ps[2].B, ps[2].Level)
	}
}
