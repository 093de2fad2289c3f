package advice_test

import (
	"strings"
	"testing"
)

// TestClosedHeadspacePressure: a stated headspace the gas overfills at the
// ambient pressure gets the pressure rise the gas would give if the vessel
// were really closed (ideal gas, V = nRT/P), and an action never to close
// it. Hand figure: 50 L of 32 % HCl (about 500 mol) on 10 kg CaCO3 (100 mol)
// gives about 100 mol CO2; 100 mol × 0.08314 L·bar/(mol·K) × 325 K / 1000 L
// ≈ 2.7 bar at the mix's 52 °C (CODATA 2018 R). An unstated headspace, or
// a stated one large enough, keeps its answer.
func TestClosedHeadspacePressure(t *testing.T) {
	a := mustAdvisor(t)
	cases := []struct {
		req    string
		gas    string
		lo, hi float64 // bar; 0, 0: none
	}{
		{"mix 50 L HCl 32 % + 10 kg CaCO3 at headspace 1 m3", "CO2", 2.2, 3.0},
		{"mix 100 L NaHSO3 38 % + 50 L H2SO4 50 % at headspace 2 m3", "SO2", 2, 20},
		{"mix 50 L HCl 32 % + 10 kg CaCO3", "CO2", 0, 0},
		{"mix 50 L HCl 32 % + 10 kg CaCO3 at headspace 10 m3", "CO2", 0, 0},
	}
	for _, tc := range cases {
		r := ask(t, a, tc.req)
		h := gasOf(r, tc.gas)
		if h == nil {
			t.Errorf("%s: no %s judged", tc.req, tc.gas)
			continue
		}
		got := h.Gas.ClosedRiseBar
		if got < tc.lo || got > tc.hi {
			t.Errorf("%s: closed rise %g bar, want %g–%g", tc.req, got, tc.lo, tc.hi)
		}
		if never := strings.Contains(h.Action, "Never close this vessel"); never != (tc.hi > 0) {
			t.Errorf("%s: action %q: never-close %v, want %v", tc.req, h.Action, never, tc.hi > 0)
		}
	}
}
