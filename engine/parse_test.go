package engine_test

import (
	"errors"
	"math"
	"strings"
	"testing"
	"unicode/utf8"

	"mixward/engine"
)

func parse(t *testing.T, req string, resolve engine.Resolver) (*engine.Request, error) {
	t.Helper()
	return engine.ParseRequest(req, mustEngine(t).Tables, resolve)
}

func TestParseRequest(t *testing.T) {
	cases := []struct {
		name    string
		in      string
		streams int
		check   func(t *testing.T, r *engine.Request)
	}{
		{"mix keyword optional", "NaOCl 12.5 % + HCl 10 %", 2, nil},
		{"volumes and temperature", "mix 200 L NaOCl 12.5 % + 50 L HCl 10 % at 20 C", 2, func(t *testing.T, r *engine.Request) {
			if r.Streams[0].VolumeL != 200 || r.Streams[1].VolumeL != 50 {
				t.Errorf("volumes = %g, %g", r.Streams[0].VolumeL, r.Streams[1].VolumeL)
			}
			if math.Abs(r.TemperatureK-293.15) > 1e-9 {
				t.Errorf("T = %g K, want 293.15", r.TemperatureK)
			}
			c := r.Streams[0].Components[0]
			if c.Chemical.Formula != "NaOCl" || c.Value != 12.5 || c.Unit != engine.PctWW {
				t.Errorf("component = %+v", c)
			}
		}},
		{"a stream's own temperature", "mix 100 L NaOH 2 %, 75 C + 300 L water", 2, func(t *testing.T, r *engine.Request) {
			if st := r.Streams[0]; st.TemperatureK == nil || math.Abs(*st.TemperatureK-348.15) > 1e-9 {
				t.Errorf("stream temperature = %v, want 348.15 K", st.TemperatureK)
			}
			// (100 L at 75 °C + 300 L at 25 °C) / 400 L = 37.5 °C.
			if math.Abs(r.TemperatureK-310.65) > 1e-9 || !r.TempStated {
				t.Errorf("mix starts at %g K (stated %v), want 310.65", r.TemperatureK, r.TempStated)
			}
			if len(r.Notes) == 0 || !strings.Contains(r.Notes[0], "37.5 °C") {
				t.Errorf("notes %q do not give the starting temperature", r.Notes)
			}
		}},
		{"the whole mix's temperature wins", "mix 100 L NaOH 2 %, 75 C + 100 L water, 10 C at 30 C", 2, func(t *testing.T, r *engine.Request) {
			if math.Abs(r.TemperatureK-303.15) > 1e-9 || r.Streams[1].TemperatureK == nil {
				t.Errorf("mix at %g K, water stream %v; want 303.15 K and the stream's own kept", r.TemperatureK, r.Streams[1].TemperatureK)
			}
		}},
		{"fahrenheit", "Zn + HCl 1 M at 77 F", 2, func(t *testing.T, r *engine.Request) {
			if math.Abs(r.TemperatureK-298.15) > 1e-9 {
				t.Errorf("77 F = %g K, want 298.15", r.TemperatureK)
			}
		}},
		{"kelvin", "Zn + HCl 1 M at 298 K", 2, func(t *testing.T, r *engine.Request) {
			if r.TemperatureK != 298 {
				t.Errorf("T = %g", r.TemperatureK)
			}
		}},
		{"names and synonyms, any case", "5 kg zinc + 100 L Muriatic Acid 5 %", 2, func(t *testing.T, r *engine.Request) {
			if r.Streams[0].MassKg != 5 || r.Streams[0].Components[0].Chemical.Formula != "Zn" {
				t.Errorf("stream 1 = %+v", r.Streams[0])
			}
			if r.Streams[1].Components[0].Chemical.Formula != "HCl" {
				t.Errorf("muriatic acid = %s", r.Streams[1].Components[0].Chemical.Formula)
			}
		}},
		{"multi-word names", "bleach + iron(II) sulfate 0.1 M + caustic soda 2 %", 3, func(t *testing.T, r *engine.Request) {
			want := []string{"NaOCl", "FeSO4.7H2O", "NaOH"} // iron(II) sulfate is read as copperas, the crystal sold (common practice, no source)
			for i, w := range want {
				if got := r.Streams[i].Components[0].Chemical.Formula; got != w {
					t.Errorf("stream %d = %s, want %s", i+1, got, w)
				}
			}
		}},
		{"several components and a pH", "500 L water, NaOH 2 %, Na2CO3 1 %, pH 12 + 20 L H2O2 30 %", 2, func(t *testing.T, r *engine.Request) {
			s := r.Streams[0]
			if len(s.Components) != 3 || s.PH == nil || *s.PH != 12 {
				t.Errorf("stream 1 = %+v", s)
			}
		}},
		// Tried as a new user would: "NaCN 500 mg/L pH 10" was refused
		// for want of a comma before the stream's pH.
		{"a pH after a strength without a comma", "1000 L NaCN 500 mg/L pH 10 + 10 L H2SO4 10 %", 2, func(t *testing.T, r *engine.Request) {
			s := r.Streams[0]
			if len(s.Components) != 1 || s.PH == nil || *s.PH != 10 || r.Streams[1].PH != nil {
				t.Errorf("stream 1 = %+v", s)
			}
		}},
		{"all concentration units", "Fe2(SO4)3 2 g/L, NH4Cl 5 mmol/L, KMnO4 3 mg/L, NaCl 100 ppm, CuSO4 1 % w/v, HNO3 2 % w/w, K2Cr2O7 0.1 mol/L + FeSO4 1 M", 2, func(t *testing.T, r *engine.Request) {
			units := []engine.ConcUnit{engine.GPerL, engine.MilliM, engine.MgPerL, engine.PPM, engine.PctWV, engine.PctWW, engine.Molar}
			for i, u := range units {
				if got := r.Streams[0].Components[i].Unit; got != u {
					t.Errorf("component %d unit = %q, want %q", i+1, got, u)
				}
			}
		}},
		{"attached units", "200L NaOCl 12.5% + 1m3 HCl 1M at 30C", 2, func(t *testing.T, r *engine.Request) {
			if r.Streams[1].VolumeL != 1000 {
				t.Errorf("1m3 = %g L", r.Streams[1].VolumeL)
			}
		}},
		{"gallons and pounds", "55 gal NaOCl 5 % + 10 lb Na2S2O5", 2, func(t *testing.T, r *engine.Request) {
			// 1 US gal = 3.785411784 L and 1 lb = 0.45359237 kg exactly (NIST SP 811, Appendix B).
			if math.Abs(r.Streams[0].VolumeL-55*3.785411784) > 1e-9 || math.Abs(r.Streams[1].MassKg-4.5359237) > 1e-12 {
				t.Errorf("amounts = %g L, %g kg", r.Streams[0].VolumeL, r.Streams[1].MassKg)
			}
		}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			r, err := parse(t, tc.in, nil)
			if err != nil {
				t.Fatalf("ParseRequest(%q): %v", tc.in, err)
			}
			if len(r.Streams) != tc.streams {
				t.Fatalf("ParseRequest(%q): %d streams, want %d", tc.in, len(r.Streams), tc.streams)
			}
			if tc.check != nil {
				tc.check(t, r)
			}
		})
	}
}

