package main

import (
	"bytes"
	"context"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"mixward/bot"
	"mixward/engine"
	"mixward/store"
)

var (
	_ bot.QueryLog  = (*store.DB)(nil)
	_ bot.Searcher  = (*store.DB)(nil)
	_ bot.Catalogue = (*store.DB)(nil)
	_ bot.Digester  = (*store.DB)(nil)
	_ bot.Answerer  = (*engine.Engine)(nil)
)

func mustEngine(t *testing.T) *engine.Engine {
	t.Helper()
	e, err := loadEngine()
	if err != nil {
		t.Fatal(err)
	}
	return e
}

// runConsole drives `mixward console` (or, with no args, `mixward`) with
// input on stdin, and returns its stdout, stderr and exit code.
func runConsole(t *testing.T, env map[string]string, input string, args ...string) (stdout, stderr string, code int) {
	t.Helper()
	var out, errb bytes.Buffer
	getenv := func(k string) string { return env[k] }
	code = run(context.Background(), args, getenv, strings.NewReader(input), &out, &errb)
	return out.String(), errb.String(), code
}

func TestConsoleAnswersLogsAndSeedsDemo(t *testing.T) {
	db := filepath.Join(t.TempDir(), "site.db")
	env := map[string]string{"MIXWARD_DB": db, "MIXWARD_TZ": "UTC"}
	input := strings.Join([]string{
		"streams",
		"mix T-102 + T-204",
		"mix 200 L NaOCl 12.5 % + 50 L HCl 10 %",
		"mix 2 L wizard dust + 1 L HCl 10 %",
		"details",
		"details 1",
		"review",
		"search chlorine",
		"streams set T-999 5 L NaOH 1 %",
		"help",
	}, "\n") + "\n"
	stdout, stderr, code := runConsole(t, env, input, "console")
	if code != 0 {
		t.Fatalf("exit %d\nstderr: %s", code, stderr)
	}
	for _, want := range []string{
		"10 streams in the catalogue", "T-102  200 L NaOCl 12.5 %", "invented demo data", // the seeded demo site
		"DO NOT MIX: releases chlorine", "T-102 is 200 L NaOCl 12.5 %", // a tag request, resolved, decision first
		"Advisory only, not a permit",
		"Verdict: SPONTANEOUS", "CAUTION: Advisory only, not a permit", // details: the full answer
		"Query #1, asked", // details of a logged query
		"Every pair of the site's tagged streams, worst first: 45 pairs", // review
		"(logged as query #1)", "(logged as query #2)",
		"couldn't read that mix request", "mix 200 L NaOCl 12.5 % + 50 L HCl 10 %", // error with an example
		"Matches 1–",  // the console may search
		"Saved T-999", // and change the catalogue
		"every command is open to you",
	} {
		if !strings.Contains(stdout, want) {
			t.Errorf("console output lacks %q", want)
		}
	}
	if strings.Contains(stdout, bot.Prompt) {
		t.Errorf("non-interactive console printed prompts")
	}
	if !strings.Contains(stderr, "seeded 10 streams") {
		t.Errorf("stderr %q does not report the demo seeding", stderr)
	}
	if t.Failed() {
		t.Logf("stdout:\n%s", stdout)
	}

	d, err := store.Open(context.Background(), db, store.Options{})
	if err != nil {
		t.Fatal(err)
	}
	defer d.Close()
	page, err := d.Search(context.Background(), store.SearchOptions{Limit: 100})
	if err != nil {
		t.Fatal(err)
	}
	if len(page.Queries) != 3 {
		t.Fatalf("%d queries logged, want 3 (two answers, one parse error)", len(page.Queries))
	}
	for _, q := range page.Queries {
		if q.UserID != "console" || q.UserName != "console" || q.Channel != "console" {
			t.Errorf("query %d logged as user %q/%q channel %q, want console", q.ID, q.UserID, q.UserName, q.Channel)
		}
	}
	if q := page.Queries[len(page.Queries)-1]; q.Resolved == "" || !strings.Contains(q.Resolved, "200 L NaOCl 12.5 %") {
		t.Errorf("tag request logged with resolved text %q", q.Resolved)
	}
}

func TestConsoleSecondStartDoesNotReseed(t *testing.T) {
	db := filepath.Join(t.TempDir(), "site.db")
	env := map[string]string{"MIXWARD_DB": db}
	if _, _, code := runConsole(t, env, "streams remove T-101\n", "console"); code != 0 {
		t.Fatal("first run failed")
	}
	stdout, stderr, code := runConsole(t, env, "streams show T-101\nstreams\n", "console")
	if code != 0 || strings.Contains(stderr, "seeded") {
		t.Fatalf("second start: exit %d, stderr %q", code, stderr)
	}
	if !strings.Contains(stdout, "no stream T-101") || !strings.Contains(stdout, "9 streams") {
		t.Errorf("second start changed the catalogue:\n%s", stdout)
	}
}

func TestConsoleNoDemoAndBadFlags(t *testing.T) {
	db := filepath.Join(t.TempDir(), "site.db")
	stdout, _, code := runConsole(t, nil, "streams\n", "console", "--db", db, "--no-demo")
	if code != 0 || !strings.Contains(stdout, "catalogue is empty") {
		t.Errorf("--no-demo: exit %d, %q", code, stdout)
	}
	for _, args := range [][]string{
		{"console", "--db", db, "--tz", "Mars/Olympus"},
		{"console", "--db", db, "--shifts", "every day"},
		{"console", "--db", db, "--frobnicate"},
		{"console", "--db", db, "extra"},
	} {
		_, stderr, code := runConsole(t, nil, "", args...)
		if code != exitUsage {
			t.Errorf("%v: exit %d, want %d (stderr %q)", args, code, exitUsage, stderr)
		}
	}
}

