package main

import (
	"context"
	"crypto/sha256"
	"database/sql"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"syscall"
	"testing"
	"time"

	"mixward/store"
)

// readOnlyCommands are the subcommands that must only read the log.
var readOnlyCommands = [][]string{
	{"log", "verify"},
	{"log", "search", "NaOCl"},
	{"log", "search", "--hazard", "CL2-GAS"},
	{"log", "show", "1"},
	{"log", "export"},
	{"log", "export", "--format", "json"},
	{"digest", "--since", "2026-12-01", "--until", "2026-12-02"},
	{"digest", "--sent"},
	{"streams", "list"},
	{"streams", "show", "T-101"},
}

// dirFiles lists the names in dir.
func dirFiles(t *testing.T, dir string) []string {
	t.Helper()
	es, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	for _, e := range es {
		out = append(out, e.Name())
	}
	sort.Strings(out)
	return out
}

func TestReadOnlyCommandsOnMissingFile(t *testing.T) {
	for _, args := range readOnlyCommands {
		t.Run(strings.Join(args, " "), func(t *testing.T) {
			env, path := storeEnv(t)
			env["MIXWARD_DB"] = path + ".typo"
			code, out, errOut := storeCLI(t, env, args...)
			if code != exitUsage || out != "" || !strings.Contains(errOut, "no database file") || !strings.Contains(errOut, ".typo") {
				t.Errorf("exit %d, stdout %q, stderr %q; want exit 2 naming the missing file", code, out, errOut)
			}
			if got := dirFiles(t, filepath.Dir(path)); len(got) != 0 {
				t.Errorf("files created: %v", got)
			}
		})
	}
}

// fileSum is the SHA-256 of the file at path.
func fileSum(t *testing.T, path string) [32]byte {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return sha256.Sum256(b)
}

// TestReadOnlyCommandsChangeNothing runs each read-only command on a closed
// log and checks that the database file is byte for byte the same.
func TestReadOnlyCommandsChangeNothing(t *testing.T) {
	env, path := storeEnv(t)
	seedLog(t, path)
	before := fileSum(t, path)
	for _, args := range readOnlyCommands {
		code, out, errOut := storeCLI(t, env, args...)
		if code != 0 && !(args[0] == "streams" && args[1] == "show") { // T-101 is not in the catalogue: exit 1
			t.Errorf("%v: exit %d\n%s%s", args, code, out, errOut)
		}
	}
	if fileSum(t, path) != before {
		t.Error("a read-only command changed the database file")
	}
}

// oldSchemaFile builds a genuine schema-version-3 log (before chain kinds)
// from the migration files, with one query, as an older mixward left it.
func oldSchemaFile(t *testing.T, path string) {
	t.Helper()
	db, err := sql.Open("sqlite3", path)
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	db.SetMaxOpenConns(1)
	stmts := []string{`CREATE TABLE schema_version (version INTEGER PRIMARY KEY, name TEXT NOT NULL, applied_at TEXT NOT NULL)`}
	for v, name := range []string{"0001_query_log", "0002_search", "0003_catalogue_digests"} {
		b, err := os.ReadFile(filepath.Join("..", "..", "store", "migrations", name+".sql"))
		if err != nil {
			t.Fatal(err)
		}
		stmts = append(stmts, string(b), fmt.Sprintf(`INSERT INTO schema_version VALUES (%d, '%s', '2026-11-01T00:00:00.000000000Z')`, v+1, name))
	}
	for _, s := range stmts {
		if _, err := db.Exec(s); err != nil {
			t.Fatalf("build old file: %v", err)
		}
	}
	// A plain row hashed as version 3 did (mixward-chain-1, no chain columns).
	cur, err := store.Open(context.Background(), filepath.Join(t.TempDir(), "donor.db"), store.Options{})
	if err != nil {
		t.Fatal(err)
	}
	q := &store.Query{Time: time.Date(2026, 11, 30, 7, 0, 0, 0, time.UTC), UserName: "op.east", Channel: "cli",
		Request: "mix 20 L CuSO4 0.5 M + 2 kg Zn", Verdict: "spontaneous", Streams: []string{"CuSO4 0.5 M", "Zn"}}
	if _, err := cur.LogQuery(context.Background(), q); err != nil {
		t.Fatal(err)
	}
	cur.Close()
	if _, err := db.Exec(`INSERT INTO queries (id, kind, time, user_name, channel, request, verdict, streams, prev_hash, hash)
		VALUES (1, 'query', ?, ?, ?, ?, ?, ?, '', ?);
		INSERT INTO query_fts (docid, request, species, hazards) VALUES (1, ? || ' ', '[]', '');
		UPDATE search_state SET indexed_upto = 1`,
		q.Time.Format("2006-01-02T15:04:05.000000000Z"), q.UserName, q.Channel, q.Request, q.Verdict, `["CuSO4 0.5 M","Zn"]`, q.Hash, q.Request); err != nil {
		t.Fatal(err)
	}
}

