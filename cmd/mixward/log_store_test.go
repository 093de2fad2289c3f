package main

import (
	"bytes"
	"context"
	"database/sql"
	"encoding/csv"
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"mixward/store"
)

// storeCLI runs mixward with env and returns the exit code and output.
func storeCLI(t *testing.T, env map[string]string, args ...string) (code int, stdout, stderr string) {
	t.Helper()
	var so, se bytes.Buffer
	code = run(context.Background(), args, func(k string) string { return env[k] }, strings.NewReader(""), &so, &se)
	return code, so.String(), se.String()
}

// storeEnv is a fresh database in a temporary directory, site in London.
func storeEnv(t *testing.T) (map[string]string, string) {
	t.Helper()
	db := filepath.Join(t.TempDir(), "mixward.db")
	return map[string]string{"MIXWARD_DB": db, "MIXWARD_TZ": "Europe/London", "USER": "test.operator"}, db
}

// seedLog logs a small scripted day shift (1 December 2026) at the
// invented Harrowgate Finishing Works.
func seedLog(t *testing.T, path string) {
	t.Helper()
	db, err := store.Open(context.Background(), path, store.Options{})
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	at := func(h, m int) time.Time { return time.Date(2026, 12, 1, h, m, 0, 0, time.UTC) }
	e := 0.12
	for _, q := range []*store.Query{
		{Time: at(6, 30), UserID: "U01", UserName: "op.north", Channel: "C0SHIFT", Request: "mix T-101 + 40 L HCl 1 M",
			Resolved: "mix 200 L NaOCl 12.5 % + 40 L HCl 1 M", Verdict: "spontaneous", Species: []string{"OCl-", "H+", "Cl-"},
			Oxidizer: "OCl-", Reducer: "Cl-", ECellV: &e,
			Hazards: []store.Hazard{{Code: "CL2-GAS", Severity: "danger", Message: "chlorine gas is released"}},
			Streams: []string{"NaOCl 12.5 %", "HCl 1 M"}, Result: json.RawMessage(`{"verdict":"spontaneous"}`)},
		{Time: at(8, 0), UserID: "U02", UserName: "op.south", Channel: "cli", Request: `mix "T-9" + (acid) NEAR *`,
			Verdict: "error", Error: `unknown word "NEAR"`},
		{Time: at(9, 15), UserID: "U02", UserName: "op.south", Channel: "console", Request: "mix 20 L CuSO4 0.5 M + 2 kg Zn",
			Verdict: "spontaneous", Species: []string{"Cu^2+", "SO4^2-", "Zn(s)"}, Streams: []string{"CuSO4 0.5 M", "Zn"}},
		{Time: at(11, 0), UserID: "U01", UserName: "op.north", Channel: "C0SHIFT", Request: "mix 50 L NaOH 1 M + 50 L water",
			Verdict: "no-reaction", Streams: []string{"NaOH 1 M", "water"}},
	} {
		if _, err := db.LogQuery(context.Background(), q); err != nil {
			t.Fatal(err)
		}
	}
}

func sqlExec(t *testing.T, path, stmt string) {
	t.Helper()
	db, err := sql.Open("sqlite3", path)
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	if _, err := db.Exec(stmt); err != nil {
		t.Fatal(err)
	}
}

