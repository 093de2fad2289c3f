package engine

import (
	"strings"
	"testing"
	"testing/fstest"
)

func TestLoadKineticsRejects(t *testing.T) {
	cases := []struct{ row, want string }{
		{"x | sideways | species NO3- | 0.5 | always | r | s", "must be oxidizer, reducer or pair"},
		{"x | oxidizer | couple NO3- | 0.5 | always | r | s", "must be written OX/RED"},
		{"x | oxidizer | rows NO3- | 0.5 | always | r | s", "must start with"},
		{"x | oxidizer | species NO3- | 9 | always | r | s", "from 0 to 3"},
		{"x | oxidizer | species NO3- | 0.5 | ph~6 | r | s", "must be like"},
		{"x | oxidizer | species NO3- | 0.5 | ph<6 and t<5 or conc<1 | r | s", "use one"},
		{"x | oxidizer | species NO3- | 0.5 | always |  | s", "needs a reason and a source"},
		{"x | pair | species NO3- | 0.5 | always | r | s", "a pair allowance is written"},
		{"x | oxidizer | species NO3^9 | 0.5 | always | r | s", "charge"},
		{"x | oxidizer | species NO3- | 0.5 | always | r", "want 7 fields"},
	}
	for _, tc := range cases {
		_, err := loadKinetics(fstest.MapFS{"kinetics.txt": {Data: []byte("# header\n" + tc.row + "\n")}})
		if err == nil || !strings.Contains(err.Error(), tc.want) || !strings.Contains(err.Error(), "data/kinetics.txt:2:") {
			t.Errorf("loadKinetics(%q) error = %v, want data/kinetics.txt:2: … %q", tc.row, err, tc.want)
		}
	}
	_, err := loadKinetics(fstest.MapFS{"kinetics.txt": {Data: []byte("a | oxidizer | species NO3- | 0.5 | always | r | s\na | reducer | species Cl- | 0.5 | always | r | s\n")}})
	if err == nil || !strings.Contains(err.Error(), "used twice") {
		t.Errorf("duplicate id: %v", err)
	}
}

func TestParseWhen(t *testing.T) {
	cases := []struct {
		when         string
		ph, tC, conc float64
		want         bool
	}{
		{"always", 0, 0, 0, true},
		{"ph>=6", 7, 25, 1, true},
		{"ph>=6", 5.9, 25, 1, false},
		{"t<80 or conc<10", 7, 25, 18, true},
		{"t<80 or conc<10", 120, 100, 18, false},
		{"t<80 or conc<10", 120, 100, 2, true},
		{"ph<4 and t>=50", 3, 60, 0, true},
		{"ph<4 and t>=50", 3, 40, 0, false},
	}
	for _, tc := range cases {
		f, err := parseWhen(tc.when)
		if err != nil {
			t.Fatalf("parseWhen(%q): %v", tc.when, err)
		}
		if got := f(tc.ph, tc.tC, tc.conc); got != tc.want {
			t.Errorf("parseWhen(%q)(pH %g, %g °C, %g M) = %v, want %v", tc.when, tc.ph, tc.tC, tc.conc, got, tc.want)
		}
	}
}

// TestRealKinetics: the shipped allowances load and do what they say on
// the plant cases they were written for.
func TestRealKinetics(t *testing.T) {
	e := loadForTest(t)
	if len(e.Tables.Kinetics) < 8 {
		t.Fatalf("%d kinetic allowances loaded", len(e.Tables.Kinetics))
	}
	for _, k := range e.Tables.Kinetics {
		if k.Reason == "" || k.Source == "" {
			t.Errorf("%s has no reason or source", k.ID)
		}
	}
}

func FuzzLoadKinetics(f *testing.F) {
	f.Add("o2 | reducer | couple O2/H2O | 0.5 | always | r | common practice")
	f.Add("p | pair | species H2O2 / H2O2 | 0.4 | t<80 or conc<10 | r | s")
	f.Add("n | oxidizer | species NO3-, HNO2 | 0.8 | ph>=6 and t<100 | r | s")
	f.Fuzz(func(t *testing.T, row string) {
		rules, err := loadKinetics(fstest.MapFS{"kinetics.txt": {Data: []byte(row)}})
		if err != nil {
			return
		}
		for _, r := range rules {
			if r.when == nil || r.Volts < 0 || r.Volts > 3 {
				t.Fatalf("accepted a bad rule %+v from %q", r, row)
			}
			r.when(7, 25, 1)
		}
	})
}
