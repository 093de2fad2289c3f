package thermo

import (
	"errors"
	"math"
	"strings"
	"testing"
	"testing/fstest"
)

const testElements = `# test elements (IUPAC CIAAW abridged weights; from memory)
H | hydrogen | 1.008 | test
O | oxygen | 15.999 | test
Cl | chlorine | 35.45 | test
Fe | iron | 55.845 | test
Na | sodium | 22.990 | test
`

// testSpecies: values of the NBS Tables 1982 and CODATA Key Values 1989, from
// memory; the rows with "invented" are made up to exercise the parser.
const testSpecies = `# species | ΔfG° | ΔfH° | S° | attributes | source
H+        | 0        | 0        | 0       | -     | convention
H2(g)     | 0        | 0        | 130.68  | -     | CODATA Key Values 1989; from memory
O2(g)     | 0        | 0        | 205.152 | -     | CODATA Key Values 1989; from memory
H2O       | -237.129 | -285.830 | 69.95   | -     | CODATA Key Values 1989; from memory
OH-       | -157.244 | -229.994 | -10.75  | -     | NBS Tables 1982; from memory
Fe^3+     | -4.7     | -48.5    | -315.9  | -     | NBS Tables 1982; from memory
Fe^2+     | -78.90   | -89.1    | -137.7  | -     | NBS Tables 1982; from memory
Cl2(g)    | 0        | 0        | 223.066 | -     | CODATA Key Values 1989; from memory
Cl2       | 6.94     | -23.4    | 121     | -     | NBS Tables 1982; from memory
Cl-       | -131.228 | -167.080 | 56.60   | -     | CODATA Key Values 1989; from memory
H2O2      | -134.03  | -191.17  | 143.9   | O=-1  | NBS Tables 1982; from memory
Na+       | -261.905 | -240.12  | 59.0    | minor | NBS Tables 1982; from memory
NaCl(s)   | -384.138 | -411.153 | 72.13   | -     | NBS Tables 1982; from memory
FeOH^2+   | -229.4   | -        | -       | inert | NBS Tables 1982; from memory
`

func testFS(species string) fstest.MapFS {
	return fstest.MapFS{
		"elements.txt": {Data: []byte(testElements)},
		"species.txt":  {Data: []byte(species)},
	}
}

func mustLoad(t testing.TB, species string) *DB {
	t.Helper()
	db, err := Load(testFS(species))
	if err != nil {
		t.Fatal(err)
	}
	return db
}

func TestLoadReadsRows(t *testing.T) {
	db := mustLoad(t, testSpecies)
	if err := db.Check(); err != nil {
		t.Fatalf("Check of the test table: %v", err)
	}
	if n := len(db.All()); n != 14 {
		t.Fatalf("loaded %d species, want 14", n)
	}
	h2o2, ok := db.Get("H2O2")
	if !ok || h2o2.DfG != -134.03 || !h2o2.HasDfH || h2o2.Ox["O"] != -1 || h2o2.Ox["H"] != 1 || h2o2.Line != 12 {
		t.Errorf("H2O2 read as %+v", h2o2)
	}
	fe, _ := db.Get("FeOH^2+")
	if fe == nil || !fe.Inert || fe.HasDfH || fe.HasS || fe.Ox["Fe"] != 3 {
		t.Errorf("FeOH^2+ read as %+v", fe)
	}
	if na, _ := db.Get("Na+"); na == nil || !na.Minor {
		t.Errorf("Na+ read as %+v", na)
	}
	// Cl2 and Cl2(aq) are one species, Cl2(g) another.
	a, _ := db.Get("Cl2(aq)")
	b, _ := db.Get("Cl2")
	g, _ := db.Get("Cl2(g)")
	if a == nil || a != b || g == nil || g == a {
		t.Errorf("Get(Cl2(aq)) = %p, Get(Cl2) = %p, Get(Cl2(g)) = %p", a, b, g)
	}
	if w, ok := db.Get("H2O(l)"); !ok || w.Text != "H2O" {
		t.Errorf("Get(H2O(l)) = %v, %v; want the H2O row", w, ok)
	}
	for _, missing := range []string{"Fe(s)", "ClO-", "nonsense^^", ""} {
		if _, ok := db.Get(missing); ok {
			t.Errorf("Get(%q) found a species", missing)
		}
	}
}

func TestWithin(t *testing.T) {
	db := mustLoad(t, testSpecies)
	var got []string
	for _, sp := range db.Within(map[string]bool{"Cl": true}) {
		got = append(got, sp.Text)
	}
	want := "H+ H2(g) O2(g) H2O OH- Cl2(g) Cl2 Cl- H2O2"
	if strings.Join(got, " ") != want {
		t.Errorf("Within(Cl) = %v, want %s", got, want)
	}
}