func TestLogVerifyCLI(t *testing.T) {
	env, path := storeEnv(t)
	code, out, errOut := storeCLI(t, env, "log", "verify")
	if code != exitUsage || out != "" || !strings.Contains(errOut, "no database file") || !strings.Contains(errOut, "never creates") {
		t.Fatalf("verify on a missing db: %d %q %q", code, out, errOut)
	}
	if _, err := os.Stat(path); !errors.Is(err, os.ErrNotExist) {
		t.Fatalf("verify on a missing db created %s (%v)", path, err)
	}
	seedLog(t, path)
	code, out, _ = storeCLI(t, env, "log", "verify")
	if code != 0 || !strings.Contains(out, "chain intact: 4 rows") || !strings.Contains(out, "head hash ") {
		t.Fatalf("verify: %d %q", code, out)
	}
	code, out, _ = storeCLI(t, env, "log", "verify", "--format", "json")
	var rep store.VerifyReport
	if code != 0 || json.Unmarshal([]byte(out), &rep) != nil || !rep.OK || rep.Queries != 4 {
		t.Fatalf("verify json: %d %q", code, out)
	}
	sqlExec(t, path, `UPDATE queries SET verdict = 'no-reaction' WHERE id = 1`)
	code, out, errOut = storeCLI(t, env, "log", "verify")
	if code != exitFail || !strings.Contains(out, "CHAIN BROKEN at row 1") || !strings.Contains(errOut, "broken at row 1") {
		t.Errorf("verify after an edit: code %d\n%s\n%s", code, out, errOut)
	}
	code, out, _ = storeCLI(t, env, "log", "verify", "--format", "json")
	if code != exitFail || !strings.Contains(out, `"broken_id": 1`) {
		t.Errorf("verify json after an edit: %d %s", code, out)
	}
}

func TestLogSearchCLI(t *testing.T) {
	env, path := storeEnv(t)
	seedLog(t, path)
	for _, tc := range []struct {
		name string
		args []string
		code int
		want []string
		not  []string
	}{
		{"terms", []string{"NaOCl"}, 0, []string{"TIME (Europe/London)", "op.north", "mix T-101 + 40 L HCl 1 M", "CL2-GAS", "Matches 1–1"}, nil},
		{"hostile terms", []string{`"T-9" + (acid) NEAR *`}, 0, []string{"op.south", `[unknown word "NEAR"]`}, []string{"op.north"}},
		{"flags after terms", []string{"Zn", "--verdict", "spontaneous"}, 0, []string{"CuSO4"}, []string{"NaOH"}},
		{"only punctuation", []string{"*(-)"}, 0, []string{"hold no letters or digits"}, nil},
		{"no match", []string{"KMnO4"}, 0, []string{"No queries match."}, nil},
		{"user filter", []string{"--user", "OP.SOUTH"}, 0, []string{"CuSO4", "NEAR"}, []string{"NaOH"}},
		{"hazard filter", []string{"--hazard", "cl2-gas"}, 0, []string{"T-101"}, []string{"CuSO4"}},
		{"window in site time", []string{"--since", "2026-12-01T08:00", "--until", "2026-12-01 10:00"}, 0, []string{"NEAR", "CuSO4"}, []string{"T-101", "NaOH"}},
		{"paging", []string{"--limit", "2"}, 0, []string{"Matches 1–2", "add --offset 2"}, nil},
		{"bad verdict", []string{"--verdict", "explosive"}, exitUsage, nil, nil},
		{"bad date", []string{"--since", "last tuesday"}, exitUsage, nil, nil},
		{"window backwards", []string{"--since", "2026-12-02", "--until", "2026-12-01"}, exitUsage, nil, nil},
		{"bad format", []string{"--format", "xml"}, exitUsage, nil, nil},
		{"bad limit", []string{"--limit", "0"}, exitUsage, nil, nil},
	} {
		t.Run(tc.name, func(t *testing.T) {
			code, out, errOut := storeCLI(t, env, append([]string{"log", "search"}, tc.args...)...)
			if code != tc.code {
				t.Fatalf("exit %d, want %d\n%s%s", code, tc.code, out, errOut)
			}
			for _, w := range tc.want {
				if !strings.Contains(out, w) {
					t.Errorf("output lacks %q:\n%s", w, out)
				}
			}
			for _, w := range tc.not {
				if strings.Contains(out, w) {
					t.Errorf("output has %q:\n%s", w, out)
				}
			}
		})
	}

	code, out, _ := storeCLI(t, env, "log", "search", "--format", "json", "HCl")
	var page struct {
		Queries []map[string]any `json:"queries"`
		HasMore bool             `json:"has_more"`
	}
	if code != 0 || json.Unmarshal([]byte(out), &page) != nil || len(page.Queries) != 1 {
		t.Fatalf("json search: %d %s", code, out)
	}
	for _, k := range []string{"id", "time", "user_id", "user_name", "channel", "request", "resolved", "verdict", "error",
		"species", "oxidizer", "reducer", "e_cell_v", "e_cell_standard_v", "hazards", "streams", "result", "engine_version",
		"data_hash", "hash", "prev_hash"} {
		if _, ok := page.Queries[0][k]; !ok {
			t.Errorf("json search result lacks %q", k)
		}
	}
	code, out, _ = storeCLI(t, env, "log", "search", "--format", "csv")
	recs, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if code != 0 || err != nil || len(recs) != 5 || recs[0][0] != "id" || recs[1][0] != "4" {
		t.Errorf("csv search: %d %v %q", code, err, recs)
	}
}

