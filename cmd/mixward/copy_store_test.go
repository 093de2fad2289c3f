package main

import (
	"crypto/rand"
	"database/sql"
	"encoding/hex"
	"net/url"
	"os"
	"path/filepath"
	"strings"
	"testing"

	_ "github.com/jackc/pgx/v5/stdlib"
)

// testPostgresURL is a new, empty schema on the server named by
// MIXWARD_TEST_POSTGRES, dropped when t ends; the test is skipped, saying
// why, when none is named.
func testPostgresURL(t *testing.T) string {
	t.Helper()
	base := os.Getenv("MIXWARD_TEST_POSTGRES")
	if base == "" {
		t.Skip("PostgreSQL tests skipped: set MIXWARD_TEST_POSTGRES to a server URL (e.g. from .ci/pg-cluster start) to run them")
	}
	var b [6]byte
	rand.Read(b[:])
	schema := "mixward_cmd_" + hex.EncodeToString(b[:])
	admin, err := sql.Open("pgx", base)
	if err != nil {
		t.Fatal(err)
	}
	defer admin.Close()
	if _, err := admin.Exec(`CREATE SCHEMA ` + schema); err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() {
		if a, err := sql.Open("pgx", base); err == nil {
			a.Exec(`DROP SCHEMA ` + schema + ` CASCADE`)
			a.Close()
		}
	})
	u, err := url.Parse(base)
	if err != nil {
		t.Fatal(err)
	}
	q := u.Query()
	q.Set("search_path", schema)
	u.RawQuery = q.Encode()
	return u.String()
}

// TestLogCopyAndSites moves a SQLite log with two sites into PostgreSQL
// (or, without a server, into another SQLite file) and back, then searches
// it by site and across sites.
func TestLogCopyAndSites(t *testing.T) {
	for _, target := range []string{"sqlite", "postgres"} {
		t.Run(target, func(t *testing.T) {
			env, src := storeEnv(t)
			mid := filepath.Join(t.TempDir(), "copy.db")
			if target == "postgres" {
				mid = testPostgresURL(t)
			}
			seedLog(t, src)
			env["MIXWARD_SITE"] = "north"
			if code, _, se := storeCLI(t, env, "ask", "mix 10 L CuSO4 0.5 M + 1 kg Zn"); code != 0 {
				t.Fatalf("ask at north: exit %d: %s", code, se)
			}
			delete(env, "MIXWARD_SITE")
			code, out, se := storeCLI(t, env, "log", "copy", "--from", src, "--to", mid)
			if code != 0 || !strings.Contains(out, "Copied 5 rows of the chain") || !strings.Contains(out, "chain intact: 5 rows") {
				t.Fatalf("log copy → %s: exit %d\n%s%s", target, code, out, se)
			}
			back := filepath.Join(t.TempDir(), "back.db")
			if code, out, se := storeCLI(t, env, "log", "copy", "--from", mid, "--to", back); code != 0 || !strings.Contains(out, "chain intact: 5 rows") {
				t.Fatalf("log copy back: exit %d\n%s%s", code, out, se)
			}
			for _, db := range []string{mid, back} {
				env["MIXWARD_DB"] = db
				_, all, _ := storeCLI(t, env, "log", "search", "CuSO4")
				_, north, _ := storeCLI(t, env, "log", "search", "CuSO4", "--site", "North")
				if !strings.Contains(all, "Matches 1–2") || !strings.Contains(north, "Matches 1–1") || !strings.Contains(north, "north/cli") {
					t.Errorf("%s: search across sites:\n%s\nsearch at north:\n%s", db, all, north)
				}
			}
			// Copying into a log that holds rows is refused, and changes nothing.
			if code, _, se := storeCLI(t, env, "log", "copy", "--from", src, "--to", mid); code != 2 {
				t.Errorf("copy into a full log: exit %d (%s), want 2", code, se)
			}
			if code, _, _ := storeCLI(t, env, "log", "copy", "--from", src); code != 2 {
				t.Errorf("copy without --to: exit %d, want 2", code)
			}
		})
	}
}
