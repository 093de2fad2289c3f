package engine_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"mixward/engine"
)

// TestNotAssessed: a chemical known by name without species data is left
// out of the answer and named when it cannot be the agent of concern; the
// whole answer is withheld when it may be (a reductant meeting an oxidizing
// agent of E° +0.7 V or more; CRC Handbook, Electrochemical Series, for
// Fe^3+/Fe^2+ +0.771 V and OCl-/Cl- +0.89 V).
func TestNotAssessed(t *testing.T) {
	for _, tc := range []struct {
		name, req string
		want      string // name of the chemical not assessed; "" when refused
	}{
		{"oxygen scavenger into water", "mix 100 L DEHA 15 % + 100 L water", "DEHA"},
		{"biocide into water", "mix 1000 L water + 10 L glutaraldehyde 50 %", "glutaraldehyde"},
		{"quat into water", "mix 1000 L water + 5 L benzalkonium chloride 50 %", "benzalkonium chloride"},
		{"quat by its trade word", "mix 1000 L water + 5 L quaternary ammonium 10 %", "quaternary ammonium"},
		{"quat with bleach is answered", "mix 10 L quat 10 % + 100 L NaOCl 1 %", "quat"},
		{"scavenger into acid is answered", "mix 10 L carbohydrazide 5 % + 100 L HCl 5 %", "carbohydrazide"},
		{"scavenger with bleach is refused", "mix 100 L DEHA 15 % + 100 L NaOCl 12.5 %", ""},
		{"scavenger with ferric is refused", "mix 10 L DEHA 15 % + 100 L FeCl3 10 %", ""},
		{"aldehyde with peroxide is refused", "mix 10 L glutaraldehyde 50 % + 10 L H2O2 35 %", ""},
		// A quat is organic matter: concentrated nitric acid or solid
		// permanganate with it is the runaway or fire of oxidizers with
		// organic materials (Bretherick's Handbook, from memory). The
		// engine takes it in as fuel by its amount, for the hazard rules
		// of that class to refuse (engine/advice fuel_without_data_test),
		// instead of withholding the answer; a 1 % nitric rinse beside it
		// is only not assessed.
		{"quat with concentrated nitric is taken in as fuel", "mix 100 L benzalkonium chloride 50 % + 100 L HNO3 68 %", "-organic"},
		{"quat with solid permanganate is taken in as fuel", "mix 100 L benzalkonium chloride 50 % + 10 kg KMnO4", "-organic"},
		{"quat with a dilute nitric rinse is answered", "mix 100 L quat 10 % + 100 L HNO3 1 %", "quat"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r, err := mustEngine(t).Ask(tc.req, engine.AskOptions{})
			if tc.want == "-organic" {
				if err != nil {
					t.Fatalf("Ask: %v, want an answer with the organic taken in as fuel", err)
				}
				if len(r.NotAssessed) != 1 || r.NotAssessed[0].Role != engine.RoleFuel || !(r.NotAssessed[0].Mol > 0) || r.NotAssessed[0].Oxidizer == "" {
					t.Fatalf("not assessed = %+v, want the quat as fuel with its amount and the oxidizer", r.NotAssessed)
				}
				return
			}
			if tc.want == "" {
				var pe *engine.ParseError
				if !errors.As(err, &pe) || pe.Code != "withheld" || !strings.Contains(pe.Message, "may be the reducing agent") {
					t.Fatalf("want a withheld answer naming the agent of concern, got %v", err)
				}
				return
			}
			if err != nil {
				t.Fatalf("Ask: %v", err)
			}
			if len(r.NotAssessed) != 1 || r.NotAssessed[0].Name != tc.want || r.NotAssessed[0].Reason == "" {
				t.Fatalf("not assessed = %+v, want %s", r.NotAssessed, tc.want)
			}
		})
	}
}

// TestZincCyanideIntoAcid: zinc cyanide is counted as its ions, held as
// Zn(CN)4^2- (NBS Tables 1982), so acid into a zinc cyanide bath releases
// hydrogen cyanide from the free cyanide and the complex.
func TestZincCyanideIntoAcid(t *testing.T) {
	r := ask(t, "mix 100 L Zn(CN)2 0.3 M, NaCN 0.5 M + 50 L HCl 10 %")
	found := false
	for _, g := range r.Gases {
		found = found || strings.HasPrefix(g.Text, "HCN") && g.HeadspacePPM > 1000
	}
	if !found {
		t.Errorf("no hydrogen cyanide in the headspace: %+v", r.Gases)
	}
}