func TestParseErrors(t *testing.T) {
	cases := []struct {
		in         string
		code       string
		pos        int
		suggestion string // must appear among the suggestions
	}{
		{"", "empty-request", 1, ""},
		{"mix", "missing-stream", 4, ""},
		{"NaOCl 12.5 % +", "missing-stream", 15, ""},
		{"bleech + HCl 1 M", "unknown-chemical", 1, "bleach"},
		{"NaOCl 5 % + hydrochloric acd 1 M", "unknown-chemical", 13, "hydrochloric acid"},
		{"200 L + HCl 1 M", "missing-chemical", 7, ""},
		{"200 parsecs NaOCl", "unknown-unit", 5, ""},
		{"NaOCl 12.5 furlongs", "unknown-unit", 12, ""},
		{"NaOCl 120 %", "bad-concentration", 7, ""},
		{"Zn + HCl 1 M at 25 Q", "unknown-unit", 20, ""},
		{"Zn + HCl 1 M at 900 C", "bad-temperature", 17, ""},
		{"Zn + HCl 1 M, 900 C", "bad-temperature", 15, ""},
		{"200 L 60 C + HCl 1 M", "missing-chemical", 1, ""},
		{"mix 1 L Cu + 1 L HCl 37 %", "metal-by-volume", 5, ""},
		{"Zn + HCl 1 M at pH", "bad-ph", 19, ""},
		{"Zn HCl", "unknown-word", 4, ""},
		// A name that begins with a known one is an unknown chemical, not
		// a stray word after the known part.
		{"10 kg sodium widget + 100 L water", "unknown-chemical", 7, "sodium"},
		{"NaOCl 12.5 % HCl", "unexpected-token", 14, ""},
		{"-5 L NaOCl", "bad-amount", 1, ""},
		{"T-999 + HCl 1 M", "unknown-tag", 1, ""},
		// A stream after the whole mix's conditions: the stream form that
		// gives one stream its own temperature is suggested.
		{"mix 1000 L water at 80 C + 20 kg NaOH", "bad-condition", 26, "mix 1000 L water, 80 C + 20 kg NaOH"},
		{"mix 1000 L water at 80 C and 2 bar + 20 kg NaOH", "bad-condition", 36, "mix 1000 L water, 80 C + 20 kg NaOH"},
		{"mix 10 L HCl 1 M at pH 3 with 1 kg Zn", "bad-condition", 26, "mix 10 L HCl 1 M, pH 3 with 1 kg Zn"},
		{"mix 1000 L water at 2 bar + 20 kg NaOH", "bad-condition", 27, ""},
	}
	for _, tc := range cases {
		t.Run(tc.in, func(t *testing.T) {
			_, err := parse(t, tc.in, func(string) (string, bool) { return "", false })
			var pe *engine.ParseError
			if !errors.As(err, &pe) {
				t.Fatalf("ParseRequest(%q) error = %v, want a *ParseError", tc.in, err)
			}
			if pe.Code != tc.code || pe.Position != tc.pos {
				t.Errorf("ParseRequest(%q) = code %q at %d (%s), want %q at %d", tc.in, pe.Code, pe.Position, pe.Message, tc.code, tc.pos)
			}
			if pe.Message == "" || pe.Suggestions == nil {
				t.Errorf("ParseRequest(%q): empty message or nil suggestions: %+v", tc.in, pe)
			}
			if tc.suggestion != "" && !contains(pe.Suggestions, tc.suggestion) {
				t.Errorf("ParseRequest(%q) suggestions = %q, want %q among them", tc.in, pe.Suggestions, tc.suggestion)
			}
			if pe.Code == "bad-condition" && tc.suggestion != "" {
				// The suggested request itself parses.
				if _, err := parse(t, tc.suggestion, func(string) (string, bool) { return "", false }); err != nil {
					t.Errorf("suggestion %q does not parse: %v", tc.suggestion, err)
				}
			}
		})
	}
}

