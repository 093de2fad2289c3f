package engine

import (
	"math"
	"reflect"
	"strings"
	"testing"
	"testing/fstest"

	"mixward/data"
)

// TestFastLoadMatchesLoad: the parse-only loader New uses builds exactly the
// tables the validating Load builds from data/.
func TestFastLoadMatchesLoad(t *testing.T) {
	full, err := Load(data.FS)
	if err != nil {
		t.Fatalf("Load(data/): %v", err)
	}
	fast, err := loadFast(data.FS)
	if err != nil {
		t.Fatalf("loadFast(data/): %v", err)
	}
	if !reflect.DeepEqual(full, fast) {
		for i := range full.Chemicals {
			if !reflect.DeepEqual(full.Chemicals[i], fast.Chemicals[i]) {
				t.Errorf("chemical %d: Load %+v, loadFast %+v", i, full.Chemicals[i], fast.Chemicals[i])
			}
		}
		t.Fatal("loadFast(data/) differs from Load(data/)")
	}
	// A table loadFast cannot parse is still refused, with file and line.
	m := dtTableFS()
	m[HalfReactionsFile].Data = append(m[HalfReactionsFile].Data, "bad | acid | Fe^3+ + e- Fe^2+ | 0.77 | test\n"...)
	if _, err := loadFast(m); err == nil {
		t.Error("loadFast accepted a reduction without ->")
	}
}

// BenchmarkNew measures start-up: every table parsed, the species data
// included.
func BenchmarkNew(b *testing.B) {
	b.ReportAllocs()
	for b.Loop() {
		if _, err := New(data.FS); err != nil {
			b.Fatal(err)
		}
	}
}

// TestCheckTables: the tables of data/ pass every check New skips, and a bad
// row in any of them is reported with its file and line.
func TestCheckTables(t *testing.T) {
	if err := CheckTables(data.FS); err != nil {
		t.Fatalf("CheckTables(data/):\n%v", err)
	}
	m := dtTableFS()
	m[ChemicalsFile].Data = append(m[ChemicalsFile].Data, "NaCl | soluble-salt | Na+ + 2 Cl- | salt | test\n"...)
	m["species.txt"] = &fstest.MapFile{Data: []byte("H+ | 0 | 0 | 0 | - | convention\nNa+ | -261.905 | -240.12 | 59.0 | - | \n")}
	err := CheckTables(m)
	for _, want := range []string{"data/chemicals.txt:", "is not neutral", "data/species.txt:2: Na+ has no source"} {
		if err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("CheckTables(bad tables) error = %v, want it to contain %q", err, want)
		}
	}
}

// TestNewLoadsSpeciesData: New hands the species data to the tables.
func TestNewLoadsSpeciesData(t *testing.T) {
	e, err := New(data.FS)
	if err != nil {
		t.Fatal(err)
	}
	w, ok := e.Tables.Thermo.Get("H2O")
	// NBS Tables 1982 -237.129, CODATA Key Values 1989 -237.140 kJ/mol.
	if !ok || math.Abs(w.DfG-(-237.13)) > 0.02 {
		t.Errorf("Thermo.Get(H2O) = %+v, %v; want the water row, ΔfG° about -237.13 kJ/mol", w, ok)
	}
	m := dtTableFS()
	for _, name := range []string{"hazards.txt", "enthalpies.txt"} {
		b, err := data.FS.ReadFile(name)
		if err != nil {
			t.Fatal(err)
		}
		m[name] = &fstest.MapFile{Data: b}
	}
	m["species.txt"] = &fstest.MapFile{Data: []byte("H+ | 0 | 0 | 0 | - | convention\nH+ | 0 | 0 | 0 | - | again\n")}
	if _, err := New(m); err == nil || !strings.Contains(err.Error(), "data/species.txt:2: H+ is already listed at line 1") {
		t.Errorf("New with a duplicate species row: error = %v", err)
	}
}
