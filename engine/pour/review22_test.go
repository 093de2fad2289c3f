package pour

import (
	"strings"
	"testing"

	"mixward/engine"
)

// TestDoseSmallNamesNoBlankHazard: a tank run into a drum only warms, the
// drum dosed into the tank meets nothing; the advice doses the drum and
// names what the other way meets, never "either order meets ,".
func TestDoseSmallNamesNoBlankHazard(t *testing.T) {
	x := engine.PourOrder{Added: "water", Into: "acid", AddedL: 300, IntoL: 30,
		Hazards: []engine.PourHazard{{Code: "warms", Worst: engine.Warning, FromFraction: 0.3, ToFraction: 1}}}
	y := engine.PourOrder{Added: "acid", Into: "water", AddedL: 30, IntoL: 300, Hazards: []engine.PourHazard{}}
	got := pairAdvice(&x, &y)
	if strings.Contains(got, "meets ,") || !strings.HasPrefix(got, "Dose acid slowly into water") || !y.Advised {
		t.Errorf("advice %q (acid advised %v), want the acid dosed into the water without a blank hazard", got, y.Advised)
	}
}

// TestWarmOnlyPairNotAdvisedAmongThree: with three streams a pair that
// only warms either way gets no order of its own ("over less of the pour")
// beside a pair that no order makes safe.
func TestWarmOnlyPairNotAdvisedAmongThree(t *testing.T) {
	warm := []engine.PourHazard{{Code: "warms", Worst: engine.Warning, FromFraction: 0.1, ToFraction: 1}}
	bad := []engine.PourHazard{{Code: "azide-forming", Worst: engine.Danger, FromFraction: 0.001, ToFraction: 1}}
	add := &engine.Addition{Orders: []engine.PourOrder{
		{Added: "b", Into: "a", Hazards: bad}, {Added: "a", Into: "b", Hazards: bad},
		{Added: "c", Into: "a", Hazards: warm}, {Added: "a", Into: "c", Hazards: append(warm[:0:0], engine.PourHazard{Code: "warms", Worst: engine.Warning, FromFraction: 0.5, ToFraction: 1})},
		{Added: "c", Into: "b", Hazards: bad}, {Added: "b", Into: "c", Hazards: bad},
	}}
	got := advice(add)
	if strings.Contains(got, "over less of the pour") {
		t.Errorf("advice %q advises an order for a pair that only warms", got)
	}
}

// TestDilutedTank: water at least five times the tank's reagents makes
// the tank diluted where a stream lands (acid dosed into water that holds a
// little bleach, at a separate point: common practice, no source).
func TestDilutedTank(t *testing.T) {
	h2o := &engine.Chemical{Formula: "H2O"}
	naocl := &engine.Chemical{Formula: "NaOCl"}
	w := func(l float64) engine.Stream {
		return engine.Stream{VolumeL: l, Components: []engine.Component{{Chemical: h2o}}}
	}
	r := func(l, kg float64) engine.Stream {
		return engine.Stream{VolumeL: l, MassKg: kg, Components: []engine.Component{{Chemical: naocl}}}
	}
	cases := []struct {
		name string
		tank []engine.Stream
		want bool
	}{
		{"bleach in much water", []engine.Stream{w(2000), r(10, 0)}, true},
		{"tablets in much water", []engine.Stream{w(50000), r(0, 2)}, true},
		{"bleach in little water", []engine.Stream{w(20), r(10, 0)}, false},
		{"no water", []engine.Stream{r(10, 0), r(10, 0)}, false},
		{"water alone", []engine.Stream{w(100)}, false},
	}
	for _, c := range cases {
		if got := dilutedTank(c.tank); got != c.want {
			t.Errorf("%s: %v, want %v", c.name, got, c.want)
		}
	}
}
