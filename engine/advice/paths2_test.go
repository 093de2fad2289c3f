package advice_test

import (
	"math"
	"strings"
	"testing"

	"mixward/engine"
	"mixward/engine/advice"
)

// TestProductPaths: the review's pours whose products or product class were
// missed, with the hazard the decision must carry and its figure.
func TestProductPaths(t *testing.T) {
	a := mustAdvisor(t)
	for _, tc := range []struct {
		name, req string
		level     engine.Level
		code      string  // a hazard the answer must carry ("" for none)
		gasMol    float64 // its gas figure (0: not checked)
		short     string  // text the short answer must hold ("" for none)
		source    string
	}{
		{"F06 peracid concentrate with caustic", "mix 50 L peracetic acid 15 % + 50 L NaOH 50 %", engine.DoNotMix, "peracid-alkali", 0, "commercial product",
			"Bretherick's Handbook, peroxyacetic acid: bases (from memory); product composition: suppliers' typical data, from memory"},
		{"peracid sanitiser into a rinse", "mix 1000 L water + 1 L peracetic acid 15 %", engine.NoConcern, "", 0, "",
			"common practice (CIP), no source"},
		{"Y5 mixed acid with glycerol", "mix 20 L H2SO4 98 % + 20 L HNO3 68 % + 5 L glycerol", engine.DoNotMix, "nitrate-esters", 0, "never cool and hold",
			"Bretherick's Handbook, glycerol: nitric acid, sulfuric acid (from memory)"},
		{"dilute acid rinse with glycerol", "mix 100 L HNO3 2 % + 100 L H2SO4 2 % + 1 L glycerol", engine.NoConcern, "", 0, "",
			"common practice, no source"},
		{"X6 sulfide into dilute nitric acid", "mix 100 L HNO3 10 % + 1 kg Na2S", engine.DoNotMix, "h2s-release", 12.8, "hydrogen sulfide",
			"Vogel, sulfides with dilute nitric acid (from memory); NIOSH Pocket Guide, H2S IDLH 100 ppm"},
		// Chrome reduction near the stoichiometric dose (8.4 mol S(IV) for 7.5 needed) at pH 1.3: 0.02 mol SO2
		// in the headspace, below the 0.10 mol that brings 25 m³ of air to IDLH 100 ppm: a precaution whose
		// action keeps the acid the reduction needs. M06, 2.8× the dose: 0.28 mol, refused.
		{"X2 chrome reduction near stoichiometric", "mix 1000 L CrO3 0.5 g/L, H2SO4 0.5 % + 0.8 kg Na2S2O5", engine.WithPrecautions, "so2-release", 0, "ORP control at pH 2–3",
			"common practice (chromate reduction in plating effluent), no source; NIOSH IDLH SO2 100 ppm; Sander 2015"},
		{"M06 chrome reduction overdosed", "mix 1000 L CrO3 0.5 g/L, H2SO4 0.5 % + 2 kg Na2S2O5", engine.DoNotMix, "so2-release", 0, "ORP control at pH 2–3",
			"common practice, no source; NIOSH IDLH SO2 100 ppm; Sander 2015"},
		{"metabisulfite into hydrochloric acid", "mix 100 L HCl 10 % + 1 kg Na2S2O5", engine.DoNotMix, "so2-release", 0, "not strongly acidic",
			"NIOSH IDLH SO2 100 ppm; Sander 2015"},
		// Bromine takes thiosulfate to sulfate and acid, and the acid takes the excess thiosulfate to sulfur
		// and sulfur dioxide; iodine stops at tetrathionate, and dechlorination in buffered water makes no gas.
		{"bromine into excess thiosulfate", "mix 1 L bromine + 100 L Na2S2O3 10 %", engine.DoNotMix, "so2-release", 0, "SO2",
			"Vogel's Textbook of Quantitative Chemical Analysis, thiosulfate with the halogens (from memory); NIOSH IDLH SO2 100 ppm"},
		{"iodine titrated with thiosulfate", "mix 1 L iodine 0.05 M + 2 L Na2S2O3 0.1 M", engine.NoConcern, "", 0, "S4O6",
			"Vogel's Textbook of Quantitative Chemical Analysis, iodometry (from memory)"},
		{"dechlorination in bicarbonate water", "mix 1000 L NaOCl 50 ppm, NaHCO3 1 g/L + 1 L Na2S2O3 10 %", engine.NoConcern, "", 0, "SO4",
			"White's Handbook of Chlorination, dechlorination with thiosulfate (from memory)"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r := ask(t, a, tc.req)
			if r.Decision == nil || r.Decision.Level != tc.level {
				t.Fatalf("%s: decision %+v, want %s (source: %s)", tc.req, r.Decision, tc.level, tc.source)
			}
			if tc.code != "" {
				h, ok := hazardOf(r, tc.code)
				if !ok {
					t.Fatalf("%s: no %s among %v", tc.req, tc.code, codesOf(r))
				}
				if tc.gasMol > 0 && (h.Gas == nil || math.Abs(h.Gas.Mol-tc.gasMol) > 0.02*tc.gasMol) {
					t.Errorf("%s: %s gas %+v, want %g mol", tc.req, tc.code, h.Gas, tc.gasMol)
				}
			}
			if sh := advice.RenderShort(r); tc.short != "" && !strings.Contains(sh, tc.short) {
				t.Errorf("%s: short answer lacks %q:\n%s", tc.req, tc.short, sh)
			}
		})
	}
}
