package engine_test

import (
	"testing"

	"mixward/engine"
)

// TestNeutralisingBasesReleasesHeat is a property test over the dictionary:
// every chemical that makes water alkaline (pH 9 or more at 0.05 mol/L)
// neutralised by an equal amount of hydrochloric acid gives off heat, or
// takes up at most a little. Protonating a base is exothermic for hydroxide
// (−55.8 kJ/mol), ammonia (−52), carbonate, phosphate, silicate and the
// like; the least favourable real case is bicarbonate whose carbon dioxide
// leaves the liquid, HCO3- + H+ → CO2(g) + H2O, about +12.7 kJ/mol (NBS
// Tables 1982, from memory). So the heat of the acid with the base, less
// that of each with water alone, must not fall below −20 kJ per mol of acid.
// A base whose species lack ΔfH° while water and H+ are counted (silicate,
// until its rows had values) fails it by hundreds of kJ per mol.
func TestNeutralisingBasesReleasesHeat(t *testing.T) {
	e := mustEngine(t)
	released := func(req string) (float64, float64, bool) {
		r, err := e.Ask(req, engine.AskOptions{})
		if err != nil || r.Heat == nil || r.Heat.HeatReleasedkJ == nil {
			return 0, 0, false
		}
		return *r.Heat.HeatReleasedkJ, r.Conditions.PH, true
	}
	const molHCl = 1.0 // 10 L of 0.1 M
	acidAlone, _, ok := released("mix 10 L HCl 0.1 M + 10 L water")
	if !ok {
		t.Fatal("no heat for hydrochloric acid with water")
	}
	tried := 0
	for _, c := range e.Tables.Chemicals {
		if c.Class != engine.StrongBase && c.Class != engine.WeakBase && c.Class != engine.SolubleSalt {
			continue
		}
		baseAlone, ph, ok := released("mix 10 L " + c.Formula + " 0.1 M + 10 L water")
		if !ok || ph < 9 {
			continue
		}
		both, _, ok := released("mix 10 L " + c.Formula + " 0.1 M + 10 L HCl 0.1 M")
		if !ok {
			continue
		}
		tried++
		if q := (both - baseAlone - acidAlone) / molHCl; q < -20 {
			t.Errorf("%s (pH %.1f with water) neutralised by HCl: %.1f kJ per mol acid, want ≥ −20 (exothermic or nearly so)", c.Formula, ph, q)
		}
	}
	if tried < 10 {
		t.Errorf("only %d bases tried; the dictionary or the request format changed", tried)
	}
	t.Logf("%d bases neutralised", tried)
}