func contains(xs []string, x string) bool {
	for _, y := range xs {
		if strings.EqualFold(y, x) {
			return true
		}
	}
	return false
}

func TestParseTags(t *testing.T) {
	cat := map[string]string{"T-101": "200 L NaOCl 12.5 %", "T-204": "HCl 10 %", "T-666": "NaOCl 12.5 furlongs"}
	resolve := func(tag string) (string, bool) { s, ok := cat[tag]; return s, ok }
	r, err := parse(t, "mix T-101 + 40 L t-204 at 20 C", resolve)
	if err != nil {
		t.Fatal(err)
	}
	if r.Streams[0].Tag != "T-101" || r.Streams[0].VolumeL != 200 || r.Streams[0].Text != "200 L NaOCl 12.5 %" {
		t.Errorf("stream 1 = %+v", r.Streams[0])
	}
	if r.Streams[1].Tag != "T-204" || r.Streams[1].VolumeL != 40 {
		t.Errorf("stream 2 (amount before the tag wins) = %+v", r.Streams[1])
	}
	_, err = parse(t, "T-666 + HCl 1 M", resolve)
	var pe *engine.ParseError
	if !errors.As(err, &pe) || pe.Position != 1 || !strings.Contains(pe.Message, "T-666") {
		t.Errorf("bad catalogue entry: %v", err)
	}
}

