package engine_test

import (
	"strings"
	"testing"
	"testing/fstest"

	"mixward/data"
	"mixward/engine"
)

// TestLoadProductsRefusesBadRows: each bad row of products.txt is reported
// with the file, its line and what to fix.
func TestLoadProductsRefusesBadRows(t *testing.T) {
	tb, err := engine.Load(data.FS)
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct{ row, want string }{
		{"XyZ9 | 15 | H2O2 23 | test", "is not a chemical"},
		{"CH3CO3H | 0 | H2O2 23 | test", "above 0 and at most 100"},
		{"CH3CO3H | 15 | H2O2 | test", "FORMULA % w/w"},
		{"CH3CO3H | 15 | CH3CO3H 10 | test", "not another chemical"},
		{"CH3CO3H | 60 | H2O2 30, CH3COOH 20 | test", "more than the whole product"},
		{"CH3CO3H | 15 | H2O2 23 | ", "source"},
	} {
		_, err := engine.LoadProducts(fstest.MapFS{engine.ProductsFile: &fstest.MapFile{Data: []byte(tc.row + "\n")}}, tb)
		if err == nil || !strings.Contains(err.Error(), "products.txt:1") || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%q: error %v, want products.txt:1 and %q", tc.row, err, tc.want)
		}
	}
	got, err := engine.LoadProducts(data.FS, tb)
	if err != nil {
		t.Fatal(err)
	}
	ps := got["CH3CO3H"]
	if len(ps) != 3 || ps[0].Grade != 5 || ps[2].Grade != 35 {
		t.Errorf("peracetic acid grades %+v, want 5, 15 and 35 rising", ps)
	}
}

// FuzzLoadProducts: any text either loads into rows that hold together
// (grades in (0, 100], companions that with the grade stay within the
// product) or is refused with the file named.
func FuzzLoadProducts(f *testing.F) {
	f.Add("CH3CO3H | 15 | H2O2 23, CH3COOH 16 | test\n")
	f.Add("CH3CO3H | 15 | H2O2 x | test\n")
	f.Add("# comment\n\nCH3CO3H|5|H2O2 22|s\n")
	tb, err := engine.Load(data.FS)
	if err != nil {
		f.Fatal(err)
	}
	f.Fuzz(func(t *testing.T, s string) {
		got, err := engine.LoadProducts(fstest.MapFS{engine.ProductsFile: &fstest.MapFile{Data: []byte(s)}}, tb)
		if err != nil {
			if !strings.Contains(err.Error(), "products.txt") {
				t.Fatalf("LoadProducts error %q does not name the file", err)
			}
			return
		}
		for f, ps := range got {
			for _, p := range ps {
				sum := p.Grade
				for _, c := range p.Companions {
					sum += c.PercentWW
				}
				if _, ok := tb.Lookup(f); !ok || !(p.Grade > 0 && p.Grade <= 100) || sum > 100 {
					t.Fatalf("LoadProducts(%q) accepted %s %+v", s, f, p)
				}
			}
		}
	})
}
