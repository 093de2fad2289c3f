package store

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"
)

// logAsVersion logs q the way a binary of schema version v did: the search
// index exists from version 2 on.
func logAsVersion(t *testing.T, db *DB, q *Query, v int) {
	t.Helper()
	ctx := context.Background()
	q.Time = db.now()
	r, err := encodeQuery(q)
	if err != nil {
		t.Fatal(err)
	}
	tx, err := db.w.BeginTx(ctx, nil)
	if err != nil {
		t.Fatal(err)
	}
	defer tx.Rollback()
	if err := db.appendRow(ctx, tx, r, ""); err != nil {
		t.Fatal(err)
	}
	if v < hazardBatchVersion {
		if err := db.insertHazards(ctx, tx, r.ID, q.Hazards); err != nil {
			t.Fatal(err)
		}
	}
	if v >= 2 {
		if _, err := db.indexUpTo(ctx, tx, r.ID, true); err != nil {
			t.Fatal(err)
		}
	}
	if err := tx.Commit(); err != nil {
		t.Fatal(err)
	}
}

func TestMigrateFromEmpty(t *testing.T) {
	db, path := mustOpen(t, nil)
	ctx := context.Background()
	v, err := db.Version(ctx)
	if err != nil || v != SchemaVersion() || v < 3 {
		t.Fatalf("Version = %d, %v; want %d", v, err, SchemaVersion())
	}
	for _, table := range []string{"queries", "query_hazards", "deliveries", "query_fts", "stream_changes", "digests", "schema_version"} {
		var n int
		if err := rawDB(t, path).QueryRow(`SELECT count(*) FROM sqlite_master WHERE name = ?`, table).Scan(&n); err != nil || n != 1 {
			t.Errorf("table %s: count %d, %v", table, n, err)
		}
	}
	// Reopening applies nothing twice.
	db.Close()
	db2, err := Open(ctx, path, Options{})
	if err != nil {
		t.Fatal(err)
	}
	defer db2.Close()
	var rows int
	rawDB(t, path).QueryRow(`SELECT count(*) FROM schema_version`).Scan(&rows)
	if rows != SchemaVersion() {
		t.Errorf("schema_version has %d rows after reopening, want %d", rows, SchemaVersion())
	}
}

func TestMigrateFromEachOlderVersion(t *testing.T) {
	ctx := context.Background()
	for v := 1; v < SchemaVersion(); v++ {
		t.Run(migrations[v-1].name, func(t *testing.T) {
			c := newClock(t0)
			path := filepath.Join(t.TempDir(), "old.db")
			old, err := openAt(ctx, path, Options{Now: c.Now}, v)
			if err != nil {
				t.Fatal(err)
			}
			if got, _ := old.Version(ctx); got != v {
				t.Fatalf("old file at version %d, want %d", got, v)
			}
			q := demoQuery()
			q.Request = "mix 20 L CuSO4 0.5 M + 2 kg Zn"
			logAsVersion(t, old, q, v)
			old.Close()

			db, err := Open(ctx, path, Options{Now: c.Now})
			if err != nil {
				t.Fatalf("Open upgraded file: %v", err)
			}
			defer db.Close()
			if got, _ := db.Version(ctx); got != SchemaVersion() {
				t.Errorf("Version after upgrade = %d, want %d", got, SchemaVersion())
			}
			if q, err := db.Get(ctx, 1); err != nil || q.Site != DefaultSite {
				t.Errorf("row logged before sites: Get = %+v, %v; want site %q", q, err, DefaultSite)
			}
			mustLog(t, db, demoQuery())
			rep, err := db.Verify(ctx)
			if err != nil || !rep.OK || rep.Queries != 2 {
				t.Errorf("Verify after upgrade = %+v, %v", rep, err)
			}
			// Rows logged before the search index existed are found.
			page, err := db.Search(ctx, SearchOptions{Terms: "CuSO4"})
			if err != nil || len(page.Queries) != 1 || page.Queries[0].ID != 1 {
				t.Errorf("Search(CuSO4) after upgrade = %+v, %v; want row 1", page.Queries, err)
			}
			page, err = db.Search(ctx, SearchOptions{Terms: "chlorine gas"})
			if err != nil || len(page.Queries) != 2 {
				t.Errorf("Search(hazard message) after upgrade = %d rows, %v; want 2", len(page.Queries), err)
			}
			if err := db.SetStream(ctx, "T-101", "200 L NaOCl 12.5 %", "", "op.north"); err != nil {
				t.Errorf("SetStream after upgrade: %v", err)
			}
		})
	}
}

