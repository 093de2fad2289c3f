package advice_test

import (
	"strings"
	"testing"
)

// TestClosedHeadspacePressure: a stated headspace the gas overfills at the
// ambient pressure gets the pressure rise the gas would give if the vessel
// were really closed (ideal gas, V = nRT/P), and an action never to close
// it (the gas-pressure hazard's). Hand figure: 50 L of 32 % HCl (about 500
// mol) on 10 kg CaCO3 (100 mol) gives about 100 mol CO2; 100 mol × 0.08314
// L·bar/(mol·K) × 325 K / 1000 L ≈ 2.7 bar at the mix's 52 °C (CODATA 2018
// R). The unstated headspace, as large as the liquid (50 L), gets the
// pressure line too (about 54 bar); a stated one large enough (10 m³, about
// 0.27 bar) keeps its answer.
func TestClosedHeadspacePressure(t *testing.T) {
	a := mustAdvisor(t)
	cases := []struct {
		req    string
		gas    string  // the gas whose own closed rise is checked; "": all the gas (gas-pressure)
		lo, hi float64 // bar; 0, 0: none
		never  bool    // the gas-pressure hazard and its never-close action
	}{
		{"mix 50 L HCl 32 % + 10 kg CaCO3 at headspace 1 m3", "CO2", 2.2, 3.0, true},
		{"mix 100 L NaHSO3 38 % + 50 L H2SO4 50 % at headspace 2 m3", "SO2", 2, 20, true},
		{"mix 50 L HCl 32 % + 10 kg CaCO3", "CO2", 0, 0, true},
		{"mix 50 L HCl 32 % + 10 kg CaCO3", "", 40, 70, true},
		{"mix 50 L HCl 32 % + 10 kg CaCO3 at headspace 10 m3", "CO2", 0, 0, false},
	}
	for _, tc := range cases {
		r := ask(t, a, tc.req)
		p, ok := hazardOf(r, "gas-pressure")
		if never := ok && strings.Contains(p.Action, "Never close this vessel"); never != tc.never {
			t.Errorf("%s: gas-pressure %v, action %q: never-close %v, want %v", tc.req, ok, p.Action, never, tc.never)
		}
		if tc.gas == "" {
			bar := 0.0
			for _, c := range p.Counts {
				bar = max(bar, c.ClosedRiseBar)
			}
			if bar < tc.lo || bar > tc.hi {
				t.Errorf("%s: all the gas closed in %g bar, want %g–%g", tc.req, bar, tc.lo, tc.hi)
			}
			continue
		}
		h := gasOf(r, tc.gas)
		if h == nil {
			t.Errorf("%s: no %s judged", tc.req, tc.gas)
			continue
		}
		got := h.Gas.ClosedRiseBar
		if got < tc.lo || got > tc.hi {
			t.Errorf("%s: closed rise %g bar, want %g–%g", tc.req, got, tc.lo, tc.hi)
		}
	}
}
