package hazard

import (
	"testing"

	"mixward/engine"
)

// TestProductPathFamilies: nitrate esters from mixed acid and a polyol, and
// a peracid concentrate meeting strong caustic, on Outcomes built by hand at
// the review's concentrations (Y5, F06) and at routine neighbours'.
func TestProductPathFamilies(t *testing.T) {
	sp := func(f string, ch int) engine.Species {
		return engine.Species{Formula: f, Charge: ch, Phase: engine.Aqueous}
	}
	out := func(ph float64, xs ...Amount) *Outcome {
		return &Outcome{VolumeL: 100, HeadspaceL: 100, TemperatureC: 25, PressureKPa: 101.325, PH: ph, Before: xs, After: xs}
	}
	am := func(f string, ch int, m float64) Amount { return Amount{Species: sp(f, ch), Molar: m, Mol: m * 100} }
	for _, tc := range []struct {
		name string
		rule func(*Outcome) (engine.Hazard, bool)
		o    *Outcome
		want engine.Severity // "" for silent
	}{
		// Bretherick's Handbook, glycerol: nitric acid, sulfuric acid (from memory).
		{"Y5 mixed acid with glycerol", nitrateEsters, out(-1.7, am("NO3", -1, 6.7), am("HSO4", -1, 8.2), am("C3H5(OH)3", 0, 1.5)), engine.Danger},
		{"mixed acid with a trace of glycol", nitrateEsters, out(-1.7, am("NO3", -1, 6.7), am("HSO4", -1, 8.2), am("HOCH2CH2OH", 0, 0.05)), engine.Danger},
		{"dilute acid rinse with glycerol", nitrateEsters, out(0.3, am("NO3", -1, 0.3), am("HSO4", -1, 0.2), am("C3H5(OH)3", 0, 0.1)), ""},
		{"strong nitric acid alone with glycerol", nitrateEsters, out(-0.8, am("NO3", -1, 6.7), am("C3H5(OH)3", 0, 1.5)), ""},
		{"mixed acid with no polyol", nitrateEsters, out(-1.7, am("NO3", -1, 6.7), am("HSO4", -1, 8.2)), ""},
		// Bretherick's Handbook, peroxyacetic acid: bases (from memory).
		{"F06 peracid 15 % with caustic 50 %", peracidAlkali, out(14.6, am("CH3CO3", -1, 1.1), am("HO2", -1, 3.7), am("OH", -1, 3.5)), engine.Danger},
		{"200 ppm peracid into caustic CIP", peracidAlkali, out(12.7, am("CH3CO3", -1, 0.0026), am("OH", -1, 0.5)), ""},
		{"peracid concentrate into water", peracidAlkali, out(2.5, am("CH3CO3H", 0, 0.4), am("H2O2", 0, 0.6)), ""},
	} {
		h, ok := tc.rule(tc.o)
		switch {
		case tc.want == "" && ok:
			t.Errorf("%s: %s (%s), want silent", tc.name, h.Code, h.Severity)
		case tc.want != "" && !ok:
			t.Errorf("%s: silent, want %s", tc.name, tc.want)
		case ok && h.Severity != tc.want:
			t.Errorf("%s: %s, want %s", tc.name, h.Severity, tc.want)
		}
	}
}

// TestSulfideBeforeNitric: the mix as combined gives off hydrogen sulfide
// that the mixed state, where dilute nitric acid has taken it to sulfur,
// no longer holds: X6, 12.8 mol Na2S (1 kg) into nitric acid 10 % (Vogel,
// sulfides with dilute nitric acid, from memory). With hypochlorite there,
// which takes it as fast as acid frees it, none is counted ahead.
func TestSulfideBeforeNitric(t *testing.T) {
	gas := engine.Species{Formula: "H2S", Phase: engine.Gas}
	aq := func(f string, ch int) engine.Species {
		return engine.Species{Formula: f, Charge: ch, Phase: engine.Aqueous}
	}
	before := []Amount{{Species: aq("NO3", -1), Molar: 1.67, Mol: 167}, {Species: aq("H2S", 0), Molar: 0.095, Mol: 9.5}, {Species: gas, Mol: 3.3}}
	o := &Outcome{VolumeL: 100, HeadspaceL: 100, TemperatureC: 25, PressureKPa: 101.325, PH: -0.07, Before: before}
	ps := map[string]*pool{"H2S": {molecular: 1}}
	sulfideBeforeNitric(o, ps)
	if got := ps["H2S"].mol; got < 12.7 || got > 12.9 {
		t.Errorf("X6: H2S pool %g mol, want 12.8 (all the sulfide)", got)
	}
	o.Before = append(o.Before, Amount{Species: aq("OCl", -1), Molar: 0.5, Mol: 50})
	ps = map[string]*pool{"H2S": {molecular: 1}}
	sulfideBeforeNitric(o, ps)
	if got := ps["H2S"].mol; got != 0 {
		t.Errorf("with hypochlorite: H2S pool %g mol, want none counted ahead", got)
	}
}

// TestSmallPuff: sulfur dioxide above its limit in the closed headspace is
// a danger only when the headspace takes up enough to bring ReferenceAirL of
// air to IDLH 100 ppm (0.10 mol at 25 °C), or stands at SevereRatio × the
// limit. X2 (0.0195 mol, 477 ppm in 1000 L) is a precaution; M06 (0.276 mol,
// 6753 ppm) is not; a bucket at 20000 ppm is a danger by concentration.
func TestSmallPuff(t *testing.T) {
	g := &GasData{Formula: "SO2", LimitPPM: 100, LimitName: "IDLH"}
	for _, tc := range []struct {
		name         string
		headspaceL   float64
		ppm          float64
		wantSmallish bool
	}{
		{"X2", 1000, 477, true},
		{"M06", 1000, 6753, false},
		{"bucket at 200× IDLH", 10, 20000, false},
		{"large tank at 2× IDLH", 50000, 200, false},
	} {
		o := &Outcome{VolumeL: tc.headspaceL, HeadspaceL: tc.headspaceL, TemperatureC: 25, PressureKPa: 101.325}
		got := smallPuff(o, g, Headspace{PPM: tc.ppm}, tc.ppm/g.LimitPPM)
		if got != tc.wantSmallish {
			t.Errorf("%s: small puff %v, want %v", tc.name, got, tc.wantSmallish)
		}
	}
	cl2 := &GasData{Formula: "Cl2", LimitPPM: 10, LimitName: "IDLH"}
	o := &Outcome{VolumeL: 1000, HeadspaceL: 1000, TemperatureC: 25, PressureKPa: 101.325}
	if smallPuff(o, cl2, Headspace{PPM: 50}, 5) {
		t.Error("chlorine is not judged by amount")
	}
}