func TestNewerSchemaRefused(t *testing.T) {
	ctx := context.Background()
	db, path := mustOpen(t, nil)
	db.Close()
	if _, err := rawDB(t, path).Exec(`INSERT INTO schema_version (version, name, applied_at) VALUES (?, '9999_future', '')`, SchemaVersion()+1); err != nil {
		t.Fatal(err)
	}
	_, err := Open(ctx, path, Options{})
	if !errors.Is(err, ErrSchemaTooNew) {
		t.Fatalf("Open(newer file) = %v, want ErrSchemaTooNew", err)
	}
	for _, want := range []string{fmt.Sprintf("schema version %d", SchemaVersion()+1), fmt.Sprintf("knows up to %d", SchemaVersion()), "newer one"} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("error %q does not say %q", err, want)
		}
	}
	if _, err := VerifyFile(ctx, path); !errors.Is(err, ErrSchemaTooNew) {
		t.Errorf("VerifyFile(newer file) = %v, want ErrSchemaTooNew", err)
	}
}

func TestConcurrentOpenOfNewFile(t *testing.T) {
	path := filepath.Join(t.TempDir(), "race.db")
	var wg sync.WaitGroup
	errs := make([]error, 4)
	for i := range errs {
		wg.Add(1)
		go func() {
			defer wg.Done()
			db, err := Open(context.Background(), path, Options{})
			if err == nil {
				_, err = db.LogQuery(context.Background(), demoQuery())
				db.Close()
			}
			errs[i] = err
		}()
	}
	wg.Wait()
	for i, err := range errs {
		if err != nil {
			t.Errorf("opener %d: %v", i, err)
		}
	}
	rep, err := VerifyFile(context.Background(), path)
	if err != nil || !rep.OK || rep.Queries != 4 {
		t.Errorf("VerifyFile = %+v, %v", rep, err)
	}
}

func TestMigrationFilesNumbered(t *testing.T) {
	for i, m := range migrations {
		if m.version != i+1 || !strings.HasPrefix(m.name, fmt.Sprintf("%04d_", i+1)) {
			t.Errorf("migration %d = %+v", i, m)
		}
		if strings.TrimSpace(m.sql) == "" {
			t.Errorf("migration %s is empty", m.name)
		}
	}
}

// mainV6 are the migrations of the release before sites and inbox leases
// (schema version 6), by name and the start of their SHA-256, so the test
// below builds exactly the file that release wrote.
var mainV6 = []struct{ name, sum string }{
	{"0001_query_log", "833964163fc21848"},
	{"0002_search", "5ddba0e95e4a3303"},
	{"0003_catalogue_digests", "c9d317cee3adf543"},
	{"0004_chain_kind", "40e27f74cc7c4765"},
	{"0005_inbox", "430bd6a694739428"},
	{"0006_presses_names", "62aec4ff6c326c37"},
}

