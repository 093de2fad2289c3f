package chem

import (
	"math"
	"strings"
	"testing"
)

// The expected states are the ones general-chemistry texts give for these
// species (common practice, no source); where a convention decides, the case
// says which.
func TestOxidationStates(t *testing.T) {
	tests := []struct {
		name     string
		species  string
		override map[string]float64
		want     map[string]float64
		wantErr  string
	}{
		{name: "thiosulfate, average", species: "S2O3^2-", want: map[string]float64{"S": 2, "O": -2}},
		{name: "tetrathionate, average", species: "S4O6^2-", want: map[string]float64{"S": 2.5, "O": -2}},
		{name: "magnetite, average", species: "Fe3O4(s)", want: map[string]float64{"Fe": 8.0 / 3, "O": -2}},
		{name: "acetic acid", species: "CH3COOH", want: map[string]float64{"C": 0, "H": 1, "O": -2}},
		{name: "formic acid", species: "HCOOH", want: map[string]float64{"C": 2, "H": 1, "O": -2}},
		{name: "cyanide", species: "CN-", want: map[string]float64{"C": 2, "N": -3}},
		// Thiocyanate by electronegativity order N > S > C: S −2, C +4, N −3.
		{name: "thiocyanate", species: "SCN-", want: map[string]float64{"S": -2, "C": 4, "N": -3}},
		// Monochloramine: Pauling's scale makes Cl the more electronegative
		// (N −1, Cl −1); water treatment counts the chlorine as +1 (N −3).
		{name: "monochloramine by rules", species: "NH2Cl", want: map[string]float64{"N": -1, "H": 1, "Cl": -1}},
		{name: "monochloramine, Cl=1", species: "NH2Cl", override: map[string]float64{"Cl": 1}, want: map[string]float64{"N": -3, "H": 1, "Cl": 1}},
		{name: "borohydride", species: "BH4-", want: map[string]float64{"B": 3, "H": -1}},
		{name: "sodium borohydride", species: "NaBH4(s)", want: map[string]float64{"Na": 1, "B": 3, "H": -1}},
		{name: "sodium hydride", species: "NaH(s)", want: map[string]float64{"Na": 1, "H": -1}},
		{name: "lithium aluminium hydride", species: "LiAlH4(s)", want: map[string]float64{"Li": 1, "Al": 3, "H": -1}},
		{name: "hydrogen peroxide, O=-1", species: "H2O2", override: map[string]float64{"O": -1}, want: map[string]float64{"H": 1, "O": -1}},
		{name: "hydrogen peroxide without override", species: "H2O2", wantErr: "O=-1"},
		{name: "superoxide without override", species: "KO2(s)", wantErr: "not the charge +0"},
		{name: "water", species: "H2O", want: map[string]float64{"H": 1, "O": -2}},
		{name: "hydroxide", species: "OH-", want: map[string]float64{"H": 1, "O": -2}},
		{name: "hydrogen gas", species: "H2(g)", want: map[string]float64{"H": 0}},
		{name: "ozone", species: "O3(g)", want: map[string]float64{"O": 0}},
		{name: "ferric ion", species: "Fe^3+", want: map[string]float64{"Fe": 3}},
		{name: "mercurous ion", species: "Hg2^2+", want: map[string]float64{"Hg": 1}},
		{name: "hypochlorite", species: "OCl-", want: map[string]float64{"O": -2, "Cl": 1}},
		{name: "perchlorate", species: "ClO4-", want: map[string]float64{"O": -2, "Cl": 7}},
		{name: "oxygen difluoride", species: "OF2(g)", want: map[string]float64{"O": 2, "F": -1}},
		{name: "iodine monochloride", species: "ICl", want: map[string]float64{"I": 1, "Cl": -1}},
		{name: "permanganate", species: "MnO4-", want: map[string]float64{"Mn": 7, "O": -2}},
		{name: "dichromate", species: "Cr2O7^2-", want: map[string]float64{"Cr": 6, "O": -2}},
		{name: "sodium chloride", species: "NaCl(s)", want: map[string]float64{"Na": 1, "Cl": -1}},
		{name: "methylamine", species: "CH3NH2", want: map[string]float64{"C": -2, "H": 1, "N": -3}},
		{name: "urea", species: "CO(NH2)2", want: map[string]float64{"C": 4, "H": 1, "N": -3, "O": -2}},
		{name: "thiourea", species: "CS(NH2)2", want: map[string]float64{"C": 4, "H": 1, "N": -3, "S": -2}},
		{name: "sulfamic acid", species: "NH2SO3H", want: map[string]float64{"N": -3, "H": 1, "S": 6, "O": -2}},
		{name: "nickel sulfamate", species: "Ni(NH2SO3)2(s)", want: map[string]float64{"Ni": 2, "N": -3, "H": 1, "S": 6, "O": -2}},
		{name: "alum", species: "KAl(SO4)2(s)", want: map[string]float64{"K": 1, "Al": 3, "S": 6, "O": -2}},
		{name: "ferricyanide", species: "Fe(CN)6^3-", want: map[string]float64{"Fe": 3, "C": 2, "N": -3}},
		{name: "ferrocyanide", species: "Fe(CN)6^4-", want: map[string]float64{"Fe": 2, "C": 2, "N": -3}},
		{name: "dicyanoaurate", species: "Au(CN)2-", want: map[string]float64{"Au": 1, "C": 2, "N": -3}},
		{name: "hexaamminecobalt(III)", species: "Co(NH3)6^3+", want: map[string]float64{"Co": 3, "N": -3, "H": 1}},
		{name: "tetraamminecopper(II)", species: "Cu(NH3)4^2+", want: map[string]float64{"Cu": 2, "N": -3, "H": 1}},
		{name: "chromite", species: "FeCr2O4(s)", want: map[string]float64{"Fe": 2, "Cr": 3, "O": -2}},
		{name: "molybdenite, metal takes the balance", species: "MoS2(s)", want: map[string]float64{"Mo": 4, "S": -2}},
		{name: "pyrite", species: "FeS2(s)", want: map[string]float64{"Fe": 2, "S": -1}},
		{name: "override of an absent element", species: "H2O", override: map[string]float64{"N": 1}, wantErr: "does not contain"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			sp, err := ParseSpecies(tc.species)
			if err != nil {
				t.Fatal(err)
			}
			a, err := ParseFormula(sp.Formula)
			if err != nil {
				t.Fatal(err)
			}
			got, err := OxidationStates(a, sp.Charge, tc.override)
			if tc.wantErr != "" {
				if err == nil || !strings.Contains(err.Error(), tc.wantErr) {
					t.Fatalf("OxidationStates(%s) = %v, %v; want an error containing %q", tc.species, got, err, tc.wantErr)
				}
				return
			}
			if err != nil {
				t.Fatalf("OxidationStates(%s): %v", tc.species, err)
			}
			if len(got) != len(tc.want) {
				t.Fatalf("OxidationStates(%s) = %v, want %v", tc.species, got, tc.want)
			}
			sum := 0.0
			for el, w := range tc.want {
				if math.Abs(got[el]-w) > 1e-9 {
					t.Errorf("OxidationStates(%s)[%s] = %g, want %g (all: %v)", tc.species, el, got[el], w, got)
				}
				sum += got[el] * float64(a[el])
			}
			if math.Abs(sum-float64(sp.Charge)) > 1e-9 {
				t.Errorf("states of %s add up to %g, not the charge %d", tc.species, sum, sp.Charge)
			}
		})
	}
}

