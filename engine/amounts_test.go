package engine_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"mixward/engine"
)

// liquidsWithoutSpeciesRow are chemicals of the dictionary whose pure form
// is a liquid at 25 °C (melting point below, boiling point above it: CRC
// Handbook of Chemistry and Physics, Physical Constants of Inorganic / of
// Organic Compounds; from memory) but that have no "(l)" row in
// data/species.txt to say so.
var liquidsWithoutSpeciesRow = []string{"N2H4.H2O", "SnCl4", "CH3SO3H", "(C2H5)2NOH", "CH3COCH3", "C6H5CH3", "CH2Cl2", "HOCH2CH2OH"}

// TestNoPureLiquidReadAsOneMolar: every chemical of the dictionary whose
// pure form is a liquid (a "(l)" row of its own formula in the species data,
// or one of liquidsWithoutSpeciesRow) is read at its strength as sold when
// the request gives none, never as a 1 mol/L solution. Metals (mercury) are
// given by mass and are left out.
func TestNoPureLiquidReadAsOneMolar(t *testing.T) {
	e := mustEngine(t)
	liquids := map[string]bool{}
	for _, f := range liquidsWithoutSpeciesRow {
		liquids[f] = true
	}
	for _, ch := range e.Tables.Chemicals {
		if _, ok := e.Tables.Thermo.Get(ch.Formula + "(l)"); ok && ch.Formula != "H2O" && ch.Class != engine.Metal {
			liquids[ch.Formula] = true
		}
	}
	for _, want := range []string{"Br2", "N2H4", "H2SO4", "HNO3", "H2O2", "CH3COOH", "HCOOH", "SO3"} {
		if !liquids[want] {
			t.Errorf("%s is not found as a liquid from the data", want)
		}
	}
	for f := range liquids {
		req := "mix 1 L " + f + " + 10 L water"
		notes, err := engine.ReadNotes(e, req)
		if err != nil {
			t.Errorf("%s: %v", req, err)
			continue
		}
		if got := strings.Join(notes, "; "); !strings.Contains(got, "no strength given for "+f) {
			t.Errorf("%s: not read as the liquid as sold (notes %q)", req, got)
		}
		// The answer itself, where the chemical has data: no 1 mol/L.
		r, err := e.Ask(req, engine.AskOptions{})
		var pe *engine.ParseError
		if errors.As(err, &pe) && pe.Code == "withheld" {
			continue
		}
		if err != nil {
			t.Errorf("%s: %v", req, err)
			continue
		}
		if notes := strings.Join(r.Notes, "; "); strings.Contains(notes, "1 mol/L assumed") {
			t.Errorf("%s: still assumes 1 mol/L: %s", req, notes)
		}
	}
}

// TestNeatLiquidAmounts: neat bromine and hydrazine by volume and by mass.
// 10 L × 3.119 kg/L / 159.81 g/mol = 195 mol Br2; 5 L × 1.004 kg/L /
// 32.05 g/mol = 157 mol N2H4 (densities: CRC Handbook, Physical Constants of
// Inorganic Compounds; from memory).
func TestNeatLiquidAmounts(t *testing.T) {
	e := mustEngine(t)
	for _, tc := range []struct {
		req, species string
		mol          float64
	}{
		{"mix 10 L Br2 + 100 L NaOH 20 %", "Br2", 195.2},
		{"mix 31.19 kg Br2 + 100 L NaOH 20 %", "Br2", 195.2},
		{"mix 5 L N2H4 + 100 L NaOCl 12.5 %", "N2H4", 156.6},
		{"mix 5 L hydrazine hydrate + 100 L water", "N2H4", 5 * 1032 / 50.06},
		{"mix 10 L H2SO4 + 100 L water", "H+", 10 * 1836.1 * 0.98 / 98.08},
	} {
		feed, err := engine.FeedOf(e, tc.req)
		if err != nil {
			t.Fatalf("%s: %v", tc.req, err)
		}
		if got := feed[tc.species]; math.Abs(got-tc.mol) > 0.01*tc.mol {
			t.Errorf("%s: %s %.1f mol in the feed, want %.1f", tc.req, tc.species, got, tc.mol)
		}
	}
}