func TestLogExportShowPruneCLI(t *testing.T) {
	env, path := storeEnv(t)
	seedLog(t, path)
	code, out, _ := storeCLI(t, env, "log", "export", "--since", "2026-12-01T08:00Z")
	recs, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if code != 0 || err != nil || len(recs) != 4 || strings.Join(recs[0][:4], ",") != "id,kind,time,user_id" || recs[1][0] != "2" {
		t.Fatalf("csv export: %d %v %q", code, err, recs)
	}
	code, out, _ = storeCLI(t, env, "log", "export", "--format", "json")
	var rows []map[string]any
	if code != 0 || json.Unmarshal([]byte(out), &rows) != nil || len(rows) != 4 || rows[0]["kind"] != "query" || rows[0]["id"] != 1.0 {
		t.Fatalf("json export: %d %s", code, out)
	}
	outFile := filepath.Join(t.TempDir(), "audit.csv")
	if code, _, errOut := storeCLI(t, env, "log", "export", "--out", outFile); code != 0 || !strings.Contains(errOut, "exported 4 rows") {
		t.Errorf("export --out: %d %s", code, errOut)
	}
	if code, _, _ := storeCLI(t, env, "log", "export", "--out", outFile); code != exitFail {
		t.Errorf("export over an existing file: exit %d, want %d", code, exitFail)
	}

	code, out, _ = storeCLI(t, env, "log", "show", "1")
	for _, w := range []string{"Query 1", "2026-12-01 06:30 GMT", "op.north (U01)", "resolved", "danger CL2-GAS", "+0.120 V", "no delivery recorded"} {
		if code != 0 || !strings.Contains(out, w) {
			t.Errorf("log show lacks %q (exit %d):\n%s", w, code, out)
		}
	}
	if code, _, _ := storeCLI(t, env, "log", "show", "99"); code != exitFail {
		t.Errorf("show of a missing id: exit %d", code)
	}
	if code, _, _ := storeCLI(t, env, "log", "show", "one"); code != exitUsage {
		t.Errorf("show of a bad id: exit %d", code)
	}

	// Prune needs --before and --confirm and never a future date.
	for _, args := range [][]string{{}, {"--before", "2026-12-01T09:00"}, {"--before", "2999-01-01", "--confirm"}} {
		if code, _, _ := storeCLI(t, env, append([]string{"log", "prune"}, args...)...); code != exitUsage {
			t.Errorf("prune %v: exit %d, want %d", args, code, exitUsage)
		}
	}
	if code, _, _ := storeCLI(t, env, "log", "verify"); code != 0 {
		t.Fatal("a refused prune changed the log")
	}
	code, out, _ = storeCLI(t, env, "log", "prune", "--before", "2026-12-01T09:00", "--confirm")
	if code != 0 || !strings.Contains(out, "Deleted 2 rows") || !strings.Contains(out, "test.operator") || !strings.Contains(out, "chain intact") {
		t.Fatalf("prune: %d\n%s", code, out)
	}
	code, out, _ = storeCLI(t, env, "log", "export", "--format", "json")
	if code != 0 || !strings.Contains(out, `"kind":"prune"`) || !strings.Contains(out, `"deleted":2`) {
		t.Errorf("export after prune lacks the prune record: %s", out)
	}
}

