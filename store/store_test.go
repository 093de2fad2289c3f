package store

import (
	"context"
	"database/sql"
	"encoding/json"
	"errors"
	"path/filepath"
	"reflect"
	"strings"
	"sync"
	"testing"
	"time"
)

// clock is a settable test clock.
type clock struct {
	mu sync.Mutex
	t  time.Time
}

func newClock(t time.Time) *clock { return &clock{t: t} }

func (c *clock) Now() time.Time {
	c.mu.Lock()
	defer c.mu.Unlock()
	return c.t
}

func (c *clock) Set(t time.Time) {
	c.mu.Lock()
	c.t = t
	c.mu.Unlock()
}

func (c *clock) Add(d time.Duration) {
	c.mu.Lock()
	c.t = c.t.Add(d)
	c.mu.Unlock()
}

// t0 is the start of the demo shift: Tuesday 1 December 2026, 06:00 UTC.
var t0 = time.Date(2026, 12, 1, 6, 0, 0, 0, time.UTC)

// mustOpen opens a database in a fresh temporary file.
func mustOpen(t testing.TB, now func() time.Time) (*DB, string) {
	t.Helper()
	path := filepath.Join(t.TempDir(), "mixward.db")
	db, err := Open(context.Background(), path, Options{Now: now})
	if err != nil {
		t.Fatalf("Open(%s): %v", path, err)
	}
	t.Cleanup(func() { db.Close() })
	return db, path
}

// rawDB opens path with plain SQL, as someone editing the file by hand would.
func rawDB(t testing.TB, path string) *sql.DB {
	t.Helper()
	r, err := sql.Open("sqlite3", path) // no pragmas: foreign keys off, as in the sqlite3 shell
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { r.Close() })
	return r
}

func fp(f float64) *float64 { return &f }

// demoQuery is a spontaneous mix at the invented Harrowgate Finishing Works.
func demoQuery() *Query {
	return &Query{
		UserID: "U0TK1", UserName: "op.north", Channel: "C0SHIFT",
		Request:  "mix T-101 + 40 L HCl 1 M",
		Resolved: "mix 200 L NaOCl 12.5 % + 40 L HCl 1 M",
		Verdict:  VerdictSpontaneous,
		Species:  []string{"OCl-", "Na+", "H+", "Cl-"},
		Oxidizer: "OCl-", Reducer: "Cl-",
		ECellV: fp(0.12), ECellStandardV: fp(0.126),
		Hazards: []Hazard{{Code: "CL2-GAS", Severity: "danger", Message: "chlorine gas is released"},
			{Code: "HEAT", Severity: "info", Message: "mild warming"}},
		Streams:       []string{"200 L NaOCl 12.5 %", "40 L HCl 1 M"},
		Result:        json.RawMessage(`{ "verdict": "spontaneous", "e_cell_v": 0.12 }`),
		EngineVersion: "0.1.0", DataHash: "sha256:abc",
	}
}

func mustLog(t testing.TB, db *DB, q *Query) int64 {
	t.Helper()
	id, err := db.LogQuery(context.Background(), q)
	if err != nil {
		t.Fatalf("LogQuery(%q): %v", q.Request, err)
	}
	return id
}

func TestOpenPragmas(t *testing.T) {
	db, _ := mustOpen(t, nil)
	ctx := context.Background()
	for _, tc := range []struct {
		pool *sql.DB
		name string
		want string
	}{
		{db.w, "journal_mode", "wal"},
		{db.w, "busy_timeout", "5000"},
		{db.w, "synchronous", "1"}, // NORMAL (FULL with Options.FullSync)
		{db.w, "foreign_keys", "1"},
		{db.r, "query_only", "0"}, // mode=ro instead, so that temporary tables work
		{db.r, "busy_timeout", "5000"},
	} {
		var got string
		if err := tc.pool.QueryRowContext(ctx, "PRAGMA "+tc.name).Scan(&got); err != nil {
			t.Fatalf("PRAGMA %s: %v", tc.name, err)
		}
		if got != tc.want {
			t.Errorf("PRAGMA %s = %s, want %s", tc.name, got, tc.want)
		}
	}
	if _, err := db.r.ExecContext(ctx, `DELETE FROM queries`); err == nil {
		t.Error("read pool accepted a DELETE")
	}
	full, err := Open(ctx, filepath.Join(t.TempDir(), "full.db"), Options{FullSync: true})
	if err != nil {
		t.Fatal(err)
	}
	defer full.Close()
	var sync string
	full.w.QueryRowContext(ctx, "PRAGMA synchronous").Scan(&sync)
	if sync != "2" {
		t.Errorf("FullSync: PRAGMA synchronous = %s, want 2 (FULL)", sync)
	}
}