func TestLoadRejects(t *testing.T) {
	tests := []struct{ name, row, want string }{
		{"fields", "Fe^2+ | -78.9 | -89.1 | -137.7 | -", "data/species.txt:2: has 5 fields, want 6"},
		{"species", "Fe^^2+ | -78.9 | -89.1 | -137.7 | - | src", "data/species.txt:2: species \"Fe^^2+\""},
		{"electron", "e- | 0 | 0 | 0 | - | src", "the electron has no row"},
		{"ΔfG missing", "Fe^2+ | - | -89.1 | -137.7 | - | src", "ΔfG° \"-\" is not a number"},
		{"ΔfH not a number", "Fe^2+ | -78.9 | abc | -137.7 | - | src", "ΔfH° \"abc\" is not a number"},
		{"S NaN", "Fe^2+ | -78.9 | -89.1 | NaN | - | src", "S° \"NaN\" is not a number"},
		{"attribute", "Fe^2+ | -78.9 | -89.1 | -137.7 | heavy | src", "attribute \"heavy\" is not X=n"},
		{"attribute element", "Fe^2+ | -78.9 | -89.1 | -137.7 | O=-1 | src", "names O, which Fe does not contain"},
		{"attribute value", "H2O2 | -134 | -191 | 143.9 | O=x | src", "like O=-1"},
		{"attribute twice", "H2O2 | -134 | -191 | 143.9 | O=-1 O=-1 | src", "is given twice"},
		{"attributes empty", "H2O2 | -134 | -191 | 143.9 |  | src", "write - when there are none"},
		{"duplicate", "H+ | 0 | 0 | 0 | - | again", "data/species.txt:2: H+ is already listed at line 1"},
		{"duplicate spelling", "H2O(l) | -237.129 | -285.83 | 69.95 | - | again", "H2O(l) is already listed"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			first := "H+ | 0 | 0 | 0 | - | convention\n"
			if strings.HasPrefix(tc.row, "H2O(l)") {
				first = "H2O | -237.129 | -285.83 | 69.95 | - | x\n"
			}
			_, err := Load(testFS(first + tc.row + "\n"))
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Fatalf("Load(%q) error = %v, want it to contain %q", tc.row, err, tc.want)
			}
		})
	}
	if _, err := Load(testFS("# nothing\n")); err == nil || !strings.Contains(err.Error(), "no rows") {
		t.Errorf("Load(empty table) error = %v", err)
	}
	if _, err := Load(fstest.MapFS{"elements.txt": {Data: []byte(testElements)}}); err == nil || !strings.Contains(err.Error(), "data/species.txt: cannot read") {
		t.Errorf("Load(no species.txt) error = %v", err)
	}
	if _, err := Load(fstest.MapFS{"species.txt": {Data: []byte(testSpecies)}}); err == nil || !strings.Contains(err.Error(), "data/elements.txt: cannot read") {
		t.Errorf("Load(no elements.txt) error = %v", err)
	}
}

func TestCheckRejects(t *testing.T) {
	tests := []struct{ name, row, want string }{
		{"no source", "Fe(s) | 0 | 0 | 27.28 | - | -", "data/species.txt:16: Fe(s) has no source"},
		{"unknown element", "Zn^2+ | -147.1 | -153.89 | -112.1 | - | src", "element \"Zn\" is not in data/elements.txt"},
		{"peroxide without override", "Na2O2(s) | -447.7 | -510.87 | 95.0 | - | src", "give the odd element's state as an attribute"},
		{"implausible state", "FeO5- | -300 | - | - | - | invented", "Fe an oxidation state of 9"},
		{"neutral S° not positive", "FeCl3(s) | -334.0 | -399.49 | -142.3 | - | src", "S° -142.3 J/(mol·K) is outside the sane range"},
		{"ion S° too low", "FeCl^2+ | -156.8 | -180.3 | -900 | - | src", "is outside the sane range"},
		{"kJ written in J", "NaOH(s) | -379.49 | -425609 | 64.46 | - | src", "imply an entropy of formation"},
		{"pair disagrees with S°", "FeCl2(s) | -302.3 | -341.79 | 217.99 | - | src", "but S° and the elements' S° give"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			tbl := testSpecies + "Fe(s) | 0 | 0 | 27.28 | - | CODATA Key Values 1989; from memory\n"
			if strings.HasPrefix(tc.row, "Fe(s)") {
				tbl = testSpecies + tc.row + "\n"
			} else {
				tbl += tc.row + "\n"
			}
			db, err := Load(testFS(tbl))
			if err != nil {
				t.Fatal(err)
			}
			err = db.Check()
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Fatalf("Check(%q) error = %v, want it to contain %q", tc.row, err, tc.want)
			}
		})
	}
	db := mustLoad(t, strings.Replace(testSpecies, "H+        | 0        | 0        | 0 ", "H+        | 0        | 0        | 1 ", 1))
	if err := db.Check(); err == nil || !strings.Contains(err.Error(), "data/species.txt:2: H+ is zero") {
		t.Errorf("Check(H+ with S° 1) error = %v", err)
	}
}