func TestLogBackupRestoreCLI(t *testing.T) {
	env, path := storeEnv(t)
	seedLog(t, path)
	bak := filepath.Join(t.TempDir(), "backup.db")
	code, out, errOut := storeCLI(t, env, "log", "backup", bak)
	if code != 0 || !strings.Contains(out, "chain intact: 4 rows") {
		t.Fatalf("backup: %d %s %s", code, out, errOut)
	}
	if code, _, _ := storeCLI(t, env, "log", "backup", bak); code == 0 {
		t.Error("backup over an existing file succeeded")
	}
	// Into a fresh database.
	env2 := map[string]string{"MIXWARD_DB": filepath.Join(t.TempDir(), "new.db")}
	code, out, errOut = storeCLI(t, env2, "log", "restore", bak)
	if code != 0 || !strings.Contains(out, "Restored") || !strings.Contains(out, "chain intact: 4 rows") {
		t.Fatalf("restore: %d %s %s", code, out, errOut)
	}
	// A log with queries is replaced only with --replace.
	if code, _, _ := storeCLI(t, env2, "log", "restore", bak); code != exitUsage {
		t.Errorf("restore over a non-empty log without --replace: exit %d", code)
	}
	// --db beats MIXWARD_DB.
	if code, _, _ := storeCLI(t, env, "log", "restore", "--db", env2["MIXWARD_DB"], "--replace", bak); code != 0 {
		t.Errorf("restore --replace --db: exit %d", code)
	}
	// A tampered backup is refused and changes nothing.
	sqlExec(t, bak, `UPDATE queries SET request = 'mix water + water' WHERE id = 3`)
	code, out, _ = storeCLI(t, env2, "log", "restore", "--replace", bak)
	if code != exitFail || !strings.Contains(out, "CHAIN BROKEN at row 3") {
		t.Errorf("restore of a tampered backup: %d %s", code, out)
	}
	if code, _, _ := storeCLI(t, env2, "log", "verify"); code != 0 {
		t.Error("the refused restore changed the log")
	}
	if code, _, _ := storeCLI(t, env2, "log", "restore", filepath.Join(t.TempDir(), "none.db")); code != exitFail {
		t.Errorf("restore of a missing file: exit %d", code)
	}
}