func TestOlderSchemaReadAsItIs(t *testing.T) {
	env, path := storeEnv(t)
	oldSchemaFile(t, path)
	before := fileSum(t, path)
	code, out, errOut := storeCLI(t, env, "log", "verify")
	if code != 0 || !strings.Contains(out, "chain intact: 1 rows") {
		t.Fatalf("verify of a version-3 file: %d\n%s%s", code, out, errOut)
	}
	for _, args := range readOnlyCommands[1:] {
		code, out, errOut := storeCLI(t, env, args...)
		if code != exitFail || !strings.Contains(errOut, "schema version 3") || !strings.Contains(errOut, "mixward log migrate") {
			t.Errorf("%v on a version-3 file: exit %d %q %q; want exit 1 naming 'mixward log migrate'", args, code, out, errOut)
		}
	}
	if fileSum(t, path) != before {
		t.Fatal("a read-only command changed the version-3 file")
	}
	code, out, errOut = storeCLI(t, env, "log", "migrate")
	if code != 0 || !strings.Contains(out, fmt.Sprintf("from schema version 3 to %d", store.SchemaVersion())) {
		t.Fatalf("log migrate: %d %q %q", code, out, errOut)
	}
	code, out, _ = storeCLI(t, env, "log", "search", "CuSO4")
	if code != 0 || !strings.Contains(out, "op.east") {
		t.Errorf("search after migrate: %d\n%s", code, out)
	}
	code, out, _ = storeCLI(t, env, "log", "verify")
	if code != 0 || !strings.Contains(out, "chain intact: 1 rows") {
		t.Errorf("verify after migrate (old hash kept): %d\n%s", code, out)
	}
}