// TestMigrateFromReleaseVersion6: a file written by the release of schema
// version 6 (presses and names, no inbox leases, no sites) opens with this
// code: its rows, press, name, digest record and pending inbox entry
// survive, the rows belong to the main site, and the chain verifies.
func TestMigrateFromReleaseVersion6(t *testing.T) {
	for i, m := range mainV6 {
		sum := sha256.Sum256([]byte(migrations[i].sql))
		if migrations[i].name != m.name || hex.EncodeToString(sum[:])[:16] != m.sum {
			t.Fatalf("migration %d is %s (%x), want the released %s (%s): released migrations never change",
				i+1, migrations[i].name, sum[:8], m.name, m.sum)
		}
	}
	ctx := context.Background()
	c := newClock(t0)
	path := filepath.Join(t.TempDir(), "v6.db")
	old, err := openAt(ctx, path, Options{Now: c.Now}, len(mainV6))
	if err != nil {
		t.Fatal(err)
	}
	id := mustLog(t, old, demoQuery())
	if err := old.RecordPress(ctx, Press{QueryID: id, Action: PressDetails, UserID: "U02", Transport: "socket", Key: "1.5/U02"}); err != nil {
		t.Fatal(err)
	}
	if err := old.NoteName(ctx, "C1", "#tank-farm", t0); err != nil {
		t.Fatal(err)
	}
	if _, err := old.AcceptMessages(ctx, []InboxEntry{{EventID: "Ev6", Received: t0, Thread: "C1/1.1", Message: []byte("{}")}}); err != nil {
		t.Fatal(err)
	}
	if _, err := old.w.Exec(`INSERT INTO digests (slot, since, claimed_at, status, attempts) VALUES (?, ?, ?, 'sent', 1)`,
		formatTime(t0.Add(6*time.Hour)), formatTime(t0.Add(-6*time.Hour)), formatTime(t0.Add(6*time.Hour))); err != nil {
		t.Fatal(err)
	}
	old.Close()

	db, err := Open(ctx, path, Options{Now: c.Now})
	if err != nil {
		t.Fatalf("Open a version-6 file: %v", err)
	}
	defer db.Close()
	if v, _ := db.Version(ctx); v != SchemaVersion() || v < siteVersion {
		t.Errorf("version after upgrade = %d, want %d", v, SchemaVersion())
	}
	if q, err := db.Get(ctx, id); err != nil || q.Site != DefaultSite {
		t.Errorf("row of the version-6 file = %+v, %v; want site %q", q, err, DefaultSite)
	}
	if ps, err := db.Presses(ctx, id); err != nil || len(ps) != 1 || ps[0].Action != PressDetails {
		t.Errorf("presses after upgrade = %+v, %v", ps, err)
	}
	if n, err := db.NameAt(ctx, "C1", t0.Add(time.Hour)); err != nil || n != "#tank-farm" {
		t.Errorf("name after upgrade = %q, %v", n, err)
	}
	if recs, err := db.DigestRecords(ctx, 0); err != nil || len(recs) != 1 || recs[0].Status != "sent" {
		t.Errorf("digest records after upgrade = %+v, %v; want the sent one, now of site main", recs, err)
	}
	if e, err := db.InboxEntryFor(ctx, "Ev6"); err != nil || e.State != "pending" {
		t.Errorf("inbox entry after upgrade = %+v, %v; want pending", e, err)
	}
	mustLog(t, db, demoQuery())
	if rep, err := db.Verify(ctx); err != nil || !rep.OK || rep.Queries != 2 {
		t.Errorf("Verify after upgrade = %+v, %v", rep, err)
	}
}

// TestPostgresMigrateFromVersion2: a PostgreSQL database of version 2
// (sites, before presses and names) is upgraded on open; until then it has
// no names to read.
func TestPostgresMigrateFromVersion2(t *testing.T) {
	requirePostgres(t)
	ctx := context.Background()
	dsn := postgresBackend.fresh(t)
	old, err := openPostgres(ctx, dsn, Options{}, false, 2)
	if err != nil {
		t.Fatal(err)
	}
	id := mustLog(t, old, demoQuery())
	if n, err := old.NameAt(ctx, "C1", t0); err != nil || n != "" || old.hasNames() {
		t.Errorf("version 2: NameAt = %q, %v; hasNames %v", n, err, old.hasNames())
	}
	old.Close()
	db, err := Open(ctx, dsn, Options{})
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	if v, _ := db.Version(ctx); v != len(pgMigrations) || !db.hasNames() {
		t.Errorf("version after upgrade = %d, want %d", v, len(pgMigrations))
	}
	if err := db.RecordPress(ctx, Press{QueryID: id, Action: PressPour}); err != nil {
		t.Errorf("RecordPress after upgrade: %v", err)
	}
	if rep, err := db.Verify(ctx); err != nil || !rep.OK {
		t.Errorf("Verify after upgrade = %+v, %v", rep, err)
	}
}

