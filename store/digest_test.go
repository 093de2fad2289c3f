package store

import (
	"bytes"
	"context"
	"encoding/json"
	"flag"
	"os"
	"path/filepath"
	"reflect"
	"testing"
	"time"
)

var update = flag.Bool("update", false, "rewrite testdata/*.golden")

func golden(t *testing.T, name string, got []byte) {
	t.Helper()
	path := filepath.Join("testdata", name)
	if *update {
		if err := os.WriteFile(path, got, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test -update to create it)", err)
	}
	if !bytes.Equal(got, want) {
		t.Errorf("%s differs (run go test -update after checking):\n--- got\n%s\n--- want\n%s", name, got, want)
	}
}

func london(t *testing.T) *time.Location {
	loc, err := time.LoadLocation("Europe/London")
	if err != nil {
		t.Fatal(err)
	}
	return loc
}

// scriptShift logs the scripted day shift of 1 December 2026 at the
// Harrowgate Finishing Works (an invented plant), plus rows just outside it.
func scriptShift(t *testing.T, db *DB) {
	t.Helper()
	at := func(h, m int) time.Time { return time.Date(2026, 12, 1, h, m, 0, 0, time.UTC) }
	danger := Hazard{"CL2-GAS", "danger", "chlorine gas is released: do not mix"}
	heat := Hazard{"HEAT", "warning", "the mix warms by about 12 °C"}
	info := Hazard{"FIZZ", "info", "some gas bubbles"}
	o2 := Hazard{"O2-GAS", "warning", "oxygen is released: vent the tank"}
	for _, q := range []*Query{
		{Time: at(5, 59), UserID: "U01", UserName: "op.north", Channel: "C0SHIFT", Request: "mix 200 L NaOCl 12.5 % + 50 L HCl 10 %",
			Verdict: VerdictSpontaneous, Hazards: []Hazard{danger}, Streams: []string{"NaOCl 12.5 %", "HCl 10 %"}}, // night shift
		{Time: at(6, 0), UserID: "U01", UserName: "op.north", Channel: "C0SHIFT", Request: "mix T-101 + 40 L HCl 1 M",
			Resolved: "mix 200 L NaOCl 12.5 % + 40 L HCl 1 M", Verdict: VerdictSpontaneous, Hazards: []Hazard{danger, heat},
			Streams: []string{"NaOCl 12.5 %", "HCl 1 M"}},
		{Time: at(6, 42), UserID: "U02", UserName: "op.south", Channel: "console", Request: "mix 20 L CuSO4 0.5 M + 2 kg Zn",
			Verdict: VerdictSpontaneous, Hazards: []Hazard{info}, Streams: []string{"CuSO4 0.5 M", "Zn"}},
		{Time: at(7, 15), UserID: "U02", UserName: "op.south", Channel: "console", Request: "mix 20 L CuSO4 0.5 M + 2 kg Zn",
			Verdict: VerdictSpontaneous, Streams: []string{"CuSO4 0.5 M", "Zn"}},
		{Time: at(8, 5), UserID: "U03", UserName: "lab.tech", Channel: "cli", Request: "mix 100 L ZnSO4 0.1 M + 5 kg Cu",
			Verdict: VerdictNonSpontaneous, Hazards: []Hazard{heat}, Streams: []string{"ZnSO4 0.1 M", "Cu"}},
		{Time: at(9, 30), UserID: "U01", UserName: "op.north", Channel: "C0SHIFT", Request: "mix 200 L Bleech + acid",
			Verdict: VerdictError, Error: `at position 11: unknown chemical "Bleech" (did you mean NaOCl?)`},
		{Time: at(11, 0), UserID: "U04", UserName: "op.west", Channel: "C0SHIFT", Request: "mix 10 L H2O2 3 % + 1 L NaOCl 12.5 % + 5 L water",
			Verdict: VerdictSpontaneous, Hazards: []Hazard{o2}, Streams: []string{"H2O2 3 %", "NaOCl 12.5 %", "water"}},
		{Time: at(12, 10), UserID: "U02", UserName: "op.south", Channel: "console", Request: "mix 50 L NaOH 1 M + 50 L water",
			Verdict: VerdictNoReaction, Streams: []string{"NaOH 1 M", "water"}},
		{Time: at(13, 45), UserID: "U03", UserName: "lab.tech", Channel: "cli", Request: "mix 20 L CuSO4 0.5 M +  2 kg Zn",
			Verdict: VerdictSpontaneous, Streams: []string{"CuSO4  0.5 M", "Zn", "Zn"}},
		{Time: at(15, 20), UserID: "U04", UserName: "op.west", Channel: "C0SHIFT", Request: "mix tank 3 with tank 4 please",
			Verdict: VerdictError, Error: "no quantities: write streams as 200 L NaOCl 12.5 %"},
		{Time: at(17, 59), UserID: "U01", UserName: "op.north", Channel: "C0SHIFT", Request: "mix 5 L KMnO4 0.02 M + 5 L FeSO4 0.1 M",
			Verdict: VerdictNonSpontaneous, Hazards: []Hazard{danger}, Streams: []string{"KMnO4 0.02 M", "FeSO4 0.1 M"}}, // not spontaneous: not flagged
		{Time: at(18, 0), UserID: "U05", UserName: "op.night", Channel: "C0SHIFT", Request: "mix 200 L NaOCl 12.5 % + 50 L HCl 10 %",
			Verdict: VerdictSpontaneous, Hazards: []Hazard{danger}, Streams: []string{"NaOCl 12.5 %", "HCl 10 %"}}, // next shift
	} {
		mustLog(t, db, q)
	}
}

