package engine_test

import (
	"math"
	"strings"
	"testing"
	"testing/fstest"

	"mixward/data"
	"mixward/engine"
)

// TestSolidsCappedAtSolubility: a solid poured into plain water counts only
// as far as the water dissolves it at 20 °C (data/solubility.txt; CRC
// Handbook, Aqueous Solubility of Inorganic Compounds, from memory), so
// 5 kg of ferrous sulfate in 8 L is a saturated solution of about 2.1 kg
// (26.3 g per 100 g water), not 4 mol/L of Fe2+ and twice the heat.
// A reaction that takes the solid into solution, hot water, or water of a
// stated pH leave the solid as given.
func TestSolidsCappedAtSolubility(t *testing.T) {
	fe := func(r *engine.Result) float64 {
		for _, s := range r.Species {
			if s.Text == "Fe^2+" {
				return s.Molar
			}
		}
		return 0
	}
	capped := ask(t, "mix 8 L water + 5 kg FeSO4")
	// 2.104 kg of FeSO4 (151.91 g/mol) in 8 L: about 1.6 mol/L as mixed,
	// less what forms complexes and ion pairs.
	if m := fe(capped); m > 1.8 || m < 0.8 {
		t.Errorf("8 L water + 5 kg FeSO4: Fe2+ %.2f mol/L, want at most the saturated 1.6 mol/L", m)
	}
	if !strings.Contains(strings.Join(capped.Notes, "\n"), "only 2.104 kg of the 5 kg of FeSO4 dissolves in 8 L") {
		t.Errorf("no note on the undissolved solid: %q", capped.Notes)
	}
	// The heat is that of 2.104 kg: 13.85 mol × 70 kJ ≈ 970 kJ (NBS Tables
	// 1982 ΔfH°, from memory), not 33 mol × 70 kJ.
	if h := capped.Heat; h == nil || h.HeatReleasedkJ == nil || math.Abs(*h.HeatReleasedkJ-970) > 100 {
		t.Errorf("heat of the saturated make-up: %+v, want about 970 kJ", capped.Heat)
	}
	for _, req := range []string{
		"mix 200 L water + 5 kg FeSO4",                // dissolves
		"mix 8 L water, 60 C + 5 kg FeSO4",            // hot: more dissolves
		"mix 8 L water, pH 2 + 5 kg FeSO4",            // not plain water
		"mix 8 L HCl 10 % + 5 kg Na2CO3",              // the acid takes it up
		"mix 8 L water + 5 kg FeSO4 + 1 L H2SO4 10 %", // a solution beside it
	} {
		for _, n := range ask(t, req).Notes {
			if strings.Contains(n, "dissolves in") {
				t.Errorf("%s: capped (%q), want the solid as given", req, n)
			}
		}
	}
}

// TestSolubilityTableChecks: the loader refuses a row for an unknown
// chemical, a bad figure, a duplicate, and a figure that disagrees with the
// same chemical's saturated ceiling, each with file:line.
func TestSolubilityTableChecks(t *testing.T) {
	e := mustEngine(t)
	if len(e.Tables.Solubility) < 15 {
		t.Fatalf("%d solubility rows loaded", len(e.Tables.Solubility))
	}
	for rows, want := range map[string]string{
		"XyZ | 10 | CRC\n":                     "solubility.txt:1:",
		"FeSO4 | -3 | CRC\n":                   "must be above 0",
		"FeSO4 | 26 | CRC\nFeSO4 | 26 | CRC\n": "already has a row at line 1",
		"NaCl | 50 | CRC\n":                    "disagrees with NaCl's saturated row",
		"FeSO4 | lots | CRC\n":                 "is not a number",
	} {
		_, err := engine.LoadSolubility(fstest.MapFS{engine.SolubilityFile: &fstest.MapFile{Data: []byte(rows)}}, e.Tables)
		if err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("%q: error %v, want %q", rows, err, want)
		}
	}
	if _, err := engine.LoadSolubility(data.FS, e.Tables); err != nil {
		t.Errorf("data/solubility.txt: %v", err)
	}
}

// TestDissolutionHeatsAdd: two solids dissolved together give the sum of
// their heats alone; one without data for its dissolved form no longer
// drops the other (nickel sulfate with boric acid read "1 kJ taken up").
func TestDissolutionHeatsAdd(t *testing.T) {
	heat := func(req string) float64 {
		r := ask(t, req)
		if r.Heat == nil || r.Heat.HeatReleasedkJ == nil {
			t.Fatalf("%s: no heat figure", req)
		}
		return *r.Heat.HeatReleasedkJ
	}
	ni, b := heat("mix 200 L water + 40 kg NiSO4"), heat("mix 200 L water + 5 kg H3BO3")
	both := heat("mix 200 L water + 40 kg NiSO4 + 5 kg H3BO3")
	if math.Abs(both-(ni+b)) > 0.03*math.Abs(ni) {
		t.Errorf("NiSO4 %.0f kJ + H3BO3 %.0f kJ alone, %.0f kJ together", ni, b, both)
	}
	if b > -1500 {
		t.Errorf("5 kg boric acid: %.0f kJ released, want about 1780 kJ taken up (81 mol × 22 kJ, NBS Tables 1982, from memory)", b)
	}
}
