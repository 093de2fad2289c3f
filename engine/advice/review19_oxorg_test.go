package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
	"mixward/engine/advice"
)

// TestReview19StrongOxidizerWithOrganic holds strong oxidizers with organic
// liquids, and concentrated peroxide heated by the mix, with the reason and
// its source beside each case; the controls must stay as they were.
func TestReview19StrongOxidizerWithOrganic(t *testing.T) {
	a := mustAdvisor(t)
	for _, tc := range []struct {
		name, req string
		level     engine.Level
		want      string // a hazard code of the final mix ("" for none)
		not       string // a hazard code the final mix must not have
		// ifRuns: the least heat, kJ, of the want hazard's runaway (the
		// heat if it runs), 0 for no check.
		ifRuns float64
		// noAction: text the short answer must not hold.
		noAction string
	}{
		{
			// 200 L of 20 % ammonium persulfate (about 175 mol with the
			// 1.00 g/mL the engine assumes without a density table) with
			// neat glycol: S2O8^2- + 2 e- → 2 SO4^2- gives 474 kJ against
			// 286 kJ for ½ O2 + 2 H+ + 2 e- → H2O (ΔfH°, NBS Tables 1982,
			// from memory), so about 397 kJ per persulfate with Thornton's
			// 209 kJ per two electrons (from memory): about 70 MJ if it
			// runs, enough to boil 220 L. Slow in the cold, runaway once
			// warm (Bretherick's Handbook of Reactive Chemical Hazards,
			// peroxodisulfates with organic matter, from memory).
			name: "persulfate with glycol", req: "mix 200 L ammonium persulfate 20 % + 20 L ethylene glycol",
			level: engine.DoNotMix, want: "oxidizer-organic-fire", ifRuns: 60e3,
		},
		{
			// Concentrated chromic acid with acetone: a listed violent
			// reaction (Bretherick's Handbook, chromium trioxide: acetone,
			// from memory); slow in the cold, so its heat is shown if it
			// runs, and no answer may advise dosing the solvent into the
			// oxidizer bath.
			name: "chromic acid with acetone", req: "mix 300 L chromic acid 250 g/L + 20 L acetone",
			level: engine.DoNotMix, want: "oxidizer-organic-fire", ifRuns: 100e3, noAction: "Dose CH3COCH3",
		},
		{
			// Dichromate made acid with sulfuric acid boils with
			// isopropanol in it: boiling solvent over a strong oxidizer
			// (Bretherick's Handbook, chromium trioxide and dichromates
			// with alcohols, from memory).
			name: "dichromate, sulfuric acid and isopropanol", req: "mix 100 L potassium dichromate 10 % + 50 L sulfuric acid 96 % + 20 L isopropanol",
			level: engine.DoNotMix, want: "oxidizer-organic-fire",
		},
		{
			// 200 L of 35 % peracetic acid quenched with 20 L of bisulfite
			// warms to about 59 °C and leaves about 32 % peracid:
			// concentrated peracid heated past about 50 °C can
			// self-accelerate (Bretherick's Handbook, peroxyacetic acid;
			// suppliers' SADT about 50–60 °C; from memory).
			name: "peracetic acid 35 % with bisulfite", req: "mix 200 L peracetic acid 35 % + 20 L sodium bisulfite 38 %",
			level: engine.DoNotMix, want: "hot-peroxide-concentrate",
		},
		{
			// The same with 15 % peracetic acid (with its 23 % peroxide):
			// to about 61 °C with the concentrate in excess.
			name: "peracetic acid 15 % with bisulfite", req: "mix 200 L peracetic acid 15 % + 20 L sodium bisulfite 38 %",
			level: engine.DoNotMix, want: "hot-peroxide-concentrate",
		},
		{
			// Persulfate with acetone: slow cold, runaway warm, as with
			// glycol (Bretherick's Handbook, peroxodisulfates, from memory).
			name: "persulfate with acetone", req: "mix 200 L sodium persulfate 20 % + 20 L acetone",
			level: engine.DoNotMix, want: "oxidizer-organic-fire", ifRuns: 40e3,
		},
		// Controls.
		{
			// A peracetic acid sanitiser dose quenched in plenty of water
			// stays cold and dilute: no hot concentrate (common practice,
			// no source). Each dosed into the water at its own point, the
			// two never meet neat, and what the second meets where it
			// lands in the diluted water is a dosing precaution, not a
			// danger of another water-first sequence: no concern, the
			// advice naming the neat streams never to meet (review 22).
			name: "dilute peracetic acid quench", req: "mix 1000 L water + 2 L peracetic acid 15 % + 1 L sodium bisulfite 38 %",
			level: engine.NoConcern, not: "hot-peroxide-concentrate",
		},
		{
			// Dilute permanganate with a little ethanol: heat, short of
			// scalding (Vogel's Textbook, permanganate with alcohols, from
			// memory; thresholds: common practice, no source).
			name: "permanganate with ethanol", req: "mix 100 L KMnO4 5 % + 10 L ethanol",
			level: engine.WithPrecautions, want: "oxidizer-organic-heat", not: "oxidizer-organic-fire",
		},
		{
			// Concentrated chromic acid with ethanol: fire (Bretherick's
			// Handbook, chromium trioxide with ethanol, from memory).
			name: "chromic acid with ethanol", req: "mix 300 L chromic acid 250 g/L + 20 L ethanol",
			level: engine.DoNotMix, want: "oxidizer-organic-fire",
		},
		{
			// Bleach with acetone stays the haloform reaction, not the
			// oxidizer–solvent rule (Bretherick's Handbook, sodium
			// hypochlorite with acetone, from memory).
			name: "bleach with acetone", req: "mix 100 L acetone + 100 L NaOCl 12.5 %",
			level: engine.DoNotMix, want: "chloroform-formation", not: "oxidizer-organic-fire",
		},
		{
			// Peroxide 35 % with sulfuric acid: Caro's acid, and no hot
			// concentrate in the final mix (it stays below 50 °C).
			name: "peroxide with sulfuric acid", req: "mix 100 L H2O2 50 % + 20 L sulfuric acid 96 %",
			level: engine.WithPrecautions, not: "hot-peroxide-concentrate",
		},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r := ask(t, a, tc.req)
			if r.Decision == nil || r.Decision.Level != tc.level {
				t.Fatalf("decision %+v, want %s", r.Decision, tc.level)
			}
			h, ok := hazardOf(r, tc.want)
			if tc.want != "" && !ok {
				t.Errorf("no %s among %v", tc.want, hazardCodes(r))
			}
			if _, bad := hazardOf(r, tc.not); tc.not != "" && bad {
				t.Errorf("%s among %v", tc.not, hazardCodes(r))
			}
			if tc.ifRuns > 0 && (h.RunawayHeat == nil || h.RunawayHeat.ReleasedkJ < tc.ifRuns) {
				t.Errorf("%s: heat if it runs %+v, want at least %.0f kJ", tc.want, h.RunawayHeat, tc.ifRuns)
			}
			if short := advice.RenderShort(r); tc.noAction != "" && strings.Contains(short, tc.noAction) {
				t.Errorf("the answer holds %q:\n%s", tc.noAction, short)
			}
		})
	}
}