func TestDigestScriptedShift(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		loc := london(t)
		path := b.fresh(t)
		db, err := Open(context.Background(), path, Options{Location: loc})
		if err != nil {
			t.Fatal(err)
		}
		defer db.Close()
		scriptShift(t, db)
		since := time.Date(2026, 12, 1, 6, 0, 0, 0, loc)
		d, err := db.Digest(context.Background(), since, since.Add(12*time.Hour))
		if err != nil {
			t.Fatal(err)
		}
		if d.Queries != 10 {
			t.Errorf("Queries = %d, want 10 (06:00 inclusive, 18:00 exclusive)", d.Queries)
		}
		if want := (VerdictCounts{Spontaneous: 5, NonSpontaneous: 2, NoReaction: 1, Error: 2}); d.Verdicts != want {
			t.Errorf("Verdicts = %+v, want %+v", d.Verdicts, want)
		}
		var flagged []int64
		for _, f := range d.Flagged {
			flagged = append(flagged, f.ID)
		}
		if want := []int64{2, 7}; !reflect.DeepEqual(flagged, want) {
			t.Errorf("flagged ids = %v, want %v (spontaneous with danger/warning only)", flagged, want)
		}
		if len(d.Flagged) == 2 && len(d.Flagged[0].Hazards) != 2 {
			t.Errorf("flagged 2 hazards = %+v, want CL2-GAS and HEAT", d.Flagged[0].Hazards)
		}
		if len(d.ParseErrors) != 2 || d.ParseErrors[0].ID != 6 || d.ParseErrors[1].ID != 10 {
			t.Errorf("ParseErrors = %+v", d.ParseErrors)
		}
		if len(d.TopPairs) == 0 || d.TopPairs[0] != (PairCount{Streams: [2]string{"CuSO4 0.5 M", "Zn"}, Count: 3}) {
			t.Errorf("TopPairs[0] = %+v, want CuSO4 0.5 M + Zn ×3 (whitespace collapsed, repeats once)", d.TopPairs)
		}
		if len(d.Askers) != 4 || d.Askers[0] != (AskerCount{"U01", "op.north", 3}) {
			t.Errorf("Askers = %+v", d.Askers)
		}
		golden(t, "digest_day_shift.txt.golden", []byte(d.Text()))
		js, err := d.JSON()
		if err != nil {
			t.Fatal(err)
		}
		golden(t, "digest_day_shift.json.golden", js)
		var back Digest
		if err := json.Unmarshal(js, &back); err != nil || back.Queries != d.Queries || len(back.Flagged) != 2 {
			t.Errorf("JSON does not read back: %v", err)
		}
	})
}

func TestDigestEmptyNightShift(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		loc := london(t)
		path := b.fresh(t)
		db, err := Open(context.Background(), path, Options{Location: loc})
		if err != nil {
			t.Fatal(err)
		}
		defer db.Close()
		since := time.Date(2026, 12, 1, 18, 0, 0, 0, loc)
		d, err := db.Digest(context.Background(), since, since.Add(12*time.Hour))
		if err != nil {
			t.Fatal(err)
		}
		golden(t, "digest_empty_night.txt.golden", []byte(d.Text()))
		js, _ := d.JSON()
		golden(t, "digest_empty_night.json.golden", js)
		if _, err := db.Digest(context.Background(), since, since); err == nil {
			t.Error("Digest over an empty period succeeded")
		}
	})
}

func TestStreamPairs(t *testing.T) {
	got := streamPairs([]string{"b", " a ", "c", "b", ""})
	want := [][2]string{{"a", "b"}, {"a", "c"}, {"b", "c"}}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("streamPairs = %v, want %v", got, want)
	}
	if got := streamPairs([]string{"x"}); got != nil {
		t.Errorf("one stream gives pairs %v", got)
	}
}
