package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
	"mixward/engine/advice"
)

// TestReview19Gas holds the gas amounts and gas surges of a mix to one
// rule: any gas, toxic or not, whose amount would raise the closed
// headspace (the stated one, else as large as the liquid) by half a bar or
// more gets the pressure figure, the action never to close the vessel, and
// at least "mix only with precautions"; a gas the state gives off as a
// bubble smaller than the headspace is shared between the liquid and the
// headspace by Henry's law, not left in the liquid. Hand figures: ideal
// gas, R = 0.08314 L·bar/(mol·K) (CODATA 2018); densities of the streams
// CRC Handbook, concentrative properties of aqueous solutions (from
// memory); kH(CO2) 0.034 mol/(L·atm) (Sander 2015, from memory); pKa of
// acetic acid 4.76 and of carbonic acid 6.35 and 10.33 (CRC Handbook,
// dissociation constants, from memory); 0.5 bar threshold: common
// practice, no source.
func TestReview19Gas(t *testing.T) {
	a := mustAdvisor(t)
	for _, tc := range []struct {
		name, req string
		level     engine.Level // the least level the mix must have
		most      engine.Level // the highest level it may have
		lo, hi    float64      // bar of the gas-pressure hazard; 0, 0: none
		gas       string       // a gas whose amount the answer's gases must give
		gasLo     float64      // mol, for gas
		gasHi     float64
	}{
		{
			// Nitrous acid takes hydroxylamine to nitrous oxide, one of
			// each (Bretherick's Handbook of Reactive Chemical Hazards,
			// hydroxylamine salts with nitrites, from memory): nitrite
			// 50 L × 1.148 kg/L × 0.20 / 69.00 g/mol ≈ 166 mol, the state
			// gives 179 mol (the excess hydroxylamine gives some more);
			// 166–179 mol × 0.08314 × 344.6 K (the mix's 71 °C) / 250 L ≈
			// 19–20.5 bar. Nitrous oxide has no exposure limit in the
			// gas table, yet it bursts a closed tank.
			name: "nitrous oxide from hydroxylamine and nitrite", req: "mix 200 L hydroxylamine sulfate 10 % + 50 L sodium nitrite 20 %",
			level: engine.WithPrecautions, most: engine.DoNotMix, lo: 15, hi: 25, gas: "N2O", gasLo: 150, gasHi: 200,
		},
		{
			// Ammonium nitrite decomposes to nitrogen, one N2 per
			// ammonium (Bretherick's Handbook, ammonium nitrite, from
			// memory): ammonium chloride 50 L × 1.072 × 0.25 / 53.49 ≈
			// 250 mol, the state gives 234 mol N2; × 0.08314 × 373 K /
			// 150 L ≈ 48 bar.
			name: "nitrogen from ammonium and nitrite, hot", req: "mix 100 L sodium nitrite 40 % + 50 L ammonium chloride 25 % at 80 C",
			level: engine.DoNotMix, most: engine.DoNotMix, lo: 35, hi: 60, gas: "N2", gasLo: 200, gasHi: 260,
		},
		{
			// Hydrochloric acid on soda ash: HCl 100 L × 1.048 × 0.10 /
			// 36.46 ≈ 287 mol, carbonate 189 mol as the tool reads it
			// (no density table for 20 %: 1.00 assumed), CO2 287 − 189 ≈
			// 98 mol; × 0.08314 × 301.6 K / 200 L ≈ 12 bar.
			name: "strong acid on soda ash", req: "mix 100 L hydrochloric acid 10 % + 100 L sodium carbonate 20 %",
			level: engine.WithPrecautions, most: engine.WithPrecautions, lo: 9, hi: 14, gas: "CO2", gasLo: 85, gasHi: 100,
		},
		{
			// Acetic acid all taken by the bicarbonate excess (K =
			// 10^(6.35 − 4.76) ≈ 39): 20 L × 1.012 × 0.10 / 60.05 ≈
			// 33.7 mol H2CO3 (and about 1.8 mol from 2 HCO3- ⇌ CO3^2- +
			// H2CO3). Closed over 1020 L of headspace at 25 °C, 33.7 =
			// p·(0.034 × 1020 + 1020 / 24.47) gives p ≈ 0.44 atm and
			// about 18 mol in the gas (19–20 with the 1.8): not "none in
			// the final mix". At about 0.45 bar the pressure line is not
			// asserted either way.
			name: "acetic acid into a bicarbonate excess", req: "mix 1000 L sodium bicarbonate 5 % + 20 L acetic acid 10 %",
			level: engine.WithPrecautions, most: engine.WithPrecautions, lo: -1, gas: "CO2", gasLo: 15, gasHi: 23,
		},
		{
			// Hydrochloric acid into the same excess: 20 L × 1.048 × 0.10
			// / 36.46 ≈ 57.5 mol CO2; 57.5 = p·(34.7 + 41.7) gives p ≈
			// 0.75 atm, about 31 mol in the gas (33 with the
			// bicarbonate's own), about 0.8 bar closed in.
			name: "strong acid into a bicarbonate excess", req: "mix 1000 L sodium bicarbonate 5 % + 20 L hydrochloric acid 10 %",
			level: engine.WithPrecautions, most: engine.WithPrecautions, lo: 0.6, hi: 1.1, gas: "CO2", gasLo: 27, gasHi: 38,
		},
		{
			// Control: a little soda ash and peroxide in a tonne of water
			// give no gas to speak of (10 g Na2CO3 is 0.094 mol).
			name: "trace of gas stays quiet", req: "mix 1000 L water + 1 L H2O2 3 % + 10 g sodium carbonate",
			level: engine.NoConcern, most: engine.NoConcern,
		},
		{
			// Control: 100 g of bicarbonate (1.19 mol CO2 at most) in
			// acidified water: 1.19 × 0.08314 × 298 / 1001 L ≈ 0.03 bar.
			name: "small fizz stays below the pressure line", req: "mix 1000 L water + 1 L HCl 10 % + 100 g sodium bicarbonate",
			level: engine.NoConcern, most: engine.WithPrecautions,
		},
		{
			// Control: about 100 mol CO2 from 10 kg of limestone in a
			// stated 10 m³ headspace: 100 × 0.08314 × 325 / 10000 ≈
			// 0.27 bar.
			name: "a large stated headspace takes the gas", req: "mix 50 L HCl 32 % + 10 kg CaCO3 at headspace 10 m3",
			level: engine.WithPrecautions, most: engine.DoNotMix,
		},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r := ask(t, a, tc.req)
			if r.Decision == nil {
				t.Fatal("no decision")
			}
			lv := r.Decision.Level
			if level19(lv) < level19(tc.level) || level19(lv) > level19(tc.most) {
				t.Errorf("level %s, want %s to %s", lv, tc.level, tc.most)
			}
			h, ok := hazardOf(r, "gas-pressure")
			bar := 0.0
			for _, c := range h.Counts {
				bar = max(bar, c.ClosedRiseBar)
			}
			switch {
			case tc.lo < 0:
			case tc.hi == 0 && ok:
				t.Errorf("gas-pressure at %g bar, want none: %s", bar, h.Message)
			case tc.hi > 0 && !ok:
				t.Errorf("no gas-pressure hazard, want %g–%g bar; hazards %v", tc.lo, tc.hi, codesOf(r))
			case tc.hi > 0 && (bar < tc.lo || bar > tc.hi):
				t.Errorf("gas-pressure %g bar, want %g–%g", bar, tc.lo, tc.hi)
			}
			forms := formsLine19(r)
			if tc.hi > 0 {
				if !strings.Contains(h.Action, "Never close this vessel") || !containsAction(r, "Never close this vessel") {
					t.Errorf("no never-close action: %q; decision actions %q", h.Action, r.Decision.Actions)
				}
				if !strings.Contains(forms, "bar: vent it") {
					t.Errorf("Forms line without the pressure: %s", forms)
				}
				if strings.Contains(forms, "no gas of concern") {
					t.Errorf("Forms line says no gas of concern: %s", forms)
				}
			}
			if tc.gas != "" {
				got := 0.0
				for _, g := range r.Gases {
					if strings.TrimSuffix(g.Text, "(g)") == tc.gas {
						got += g.Mol
					}
				}
				if got < tc.gasLo || got > tc.gasHi {
					t.Errorf("%s given off %g mol, want %g–%g", tc.gas, got, tc.gasLo, tc.gasHi)
				}
				if strings.Contains(forms, tc.gas+" none in the final mix") {
					t.Errorf("Forms line says none in the final mix: %s", forms)
				}
			}
		})
	}
}

// containsAction reports whether one of the decision's actions holds s.
func containsAction(r *engine.Result, s string) bool {
	for _, a := range r.Decision.Actions {
		if strings.Contains(a, s) {
			return true
		}
	}
	return false
}

// level19 orders the levels: no concern, with precautions, do not mix.
func level19(l engine.Level) int {
	return map[engine.Level]int{engine.NoConcern: 0, engine.WithPrecautions: 1, engine.DoNotMix: 2}[l]
}

// formsLine19 is the Forms line of the short answer.
func formsLine19(r *engine.Result) string {
	for _, l := range strings.Split(advice.RenderShort(r), "\n") {
		if strings.HasPrefix(l, "Forms:") {
			return l
		}
	}
	return ""
}
