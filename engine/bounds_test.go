package engine_test

import (
	"errors"
	"io/fs"
	"math"
	"strings"
	"testing"
	"testing/fstest"

	"mixward/data"
	"mixward/engine"
)

// TestParseBounds checks every plausibility bound of the request language
// on both sides: the edge value is accepted, the value just past it is
// refused with its code, at the position of the number, naming the number.
//
// The ceilings are worked by hand from data/ceilings.txt:
// HCl 42 % × 1.21 g/mL × 10 = 508.2 g/L; ÷ 36.458 g/mol = 13.94 mol/L.
// NaOH 52.5 % × 1.55 × 10 = 813.75 g/L; ÷ 39.997 = 20.35 mol/L.
// H2SO4 100 % × 1.8305 × 10 = 1830.5 g/L; ÷ 98.072 = 18.66 mol/L.
// NaOCl has no row: 3000 g/L ÷ 74.44 g/mol = 40.30 mol/L.
func TestParseBounds(t *testing.T) {
	cases := []struct {
		in    string
		code  string // "" when the request must be accepted
		token string // the refused number as typed
	}{
		// Concentrations with a ceiling row.
		{"Zn + HCl 13.9 M", "", ""},
		{"Zn + HCl 14 M", "bad-concentration", "14"},
		{"Zn + HCl 40 M", "bad-concentration", "40"},
		{"Zn + HCl 13900 mM", "", ""},
		{"Zn + HCl 14000 mM", "bad-concentration", "14000"},
		{"Zn + HCl 42 %", "", ""},
		{"Zn + HCl 42.1 %", "bad-concentration", "42.1"},
		{"Zn + HCl 45 % w/w", "bad-concentration", "45"},
		{"Zn + HCl 508 g/L", "", ""},
		{"Zn + HCl 509 g/L", "bad-concentration", "509"},
		{"Zn + HCl 1e308 g/L", "bad-concentration", "1e308"},
		{"Zn + HCl 508000 mg/L", "", ""},
		{"Zn + HCl 509000 mg/L", "bad-concentration", "509000"},
		{"Zn + HCl 508000 ppm", "", ""},
		{"Zn + HCl 509000 ppm", "bad-concentration", "509000"},
		{"Zn + HCl 50.8 % w/v", "", ""},
		{"Zn + HCl 50.9 % w/v", "bad-concentration", "50.9"},
		{"Zn + NaOH 20.3 M", "", ""},
		{"Zn + NaOH 50 M", "bad-concentration", "50"},
		{"Zn + NaOH 52.5 %", "", ""},
		{"Zn + NaOH 53 %", "bad-concentration", "53"},
		{"Zn + 10 L NaOH 99 %", "bad-concentration", "99"},
		{"Zn + 10 kg NaOH 99 %", "", ""}, // a solid: 99 % is its share of the flakes
		{"Zn + H2SO4 18.6 M", "", ""},
		{"Zn + H2SO4 18.7 M", "bad-concentration", "18.7"},
		{"Zn + H2SO4 100 %", "", ""},
		{"Zn + H2SO4 100.1 %", "bad-concentration", "100.1"},
		// Chemicals without a row: the general ceilings.
		{"Zn + NaOCl 40.3 M", "", ""},
		{"Zn + NaOCl 40.4 M", "bad-concentration", "40.4"},
		{"Zn + NaOCl 3000 g/L", "", ""},
		{"Zn + NaOCl 3001 g/L", "bad-concentration", "3001"},
		{"Zn + NaOCl 100 %", "", ""},
		{"Zn + NaOCl 101 %", "bad-concentration", "101"},
		{"Zn + NaOCl 100 % w/v", "", ""},
		{"Zn + NaOCl 100.5 % w/v", "bad-concentration", "100.5"},
		{"Zn + KNO3 1000000 ppm", "", ""},
		{"Zn + KNO3 1000001 ppm", "bad-concentration", "1000001"},
		{"Zn + NaOCl 0 %", "", ""},
		{"Zn + HCl -1 M", "bad-concentration", "-1"},
		// Temperatures: −30 to 150 °C.
		{"Zn + HCl 1 M at -30 C", "", ""},
		{"Zn + HCl 1 M at -30.1 C", "bad-temperature", "-30.1"},
		{"Zn + HCl 1 M at 150 C", "", ""},
		{"Zn + HCl 1 M at 150.1 C", "bad-temperature", "150.1"},
		{"Zn + HCl 1 M at 302 F", "", ""},
		{"Zn + HCl 1 M at 303 F", "bad-temperature", "303"},
		{"Zn + HCl 1 M at 423.15 K", "", ""},
		{"Zn + HCl 1 M at 423.2 K", "bad-temperature", "423.2"},
		{"Zn + HCl 1 M at 1e308 F", "bad-temperature", "1e308"},
		// pH: −2 to 16, of the mix and of a stream.
		{"Zn + HCl 1 M at pH -2", "", ""},
		{"Zn + HCl 1 M at pH -2.1", "bad-ph", "-2.1"},
		{"Zn + water, pH 16", "", ""},
		{"Zn + water, pH 16.1", "bad-ph", "16.1"},
		// Pressures: 1 kPa to 10 MPa.
		{"Zn + HCl 1 M at 1 kPa", "", ""},
		{"Zn + HCl 1 M at 0.99 kPa", "bad-pressure", "0.99"},
		{"Zn + HCl 1 M at 1e-320 kPa", "bad-pressure", "1e-320"},
		{"Zn + HCl 1 M at 0 kPa", "bad-pressure", "0"},
		{"Zn + HCl 1 M at -5 kPa", "bad-pressure", "-5"},
		{"Zn + HCl 1 M at 10000 kPa", "", ""},
		{"Zn + HCl 1 M at 10 MPa", "", ""},
		{"Zn + HCl 1 M at 10.1 MPa", "bad-pressure", "10.1"},
		{"Zn + HCl 1 M at 100 bar", "", ""},
		{"Zn + HCl 1 M at 100.1 bar", "bad-pressure", "100.1"},
		{"Zn + HCl 1 M at 98 atm", "", ""},
		{"Zn + HCl 1 M at 99 atm", "bad-pressure", "99"}, // 10.03 MPa
		// Amounts: 1 µL or 1 mg to 10 000 m³ or 10 000 t.
		{"Zn + 0.001 mL HCl 1 M", "", ""},
		{"Zn + 0.0009 mL HCl 1 M", "bad-amount", "0.0009"},
		{"Zn + 10000 m3 HCl 1 M", "", ""},
		{"Zn + 10001 m3 HCl 1 M", "bad-amount", "10001"},
		{"Zn + 1e308 m3 HCl 1 M", "bad-amount", "1e308"}, // +Inf litres
		{"Zn + 0 L HCl 1 M", "bad-amount", "0"},
		{"0.001 g Zn + HCl 1 M", "", ""},
		{"0.0009 g Zn + HCl 1 M", "bad-amount", "0.0009"},
		{"10000 t Zn + HCl 1 M", "", ""},
		{"10001 t Zn + HCl 1 M", "bad-amount", "10001"},
		// Numbers that are not finite never get as far as a bound.
		{"Zn + HCl 1e400 M", "bad-number", "1e400"},
		{"Zn + HCl NaN M", "unknown-word", "NaN"},
		{"Zn + HCl Inf M", "unknown-word", "Inf"},
	}
	for _, tc := range cases {
		t.Run(tc.in, func(t *testing.T) {
			r, err := parse(t, tc.in, nil)
			if tc.code == "" {
				if err != nil {
					t.Fatalf("ParseRequest(%q): %v, want it accepted", tc.in, err)
				}
				if _, err := mustEngine(t).Predict(r); err != nil {
					t.Errorf("Predict(%q): %v", tc.in, err)
				}
				return
			}
			var pe *engine.ParseError
			if !errors.As(err, &pe) {
				t.Fatalf("ParseRequest(%q) = %v, want a *ParseError %s", tc.in, err, tc.code)
			}
			if pe.Code != tc.code || pe.Token != tc.token || pe.Position != strings.Index(tc.in, tc.token)+1 {
				t.Errorf("ParseRequest(%q) = %s at %d on %q (%s), want %s at %d on %q",
					tc.in, pe.Code, pe.Position, pe.Token, pe.Message, tc.code, strings.Index(tc.in, tc.token)+1, tc.token)
			}
			if pe.Suggestions == nil || len(pe.Message) < 20 {
				t.Errorf("ParseRequest(%q): thin error %+v", tc.in, pe)
			}
		})
	}
}

