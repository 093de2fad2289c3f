package hazard

import (
	"math"
	"strings"
	"testing"
	"testing/fstest"

	"mixward/data"
)

// TestVapourKPaReadsTheTable: interpolation in log space between rows, van
// 't Hoff in temperature from the row's slope, nothing below the first
// row, a lower bound above the last.
func TestVapourKPaReadsTheTable(t *testing.T) {
	rows := []VapourRow{{Gas: "HCl", Percent: 20, KPa25: 0.01, SlopeK: 9000, Source: "a"}, {Gas: "HCl", Percent: 30, KPa25: 1, SlopeK: 9000, Source: "b"}}
	for _, tc := range []struct {
		name         string
		pct, tK      float64
		want         float64
		lower, found bool
	}{
		{"on a row", 20, 298.15, 0.01, false, true},
		{"half way, geometric mean", 25, 298.15, 0.1, false, true},
		{"warmer by van 't Hoff", 30, 318.15, math.Exp(-9000 * (1/318.15 - 1/298.15)), false, true},
		{"below the table", 19, 298.15, 0, false, false},
		{"above the table: the last row, a lower bound", 35, 298.15, 1, true, true},
	} {
		got, lower, _, ok := VapourKPa(rows, tc.pct, tc.tK)
		if ok != tc.found || lower != tc.lower || math.Abs(got-tc.want) > 1e-9*math.Max(1, tc.want) {
			t.Errorf("%s: %g kPa lower %v ok %v, want %g %v %v", tc.name, got, lower, ok, tc.want, tc.lower, tc.found)
		}
	}
}

// TestVapourTableLoads: the embedded table loads, every gas has rising rows
// and a source; bad rows are refused with the line.
func TestVapourTableLoads(t *testing.T) {
	d, err := Load(data.FS)
	if err != nil {
		t.Fatal(err)
	}
	for _, g := range []string{"HCl", "HF", "NH3"} {
		if len(d.Vapour[g]) == 0 {
			t.Errorf("no vapour rows for %s", g)
		}
	}
	gases := map[string]*GasData{"HCl": {}}
	for _, bad := range []string{
		"HCl | 20 | 0.04 | 9003\n",
		"HCl | 20 | -1 | 9003 | src\n",
		"HCl | 20 | 0.04 | 9003 | src\nHCl | 10 | 0.001 | 9003 | src\n",
		"Cl2 | 20 | 0.04 | 9003 | src\n",
	} {
		_, err := loadVapour(fstest.MapFS{VapourFile: {Data: []byte(bad)}}, gases)
		if err == nil || !strings.Contains(err.Error(), VapourFile+":") {
			t.Errorf("%q: error %v, want one naming the line", bad, err)
		}
	}
}