func TestOxidationStatesBadInput(t *testing.T) {
	if _, err := OxidationStates(nil, 0, nil); err == nil {
		t.Error("OxidationStates(no atoms) gave no error")
	}
	if _, err := OxidationStates(Atoms{"Fe": 0}, 0, nil); err == nil {
		t.Error("OxidationStates(Fe count 0) gave no error")
	}
	if _, err := OxidationStates(Atoms{"O": 1, "H": 2}, 0, map[string]float64{"O": math.NaN()}); err == nil {
		t.Error("OxidationStates(NaN override) gave no error")
	}
}

func TestReadAtomicWeights(t *testing.T) {
	good := "# c\nH | hydrogen | 1.008 | src\n\nO | oxygen | 15.999 | src\n"
	w, err := ReadAtomicWeights("data/elements.txt", []byte(good))
	if err != nil || len(w) != 2 || w["O"] != 15.999 {
		t.Fatalf("ReadAtomicWeights(good) = %v, %v", w, err)
	}
	bad := []struct{ row, want string }{
		{"H | hydrogen | 1.008", "data/elements.txt:2: has 3 fields"},
		{"fe | iron | 55.8 | src", "data/elements.txt:2: \"fe\" is not an element symbol"},
		{"H | protium | 1.008 | src", "data/elements.txt:2: H is listed twice"},
		{"Fe | hydrogen | 55.8 | src", "is already used by the element at line 1"},
		{"Fe | iron | -5 | src", "between 0 and 300"},
		{"Fe | iron | 55.8 | ", "field 4 is empty"},
	}
	for _, tc := range bad {
		_, err := ReadAtomicWeights("data/elements.txt", []byte("H | hydrogen | 1.008 | src\n"+tc.row+"\n"))
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("ReadAtomicWeights(%q) error = %v, want %q", tc.row, err, tc.want)
		}
	}
	if _, err := ReadAtomicWeights("e.txt", []byte("# only a comment\n")); err == nil || !strings.Contains(err.Error(), "no rows") {
		t.Errorf("ReadAtomicWeights(empty) error = %v", err)
	}
}
