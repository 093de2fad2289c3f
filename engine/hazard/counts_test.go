package hazard

import (
	"math"
	"testing"

	"mixward/data"
	"mixward/engine"
)

func amt(formula string, charge int, molar, volumeL float64) Amount {
	return Amount{Species: engine.Species{Formula: formula, Charge: charge}, Molar: molar, Mol: molar * volumeL}
}

// TestAcidFumesCountsHydrogenChloride: concentrated sulfuric acid with
// hydrochloric acid counts the hydrogen chloride it drives out, up to the
// chloride the mix holds, against NIOSH's IDLH 50 ppm, with the mixed
// state's headspace figure. Hand check: 100 L of 32 % HCl (1.159 kg/L, CRC
// Handbook, from memory) hold 100 × 1159 × 0.32 / 36.46 = 1017 mol; in 200
// L of mix that is 5.09 mol/L.
func TestAcidFumesCountsHydrogenChloride(t *testing.T) {
	d, err := Load(data.FS)
	if err != nil {
		t.Fatal(err)
	}
	const vol = 200.0
	o := &Outcome{VolumeL: vol, TemperatureC: 25, PressureKPa: 101.325, PH: -1,
		Before:   []Amount{amt("HSO4", -1, 9.2, vol), amt("Cl", -1, 5.085, vol)},
		Measured: map[string]MeasuredGas{"HCl": {Mol: 0.00109, PPM: 133.5}},
	}
	h, ok := volatileAcid(o)
	if !ok {
		t.Fatal("acid-fumes not raised for 9.2 mol/L sulfuric acid with 5.1 mol/L chloride")
	}
	hs := []engine.Hazard{h}
	fillCounts(o, d, hs)
	if len(hs[0].Counts) != 1 {
		t.Fatalf("counts %+v, want hydrogen chloride alone", hs[0].Counts)
	}
	c := hs[0].Counts[0]
	if c.Formula != "HCl" || !c.Beyond || c.InLiquid {
		t.Errorf("count %+v, want HCl beyond the state, as a gas", c)
	}
	if math.Abs(c.Mol-1017) > 0.01*1017 {
		t.Errorf("HCl up to %v mol, want 1017 ± 1 %% (hand)", c.Mol)
	}
	// 1017 mol at 298.15 K and 1.01325 bar: 1017 × 0.0831446 × 298.15 / 1.01325 = 24880 L.
	if math.Abs(c.VolumeL-24880) > 0.01*24880 {
		t.Errorf("volume %v L, want 24880 ± 1 %%", c.VolumeL)
	}
	if c.LimitName != "IDLH" || c.LimitPPM != 50 || math.Abs(c.Ratio-133.5/50) > 0.01 {
		t.Errorf("limit %s %v ppm, ratio %v; want IDLH 50 ppm, 2.67× (headspace 133.5 ppm)", c.LimitName, c.LimitPPM, c.Ratio)
	}
}

// TestOxygenCountsBeyondState: a family's oxygen adds to the state's only
// where the state gives off none of its own. Peracetic acid at pH 8
// breaking down (2 CH3CO3H → 2 CH3COOH + O2) counts half its amount; once
// the state gives off oxygen (the same breakdown, or another), the family's
// figure is told again, not added.
func TestOxygenCountsBeyondState(t *testing.T) {
	const vol = 100.0
	base := func(stateO2 float64) *Outcome {
		return &Outcome{VolumeL: vol, TemperatureC: 25, PressureKPa: 101.325, PH: 8,
			Before:   []Amount{amt("CH3CO3H", 0, 1.0, vol)},
			Measured: map[string]MeasuredGas{"O2": {Mol: stateO2, PPM: math.Min(stateO2*1e5, 1e6)}}}
	}
	for _, tc := range []struct {
		name    string
		stateO2 float64
		beyond  bool
	}{
		{"state gives off no oxygen", 0, true},
		{"state gives off oxygen", 10, false},
	} {
		h, ok := oxygenSurge(base(tc.stateO2))
		if !ok || len(h.Counts) != 1 {
			t.Fatalf("%s: oxygen-surge %v with counts %+v, want one oxygen count", tc.name, ok, h.Counts)
		}
		c := h.Counts[0]
		if c.Formula != "O2" || c.Beyond != tc.beyond {
			t.Errorf("%s: count %+v, want O2 with beyond %v", tc.name, c, tc.beyond)
		}
		// 1.0 mol/L peracid in 100 L: 100 mol, half of it as O2.
		if tc.beyond && math.Abs(c.Mol-50) > 1e-9 {
			t.Errorf("%s: O2 up to %v mol, want 50", tc.name, c.Mol)
		}
	}
}