func TestOpenPaths(t *testing.T) {
	ctx := context.Background()
	dir := t.TempDir()
	for _, name := range []string{"plain.db", "with space.db", "q?mark.db", "hash#.db", "pct%20.db"} {
		path := filepath.Join(dir, name)
		db, err := Open(ctx, path, Options{})
		if err != nil {
			t.Errorf("Open(%q): %v", name, err)
			continue
		}
		mustLog(t, db, demoQuery())
		db.Close()
		if _, err := VerifyFile(ctx, path); err != nil {
			t.Errorf("VerifyFile(%q) after Open: %v (file not where it was asked for?)", name, err)
		}
	}
	for _, bad := range []string{"", ":memory:", "file:x.db"} {
		if _, err := Open(ctx, bad, Options{}); !errors.Is(err, ErrInvalid) {
			t.Errorf("Open(%q) = %v, want ErrInvalid", bad, err)
		}
	}
	if _, err := Open(ctx, filepath.Join(dir, "no", "such", "dir.db"), Options{}); err == nil {
		t.Error("Open in a missing directory succeeded")
	}
}

func TestLogQueryRoundTrip(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		c := newClock(t0.Add(90 * time.Minute))
		db, _ := b.mustOpen(t, c.Now)
		ctx := context.Background()
		q := demoQuery()
		id := mustLog(t, db, q)
		if id != 1 || q.ID != 1 {
			t.Fatalf("first id = %d (q.ID %d), want 1", id, q.ID)
		}
		if !q.Time.Equal(c.Now()) || q.Time.Location() != time.UTC {
			t.Errorf("Time = %v, want the clock %v in UTC", q.Time, c.Now())
		}
		if q.PrevHash != "" || len(q.Hash) != 64 {
			t.Errorf("hashes = %q / %q, want genesis \"\" and a 64-hex hash", q.PrevHash, q.Hash)
		}
		got, err := db.Get(ctx, id)
		if err != nil {
			t.Fatal(err)
		}
		q.Result = json.RawMessage(`{"verdict":"spontaneous","e_cell_v":0.12}`) // stored compacted
		if !reflect.DeepEqual(got, q) {
			t.Errorf("Get = %+v\nwant %+v", got, q)
		}

		// The second row links to the first; a caller-set time is kept.
		q2 := demoQuery()
		q2.Time = time.Date(2026, 12, 1, 9, 30, 0, 123456789, time.FixedZone("X", 3600))
		mustLog(t, db, q2)
		if q2.PrevHash != q.Hash {
			t.Errorf("row 2 prev_hash = %s, want row 1 hash %s", q2.PrevHash, q.Hash)
		}
		g2, err := db.Get(ctx, q2.ID)
		if err != nil {
			t.Fatal(err)
		}
		if !g2.Time.Equal(q2.Time) || g2.Time.Nanosecond() != 123456789 {
			t.Errorf("stored time = %v, want %v to the nanosecond", g2.Time, q2.Time)
		}
		if _, err := db.Get(ctx, 99); !errors.Is(err, ErrNotFound) {
			t.Errorf("Get(99) = %v, want ErrNotFound", err)
		}
	})
}

func TestLogQueryParseError(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		db, _ := b.mustOpen(t, newClock(t0).Now)
		ctx := context.Background()
		q := &Query{UserName: "op.south", Channel: "console", Request: "mix 200 L Bleech + acid",
			Verdict: VerdictError, Error: `at position 11: unknown chemical "Bleech"`}
		id := mustLog(t, db, q)
		got, err := db.Get(ctx, id)
		if err != nil {
			t.Fatal(err)
		}
		if got.Error != q.Error || got.Result != nil || len(got.Species) != 0 || got.Species == nil {
			t.Errorf("parse-error row = %+v; want error text kept, nil result, empty species", got)
		}
	})
}

