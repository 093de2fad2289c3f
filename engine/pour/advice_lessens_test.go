package pour

import (
	"strings"
	"testing"

	"mixward/engine"
)

// TestLessensNamesWhatTheOtherWayMeets: where the better order meets
// nothing, the advice names what the other way meets instead of an empty
// list ("it meets  over less of the pour", tried as a new user would on a
// make-up of alum and soda ash in water).
func TestLessensNamesWhatTheOtherWayMeets(t *testing.T) {
	good := engine.PourOrder{Added: "Na2CO3", Into: "H2O"}
	bad := engine.PourOrder{Added: "H2O", Into: "Na2CO3", Hazards: []engine.PourHazard{{Code: "warms", FromFraction: 0.001, ToFraction: 0.07, Worst: engine.Warning}}}
	got := lessens(good, bad)
	if strings.Contains(got, "meets  ") || !strings.Contains(got, "the other way meets warms") {
		t.Errorf("lessens = %q", got)
	}
}
