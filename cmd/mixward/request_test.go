package main

import (
	"bytes"
	"context"
	"encoding/json"
	"path/filepath"
	"strings"
	"testing"
)

// TestRequestRefusals: a request with an implausible number exits 2 with a
// JSON error object (code, position, token), on stdout, and the refusal is
// what gets logged: one row, verdict error, no result.
func TestRequestRefusals(t *testing.T) {
	cases := []struct {
		req, code, token string
		pos              int
	}{
		{"HCl 40 M + Zn", "bad-concentration", "40", 5},
		{"Zn + NaOH 50 M", "bad-concentration", "50", 11},
		{"Zn + HCl 1e308 g/L", "bad-concentration", "1e308", 10},
		{"Zn + HCl 600000 mg/L", "bad-concentration", "600000", 10},
		{"Zn + NaCl 400000 ppm", "bad-concentration", "400000", 11},
		{"Zn + HCl 15000 mM", "bad-concentration", "15000", 10},
		{"Zn + HCl 45 %", "bad-concentration", "45", 10},
		{"Zn + NaOCl 120 %", "bad-concentration", "120", 12},
		{"Zn + HCl 1 M at pH 16.5", "bad-ph", "16.5", 20},
		{"Zn + HCl 1 M at pH -3", "bad-ph", "-3", 20},
		{"Zn + HCl 1 M at 0.5 kPa", "bad-pressure", "0.5", 17},
		{"Zn + HCl 1 M at 1e-320 kPa", "bad-pressure", "1e-320", 17},
		{"Zn + HCl 1 M at 11 MPa", "bad-pressure", "11", 17},
		{"Zn + HCl 1 M at -40 C", "bad-temperature", "-40", 17},
		{"Zn + HCl 1 M at 500 K", "bad-temperature", "500", 17},
		{"Zn + 0 L HCl 1 M", "bad-amount", "0", 6},
		{"Zn + -2 L HCl 1 M", "bad-amount", "-2", 6},
		{"Zn + 1e9 m3 HCl 1 M", "bad-amount", "1e9", 6},
		{"1e-9 kg Zn + HCl 1 M", "bad-amount", "1e-9", 1},
		{"Zn + HCl 1e999 M", "bad-number", "1e999", 10},
		{"Zn + 1,500 L HCl 1 M", "ambiguous-number", "1,500", 6},
	}
	dir := t.TempDir()
	db := filepath.Join(dir, "log.db")
	getenv := func(k string) string {
		switch k {
		case "MIXWARD_DB":
			return db
		case "USER":
			return "test-operator"
		}
		return ""
	}
	for _, tc := range cases {
		var out, errw bytes.Buffer
		code := run(context.Background(), []string{"ask", "--format", "json", tc.req}, getenv, nil, &out, &errw)
		if code != exitUsage {
			t.Errorf("ask %q: exit %d, want %d (stderr %s)", tc.req, code, exitUsage, errw.String())
			continue
		}
		var got struct {
			Error struct {
				Code, Message, Token string
				Position             int
				Suggestions          []string
			}
		}
		if err := json.Unmarshal(out.Bytes(), &got); err != nil {
			t.Errorf("ask %q: stdout is not JSON (%v): %s", tc.req, err, out.String())
			continue
		}
		e := got.Error
		if e.Code != tc.code || e.Token != tc.token || e.Position != tc.pos || e.Message == "" || e.Suggestions == nil {
			t.Errorf("ask %q: error %+v, want %s at %d on %q", tc.req, e, tc.code, tc.pos, tc.token)
		}
	}
	// Every refusal is on record as one error row with its message and no
	// result.
	var out, errw bytes.Buffer
	if code := run(context.Background(), []string{"log", "export", "--since", "2000-01-01", "--format", "json"}, getenv, nil, &out, &errw); code != exitOK {
		t.Fatalf("log export: exit %d: %s", code, errw.String())
	}
	var rows []struct {
		Request, Verdict, Error string
		Result                  json.RawMessage
	}
	if err := json.Unmarshal(out.Bytes(), &rows); err != nil {
		t.Fatalf("log export: %v", err)
	}
	if len(rows) != len(cases) {
		t.Fatalf("%d rows logged, want %d", len(rows), len(cases))
	}
	for i, r := range rows {
		if r.Request != cases[i].req || r.Verdict != "error" || !strings.Contains(r.Error, "position") || string(r.Result) != "null" {
			t.Errorf("row %d = %+v, want the refusal of %q", i+1, r, cases[i].req)
		}
	}
}