func TestDemoStreamsAllParse(t *testing.T) {
	eng := mustEngine(t)
	demo, err := parseDemo(demoStreams)
	if err != nil {
		t.Fatal(err)
	}
	if len(demo) < 8 {
		t.Fatalf("%d demo streams, want about ten", len(demo))
	}
	for _, d := range demo {
		if err := checkStream(eng, d.Stream); err != nil {
			t.Errorf("demo stream %s %q: %v", d.Tag, d.Stream, err)
		}
		if !strings.Contains(d.Note, "invented demo data") {
			t.Errorf("demo stream %s is not marked as invented demo data: %q", d.Tag, d.Note)
		}
	}
}

func TestCheckStream(t *testing.T) {
	eng := mustEngine(t)
	for _, tc := range []struct {
		text string
		ok   bool
	}{
		{"200 L NaOCl 12.5 %", true},
		{"NaOH 5 %, Na2CO3 2 %", true},
		{"200 L NaOCl 12.5 % + 50 L HCl 10 %", false}, // two streams
		{"200 L NaOCl 12.5 % at 40 C", false},         // conditions belong to a request
		{"200 L unobtainium 5 %", false},
	} {
		err := checkStream(eng, tc.text)
		if (err == nil) != tc.ok {
			t.Errorf("checkStream(%q) = %v, want ok %v", tc.text, err, tc.ok)
		}
	}
}

func TestNoArgumentsStartsTheConsole(t *testing.T) {
	env := map[string]string{"MIXWARD_DB": filepath.Join(t.TempDir(), "d.db")}
	stdout, stderr, code := runConsole(t, env, "mix 200 L NaOCl 12.5 % + 50 L HCl 10 %\n")
	if code != 0 || !strings.Contains(stdout, "DO NOT MIX: releases chlorine") {
		t.Errorf("mixward with no arguments: exit %d\nstdout %s\nstderr %s", code, stdout, stderr)
	}
}

// Every pair of demo streams gets an answer that fits Slack's Block Kit
// limits once rendered.
func TestDemoPairsRenderWithinBlockKitLimits(t *testing.T) {
	eng := mustEngine(t)
	demo, err := parseDemo(demoStreams)
	if err != nil {
		t.Fatal(err)
	}
	byTag := map[string]string{}
	for _, d := range demo {
		byTag[d.Tag] = d.Stream
	}
	resolve := func(tag string) (string, bool) { s, ok := byTag[tag]; return s, ok }
	for i, a := range demo {
		for _, b := range demo[i+1:] {
			req := "mix " + a.Tag + " + " + b.Tag
			res, err := eng.Ask(req, engine.AskOptions{Resolve: resolve})
			if err != nil {
				t.Errorf("%s: %v", req, err)
				continue
			}
			msgs := bot.SplitMessages(engine.RenderText(res), bot.ResultBlocks(res, 1))
			for _, m := range msgs {
				if len(m.Blocks) > bot.MaxBlocks || len(m.Text) > bot.MaxFallback {
					t.Errorf("%s: message of %d blocks, %d bytes of fallback", req, len(m.Blocks), len(m.Text))
				}
				js, _ := json.Marshal(m.Blocks)
				var blocks []struct {
					Type string `json:"type"`
					Text struct {
						Text string `json:"text"`
					} `json:"text"`
				}
				json.Unmarshal(js, &blocks)
				for _, bl := range blocks {
					n := len([]rune(bl.Text.Text))
					if bl.Type == "header" && n > bot.MaxHeaderChars || bl.Type == "section" && (n > bot.MaxSectionText || n == 0) {
						t.Errorf("%s: %s block of %d characters", req, bl.Type, n)
					}
				}
			}
		}
	}
}

// TestConsolePourPictureRecorded: the console's details, pour and picture
// show the last answer (or a logged one), the picture is written as a PNG,
// and each is recorded against its query like a button press.
func TestConsolePourPictureRecorded(t *testing.T) {
	dir := t.TempDir()
	db := filepath.Join(dir, "site.db")
	env := map[string]string{"MIXWARD_DB": db, "MIXWARD_TZ": "UTC"}
	input := "mix 200 L NaOCl 12.5 % + 50 L HCl 10 %\npour\npicture\ndetails 1\npour 9\n"
	stdout, stderr, code := runConsole(t, env, input, "console", "--no-demo", "--picture-dir", dir)
	if code != 0 {
		t.Fatalf("exit %d\nstderr: %s", code, stderr)
	}
	for _, want := range []string{"Along the pour", "into", "E–pH picture written to " + filepath.Join(dir, "mixward-eph-1.png"),
		"Query #1, asked", "I could not read query #9"} {
		if !strings.Contains(stdout, want) {
			t.Errorf("console output lacks %q:\n%s", want, stdout)
		}
	}
	png, err := os.ReadFile(filepath.Join(dir, "mixward-eph-1.png"))
	if err != nil || !bytes.HasPrefix(png, []byte("\x89PNG")) {
		t.Errorf("picture file: %d bytes, %v", len(png), err)
	}
	s, err := store.OpenReadOnly(context.Background(), db, store.Options{})
	if err != nil {
		t.Fatal(err)
	}
	defer s.Close()
	ps, err := s.Presses(context.Background(), 1)
	if err != nil || len(ps) != 3 || ps[0].Action != "pour" || ps[1].Action != "picture" || ps[2].Action != "details" || ps[0].Transport != "console" {
		t.Errorf("presses = %+v, %v; want pour, picture, details from the console", ps, err)
	}
}
