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
			want := []string{"NaOCl", "FeSO4", "NaOH"}
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
		{"Zn + HCl 1 M at pH", "bad-ph", 19, ""},
		{"Zn HCl", "unknown-word", 4, ""},
		{"NaOCl 12.5 % HCl", "unexpected-token", 14, ""},
		{"-5 L NaOCl", "bad-amount", 1, ""},
		{"T-999 + HCl 1 M", "unknown-tag", 1, ""},
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

func FuzzParseRequest(f *testing.F) {
	for _, s := range []string{
		"mix 200 L NaOCl 12.5 % + 50 L HCl 10 % at 20 C",
		"Zn + CuSO4 1 M", "T-101 + 40 L HCl 1 M", "500 L water, NaOH 2 %, pH 12 + 20 L H2O2 30 %",
		"55 gal bleach + 10 lb Na2S2O5 at 2 bar, pH 3", "1e3 mL Fe2(SO4)3 2 g/L", "-5 C", "mix mix + + , ,",
		"NaOCl 12.5 % w/v + iron(II) sulfate 3 mg/L at 77 F",
	} {
		f.Add(s)
	}
	e := mustEngine(f)
	resolve := func(tag string) (string, bool) {
		if tag == "T-101" {
			return "200 L NaOCl 12.5 %", true
		}
		return "", false
	}
	f.Fuzz(func(t *testing.T, s string) {
		r, err := engine.ParseRequest(s, e.Tables, resolve)
		if err != nil {
			var pe *engine.ParseError
			if !errors.As(err, &pe) {
				t.Fatalf("ParseRequest(%q) error %v is not a *ParseError", s, err)
			}
			if pe.Message == "" || pe.Position < 1 || pe.Position > utf8.RuneCountInString(s)+1 {
				t.Fatalf("ParseRequest(%q): bad error %+v", s, pe)
			}
			return
		}
		if len(r.Streams) == 0 {
			t.Fatalf("ParseRequest(%q) gave no streams and no error", s)
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