// TestParseForgiving covers the forgiving forms: decimal commas, stream
// separators other than "+", gallons of both kinds and "wt%".
func TestParseForgiving(t *testing.T) {
	cases := []struct {
		name   string
		in     string
		values []float64 // the first component's value of each stream
		litres []float64 // each stream's volume, when checked
		notes  []string  // each must appear in the request's notes
		tempK  float64   // when not 0
	}{
		{"decimal comma", "NaOCl 12,5 % + HCl 10 %", []float64{12.5, 10}, nil, nil, 0},
		{"decimal comma before a unit", "NaOCl 12,5% + HCl 0,5M", []float64{12.5, 0.5}, nil, nil, 0},
		{"decimal comma after a lone zero", "NaOCl 0,125 M + HCl 1 M", []float64{0.125, 1}, nil, nil, 0},
		{"four decimals are not thousands", "NaOCl 1234,567 mg/L + HCl 1 M", []float64{1234.567, 1}, nil, nil, 0},
		{"decimal comma in an amount and a condition", "2,5 L NaOCl 5 % + HCl 1 M at 20,5 C", []float64{5, 1}, []float64{2.5, 0}, nil, 293.65},
		{"decimal comma with an exponent", "NaOCl 1,5e-3 M + HCl 1 M", []float64{1.5e-3, 1}, nil, nil, 0},
		{"comma before a letter separates components", "water, NaOH 2,5 %,NaCl 1 % + HCl 1 M", nil, nil, nil, 0},
		{"and", "NaOCl 5 % and HCl 10 %", []float64{5, 10}, nil, nil, 0},
		{"with", "mix bleach with HCl 10 %", []float64{0, 10}, nil, nil, 0},
		{"ampersand", "NaOCl 5 %&HCl 10 % & Zn", []float64{5, 10, 0}, nil, nil, 0},
		{"all separators and conditions", "NaOCl 5 % + HCl 1 M and Zn with Fe & Cu at 20 C and pH 3", []float64{5, 1, 0, 0, 0}, nil, nil, 293.15},
		{"gal is the US gallon, and the answer says so", "55 gal NaOCl 5 % + HCl 1 M", nil, []float64{55 * 3.785411784, 0},
			[]string{"55 gal read as US gallons: 208.2 L", "write imp gal for imperial gallons"}, 0},
		{"US gal", "10 US gal NaOCl 5 % + HCl 1 M", nil, []float64{37.85411784, 0}, []string{"10 US gal read as US gallons: 37.85 L"}, 0},
		{"imp gal", "10 imp gal NaOCl 5 % + 2 imperial gallons HCl 1 M", nil, []float64{45.4609, 9.09218},
			[]string{"10 imp gal read as imperial gallons: 45.46 L (1 imp gal = 4.54609 L", "2 imperial gallons read as imperial gallons: 9.092 L"}, 0},
		{"gallons", "3 gallons NaOCl 5 % + HCl 1 M", nil, []float64{3 * 3.785411784, 0}, []string{"3 gallons read as US gallons"}, 0},
		{"wt%", "NaOCl 12.5 wt% + HCl 10 wt %", []float64{12.5, 10}, nil, nil, 0},
		{"MPa", "Zn + HCl 1 M at 0.2 MPa", nil, nil, nil, 0},
		{"the form of a solid", "5 kg NaOH flakes + 20 L water", nil, nil, []string{`"flakes" read as the form of solid NaOH`}, 0},
		{"the form of a solid before its strength", "aluminium powder 100 % + NaOH 20 %", []float64{100, 20}, nil, []string{`"powder" read as the form`}, 0},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			r, err := parse(t, tc.in, nil)
			if err != nil {
				t.Fatalf("ParseRequest(%q): %v", tc.in, err)
			}
			if tc.values != nil && len(r.Streams) != len(tc.values) {
				t.Fatalf("ParseRequest(%q): %d streams, want %d", tc.in, len(r.Streams), len(tc.values))
			}
			for i, v := range tc.values {
				if got := r.Streams[i].Components[0].Value; math.Abs(got-v) > 1e-12 {
					t.Errorf("stream %d value = %g, want %g", i+1, got, v)
				}
			}
			for i, l := range tc.litres {
				if got := r.Streams[i].VolumeL; math.Abs(got-l) > 1e-9 {
					t.Errorf("stream %d = %g L, want %g", i+1, got, l)
				}
			}
			for _, n := range tc.notes {
				if !containsSub(r.Notes, n) {
					t.Errorf("notes %q lack %q", r.Notes, n)
				}
			}
			if tc.tempK != 0 && math.Abs(r.TemperatureK-tc.tempK) > 1e-9 {
				t.Errorf("T = %g K, want %g", r.TemperatureK, tc.tempK)
			}
		})
	}
	r, err := parse(t, "Zn + HCl 1 M at 0,2 MPa", nil)
	if err != nil || math.Abs(r.PressureKPa-200) > 1e-9 {
		t.Errorf("0,2 MPa = %v kPa (%v), want 200", r, err)
	}
}

// TestParseForgivingErrors: the forms that stay errors.
func TestParseForgivingErrors(t *testing.T) {
	for in, want := range map[string]struct {
		code string
		pos  int
	}{
		"1,500 L NaOCl 5 % + HCl 1 M":  {"ambiguous-number", 1},
		"NaOCl 12,500 mg/L + HCl 1 M":  {"ambiguous-number", 7},
		"NaOCl 1,000,000 ppm + HCl":    {"ambiguous-number", 7},
		"NaOCl 12, 5 % + HCl 1 M":      {"missing-unit", 9},
		"NaOCl 5 % and":                {"missing-stream", 14},
		"NaOCl 5 % with + HCl":         {"missing-stream", 16},
		"NaOCl 5 % & at 20 C":          {"missing-stream", 13},
		"10 pints NaOCl 5 %":           {"unknown-unit", 4},
		"10 imp NaOCl 5 %":             {"unknown-unit", 4},
		"Zn + HCl 1 M at 2 psi":        {"unknown-unit", 19},
		"Zn + HCl 1 M at 20 C with Fe": {"bad-condition", 22},
	} {
		_, err := parse(t, in, nil)
		var pe *engine.ParseError
		if !errors.As(err, &pe) || pe.Code != want.code || pe.Position != want.pos {
			t.Errorf("ParseRequest(%q) = %v, want %s at %d", in, err, want.code, want.pos)
		}
	}
}