// TestSolutionByMass: a mass of a named solution is that solution: 152 kg
// of 50 % lye is 152 / 1.5253 = 99.65 L of it (CRC density, from memory), so
// the answer is that of 99.65 L: heat of diluting the lye (≈ 20 kJ/mol, NBS
// Tables 1982 via data/dilution.txt), not of dissolving solid NaOH
// (44.5 kJ/mol), and the volume includes the solution's water.
func TestSolutionByMass(t *testing.T) {
	byMass := ask(t, "mix 152 kg NaOH 50 % + 800 L water")
	byVol := ask(t, "mix 99.65 L NaOH 50 % + 800 L water")
	if v := byMass.Conditions.VolumeL; math.Abs(v-899.65) > 0.5 {
		t.Errorf("by mass: mix volume %.2f L, want 899.65", v)
	}
	qm, qv := *byMass.Heat.HeatReleasedkJ, *byVol.Heat.HeatReleasedkJ
	if math.Abs(qm-qv) > 1e-3*math.Abs(qv) {
		t.Errorf("by mass %.0f kJ, by volume %.0f kJ: want the same", qm, qv)
	}
	if perMol := qm / 1900; perMol < 17 || perMol > 23 {
		t.Errorf("heat %.1f kJ per mol NaOH, want about 20 (dilution of 50 %% lye)", perMol)
	}
	if notes := strings.Join(byMass.ReadAs, "; "); !strings.Contains(notes, "152 kg of NaOH 50 % read as 99.65 L") {
		t.Errorf("read-as notes %q do not say how the mass was read", notes)
	}
	// 1 t of the lye into 5 m³ of water: 12,500 mol at about 20 kJ/mol.
	big := ask(t, "mix 1 t NaOH 50 % + 5 m3 water")
	if perMol := *big.Heat.HeatReleasedkJ / 12500; perMol < 17 || perMol > 23 {
		t.Errorf("1 t of 50 %% lye: %.1f kJ per mol NaOH, want about 20", perMol)
	}
	// A solid blend by shares is still a solid: no solution water.
	blend := ask(t, "mix 100 kg NaOH 50 %, Na2CO3 50 % + 1000 L water")
	if v := blend.Conditions.VolumeL; math.Abs(v-1000) > 0.5 {
		t.Errorf("solid blend: mix volume %.1f L, want 1000 (the blend is not a solution)", v)
	}
	// A solid with no density table is still a solid.
	solid := ask(t, "mix 25 kg NaOH + 200 L water")
	if q := *solid.Heat.HeatReleasedkJ / (25000 / 39.997); q < 40 {
		t.Errorf("solid NaOH: %.1f kJ/mol, want its heat of solution, about 44.5", q)
	}
}

// TestAssumedStrengthInShortAnswer: a strength the engine assumed is said
// where the short answer shows the request's readings (Result.ReadAs).
func TestAssumedStrengthInShortAnswer(t *testing.T) {
	for _, tc := range []struct{ req, want string }{
		{"mix 10 L NaOCl + 10 L water", "no concentration given for NaOCl: 1 mol/L assumed"},
		{"mix 10 L Br2 + 100 L water", "no strength given for Br2: read as the neat liquid"},
		{"mix 10 L H2SO4 + 100 L water", "no strength given for H2SO4: read as 98 % w/w"},
	} {
		r := ask(t, tc.req)
		if got := strings.Join(r.ReadAs, "; "); !strings.Contains(got, tc.want) {
			t.Errorf("%s: read-as %q lacks %q", tc.req, got, tc.want)
		}
	}
}