// TestBoundMessages: a refused concentration says what the ceiling is and
// where it comes from.
func TestBoundMessages(t *testing.T) {
	for in, want := range map[string][]string{
		"HCl 40 M + Zn":     {"saturated hydrochloric acid at 20 °C", "13.94 mol/L", "data/ceilings.txt"},
		"H2SO4 20 M + Zn":   {"pure sulfuric acid", "18.66 mol/L"},
		"NaOCl 50 M + Zn":   {"40.3 mol/L"},
		"Zn at 200 C":       {"−30 to 150 °C"},
		"Zn at 1e-320 kPa":  {"1 kPa to 10 MPa"},
		"1e9 L HCl 1 M":     {"10 000 m³"},
		"Zn + 1,500 L HCl":  {"1500 or 1.5"},
		"Zn + 12,000 L HCl": {"12000 or 12"},
	} {
		_, err := parse(t, in, nil)
		if err == nil {
			t.Errorf("ParseRequest(%q) accepted", in)
			continue
		}
		for _, w := range want {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("ParseRequest(%q) = %q, want it to mention %q", in, err, w)
			}
		}
	}
}

// TestCeilingsAboveDensityTables: every ceiling is at least as strong as
// the strongest solution the density tables list, in % and in mol/L (37 %
// HCl is about 12 mol/L; CRC Handbook, Concentrative Properties of Aqueous
// Solutions; from memory).
func TestCeilingsAboveDensityTables(t *testing.T) {
	tb := mustEngine(t).Tables
	if len(tb.Ceilings) < 10 {
		t.Fatalf("%d ceilings loaded, want the rows of data/ceilings.txt", len(tb.Ceilings))
	}
	for f, c := range tb.Ceilings {
		ch, ok := tb.Lookup(f)
		if !ok {
			t.Fatalf("ceiling for unknown chemical %s", f)
		}
		max, _ := engine.ConcCeiling(tb, ch, engine.Molar, true)
		if got := c.GPerL() / ch.MolarMass; math.Abs(got-max) > 1e-9 {
			t.Errorf("%s: Molar ceiling %g, want %g", f, max, got)
		}
		pts := tb.Densities[f]
		if len(pts) == 0 {
			continue
		}
		top := pts[len(pts)-1]
		if m := top.PercentWW / 100 * top.GPerML * 1000 / ch.MolarMass; m > max {
			t.Errorf("%s: density table's %g %% is %.2f mol/L, above the ceiling %.2f", f, top.PercentWW, m, max)
		}
	}
	hcl, _ := tb.Lookup("HCl")
	d, _ := tb.Density("HCl", 37)
	if m37, max := 37*d*10/hcl.MolarMass, mustCeiling(t, tb, hcl, engine.Molar); m37 < 11.8 || m37 > 12.2 || max < m37 {
		t.Errorf("37 %% HCl = %.2f mol/L (want about 12), ceiling %.2f", m37, max)
	}
}