// TestDigestLevelAfterUpgrade: a row logged before the level column
// (SQLite version 8, PostgreSQL version 3) is counted by its decision level
// after the upgrade, from the column the migration derived, and the chain
// still verifies.
func TestDigestLevelAfterUpgrade(t *testing.T) {
	ctx := context.Background()
	withLevel := func(level string) *Query {
		q := demoQuery()
		q.Result = json.RawMessage(`{"decision":{"level":"` + level + `"}}`)
		return q
	}
	check := func(t *testing.T, db *DB) {
		t.Helper()
		mustLog(t, db, withLevel(LevelWithPrecautions))
		d, err := db.Digest(ctx, t0.Add(-time.Hour), t0.Add(time.Hour))
		if err != nil {
			t.Fatal(err)
		}
		if d.Levels != (LevelCounts{DoNotMix: 1, WithPrecautions: 1}) {
			t.Errorf("levels after upgrade = %+v, want one do-not-mix (logged before) and one with-precautions", d.Levels)
		}
		if rep, err := db.Verify(ctx); err != nil || !rep.OK || rep.Queries != 2 {
			t.Errorf("Verify after upgrade = %+v, %v", rep, err)
		}
	}
	t.Run("sqlite", func(t *testing.T) {
		c := newClock(t0)
		path := filepath.Join(t.TempDir(), "v8.db")
		old, err := openAt(ctx, path, Options{Now: c.Now}, 8)
		if err != nil {
			t.Fatal(err)
		}
		mustLog(t, old, withLevel(LevelDoNotMix))
		old.Close()
		db, err := Open(ctx, path, Options{Now: c.Now})
		if err != nil {
			t.Fatal(err)
		}
		defer db.Close()
		check(t, db)
	})
	t.Run("postgres", func(t *testing.T) {
		requirePostgres(t)
		c := newClock(t0)
		dsn := postgresBackend.fresh(t)
		old, err := openPostgres(ctx, dsn, Options{Now: c.Now}, false, 3)
		if err != nil {
			t.Fatal(err)
		}
		mustLog(t, old, withLevel(LevelDoNotMix))
		old.Close()
		db, err := Open(ctx, dsn, Options{Now: c.Now})
		if err != nil {
			t.Fatal(err)
		}
		defer db.Close()
		check(t, db)
	})
}

// TestLevelOfUnusualResult: a result that is valid JSON but holds a NUL
// escape (json.Marshal writes one for a NUL in a string) is logged on both
// backends and counted by its decision level; one without a decision by
// the level judged from its hazards.
func TestLevelOfUnusualResult(t *testing.T) {
	eachBackend(t, func(t *testing.T, be backend) {
		ctx := context.Background()
		db, _ := be.mustOpen(t, newClock(t0).Now)
		for _, res := range []string{`{"request":"a\u0000b \\u0000","decision":{"level":"no-concern"}}`, `{"verdict":"spontaneous"}`} {
			q := demoQuery()
			q.Result = json.RawMessage(res)
			mustLog(t, db, q)
		}
		d, err := db.Digest(ctx, t0.Add(-time.Hour), t0.Add(time.Hour))
		if err != nil {
			t.Fatal(err)
		}
		// demoQuery's hazards hold a danger: the second is judged do-not-mix.
		if d.Levels != (LevelCounts{DoNotMix: 1, NoConcern: 1}) {
			t.Errorf("levels = %+v, want one no-concern (stored) and one do-not-mix (judged from its hazards)", d.Levels)
		}
	})
}

