package advice_test

import (
	"testing"

	"mixward/engine"
	"mixward/engine/advice"
)

// TestOxidizerWithOrganicWithoutData: organic matter the dictionary knows
// but the species data lack (sugar, solvents, surfactants) beside a strong
// oxidizing agent is refused by the class of strong oxidizers with organic
// matter (Bretherick's Handbook of Reactive Chemical Hazards: chlorates,
// permanganates, chromium trioxide, nitric acid, nitrates and hydrogen
// peroxide with organic materials, from memory), not withheld for the
// missing ΔfG°. Without a strong oxidizing agent the missing data still
// withhold the answer, and a surfactant beside dilute acid is still only
// not assessed.
func TestOxidizerWithOrganicWithoutData(t *testing.T) {
	a := mustAdvisor(t)
	refused := []string{
		"mix 10 L H2O2 50 % + 10 L toluene",
		"mix 200 L CrO3 25 % + 10 L hexane",
		"mix 10 kg NaClO3 + 100 L sucrose 20 %",
		"mix 10 kg NaNO3 + 20 L dichloromethane",
		"mix 100 L benzalkonium chloride 50 % + 100 L HNO3 68 %",
		"mix 100 L benzalkonium chloride 50 % + 10 kg KMnO4",
	}
	for _, req := range refused {
		r := ask(t, a, req)
		if r.Decision.Level != engine.DoNotMix {
			t.Errorf("%s: level %v, want %v", req, r.Decision.Level, engine.DoNotMix)
		}
		found := false
		for _, h := range r.Hazards {
			found = found || h.Code == "oxidizer-organic-fire" && h.Severity == engine.Danger
		}
		if !found {
			t.Errorf("%s: no oxidizer-organic-fire danger", req)
		}
		fuel := false
		for _, n := range r.NotAssessed {
			fuel = fuel || n.Role == engine.RoleFuel && n.Mol > 0
		}
		if !fuel {
			t.Errorf("%s: the organic is not listed as not assessed fuel: %+v", req, r.NotAssessed)
		}
	}
	if _, err := askErr(a, "mix 100 L water + 20 L sucrose 50 %"); err == nil {
		t.Errorf("water with sucrose: answered, want withheld for the missing data")
	}
	if r := ask(t, a, "mix 100 L HNO3 1 % + 1 L benzalkonium chloride"); r.Decision.Level == engine.DoNotMix {
		t.Errorf("dilute nitric acid with a quat: refused, want the quat only not assessed")
	}
}

func askErr(a *advice.Advisor, req string) (*engine.Result, error) {
	return a.Ask(req, engine.AskOptions{})
}
