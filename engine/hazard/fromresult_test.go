package hazard

import (
	"testing"

	"mixward/data"
	"mixward/engine"
)

// TestMarginPairRaisesNothing: a headline at +0.001 V that would give
// hydrogen does not proceed, so no hydrogen hazard, and its gas and heat are
// not counted (the issue's false alarm "hydrogen DANGER from a pair at
// +0.001 V").
func TestMarginPairRaisesNothing(t *testing.T) {
	e, err := engine.New(data.FS)
	if err != nil {
		t.Fatal(err)
	}
	d, err := Load(data.FS)
	if err != nil {
		t.Fatal(err)
	}
	ecell, heat, rise := 0.001, 500.0, 45.0
	mk := func(e float64) *engine.Result {
		return &engine.Result{
			Conditions: engine.Conditions{PH: 6, TemperatureC: 25, PressureKPa: 101.325, VolumeL: 10},
			Reaction: &engine.Reaction{Text: "2 H2O(l) + Fe(s) → H2(g) + Fe(OH)2(s)",
				Products: []engine.EqTerm{{Formula: "H2", Phase: engine.Gas, Coef: 1}}},
			ECell:            &e,
			Verdict:          engine.Spontaneous,
			Amounts:          &engine.Amounts{Formed: []engine.AmountOf{{Text: "H2(g)", Mol: 5, Phase: engine.Gas}}},
			Gases:            []engine.GasRelease{{Text: "H2(g)", Mol: 5, Kind: "formed"}},
			Heat:             &engine.Heat{HeatReleasedkJ: &heat, TemperatureRiseC: &rise},
			FinalComposition: []engine.AmountOf{},
		}
	}
	o := FromResult(mk(ecell), e.Tables)
	if len(o.Reactions) != 0 || len(o.HeldBack) != 1 {
		t.Fatalf("reactions %v, held back %v; want the pair held back", o.Reactions, o.HeldBack)
	}
	if hs := Judge(o, d); len(hs) != 0 {
		t.Errorf("a pair at +0.001 V raised %v", hs)
	}
	// The same pair at +0.4 V proceeds: hydrogen against its LFL, and heat.
	o = FromResult(mk(0.4), e.Tables)
	got := map[string]engine.Severity{}
	for _, h := range Judge(o, d) {
		got[h.Code] = h.Severity
	}
	if got["hydrogen-release"] != engine.Danger || got["scalding-heat"] != engine.Warning {
		t.Errorf("a pair at +0.4 V gave %v, want hydrogen-release danger and scalding-heat warning", got)
	}
}

// TestTraceRaisesNothing: species below TraceMolar count as absent.
func TestTraceRaisesNothing(t *testing.T) {
	o := &Outcome{VolumeL: 1, HeadspaceL: 1, PressureKPa: 101.325, TemperatureC: 25, PH: 3,
		Before: []Amount{
			{Species: engine.Species{Formula: "Ag", Charge: 1, Phase: engine.Aqueous}, Molar: TraceMolar / 10},
			{Species: engine.Species{Formula: "NH3", Phase: engine.Aqueous}, Molar: 0.5},
		}}
	o.After = o.Before
	if _, ok := silverAmmonia(o); ok {
		t.Error("a trace of silver raised explosive-residue")
	}
	o.Before[0].Molar = 1e-3
	if _, ok := silverAmmonia(o); !ok {
		t.Error("1 mmol/L silver with ammonia raised nothing (Bretherick's Handbook, silver nitrate with ammonia)")
	}
}