func TestStreamsCLI(t *testing.T) {
	env, _ := storeEnv(t)
	code, out, errOut := storeCLI(t, env, "streams", "set", "t-101", "200 L NaOCl 12.5 %", "--note", "bleach day tank")
	if code != 0 || !strings.Contains(out, "T-101 set: 200 L NaOCl 12.5 %") {
		t.Fatalf("streams set: %d %s %s", code, out, errOut)
	}
	code, out, _ = storeCLI(t, env, "streams", "set", "T-101", "200 L NaOCl 10 %", "--by", "shift.lead")
	if code != 0 || !strings.Contains(out, "was 200 L NaOCl 12.5 %") {
		t.Fatalf("streams set again: %d %s", code, out)
	}
	code, out, _ = storeCLI(t, env, "streams", "list")
	if code != 0 || !strings.Contains(out, "T-101") || !strings.Contains(out, "200 L NaOCl 10 %") || !strings.Contains(out, "shift.lead") {
		t.Errorf("streams list: %d %s", code, out)
	}
	code, out, _ = storeCLI(t, env, "streams", "show", "T-101")
	for _, w := range []string{"T-101 = 200 L NaOCl 10 %", "History (Europe/London)", "test.operator", "set to 200 L NaOCl 12.5 %", "bleach day tank", "shift.lead"} {
		if code != 0 || !strings.Contains(out, w) {
			t.Errorf("streams show lacks %q:\n%s", w, out)
		}
	}
	code, out, _ = storeCLI(t, env, "streams", "show", "T-101", "--format", "json")
	var show struct {
		Tag     string               `json:"tag"`
		Current *store.Stream        `json:"current"`
		History []store.StreamChange `json:"history"`
	}
	if code != 0 || json.Unmarshal([]byte(out), &show) != nil || show.Current == nil || len(show.History) != 2 {
		t.Errorf("streams show json: %d %s", code, out)
	}
	if code, _, _ := storeCLI(t, env, "streams", "rm", "T-101"); code != 0 {
		t.Errorf("streams rm: exit %d", code)
	}
	code, out, _ = storeCLI(t, env, "streams", "show", "t-101")
	if code != 0 || !strings.Contains(out, "removed") {
		t.Errorf("streams show after rm: %d %s", code, out)
	}
	code, out, _ = storeCLI(t, env, "streams", "list", "--format", "json")
	if code != 0 || strings.TrimSpace(out) != "[]" {
		t.Errorf("streams list json after rm: %d %q", code, out)
	}
	for _, tc := range []struct {
		args []string
		code int
	}{
		{[]string{"set", "T 101", "water"}, exitUsage},
		{[]string{"set", "T-1"}, exitUsage},
		{[]string{"set", "T-1", "200 L Bleech 12.5 %"}, exitUsage},           // does not parse
		{[]string{"set", "T-1", "200 L NaOCl 12.5 % + 50 L HCl"}, exitUsage}, // two streams
		{[]string{"show", "T-404"}, exitFail},
		{[]string{"rm", "T-404"}, exitFail},
		{[]string{"frob"}, exitUsage},
		{nil, exitUsage},
	} {
		if code, out, errOut := storeCLI(t, env, append([]string{"streams"}, tc.args...)...); code != tc.code {
			t.Errorf("streams %q: exit %d, want %d\n%s%s", tc.args, code, tc.code, out, errOut)
		}
	}
}

func TestDigestCLI(t *testing.T) {
	env, path := storeEnv(t)
	seedLog(t, path)
	code, out, errOut := storeCLI(t, env, "digest", "--since", "2026-12-01T06:00", "--until", "2026-12-01T18:00")
	for _, w := range []string{"Shift digest Tue 01 Dec 2026 06:00 GMT – 18:00 GMT (Europe/London)", "4 queries from 2 people",
		"do not mix 1", "DO NOT MIX       ×1   HCl 1 M + NaOCl 12.5 %  CL2-GAS  #1", "Requests that did not parse (1)", "advisory, never a permit"} {
		if code != 0 || !strings.Contains(out, w) {
			t.Errorf("digest lacks %q (exit %d, %s):\n%s", w, code, errOut, out)
		}
	}
	code, out, _ = storeCLI(t, env, "digest", "--since", "2026-12-01T06:00", "--until", "2026-12-01T18:00", "--format", "json")
	var d store.Digest
	if code != 0 || json.Unmarshal([]byte(out), &d) != nil || d.Queries != 4 || d.TimeZone != "Europe/London" || len(d.Flagged) != 1 {
		t.Errorf("digest json: %d %s", code, out)
	}
	// The default period is the shift that ended last.
	code, out, _ = storeCLI(t, env, "digest", "--shifts", "0 6,18 * * *")
	if code != 0 || !strings.Contains(out, "Shift digest") {
		t.Errorf("default digest: %d %s", code, out)
	}
	code, out, _ = storeCLI(t, env, "digest", "--sent")
	if code != 0 || !strings.Contains(out, "No scheduled digests") {
		t.Errorf("digest --sent: %d %s", code, out)
	}
	for _, args := range [][]string{{"--until", "2026-12-01"}, {"--shifts", "every day"}, {"--since", "2026-12-02", "--until", "2026-12-01"}, {"--format", "pdf"}} {
		if code, _, _ := storeCLI(t, env, append([]string{"digest"}, args...)...); code != exitUsage {
			t.Errorf("digest %v: exit %d, want %d", args, code, exitUsage)
		}
	}
	env["MIXWARD_TZ"] = "Mars/Olympus"
	if code, _, _ := storeCLI(t, env, "digest"); code != exitUsage {
		t.Errorf("digest with a bad MIXWARD_TZ: exit %d", code)
	}
}