// TestFilesArePrivate: the database, its WAL and shared-memory files and a
// backup are created 0600, whatever the umask, and restrictUmask sets 0077.
func TestFilesArePrivate(t *testing.T) {
	old := syscall.Umask(0o022)
	defer syscall.Umask(old)
	env, path := storeEnv(t)
	db, err := store.Open(context.Background(), path, store.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if _, err := db.LogQuery(context.Background(), &store.Query{Request: "mix 1 L water + 1 L water", Verdict: "no-reaction"}); err != nil {
		t.Fatal(err)
	}
	for _, f := range []string{path, path + "-wal", path + "-shm"} {
		if st, err := os.Stat(f); err != nil || st.Mode().Perm() != 0o600 {
			t.Errorf("%s: %v %v; want mode 0600", filepath.Base(f), st.Mode().Perm(), err)
		}
	}
	db.Close()
	bak := filepath.Join(t.TempDir(), "backup.db")
	if code, out, errOut := storeCLI(t, env, "log", "backup", bak); code != 0 {
		t.Fatalf("backup: %d %s %s", code, out, errOut)
	}
	if st, err := os.Stat(bak); err != nil || st.Mode().Perm() != 0o600 {
		t.Errorf("backup: %v %v; want mode 0600", st.Mode().Perm(), err)
	}
	restrictUmask()
	if got := syscall.Umask(0o022); got != 0o077 {
		t.Errorf("umask after restrictUmask = %#o, want 077", got)
	}
}

func TestSearchTermLimitAndDashes(t *testing.T) {
	env, path := storeEnv(t)
	seedLog(t, path)
	terms := make([]string, 4096)
	for i := range terms {
		terms[i] = fmt.Sprintf("w%d", i)
	}
	code, out, errOut := storeCLI(t, env, append([]string{"log", "search"}, terms...)...)
	if code != exitUsage || !strings.Contains(errOut, "4096 different terms") || !strings.Contains(errOut, fmt.Sprintf("at most %d terms", store.MaxSearchTerms)) || strings.Contains(errOut, "FTS") {
		t.Errorf("4,096 terms: exit %d %q %q; want exit 2 with the limit", code, out, errOut)
	}
	code, out, errOut = storeCLI(t, env, append([]string{"log", "search"}, terms[:store.MaxSearchTerms]...)...)
	if code != 0 || !strings.Contains(out, "No queries match") {
		t.Errorf("%d terms: exit %d %q %q", store.MaxSearchTerms, code, out, errOut)
	}
	// A first term starting with - is a flag unless -- comes first.
	code, _, errOut = storeCLI(t, env, "log", "search", "-40", "L")
	if code != exitUsage || !strings.Contains(errOut, "-- ends the flags") {
		t.Errorf("search -40 L: exit %d %q; want exit 2 and the usage saying -- ends the flags", code, errOut)
	}
	code, out, errOut = storeCLI(t, env, "log", "search", "--", "-40", "L")
	if code != 0 || !strings.Contains(out, "T-101") || !strings.Contains(out, "Matches 1–1") {
		t.Errorf("search -- -40 L: exit %d\n%s%s; want the query with 40 L", code, out, errOut)
	}
	// After --, a flag-like word is a term too (here one no query holds).
	code, out, errOut = storeCLI(t, env, "log", "search", "--", "-40", "--limit")
	if code != 0 || !strings.Contains(out, "No queries match") {
		t.Errorf("search -- -40 --limit: exit %d\n%s%s; want --limit read as a term", code, out, errOut)
	}
	code, out, _ = storeCLI(t, env, "log", "search", "--verdict", "spontaneous", "--", "-40")
	if code != 0 || !strings.Contains(out, "T-101") {
		t.Errorf("search --verdict spontaneous -- -40: exit %d\n%s", code, out)
	}
}

// hostile is what a chat user could type to take over a reviewer's
// terminal: clear the screen, home the cursor, print in green, ring the
// bell, return the carriage, and reverse the text that follows.
const hostile = "\x1b[2J\x1b[H\x1b[32mALL CLEAR: SAFE TO MIX\x1b[0m\a\r\u202eXIM\u009b1m"

func assertNoControls(t *testing.T, where, out string) {
	t.Helper()
	if i := strings.IndexFunc(out, func(r rune) bool {
		return r == 0x1b || r == '\a' || r == '\r' || r == 0x202e || r == 0x9b
	}); i >= 0 {
		t.Errorf("%s prints a raw control character %q at byte %d:\n%q", where, out[i:i+1], i, out)
	}
	if !strings.Contains(out, `\x1b[2J`) {
		t.Errorf("%s does not show the escape sequence escaped (\\x1b[2J):\n%s", where, out)
	}
}

// TestEscapesShownEscaped puts an escape sequence in a request, a user
// name, a parse error, a stream note and a changed-by name, and reads it
// back through every printing path.
func TestEscapesShownEscaped(t *testing.T) {
	env, path := storeEnv(t)
	db, err := store.Open(context.Background(), path, store.Options{})
	if err != nil {
		t.Fatal(err)
	}
	at := time.Date(2026, 12, 1, 7, 0, 0, 0, time.UTC)
	for _, q := range []*store.Query{
		{Time: at, UserID: "U09", UserName: "op" + hostile, Channel: "C0SHIFT", Request: "mix T-101 + 40 L HCl 1 M" + hostile,
			Verdict: "spontaneous", Hazards: []store.Hazard{{Code: "CL2-GAS", Severity: "danger", Message: "chlorine" + hostile}},
			Streams: []string{"NaOCl" + hostile, "HCl 1 M"}},
		{Time: at.Add(time.Minute), UserID: "U09", UserName: "op" + hostile, Channel: "cli", Request: hostile,
			Verdict: "error", Error: `unknown word "` + hostile + `"`},
	} {
		if _, err := db.LogQuery(context.Background(), q); err != nil {
			t.Fatal(err)
		}
	}
	oneLine := strings.ReplaceAll(hostile, "\r", "") // notes and names are refused with a line break
	if err := db.SetStream(context.Background(), "T-101", "200 L NaOCl 12.5 %", "note"+oneLine, "sup"+oneLine); err != nil {
		t.Fatal(err)
	}
	db.Close()
	for _, args := range [][]string{
		{"log", "show", "1"},
		{"log", "show", "2"},
		{"log", "search"},
		{"log", "search", "chlorine"},
		{"log", "search", "--format", "csv"},
		{"log", "export"},
		{"digest", "--since", "2026-12-01", "--until", "2026-12-02"},
		{"streams", "list"},
		{"streams", "show", "T-101"},
	} {
		code, out, errOut := storeCLI(t, env, args...)
		if code != 0 {
			t.Errorf("%v: exit %d %s", args, code, errOut)
		}
		assertNoControls(t, strings.Join(args, " "), out+errOut)
	}
	// The ask error echo repeats the request and the engine's message.
	code, out, errOut := storeCLI(t, env, "ask", "--no-log", "mix "+hostile+" + HCl")
	if code != exitUsage {
		t.Errorf("ask of a hostile request: exit %d", code)
	}
	assertNoControls(t, "ask error echo", out+errOut)
}

func TestKeyedChainCLI(t *testing.T) {
	env, path := storeEnv(t)
	keyFile := filepath.Join(t.TempDir(), "chain.key")
	if err := os.WriteFile(keyFile, []byte("8c1d4f0e9a7b6c5d4e3f2a1b0c9d8e7f\n"), 0o600); err != nil {
		t.Fatal(err)
	}
	keyed := map[string]string{}
	for k, v := range env {
		keyed[k] = v
	}
	keyed["MIXWARD_CHAIN_KEY_FILE"] = keyFile
	for _, req := range []string{"mix 200 L NaOCl 12.5 % + 50 L HCl 10 %", "mix 20 L CuSO4 0.5 M + 2 kg Zn", "Zn + HCl 1 M"} {
		if code, _, errOut := storeCLI(t, keyed, "ask", req); code != 0 {
			t.Fatalf("ask with key: %d %s", code, errOut)
		}
	}
	code, out, _ := storeCLI(t, keyed, "log", "verify")
	if code != 0 || !strings.Contains(out, "chain: keyed (HMAC-SHA256") || !strings.Contains(out, "all 3 keyed rows checked") {
		t.Errorf("verify with key: %d\n%s", code, out)
	}
	code, out, _ = storeCLI(t, env, "log", "verify")
	if code != 0 || !strings.Contains(out, "NOT CHECKED: 3 keyed rows") {
		t.Errorf("verify without key: %d\n%s", code, out)
	}
	if code, _, errOut := storeCLI(t, env, "ask", "Zn + HCl 1 M"); code != exitFail || !strings.Contains(errOut, "set MIXWARD_CHAIN_KEY_FILE") {
		t.Errorf("ask without the key on a keyed log: %d %q; want exit 1 asking for the key", code, errOut)
	}
	short := filepath.Join(t.TempDir(), "short.key")
	os.WriteFile(short, []byte("too short"), 0o600)
	keyed["MIXWARD_CHAIN_KEY_FILE"] = short
	if code, _, errOut := storeCLI(t, keyed, "log", "verify"); code != exitUsage || !strings.Contains(errOut, "too short") {
		t.Errorf("verify with a short key: %d %q", code, errOut)
	}
	keyed["MIXWARD_CHAIN_KEY_FILE"] = keyFile

	// The head hash noted now (from verify's JSON) catches a cut tail later.
	var rep store.VerifyReport
	_, out, _ = storeCLI(t, keyed, "log", "verify", "--format", "json")
	if err := jsonUnmarshal(out, &rep); err != nil || rep.HeadHash == "" || rep.LastID != 3 {
		t.Fatalf("verify json: %v %+v", err, rep)
	}
	if code, out, _ := storeCLI(t, keyed, "log", "verify", "--expect", rep.HeadHash); code != 0 || !strings.Contains(out, "on the chain at row 3") {
		t.Errorf("verify --expect head: %d\n%s", code, out)
	}
	anchors := filepath.Join(t.TempDir(), "anchors.txt")
	os.WriteFile(anchors, []byte(fmt.Sprintf("# shift report 06:00\n%d %s\n", rep.LastID, rep.HeadHash)), 0o600)
	sqlExec(t, path, `DELETE FROM queries WHERE id = 3; DELETE FROM query_hazards WHERE query_id = 3; DELETE FROM query_keys WHERE id = 3;
		UPDATE query_ids SET retired_upto = 2; UPDATE search_state SET indexed_upto = min(indexed_upto, 2)`)
	if code, out, _ := storeCLI(t, keyed, "log", "verify"); code != 0 {
		t.Errorf("verify without anchors after a careful cut: %d (the cut alone is not visible)\n%s", code, out)
	}
	code, out, errOut := storeCLI(t, keyed, "log", "verify", "--anchors", anchors)
	if code != exitFail || !strings.Contains(out, "the newest rows were cut off") {
		t.Errorf("verify --anchors after a cut: %d\n%s%s", code, out, errOut)
	}
	code, out, _ = storeCLI(t, keyed, "log", "verify", "--expect", rep.HeadHash, "--format", "json")
	if code != exitFail || !strings.Contains(out, `"status": "missing"`) {
		t.Errorf("verify --expect after a cut: %d\n%s", code, out)
	}
	if code, _, _ := storeCLI(t, keyed, "log", "verify", "--expect", "12345"); code != exitUsage {
		t.Errorf("verify --expect with a bad hash: exit %d, want 2", code)
	}
}

func jsonUnmarshal(s string, v any) error { return json.Unmarshal([]byte(s), v) }

func TestLogReindexCLI(t *testing.T) {
	env, path := storeEnv(t)
	seedLog(t, path)
	sqlExec(t, path, `DELETE FROM query_hazards WHERE severity = 'danger'; DELETE FROM query_fts WHERE docid = 3`)
	code, out, _ := storeCLI(t, env, "log", "verify")
	if code != exitFail || !strings.Contains(out, "CL2-GAS") {
		t.Fatalf("verify after deleting derived rows: %d\n%s", code, out)
	}
	code, out, errOut := storeCLI(t, env, "log", "reindex")
	if code != 0 || !strings.Contains(out, "Rebuilt") || !strings.Contains(out, "chain intact: 4 rows") {
		t.Fatalf("log reindex: %d\n%s%s", code, out, errOut)
	}
	if code, out, _ := storeCLI(t, env, "log", "search", "CuSO4"); code != 0 || !strings.Contains(out, "Matches 1–1") {
		t.Errorf("search after reindex: %d\n%s", code, out)
	}
}
