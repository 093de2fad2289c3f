package store

import (
	"context"
	"crypto/rand"
	"database/sql"
	"encoding/hex"
	"net/url"
	"os"
	"path/filepath"
	"testing"
	"time"

	"github.com/jackc/pgx/v5"
	"github.com/jackc/pgx/v5/stdlib"
)

// backend is one kind of database the store's tests run against.
type backend struct {
	name  string
	fresh func(t testing.TB) string // the location of a new, empty database
}

var sqliteBackend = backend{name: "sqlite", fresh: func(t testing.TB) string {
	return filepath.Join(t.TempDir(), "mixward.db")
}}

// testPostgres is the PostgreSQL server the tests may use: a URL in
// MIXWARD_TEST_POSTGRES (.ci/pg-cluster starts a throw-away one).
func testPostgres() string { return os.Getenv("MIXWARD_TEST_POSTGRES") }

// postgresBackend gives each test its own schema in the test server's
// database, dropped when the test ends.
var postgresBackend = backend{name: "postgres", fresh: func(t testing.TB) string {
	t.Helper()
	base := testPostgres()
	var b [6]byte
	rand.Read(b[:])
	schema := "mixward_test_" + hex.EncodeToString(b[:])
	admin, err := sql.Open("pgx", base)
	if err != nil {
		t.Fatalf("MIXWARD_TEST_POSTGRES: %v", err)
	}
	defer admin.Close()
	if _, err := admin.Exec(`CREATE SCHEMA ` + schema); err != nil {
		t.Fatalf("MIXWARD_TEST_POSTGRES: create schema: %v", err)
	}
	t.Cleanup(func() {
		admin, err := sql.Open("pgx", base)
		if err != nil {
			return
		}
		defer admin.Close()
		admin.Exec(`DROP SCHEMA ` + schema + ` CASCADE`)
	})
	return withParam(t, base, "search_path", schema)
}}

// withParam adds a run-time parameter to a PostgreSQL URL.
func withParam(t testing.TB, dsn, k, v string) string {
	u, err := url.Parse(dsn)
	if err != nil {
		t.Fatalf("MIXWARD_TEST_POSTGRES %q: %v", dsn, err)
	}
	q := u.Query()
	q.Set(k, v)
	u.RawQuery = q.Encode()
	return u.String()
}

// eachBackend runs fn once per backend as a subtest: SQLite always,
// PostgreSQL when MIXWARD_TEST_POSTGRES names a server, and a visible skip
// otherwise.
func eachBackend(t *testing.T, fn func(t *testing.T, b backend)) {
	t.Run("sqlite", func(t *testing.T) { fn(t, sqliteBackend) })
	t.Run("postgres", func(t *testing.T) {
		requirePostgres(t)
		fn(t, postgresBackend)
	})
}

// requirePostgres skips t, saying why, when no test server is given.
func requirePostgres(t testing.TB) {
	t.Helper()
	if testPostgres() == "" {
		t.Skip("PostgreSQL tests skipped: set MIXWARD_TEST_POSTGRES to a server URL (e.g. from .ci/pg-cluster start) to run them")
	}
}

// mustOpen opens a new database of this backend.
func (b backend) mustOpen(t testing.TB, now func() time.Time) (*DB, string) {
	t.Helper()
	return b.mustOpenWith(t, Options{Now: now})
}

func (b backend) mustOpenWith(t testing.TB, opt Options) (*DB, string) {
	t.Helper()
	dsn := b.fresh(t)
	db, err := Open(context.Background(), dsn, opt)
	if err != nil {
		t.Fatalf("Open(%s): %v", dsn, err)
	}
	t.Cleanup(func() { db.Close() })
	return db, dsn
}

// raw opens dsn with plain SQL, as someone editing the database by hand
// would (? placeholders in both).
func (b backend) raw(t testing.TB, dsn string) *sql.DB {
	t.Helper()
	if b.name == "sqlite" {
		return rawDB(t, dsn)
	}
	cfg, err := pgx.ParseConfig(dsn)
	if err != nil {
		t.Fatal(err)
	}
	r := sql.OpenDB(qmarkConnector{stdlib.GetConnector(*cfg)})
	t.Cleanup(func() { r.Close() })
	return r
}