// TestStoreSubcommandHelp checks that every subcommand documents its flags.
func TestStoreSubcommandHelp(t *testing.T) {
	env, _ := storeEnv(t)
	for _, tc := range []struct {
		args  []string
		flags []string
	}{
		{[]string{"log", "verify"}, []string{"-db", "-tz", "-format"}},
		{[]string{"log", "search"}, []string{"-since", "-until", "-user", "-verdict", "-hazard", "-limit", "-offset", "-format", "-db", "NEAR"}},
		{[]string{"log", "export"}, []string{"-since", "-until", "-format", "-out"}},
		{[]string{"log", "show"}, []string{"-format"}},
		{[]string{"log", "prune"}, []string{"-before", "-confirm", "-by"}},
		{[]string{"log", "backup"}, []string{"-db", "online backup"}},
		{[]string{"log", "restore"}, []string{"-replace"}},
		{[]string{"streams", "set"}, []string{"-note", "-by"}},
		{[]string{"streams", "list"}, []string{"-format"}},
		{[]string{"streams", "show"}, []string{"-format"}},
		{[]string{"streams", "rm"}, []string{"-by"}},
		{[]string{"digest"}, []string{"-since", "-until", "-format", "-shifts", "-sent"}},
	} {
		code, _, errOut := storeCLI(t, env, append(tc.args, "-h")...)
		if code != 0 {
			t.Errorf("%v -h: exit %d", tc.args, code)
		}
		for _, f := range tc.flags {
			if !strings.Contains(errOut, f) {
				t.Errorf("%v -h does not mention %s:\n%s", tc.args, f, errOut)
			}
		}
	}
	for _, args := range [][]string{{"log"}, {"log", "frob"}} {
		if code, _, errOut := storeCLI(t, env, args...); code != exitUsage || !strings.Contains(errOut, "verify") {
			t.Errorf("%v: exit %d %s", args, code, errOut)
		}
	}
}

// TestLogShowPressesAndNames: log show names the channel as it was called
// at the time and lists the buttons pressed on the answer; log search names
// the channel too.
func TestLogShowPressesAndNames(t *testing.T) {
	env, path := storeEnv(t)
	seedLog(t, path)
	db, err := store.Open(context.Background(), path, store.Options{})
	if err != nil {
		t.Fatal(err)
	}
	ctx := context.Background()
	at := time.Date(2026, 12, 1, 6, 0, 0, 0, time.UTC)
	if err := db.NoteName(ctx, "C0SHIFT", "#finishing", at); err != nil {
		t.Fatal(err)
	}
	if err := db.RecordPress(ctx, store.Press{QueryID: 1, Action: store.PressDetails, UserID: "U02", UserName: "op.south", Channel: "C0SHIFT", Transport: "socket", Time: at.Add(time.Hour)}); err != nil {
		t.Fatal(err)
	}
	db.Close()
	code, out, errOut := storeCLI(t, env, "log", "show", "1")
	for _, want := range []string{"where", "#finishing (C0SHIFT)", "pressed", "details by op.south (U02) over socket"} {
		if code != 0 || !strings.Contains(out, want) {
			t.Errorf("log show lacks %q (exit %d %s):\n%s", want, code, errOut, out)
		}
	}
	code, out, _ = storeCLI(t, env, "log", "show", "1", "--format", "json")
	var js struct {
		ChannelName string        `json:"channel_name"`
		Presses     []store.Press `json:"presses"`
	}
	if code != 0 || json.Unmarshal([]byte(out), &js) != nil || js.ChannelName != "#finishing" || len(js.Presses) != 1 {
		t.Errorf("log show json: %d %s", code, out)
	}
	if code, out, _ = storeCLI(t, env, "log", "search", "HCl"); code != 0 || !strings.Contains(out, "#finishing") {
		t.Errorf("log search does not name the channel: %d\n%s", code, out)
	}
}