// The real FeCl2(s) has S° 117.95 J/(mol·K) (NBS Tables 1982, from memory);
// the row above adds 100 to it, which the pair check must see.

func TestGibbsRT(t *testing.T) {
	db := mustLoad(t, testSpecies)
	w, _ := db.Get("H2O")
	// At 298.15 K, μ°/RT is ΔfG°/(R·298.15) (R from gonum's CODATA constants).
	if got, want := w.GibbsRT(T0), -237.129e3/(R*T0); math.Abs(got-want) > 1e-12*math.Abs(want) {
		t.Errorf("GibbsRT(298.15) = %.12g, want %.12g", got, want)
	}
	// At 350 K with constant ΔfH°: ΔfG = ΔfH − T·(ΔfH − ΔfG°)/298.15.
	want := (-285.830 - 350*(-285.830+237.129)/T0) * 1000 / (R * 350)
	if got := w.GibbsRT(350); math.Abs(got-want) > 1e-9 {
		t.Errorf("GibbsRT(350) = %g, want %g", got, want)
	}
	// Without ΔfH° the value is ΔfG° at every temperature.
	fe, _ := db.Get("FeOH^2+")
	if got, want := fe.GibbsRT(350), -229.4e3/(R*350); math.Abs(got-want) > 1e-9 {
		t.Errorf("GibbsRT(350) of FeOH^2+ = %g, want %g", got, want)
	}
}

func TestWithheld(t *testing.T) {
	fsys := testFS(testSpecies)
	fsys["withheld.txt"] = &fstest.MapFile{Data: []byte("# formula | missing | source\nNaBH4 | no reliable ΔfG° of BH4- at hand | test\n")}
	db, err := Load(fsys)
	if err != nil {
		t.Fatal(err)
	}
	w, ok := db.Withheld("NaBH4")
	if !ok || w.Line != 2 || len(db.AllWithheld()) != 1 {
		t.Fatalf("Withheld(NaBH4) = %+v, %v", w, ok)
	}
	err = db.WithheldError("NaBH4")
	if !errors.Is(err, ErrWithheld) || !strings.HasPrefix(err.Error(), "no thermodynamic data for NaBH4; answer withheld") {
		t.Errorf("WithheldError(NaBH4) = %v", err)
	}
	if db.WithheldError("NaCl") != nil {
		t.Error("NaCl reported as withheld")
	}
	if w.Role != "" {
		t.Errorf("a three-column row has role %q, want none", w.Role)
	}
	fsys["withheld.txt"] = &fstest.MapFile{Data: []byte("NaBH4 | no reliable ΔfG° | reductant | test\n")}
	if db, err = Load(fsys); err != nil {
		t.Fatal(err)
	}
	if w, ok := db.Withheld("NaBH4"); !ok || w.Role != RoleReductant || w.Source != "test" || w.Missing != "no reliable ΔfG°" {
		t.Errorf("four-column row read as %+v", w)
	}
	for _, bad := range []struct{ row, want string }{
		{"NaBH4 | x", "data/withheld.txt:1: has 2 fields"},
		{"NaBH4 |  | src", "neither may be empty"},
		{"nabh4 | x | src", "write the formula as in chemicals.txt"},
		{"NaBH4 | x | s\nNaBH4 | y | s", "data/withheld.txt:2: NaBH4 is already listed at line 1"},
		{"NaBH4 | x | maybe | s", "role \"maybe\": write reductant, oxidant or inert"},
		{"NaBH4 | x | reductant | s | extra", "has 5 fields"},
	} {
		fsys["withheld.txt"] = &fstest.MapFile{Data: []byte(bad.row + "\n")}
		if _, err := Load(fsys); err == nil || !strings.Contains(err.Error(), bad.want) {
			t.Errorf("Load(withheld %q) error = %v, want %q", bad.row, err, bad.want)
		}
	}
}
