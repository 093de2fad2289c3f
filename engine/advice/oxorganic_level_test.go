package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
)

// TestOxidizerOrganicLevelAndReason: the short answer's reason agrees with
// its level. A dilute permanganate solution that stays short of scalding
// oxidizes an alcohol with heat (warning, oxidizer-organic-heat); more
// alcohol or a hot result is the fire code at do-not-mix (Bretherick's
// Handbook of Reactive Chemical Hazards, potassium permanganate, from
// memory; thresholds: common practice, no source).
func TestOxidizerOrganicLevelAndReason(t *testing.T) {
	a := mustAdvisor(t)
	for _, tc := range []struct {
		req   string
		level engine.Level
		code  string
	}{
		{"mix 100 L KMnO4 5 % + 10 L ethanol", engine.WithPrecautions, "oxidizer-organic-heat"},
		{"mix 100 L KMnO4 5 % + 30 L ethanol", engine.DoNotMix, "oxidizer-organic-fire"},
	} {
		r := ask(t, a, tc.req)
		if r.Decision.Level != tc.level {
			t.Errorf("%s: level %s, want %s", tc.req, r.Decision.Level, tc.level)
		}
		found := false
		for _, h := range r.Hazards {
			found = found || h.Code == tc.code
		}
		if !found {
			t.Errorf("%s: no %s", tc.req, tc.code)
		}
		if tc.level != engine.DoNotMix && strings.Contains(r.Decision.Title, "fire") {
			t.Errorf("%s: %s answer's reason promises a fire: %q", tc.req, tc.level, r.Decision.Title)
		}
	}
}