// TestHeatOfKnownPart: a species without ΔfH° no longer drops the heat; it
// is counted as a related form with ΔfH° and what that leaves out is
// bounded, or (for protonated amines) it has ΔfH° from its heat of
// ionisation.
func TestHeatOfKnownPart(t *testing.T) {
	for _, tc := range []struct {
		name, req, missing string
		min, max           float64 // kJ released
	}{
		{
			// NaOH 10 % 100 L × 1.109 kg/L (CRC) = 277 mol NaOH against
			// HCl 36 % 20 L × 1.179 kg/L × 0.36 / 36.46 = 232.8 mol: 232.8 ×
			// 55.8 kJ/mol (NBS Tables 1982) = 13.0 MJ, plus the heat of
			// diluting 36 % HCl (about 16 kJ/mol, data/dilution.txt) 3.7 MJ:
			// about 16.7 MJ; the zincate is left as it is in the caustic
			// excess to within the bound.
			name: "zincate bath neutralised", req: "mix 100 L NaOH 10 %, sodium zincate 0.2 M + 20 L HCl 36 %",
			missing: "Zn(OH)4^2-", min: 15000, max: 18500,
		},
		{
			// Morpholine 10 % 100 L ≈ 10 kg / 87.12 g/mol = 114.8 mol, all
			// protonated by 108.7 mol H2SO4: 114.8 × 39 kJ/mol (heat of
			// ionisation, Christensen, Hansen & Izatt 1976; from memory) =
			// 4.5 MJ, plus HSO4- giving up its proton (-21.9 kJ/mol, NBS
			// Tables 1982) for part of it: 4.5-5.6 MJ.
			name: "amine neutralised", req: "mix 100 L morpholine 10 % + 100 L H2SO4 10 %",
			min: 4400, max: 5600,
		},
	} {
		t.Run(tc.name, func(t *testing.T) {
			h := ask(t, tc.req).Heat
			if h == nil || h.HeatReleasedkJ == nil {
				t.Fatalf("no heat figure: %+v", h)
			}
			if q := *h.HeatReleasedkJ; q < tc.min || q > tc.max {
				t.Errorf("heat %.0f kJ, want %.0f-%.0f", q, tc.min, tc.max)
			}
			if tc.missing == "" {
				return
			}
			if h.LeftOutBoundkJ == nil || !(*h.LeftOutBoundkJ > 0) || *h.LeftOutBoundkJ > 0.1*math.Abs(*h.HeatReleasedkJ) {
				t.Errorf("left-out bound %v, want above 0 and below a tenth of the heat", h.LeftOutBoundkJ)
			}
			if !strings.Contains(strings.Join(h.Missing, " "), tc.missing) {
				t.Errorf("missing %v, want %s named", h.Missing, tc.missing)
			}
		})
	}
}

// TestScaleSolids: Na2SiF6 (solubility about 6 g/L; Vogel,
// hexafluorosilicates) and Zn3(PO4)2 (Ksp about 1e-33, CRC Handbook; from
// memory) precipitate from the pours that form them.
func TestScaleSolids(t *testing.T) {
	for _, tc := range []struct {
		req, solid string
		min        float64 // mol
	}{
		// 100 L H2SiF6 25 % × 1.22 kg/L / 144.09 g/mol ≈ 212 mol SiF6^2-
		// against 278 mol Na+: at most 139 mol Na2SiF6, less about 0.032
		// mol/L × 200 L left dissolved.
		{"mix 100 L H2SiF6 25 % + 100 L NaOH 10 %", "Na2SiF6(s)", 120},
		// 68.6 mol Zn^2+ and about 67 mol PO4^3-: well over 10 mol
		// Zn3(PO4)2 even with some phosphate held as HPO4^2-.
		{"mix 100 L Na3PO4 10 % + 100 L ZnSO4 10 %", "Zn3(PO4)2(s)", 10},
	} {
		got := 0.0
		for _, c := range ask(t, tc.req).FinalComposition {
			if c.Text == tc.solid {
				got = c.Mol
			}
		}
		if got < tc.min {
			t.Errorf("%s: %s %.3g mol, want at least %.0f", tc.req, tc.solid, got, tc.min)
		}
	}
}
