package hazard

import (
	"strings"
	"testing"

	"mixward/engine"
)

// TestOwnHazardComparison: a hazard is the stream's own when the stream
// alone has it at least as badly, a gas compared at the same headspace
// (Alone.InTank) and, when the mix's own heat drove it out below scalding,
// at the streams' temperature (GasJudged.ColdPPM).
func TestOwnHazardComparison(t *testing.T) {
	gas := func(ppm, cold float64) engine.Hazard {
		return engine.Hazard{Code: "hf-release", Severity: engine.Danger, Title: "releases hydrogen fluoride",
			Gas: &engine.GasJudged{Formula: "HF", Mol: 0.006, HeadspacePPM: ppm, ColdPPM: cold, LimitPPM: 30, LimitName: "IDLH", Ratio: ppm / 30}}
	}
	alone := func(ppm float64) []engine.Hazard { return []engine.Hazard{gas(ppm, 0)} }
	for _, tc := range []struct {
		name  string
		mix   engine.Hazard
		alone Alone
		own   bool
	}{
		// HF 5 % with lime: 322 ppm over the mix warmed to 45 °C, less
		// than the acid's 170 ppm at 25 °C.
		{"warmed, cold no worse", gas(322, 150), Alone{Name: "HF 5 %", Hazards: alone(170)}, true},
		{"warmed, cold worse", gas(322, 250), Alone{Name: "HF 5 %", Hazards: alone(170)}, false},
		{"not warmed, worse", gas(322, 0), Alone{Name: "HF 5 %", Hazards: alone(170)}, false},
		// A drum's own gas judged by amount under the tank's headspace:
		// nothing in its own headspace, as bad in the tank's.
		{"in the tank's headspace", gas(2190, 0), Alone{Name: "NaHSO3 38 %", InTank: alone(2250)}, true},
		{"worse than in the tank", gas(38670, 0), Alone{Name: "NaHSO3 38 %", InTank: alone(2250)}, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, own := ownHazard(tc.mix, []Alone{tc.alone})
			if own != tc.own {
				t.Errorf("own %v, want %v", own, tc.own)
			}
		})
	}
}

// TestNearBoilingByHeatSource: a mean of 80–100 °C reached by diluting or
// dissolving is a warning (run the concentrate slowly into the water with
// cooling: a routine make-up, common practice, no source); by a reaction or
// mostly by neutralisation it stays a danger, and a mean that boils is
// always one.
func TestNearBoilingByHeatSource(t *testing.T) {
	for _, tc := range []struct {
		name string
		heat Heat
		code string
		sev  engine.Severity
	}{
		{"dilution", Heat{Known: true, ReleasedkJ: 59650, RiseC: 61.4, ReachedC: 81.4, MixingkJ: 59650}, "near-boiling", engine.Warning},
		// 50 kg of caustic flakes in 200 L of water: the state's own
		// change of the solid to ions, less a dilution correction.
		{"dissolving flakes", Heat{Known: true, ReleasedkJ: 51460, RiseC: 56.5, ReachedC: 81.5, MixingkJ: -4177}, "near-boiling", engine.Warning},
		// Caustic on a weak acid (peracetic, acetic): the state's heat,
		// not dilution.
		{"weak acid with caustic", Heat{Known: true, ReleasedkJ: 50000, RiseC: 60, ReachedC: 85, MixingkJ: 10000}, "near-boiling", engine.Danger},
		{"reaction", Heat{Known: true, ReleasedkJ: 5000, RiseC: 60, ReachedC: 85, Reactions: true, MixingkJ: 100}, "near-boiling", engine.Danger},
		{"boils", Heat{Known: true, ReleasedkJ: 42710, RiseC: 80, ReachedC: 100, Boils: true, MixingkJ: 42710}, "boils", engine.Danger},
	} {
		t.Run(tc.name, func(t *testing.T) {
			o := &Outcome{Heat: tc.heat, Chemicals: []string{"H2O", "CH3COOH", "NaOH"}}
			if tc.name == "dissolving flakes" {
				o.Chemicals, o.SolidChemicals = []string{"H2O", "NaOH"}, []string{"NaOH"}
			}
			hs := judgeHeat(o)
			if len(hs) != 1 || hs[0].Code != tc.code || hs[0].Severity != tc.sev {
				t.Fatalf("got %+v, want %s %s", hs, tc.code, tc.sev)
			}
		})
	}
}

// TestHydrofluoricBurnStrength: the HF rule fires from about 0.1 % (EU CLP
// Annex VI specific concentration limits for hydrofluoric acid, from
// memory), not from the few mmol/L of a fluoride salt in water (AWWA
// fluoridation practice, from memory); the order of addition is named only
// for strong acid.
func TestHydrofluoricBurnStrength(t *testing.T) {
	hf := func(molar float64) []Amount {
		return []Amount{{Species: engine.Species{Formula: "HF"}, Molar: molar, Mol: molar}}
	}
	for _, tc := range []struct {
		name   string
		o      Outcome
		fires  bool
		orderd bool
	}{
		{"silicofluoride in water", Outcome{Before: hf(0.0024), After: hf(0.0024), Chemicals: []string{"Na2SiF6", "H2O"}}, false, false},
		{"HF 5 % with lime", Outcome{Before: hf(1.32), After: hf(1.32), Chemicals: []string{"HF", "Ca(OH)2"}}, true, false},
		{"HF 40 % into water", Outcome{Before: hf(11.5), After: hf(11.5), Chemicals: []string{"HF", "H2O"}}, true, true},
		{"fluorosilicic acid handled", Outcome{Before: hf(0.002), After: hf(0.002), Chemicals: []string{"H2SiF6", "H2O"}}, true, false},
		{"HF taken up by caustic", Outcome{Chemicals: []string{"HF", "NaOH"}}, true, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			h, ok := hydrofluoric(&tc.o)
			if ok != tc.fires {
				t.Fatalf("fires %v, want %v", ok, tc.fires)
			}
			if got := strings.Contains(h.Action, "add the acid into the water"); ok && got != tc.orderd {
				t.Errorf("action %q: order named %v, want %v", h.Action, got, tc.orderd)
			}
		})
	}
}
