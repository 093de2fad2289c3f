package engine

import (
	"reflect"
	"testing"

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