func TestLogQueryInvalid(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		db, path := b.mustOpen(t, newClock(t0).Now)
		nan := 0.0
		nan = nan / nan
		for _, tc := range []struct {
			name string
			edit func(q *Query)
			want string
		}{
			{"unknown verdict", func(q *Query) { q.Verdict = "maybe" }, "verdict"},
			{"empty verdict", func(q *Query) { q.Verdict = "" }, "verdict"},
			{"error without message", func(q *Query) { q.Verdict = VerdictError; q.Error = " " }, "parse error message"},
			{"NaN potential", func(q *Query) { q.ECellV = &nan }, "e_cell_v"},
			{"hazard without code", func(q *Query) { q.Hazards = []Hazard{{Severity: "danger"}} }, "no code"},
			{"bad severity", func(q *Query) { q.Hazards = []Hazard{{Code: "X", Severity: "fatal"}} }, "severity"},
			{"bad result JSON", func(q *Query) { q.Result = json.RawMessage(`{"a":`) }, "not valid JSON"},
		} {
			t.Run(tc.name, func(t *testing.T) {
				q := demoQuery()
				tc.edit(q)
				_, err := db.LogQuery(context.Background(), q)
				if !errors.Is(err, ErrInvalid) || !strings.Contains(err.Error(), tc.want) {
					t.Errorf("LogQuery = %v, want ErrInvalid mentioning %q", err, tc.want)
				}
			})
		}
		var n int
		b.raw(t, path).QueryRow(`SELECT count(*) FROM queries`).Scan(&n)
		if n != 0 {
			t.Errorf("%d rows written by invalid queries, want 0", n)
		}
	})
}

func TestLogQueryDuplicateEvent(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		db, _ := b.mustOpen(t, newClock(t0).Now)
		ctx := context.Background()
		q := demoQuery()
		q.EventID = "Ev0TANK101"
		id := mustLog(t, db, q)
		again := demoQuery()
		again.EventID = "Ev0TANK101"
		got, err := db.LogQuery(ctx, again)
		if !errors.Is(err, ErrDuplicate) || got != id {
			t.Fatalf("second LogQuery = %d, %v; want %d, ErrDuplicate", got, err, id)
		}
		if n, _ := db.Count(ctx); n != 1 {
			t.Errorf("Count = %d, want 1", n)
		}
		// Queries without an event id are never duplicates of each other.
		mustLog(t, db, demoQuery())
		mustLog(t, db, demoQuery())
		if n, _ := db.Count(ctx); n != 3 {
			t.Errorf("Count = %d, want 3", n)
		}
	})
}

func TestLogQueryCleansText(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		db, _ := b.mustOpen(t, newClock(t0).Now)
		q := demoQuery()
		q.Request = "mix \x00T-101\xff + acid"
		id := mustLog(t, db, q)
		got, err := db.Get(context.Background(), id)
		if err != nil {
			t.Fatal(err)
		}
		if want := "mix \uFFFDT-101\uFFFD + acid"; got.Request != want || q.Request != want {
			t.Errorf("stored request %q (caller sees %q), want %q", got.Request, q.Request, want)
		}
		if rep, err := db.Verify(context.Background()); err != nil || !rep.OK {
			t.Errorf("Verify = %+v, %v", rep, err)
		}
	})
}

func TestConcurrentWriters(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		ctx := context.Background()
		db, path := b.mustOpen(t, nil)
		// A second handle on the same file, as `mixward ask` beside the bot.
		db2, err := Open(ctx, path, Options{})
		if err != nil {
			t.Fatal(err)
		}
		defer db2.Close()
		var wg sync.WaitGroup
		errs := make(chan error, 100)
		for w, d := range []*DB{db, db2, db, db2} {
			wg.Add(1)
			go func() {
				defer wg.Done()
				for i := 0; i < 25; i++ {
					q := demoQuery()
					q.UserName = "writer" + string(rune('A'+w))
					if _, err := d.LogQuery(ctx, q); err != nil {
						errs <- err
						return
					}
				}
			}()
		}
		wg.Wait()
		close(errs)
		for err := range errs {
			t.Error(err)
		}
		rep, err := db.Verify(ctx)
		if err != nil || !rep.OK || rep.Queries != 100 {
			t.Errorf("Verify = %+v, %v; want OK with 100 queries", rep, err)
		}
	})
}