func containsSub(xs []string, sub string) bool {
	for _, x := range xs {
		if strings.Contains(x, sub) {
			return true
		}
	}
	return false
}

// TestParseTagAmounts: an amount before a tag scales the tag's stream at its
// catalogue concentrations, and the notes say so.
func TestParseTagAmounts(t *testing.T) {
	cat := map[string]string{"T-204": "1500 L HCl 10 %", "T-412": "NaOH 10 %", "T-301": "25 kg Zn", "T-555": "55 gal NaOCl 5 %", "T-777": "NaOCl 5 %, NaCl 1 %"}
	resolve := func(tag string) (string, bool) { s, ok := cat[tag]; return s, ok }
	cases := []struct {
		in     string
		litres float64
		kg     float64
		note   string
	}{
		{"mix 40 L T-204 + T-412", 40, 0, "40 L of T-204 used at its catalogue concentrations (HCl 10 %); the catalogue states 1500 L"},
		{"mix 1 m3 T-412 + T-204", 1000, 0, "1 m3 of T-412 used at its catalogue concentrations (NaOH 10 %)"},
		{"mix 10 gal T-777 + T-204", 37.85411784, 0, "10 gal of T-777 used at its catalogue concentrations (NaOCl 5 %, NaCl 1 %)"},
		// 1 kg of 10 % HCl at 1.0474 kg/L (data/densities.txt) is 0.9547 L.
		{"mix 1 kg T-204 + T-412", 1 / 1.0474, 0, "1 kg of T-204 (HCl 10 %) taken as 0.9547 L at 1.047 kg/L (from data/densities.txt)"},
		{"mix 2 kg T-301 + T-204", 0, 2, "2 kg of T-301 used at its catalogue concentrations (Zn); the catalogue states 25 kg"},
		{"mix T-555 + T-204", 55 * 3.785411784, 0, "T-555: 55 gal read as US gallons"},
	}
	for _, tc := range cases {
		r, err := parse(t, tc.in, resolve)
		if err != nil {
			t.Errorf("ParseRequest(%q): %v", tc.in, err)
			continue
		}
		st := r.Streams[0]
		if math.Abs(st.VolumeL-tc.litres) > 1e-9 || math.Abs(st.MassKg-tc.kg) > 1e-12 {
			t.Errorf("ParseRequest(%q): stream 1 = %g L, %g kg, want %g L, %g kg", tc.in, st.VolumeL, st.MassKg, tc.litres, tc.kg)
		}
		if !containsSub(r.Notes, tc.note) {
			t.Errorf("ParseRequest(%q): notes %q lack %q", tc.in, r.Notes, tc.note)
		}
		res, err := mustEngine(t).Predict(r)
		if err != nil || !containsSub(res.Notes, tc.note) {
			t.Errorf("Predict(%q): %v, notes %q lack %q", tc.in, err, res.Notes, tc.note)
		}
	}
	_, err := parse(t, "mix 40 L T-301 + T-204", resolve)
	var pe *engine.ParseError
	if !errors.As(err, &pe) || pe.Code != "bad-amount" || pe.Position != 10 || pe.Token != "T-301" || !strings.Contains(pe.Message, "as a mass") {
		t.Errorf("a volume of a solid tag: %v, want bad-amount at 10 on T-301", err)
	}
}

