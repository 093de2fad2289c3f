package advice_test

import (
	"testing"

	"mixward/engine"
)

// TestReview16 holds pours a plant-chemist review of the build would not
// sign, each with the reason and its source.
func TestReview16(t *testing.T) {
	a := mustAdvisor(t)
	for _, tc := range []struct {
		name, req string
		level     engine.Level
		want      string // a hazard code that must be there ("" for none)
		not       string // a hazard code that must not be there, final or along the pour
	}{
		{
			// Hydrazine with nitrite and a strong acid: the acid is the
			// acidification the azide-forming rule forbids, even where the
			// hydrazine buffers the final mix near pH 8.4 (Bretherick's
			// Handbook of Reactive Chemical Hazards, hydrazine with nitrous
			// acid, from memory).
			name: "hydrazine, nitrite and acid", req: "mix 100 L hydrazine 15 % + 100 L sodium nitrite 10 % + 50 L HCl 10 %",
			level: engine.DoNotMix, want: "azide-forming",
		},
		{
			// The trade's potassium peroxymonosulfate is the triple salt
			// 2KHSO5·KHSO4·K2SO4; it oxidizes chloride to chlorine in its
			// own acid (suppliers' safety data sheets: chlorine with
			// chlorides, from memory; E° HSO5-/HSO4- about 1.82 V against
			// 1.36 V for Cl2/Cl-, CRC Handbook, Electrochemical Series).
			// 200 L of 5 % is 200 × 1.03 × 0.05 / 614.7 × 2 = 33.5 mol HSO5-.
			name: "peroxymonosulfate with brine", req: "mix 200 L potassium peroxymonosulfate 5 % + 20 L sodium chloride 20 %",
			level: engine.DoNotMix, want: "chlorine-release",
		},
		{
			// Bleach is made and kept in brine: a trace of bleach in a
			// brine tank gives no chlorine without acid (common practice,
			// no source). The first millilitres of bleach on the salt used
			// to stand at 73 ppm over 2 mL of liquid: 6e-9 mol.
			name: "brine with a little bleach", req: "mix 1000 L water + 25 kg sodium chloride + 2 L NaOCl 12.5 %",
			level: engine.NoConcern, not: "chlorine-release",
		},
		{
			// A litre of 5 % bleach with a litre of 5 % citric acid: a few
			// millilitres of chlorine, far above its limit over the liquid
			// (the amount threshold of a pour point must not hide it).
			name: "bleach with citric acid", req: "mix 1 L NaOCl 5 % + 1 L citric acid 5 %",
			level: engine.DoNotMix, want: "chlorine-release",
		},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r := ask(t, a, tc.req)
			if r.Decision == nil || r.Decision.Level != tc.level {
				t.Fatalf("decision %+v, want %s", r.Decision, tc.level)
			}
			codes := map[string]bool{}
			for _, h := range r.Hazards {
				codes[h.Code] = true
			}
			if tc.want != "" && !codes[tc.want] {
				t.Errorf("no %s among %v", tc.want, hazardCodes(r))
			}
			for _, o := range r.Addition.Orders {
				for _, h := range o.Hazards {
					codes[h.Code] = true
				}
			}
			if tc.not != "" && codes[tc.not] {
				t.Errorf("%s fires (final or along the pour)", tc.not)
			}
		})
	}
}
