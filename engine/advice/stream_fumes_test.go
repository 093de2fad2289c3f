package advice_test

import (
	"testing"

	"mixward/engine"
)

// TestStreamFumesWhenTheMixTakesTheGasUp: neat bromine gives off about
// 0.28 atm of bromine by itself (CRC Handbook, vapour pressure of bromine
// at 25 °C, from memory; NIOSH IDLH 3 ppm), so pouring it into caustic or
// thiosulfate, which take the bromine up, is never "no concern": the
// operator handles the fuming liquid first. Streams that fume at nothing
// above a limit add no such warning.
func TestStreamFumesWhenTheMixTakesTheGasUp(t *testing.T) {
	a := mustAdvisor(t)
	cases := []struct {
		req   string
		fumes bool
	}{
		{"mix 10 L Br2 + 100 L NaOH 20 %", true},
		{"mix 1 L bromine + 100 L Na2S2O3 10 %", true},
		{"mix 100 L NaOH 2 % + 100 L HCl 2 %", false},
		{"mix 1000 L water + 10 kg NaHCO3", false},
	}
	for _, tc := range cases {
		r := ask(t, a, tc.req)
		fumes := false
		for _, h := range r.Hazards {
			fumes = fumes || h.Code == "stream-fumes"
		}
		if fumes != tc.fumes {
			t.Errorf("%s: stream-fumes %v, want %v", tc.req, fumes, tc.fumes)
		}
		if tc.fumes && r.Decision.Level == engine.NoConcern {
			t.Errorf("%s: no concern beside a fuming stream", tc.req)
		}
	}
}