// TestParseTagSuggestions: near misses of a catalogue tag get the nearest
// tags as suggestions when the catalogue can list them.
func TestParseTagSuggestions(t *testing.T) {
	cat := map[string]string{"T-102": "200 L NaOCl 12.5 %", "T-204": "HCl 10 %", "T-103": "H2O2 3 %", "TK-7": "NaOH 5 %"}
	resolve := func(tag string) (string, bool) { s, ok := cat[tag]; return s, ok }
	tags := func() []string { return []string{"T-102", "T-103", "T-204", "TK-7"} }
	opt := engine.AskOptions{Resolve: resolve, Tags: tags}
	cases := []struct {
		in   string
		code string
		want []string // suggestions, in order
	}{
		{"T102 + T-204", "unknown-tag", []string{"T-102"}},
		{"T-120 + T-204", "unknown-tag", []string{"T-102"}},
		{"T-10 + T-204", "unknown-tag", []string{"T-102", "T-103"}},
		{"T_102 + T-204", "unknown-tag", []string{"T-102"}},
		{"mix 40 L T-2044 + T-102", "unknown-tag", []string{"T-204"}},
		{"TK7 + T-204", "unknown-tag", []string{"TK-7"}},
		{"T-999 + T-204", "unknown-tag", []string{}},
		{"H2S04 + T-204", "unknown-chemical", nil}, // a formula typo, not a tag
	}
	for _, tc := range cases {
		_, err := engine.Parse(tc.in, mustEngine(t).Tables, opt)
		var pe *engine.ParseError
		if !errors.As(err, &pe) || pe.Code != tc.code {
			t.Errorf("Parse(%q) = %v, want %s", tc.in, err, tc.code)
			continue
		}
		if tc.want != nil && strings.Join(pe.Suggestions, ",") != strings.Join(tc.want, ",") {
			t.Errorf("Parse(%q) suggestions = %q, want %q", tc.in, pe.Suggestions, tc.want)
		}
		if len(tc.want) > 0 && !strings.Contains(pe.Message, `did you mean "`+tc.want[0]+`"`) {
			t.Errorf("Parse(%q) message %q does not offer %s", tc.in, pe.Message, tc.want[0])
		}
	}
	// Lower case resolves as it always did; no suggestion needed.
	r, err := engine.Parse("t-102 + T-204", mustEngine(t).Tables, opt)
	if err != nil || r.Streams[0].Tag != "T-102" {
		t.Errorf("t-102: %v", err)
	}
	// Without a catalogue a tag-like word says so rather than calling itself
	// an unknown chemical.
	_, err = parse(t, "T-301 + HCl 1 M", nil)
	if pe := (*engine.ParseError)(nil); !errors.As(err, &pe) || pe.Code != "unknown-tag" || !strings.Contains(pe.Message, "no site stream catalogue") {
		t.Errorf("no catalogue: %v", err)
	}
	// Without a tag list there is nothing to suggest, but the error stands.
	_, err = parse(t, "T-120 + T-204", resolve)
	var pe *engine.ParseError
	if !errors.As(err, &pe) || pe.Code != "unknown-tag" || len(pe.Suggestions) != 0 {
		t.Errorf("no tag list: %v", err)
	}
}

func TestSuggestTags(t *testing.T) {
	tags := []string{"T-101", "T-102", "T-204", "TANK-12A", "P-7"}
	for in, want := range map[string]string{
		"T102": "T-102", "t-102": "T-102", "T-999": "", "T-201": "T-101", "T-2O4": "T-204", "TANK12B": "TANK-12A", "TANK-21A": "TANK-12A",
		"P7": "P-7", "Q-7": "P-7", "": "", "ZZZZZZ": "",
	} {
		got := engine.SuggestTags(in, tags, 1)
		if (want == "" && len(got) != 0) || (want != "" && (len(got) != 1 || got[0] != want)) {
			t.Errorf("SuggestTags(%q) = %q, want %q", in, got, want)
		}
	}
}

