package hazard

import "testing"

// TestScaldNeedsTheHeat: skin scalds above about 60 °C (common practice,
// no source), so a mix the heat brings from below that line to above it is
// hot enough to scald; a liquid stated at 60 °C or more scalds before it
// meets anything, and the few degrees dissolving adds to it are judged as a
// warm-up, boiling and near-boiling as always. A reaction's heat in a hot
// liquid still scalds (it speeds up as it warms). Tried as a new user would:
// water at 70 °C run onto a heap of soda ash read "never H2O into Na2CO3
// (scalding-heat)".
func TestScaldNeedsTheHeat(t *testing.T) {
	for _, tc := range []struct {
		name     string
		startC   float64 // the mix's starting temperature
		hottestC float64 // the hottest stream's own (0: not set)
		rise     float64
		reaction bool
		code     string // "" for none
	}{
		{"cold start reaches 65 °C", 25, 25, 40, false, "scalding-heat"},
		{"cold start, field not set", 25, 0, 40, false, "scalding-heat"},
		{"hot water, small rise", 62.5, 70, 9.7, false, ""},
		{"hot water, rise of 12 °C", 70, 70, 12, false, "warms"},
		{"hot water averaged below 60 °C with a cold solid", 48, 60, 21, false, "warms"},
		{"hot water, near boiling", 65, 70, 25, false, "near-boiling"},
		{"hot water boils", 70, 70, 30, false, "boils"},
		{"a reaction in hot caustic", 77, 80, 13, true, "scalding-heat"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			reached := tc.startC + tc.rise
			h := Heat{Known: true, ReleasedkJ: 1000, RiseC: tc.rise, ReachedC: reached, Boils: reached >= 100, MixingkJ: 1000}
			if tc.reaction {
				h.Reactions, h.MixingkJ = true, 0
			}
			o := &Outcome{Heat: h, TemperatureC: tc.startC, HottestC: tc.hottestC, Chemicals: []string{"H2O", "Na2CO3"}}
			hs := judgeHeat(o)
			got := ""
			if len(hs) > 0 {
				got = hs[0].Code
			}
			if got != tc.code {
				t.Errorf("got %q, want %q", got, tc.code)
			}
		})
	}
}