func mustCeiling(t *testing.T, tb *engine.Tables, ch *engine.Chemical, u engine.ConcUnit) float64 {
	t.Helper()
	v, why := engine.ConcCeiling(tb, ch, u, true)
	if why == "" {
		t.Fatalf("ConcCeiling(%s, %s): no reason given", ch.Formula, u)
	}
	return v
}

// TestLoadCeilingsRefusesBadRows: each kind of bad row is reported with
// its line.
func TestLoadCeilingsRefusesBadRows(t *testing.T) {
	tb, err := engine.Load(data.FS)
	if err != nil {
		t.Fatal(err)
	}
	rows := strings.Join([]string{
		"HCl | 30 | 1.15 | saturated | below the density table's 38 % row",
		"XyZ9 | 10 | 1.1 | saturated | unknown chemical",
		"H2SO4 | 98 | 1.83 | pure | pure but not 100 %",
		"NaOH | 52 | 1.55 | molten | unknown state",
		"KOH | 53 | 9.5 | saturated | density out of range",
		"HNO3 | 100 | 1.51 | pure | first row",
		"HNO3 | 100 | 1.51 | pure | duplicate",
		"NH3 | 34 | 0.88 | saturated",
	}, "\n")
	fsys := fstest.MapFS{engine.CeilingsFile: &fstest.MapFile{Data: []byte(rows)}}
	_, err = engine.LoadCeilings(fsys, tb)
	if err == nil {
		t.Fatal("LoadCeilings accepted bad rows")
	}
	for _, want := range []string{":1:", ":2:", ":3:", ":4:", ":5:", ":7:", ":8:"} {
		if !strings.Contains(err.Error(), "ceilings.txt"+want) {
			t.Errorf("LoadCeilings error does not report line %s:\n%v", want, err)
		}
	}
	if strings.Contains(err.Error(), "ceilings.txt:6:") {
		t.Errorf("the good row 6 was reported:\n%v", err)
	}
	if _, err := engine.LoadCeilings(fstest.MapFS{}, tb); !errors.Is(err, fs.ErrNotExist) && (err == nil || !strings.Contains(err.Error(), "cannot read")) {
		t.Errorf("missing file: %v", err)
	}
}

func FuzzLoadCeilings(f *testing.F) {
	for _, s := range []string{
		"HCl | 42 | 1.21 | saturated | source",
		"H2SO4 | 100 | 1.8305 | pure | source\nHNO3 | 100 | 1.51 | pure | source",
		"# comment\n\nNaOH | 52.5 | 1.55 | saturated | x",
		"HCl | 30 | 1.15 | saturated | x", "XyZ | 1 | 1 | pure | x", "HCl | NaN | Inf | pure | x", "| | | |", "HCl|42|1.21|saturated|x|y",
	} {
		f.Add(s)
	}
	tb, err := engine.Load(data.FS)
	if err != nil {
		f.Fatal(err)
	}
	f.Fuzz(func(t *testing.T, s string) {
		got, err := engine.LoadCeilings(fstest.MapFS{engine.CeilingsFile: &fstest.MapFile{Data: []byte(s)}}, tb)
		if err != nil {
			if !strings.Contains(err.Error(), "ceilings.txt") {
				t.Fatalf("LoadCeilings error %q does not name the file", err)
			}
			return
		}
		for f, c := range got {
			if _, ok := tb.Lookup(f); !ok || !(c.PercentWW > 0 && c.PercentWW <= 100) || !(c.GPerML > 0) || math.IsInf(c.GPerL(), 0) {
				t.Fatalf("LoadCeilings(%q) accepted %s %+v", s, f, c)
			}
		}
	})
}