func FuzzParseRequest(f *testing.F) {
	for _, s := range []string{
		"NaOCl 12,5 % and HCl 10 % with Zn & Fe", "1,500 L NaOCl", "NaOCl 0,125 M + HCl 1,5e-3 M at 20,5 C",
		"55 US gal bleach + 10 imp gal HCl 10 % + 3 gallons NaOH 2 %", "40 L T-101 + 2 kg T-101 + T102 + T-110",
		"Zn + HCl 1e308 g/L at 1e-320 kPa", "HCl 40 M + NaOH 50 M at pH 17", "NaOH 10 wt% + HCl 42 % at 10 MPa",
		"10 kg NaOH 99 % + 10 L NaOH 99 %", "Zn at 1e308 F", "1e308 m3 HCl", "0,0001 mL HCl",
		"mix 200 L NaOCl 12.5 % + 50 L HCl 10 % at 20 C", "100 L NaOH 2 %, 75 C + 100 L water, 10 F", "1 L 5 K",
		"Zn + CuSO4 1 M", "T-101 + 40 L HCl 1 M", "500 L water, NaOH 2 %, pH 12 + 20 L H2O2 30 %",
		"55 gal bleach + 10 lb Na2S2O5 at 2 bar, pH 3", "1e3 mL Fe2(SO4)3 2 g/L", "-5 C", "mix mix + + , ,",
		"NaOCl 12.5 % w/v + iron(II) sulfate 3 mg/L at 77 F",
		"mix 40 L T-301 + 2 kg T-412 & 3 imp gal T-555 with T-101", "T-10 + t_412 and T301", "5 kg T-555 + T-412",
	} {
		f.Add(s)
	}
	e := mustEngine(f)
	cat := map[string]string{"T-101": "200 L NaOCl 12.5 %", "T-301": "25 kg Zn", "T-555": "55 gal NaOCl 5 %", "T-412": "NaOH 10 %"}
	opt := engine.AskOptions{
		Resolve: func(tag string) (string, bool) { s, ok := cat[tag]; return s, ok },
		Tags:    func() []string { return []string{"T-101", "T-301", "T-412", "T-555"} },
	}
	f.Fuzz(func(t *testing.T, s string) {
		r, err := engine.Parse(s, e.Tables, opt)
		if err != nil {
			var pe *engine.ParseError
			if !errors.As(err, &pe) {
				t.Fatalf("ParseRequest(%q) error %v is not a *ParseError", s, err)
			}
			if pe.Message == "" || pe.Code == "" || pe.Suggestions == nil || pe.Position < 1 || pe.Position > utf8.RuneCountInString(s)+1 {
				t.Fatalf("ParseRequest(%q): bad error %+v", s, pe)
			}
			return
		}
		if len(r.Streams) == 0 {
			t.Fatalf("ParseRequest(%q) gave no streams and no error", s)
		}
		// Every accepted number is finite and inside its bounds.
		if !(r.TemperatureK >= 243.15 && r.TemperatureK <= 423.15) || !(r.PressureKPa >= 1 && r.PressureKPa <= 10000) {
			t.Fatalf("ParseRequest(%q): conditions %g K, %g kPa out of bounds", s, r.TemperatureK, r.PressureKPa)
		}
		for _, st := range r.Streams {
			if !(st.VolumeL >= 0 && st.VolumeL <= 1e7) || !(st.MassKg >= 0 && st.MassKg <= 1e7) {
				t.Fatalf("ParseRequest(%q): amount %g L, %g kg out of bounds", s, st.VolumeL, st.MassKg)
			}
			for _, c := range st.Components {
				if max, _ := engine.ConcCeiling(e.Tables, c.Chemical, c.Unit, st.VolumeL > 0); !(c.Value >= 0 && c.Value <= max) && c.Unit != engine.NoConc {
					t.Fatalf("ParseRequest(%q): %s %g %s above its ceiling %g", s, c.Name, c.Value, c.Unit, max)
				}
			}
		}
		// A parsed request must always be answerable.
		if _, err := e.Predict(r); err != nil {
			var pe *engine.ParseError
			if !errors.As(err, &pe) {
				t.Fatalf("Predict(%q): %v", s, err)
			}
		}
	})
}

func TestStreamLabel(t *testing.T) {
	resolve := func(tag string) (string, bool) { return "200 L NaOCl 12.5 %", tag == "T-101" }
	r, err := parse(t, "T-101 + 50 L NaOCl 12.5 %, NaOH 1 % + 20 L water, pH 11", resolve)
	if err != nil {
		t.Fatal(err)
	}
	want := []string{"T-101", "NaOCl 12.5 %, NaOH 1 %", "H2O, pH 11"}
	for i, w := range want {
		if got := r.Streams[i].Label(); got != w {
			t.Errorf("stream %d label = %q, want %q", i+1, got, w)
		}
	}
}

// TestOperatorVerbs: "combine" and "pour ... into ..." read as "mix", and
// NH4OH is ammonia solution (its label name in the trade), as typed by a
// new user.
func TestOperatorVerbs(t *testing.T) {
	tb := mustEngine(t).Tables
	for _, text := range []string{
		"combine 50 L NaOH 15 % with 2 kg Al",
		"pour 10 L HCl 10 % into 100 L water",
		"pour 40 L water into 200 L H2SO4 98 %", // a bare name before "into"
		"pour 5 kg NaCl into 100 L water",
		"mix 50 L NH4OH 28 % + 50 L NaOCl 12.5 %",
	} {
		req, err := engine.Parse(text, tb, engine.AskOptions{})
		if err != nil {
			t.Errorf("Parse(%q): %v", text, err)
			continue
		}
		if len(req.Streams) != 2 {
			t.Errorf("Parse(%q): %d streams, want 2", text, len(req.Streams))
		}
	}
	req, err := engine.Parse("mix 50 L NH4OH 28 % + 50 L water", tb, engine.AskOptions{})
	if err == nil && req.Streams[0].Components[0].Chemical.Formula != "NH3" {
		t.Errorf("NH4OH read as %s, want NH3", req.Streams[0].Components[0].Chemical.Formula)
	}
}