// TestAlkalinePeroxideCountsWhenHeld: the oxygen of concentrated peroxide
// made alkaline is counted beyond the state only while the state's lock
// holds the breakdown back; where the state runs it, its oxygen is the
// state's. 6 mol/L in 100 L: up to 300 mol O2 (2 H2O2 → 2 H2O + O2).
func TestAlkalinePeroxideCountsWhenHeld(t *testing.T) {
	const vol = 100.0
	for _, held := range []bool{true, false} {
		o := &Outcome{VolumeL: vol, TemperatureC: 25, PressureKPa: 101.325, PH: 8.5, StrongBase: true,
			Before: []Amount{amt("H2O2", 0, 6, vol)}}
		if held {
			o.HeldBack = []HeldBack{{Text: "2 H2O2 → 2 H2O + O2", Lock: "peroxide-self-decomposition"}}
		}
		h, ok := alkalinePeroxide(o)
		if !ok || len(h.Counts) != 1 {
			t.Fatalf("held %v: alkaline-peroxide %v with counts %+v, want one oxygen count", held, ok, h.Counts)
		}
		if c := h.Counts[0]; c.Formula != "O2" || c.Beyond != held || math.Abs(c.Mol-300) > 1e-9 {
			t.Errorf("held %v: count %+v, want O2 up to 300 mol, beyond %v", held, c, held)
		}
	}
}

// TestChloraminesCountedInLiquid: the chloramines stay in the liquid; the
// hazard counts them there, with no exposure limit (NIOSH lists none, from
// memory), so the short answer names the vapour.
func TestChloraminesCountedInLiquid(t *testing.T) {
	const vol = 150.0
	o := &Outcome{VolumeL: vol, TemperatureC: 25, PressureKPa: 101.325, PH: 10,
		Before: []Amount{amt("NH2Cl", 0, 1.25, vol), amt("OCl", -1, 0.1, vol)}}
	h, ok := chloramines(o)
	if !ok || len(h.Counts) != 1 {
		t.Fatalf("chloramine-release %v with counts %+v, want one count", ok, h.Counts)
	}
	if c := h.Counts[0]; c.Formula != "NH2Cl" || !c.InLiquid || c.LimitName != "" || math.Abs(c.Mol-1.25*vol) > 1e-9 {
		t.Errorf("count %+v, want 187.5 mol NH2Cl in the liquid, no limit", c)
	}
}

// TestReasonGivesCounts: a hazard that counts a gas by amount gives the
// amount in its reason, as a gas hazard gives its headspace figure.
func TestReasonGivesCounts(t *testing.T) {
	for _, tc := range []struct {
		h    engine.Hazard
		want string
	}{
		{engine.Hazard{Title: "drives out acid fumes", Counts: []engine.GasCount{{Formula: "HCl", Mol: 1017, VolumeL: 24880, Beyond: true}}},
			"drives out acid fumes: up to 1020 mol HCl (24900 L)"},
		{engine.Hazard{Title: "forms chloramines", Counts: []engine.GasCount{{Formula: "NH2Cl", Mol: 187.5, InLiquid: true}}},
			"forms chloramines: 188 mol NH2Cl in the liquid"},
		{engine.Hazard{Title: "forms explosive nitrogen trichloride"}, "forms explosive nitrogen trichloride"},
	} {
		if got := Reason(tc.h); got != tc.want {
			t.Errorf("Reason = %q, want %q", got, tc.want)
		}
	}
}