// TestMigrateHazardRowsBatched: a file of version 9 left by a process that
// stopped before indexing its newest rows (their hazard rows written one
// by one) migrates to the batched hazard rows: every row is kept, the
// chain and the derived tables verify, the hazard search finds every row
// before and after the next batch, and the batch writes the hazard rows of
// the rows above the mark without clashing with the old ones.
func TestMigrateHazardRowsBatched(t *testing.T) {
	ctx := context.Background()
	c := newClock(t0)
	path := filepath.Join(t.TempDir(), "v9.db")
	old, err := openAt(ctx, path, Options{Now: c.Now}, hazardBatchVersion-1)
	if err != nil {
		t.Fatal(err)
	}
	logN(t, old, c, indexBatch+6)
	// Stopped without Close, so the 6 rows above the mark stay unindexed.
	old.ws.close()
	old.r.Close()
	old.w.Close()
	raw := rawDB(t, path)
	count := func(q string) (n int64) {
		t.Helper()
		if err := raw.QueryRow(q).Scan(&n); err != nil {
			t.Fatal(err)
		}
		return n
	}
	if n := count(fmt.Sprintf(`SELECT count(*) FROM query_hazards WHERE query_id > %d`, indexBatch)); n != 12 {
		t.Fatalf("version 9 file: %d hazard rows above the mark, want 12 (the test needs them)", n)
	}

	db, err := Open(ctx, path, Options{Now: c.Now})
	if err != nil {
		t.Fatalf("Open upgraded file: %v", err)
	}
	defer db.Close()
	if n := count(`SELECT count(*) FROM query_hazards WHERE query_id > (SELECT indexed_upto FROM search_state)`); n != 0 {
		t.Errorf("after migrating: %d hazard rows above the mark, want 0", n)
	}
	hazardSearch := func(when string, want int) {
		t.Helper()
		var got []int64
		o := SearchOptions{Hazard: "cl2-gas", Limit: 50}
		for {
			page, err := db.Search(ctx, o)
			if err != nil {
				t.Fatalf("%s: Search(--hazard): %v", when, err)
			}
			got = append(got, ids(page.Queries)...)
			if !page.HasMore {
				break
			}
			o.Offset = page.NextOffset
		}
		if len(got) != want || got[0] != int64(want) || got[want-1] != 1 {
			t.Errorf("%s: Search(--hazard) = %d rows %v…; want %d down to 1", when, len(got), got[:min(len(got), 5)], want)
		}
	}
	verify := func(when string, want int) {
		t.Helper()
		if rep, err := db.Verify(ctx); err != nil || !rep.OK || rep.Queries != int64(want) {
			t.Errorf("%s: Verify = %+v, %v", when, rep, err)
		}
	}
	verify("after migrating", indexBatch+6)
	hazardSearch("after migrating", indexBatch+6)

	logN(t, db, c, indexBatch) // one batch: the rows up to 2*indexBatch get their hazard rows
	if n := count(`SELECT count(*) FROM query_hazards`); n != 2*2*indexBatch {
		t.Errorf("after the next batch: %d hazard rows, want %d", n, 2*2*indexBatch)
	}
	verify("after the next batch", 2*indexBatch+6)
	hazardSearch("after the next batch", 2*indexBatch+6)

	// A hazard row added to a row not yet indexed is reported.
	above := int64(2*indexBatch + 5)
	if _, err := raw.Exec(`INSERT INTO query_hazards (query_id, pos, code, severity, message) VALUES (?, 0, 'HEAT', 'info', 'x')`, above); err != nil {
		t.Fatal(err)
	}
	if rep, _ := db.Verify(ctx); rep.OK || rep.BrokenID != above || !strings.Contains(rep.Problem, "not indexed yet") {
		t.Errorf("Verify with a hazard row added above the mark = %+v; want row %d reported", rep, above)
	}
}