// TestParseHeadspace: the closed gas space above the mix may be stated
// after "at" in any liquid volume unit; a mass, a missing number or a
// vessel beyond any plant's are refused with the position of the fault.
func TestParseHeadspace(t *testing.T) {
	tb := mustEngine(t).Tables
	for text, want := range map[string]float64{
		"mix 10 L HCl 1 M + 1 kg Zn at headspace 2 m3":              2000,
		"mix 10 L HCl 1 M + 1 kg Zn at 30 C, headspace 500 L":       500,
		"mix 10 L HCl 1 M + 1 kg Zn at headspace 100 imp gal, pH 1": 454.609,
		"mix 10 L HCl 1 M + 1 kg Zn":                                0,
	} {
		req, err := engine.ParseRequest(text, tb, nil)
		if err != nil {
			t.Errorf("%s: %v", text, err)
			continue
		}
		if math.Abs(req.HeadspaceL-want) > 1e-9 {
			t.Errorf("%s: headspace %g L, want %g", text, req.HeadspaceL, want)
		}
	}
	for text, code := range map[string]string{
		"mix 10 L HCl 1 M + 1 kg Zn at headspace 5 kg":   "unknown-unit",
		"mix 10 L HCl 1 M + 1 kg Zn at headspace":        "bad-headspace",
		"mix 10 L HCl 1 M + 1 kg Zn at headspace 2":      "missing-unit",
		"mix 10 L HCl 1 M + 1 kg Zn at headspace 1e9 m3": "bad-amount",
		"mix 10 L HCl 1 M + 1 kg Zn at headspace -2 m3":  "bad-amount",
	} {
		_, err := engine.ParseRequest(text, tb, nil)
		var pe *engine.ParseError
		if !errors.As(err, &pe) || pe.Code != code {
			t.Errorf("%s: error %v, want code %s", text, err, code)
		}
	}
}

// TestStatedHeadspace: the gas figures are for the stated headspace. A
// dissolved gas keeps its equilibrium concentration (Henry's law) and the
// larger space holds more of it; a gas phase given off (hydrogen from zinc
// in acid: 1 mol per mol of zinc, 30.6 mol from 2 kg, 746 L at 25 °C)
// fills a larger space more thinly: 746 L in 5 m³ is about 14.9 %.
func TestStatedHeadspace(t *testing.T) {
	small := ask(t, "mix 100 L HCl 10 % + 2 kg Zn")
	big := ask(t, "mix 100 L HCl 10 % + 2 kg Zn at headspace 5 m3")
	if !big.Conditions.HeadspaceStated || big.Conditions.HeadspaceL != 5000 || small.Conditions.HeadspaceStated || small.Conditions.HeadspaceL != small.Conditions.VolumeL {
		t.Fatalf("conditions: stated %+v, default %+v", big.Conditions, small.Conditions)
	}
	cl := func(r *engine.Result) (mol, ppm float64) {
		for _, g := range r.Gases {
			if g.Text == "Cl2(g)" {
				return g.Mol, g.HeadspacePPM
			}
		}
		return 0, 0
	}
	m1, p1 := cl(ask(t, "mix 200 L NaOCl 12.5 % + 50 L HCl 10 %"))
	m2, p2 := cl(ask(t, "mix 200 L NaOCl 12.5 % + 50 L HCl 10 % at headspace 20 m3"))
	if !(m1 > 0) || m2 < 50*m1 || math.Abs(p2-p1) > 0.05*p1 {
		t.Errorf("chlorine: %.3g mol at %.4g ppm over 250 L, %.3g mol at %.4g ppm over 20 m³; want the same ppm and 80 times the amount", m1, p1, m2, p2)
	}
}

// TestParsePourInto: "pour A into B" records the order written (two
// streams only); "mix", "combine" and "+" write none.
func TestParsePourInto(t *testing.T) {
	for _, tc := range []struct {
		req  string
		want bool
	}{
		{"pour 40 L water into 200 L H2SO4 98 %", true},
		{"pour 40 L water into 200 L H2SO4 98 % at 30 C", true},
		{"pour 40 L water + 200 L H2SO4 98 %", false},
		{"mix 40 L water into 200 L H2SO4 98 %", false},
		{"combine 40 L water with 200 L H2SO4 98 %", false},
		{"pour 40 L water into 200 L H2SO4 98 % + 10 L HCl 10 %", false},
	} {
		req, err := engine.ParseRequest(tc.req, mustEngine(t).Tables, nil)
		if err != nil {
			t.Fatalf("%s: %v", tc.req, err)
		}
		if req.PourInto != tc.want {
			t.Errorf("%s: PourInto %v, want %v", tc.req, req.PourInto, tc.want)
		}
	}
}
