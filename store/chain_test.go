package store

import (
	"context"
	"errors"
	"fmt"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// logN logs n demo queries a minute apart starting at the clock's time.
func logN(t testing.TB, db *DB, c *clock, n int) []int64 {
	t.Helper()
	var ids []int64
	for i := 0; i < n; i++ {
		q := demoQuery()
		q.Request = fmt.Sprintf("mix T-%d + 40 L HCl 1 M", 101+i)
		ids = append(ids, mustLog(t, db, q))
		c.Add(time.Minute)
	}
	return ids
}

func TestVerifyIntact(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		c := newClock(t0)
		db, _ := b.mustOpen(t, c.Now)
		ctx := context.Background()
		rep, err := db.Verify(ctx)
		if err != nil || !rep.OK || rep.Rows != 0 {
			t.Fatalf("Verify(empty) = %+v, %v; want OK with 0 rows", rep, err)
		}
		logN(t, db, c, 5)
		rep, err = db.Verify(ctx)
		if err != nil || !rep.OK || rep.Rows != 5 || rep.FirstID != 1 || rep.LastID != 5 {
			t.Fatalf("Verify = %+v, %v; want OK, rows 1–5", rep, err)
		}
		last, _ := db.Get(ctx, 5)
		if rep.HeadHash != last.Hash {
			t.Errorf("HeadHash = %s, want row 5 hash %s", rep.HeadHash, last.Hash)
		}
	})
}

// TestVerifyDetectsEdits edits one row with plain SQL, column by column, as
// someone with the file and the sqlite3 shell could.
func TestVerifyDetectsEdits(t *testing.T) {
	for _, tc := range []struct {
		name    string
		sql     string
		brokeAt int64
		problem string
	}{
		{"request", `UPDATE queries SET request = 'mix water + water' WHERE id = 3`, 3, "content does not match"},
		{"verdict", `UPDATE queries SET verdict = 'no-reaction' WHERE id = 3`, 3, "content does not match"},
		{"potential", `UPDATE queries SET e_cell_v = -0.5 WHERE id = 3`, 3, "content does not match"},
		{"potential to NULL", `UPDATE queries SET e_cell_v = NULL WHERE id = 3`, 3, "content does not match"},
		{"hazards", `UPDATE queries SET hazards = '[]' WHERE id = 3`, 3, "content does not match"},
		{"user", `UPDATE queries SET user_name = 'someone.else' WHERE id = 3`, 3, "content does not match"},
		{"time", `UPDATE queries SET time = '2026-12-01T05:00:00.000000000Z' WHERE id = 3`, 3, "content does not match"},
		{"result", `UPDATE queries SET result = '{}' WHERE id = 3`, 3, "content does not match"},
		{"engine version", `UPDATE queries SET engine_version = '9' WHERE id = 3`, 3, "content does not match"},
		{"kind", `UPDATE queries SET kind = 'prune' WHERE id = 3`, 3, "content does not match"},
		{"re-hashed row breaks the next link", "", 4, "does not follow row 3"},
		{"middle row deleted", `DELETE FROM queries WHERE id = 3`, 4, "rows 3–3 are missing"},
		{"first row deleted", `DELETE FROM queries WHERE id = 1`, 2, "no prune"},
		{"newest row deleted", `DELETE FROM queries WHERE id = 5`, 5, "rows after 4 are missing"},
		{"all rows deleted", `DELETE FROM queries`, 1, "log is empty but ids up to 5"},
		{"rows swapped", `UPDATE queries SET id = id + 100 WHERE id IN (2, 3); UPDATE queries SET id = 5 - (id - 100) WHERE id > 100`, 2, "content does not match"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c := newClock(t0)
			db, path := mustOpen(t, c.Now)
			ctx := context.Background()
			logN(t, db, c, 5)
			raw := rawDB(t, path)
			stmt := tc.sql
			if stmt == "" {
				// Edit row 3 and recompute its own hash: only the link from
				// row 4 can tell.
				var r row
				if err := raw.QueryRow(`SELECT ` + rowColumns + ` FROM queries WHERE id = 3`).Scan(r.scanDest()...); err != nil {
					t.Fatal(err)
				}
				r.Request = "mix water + water"
				stmt = fmt.Sprintf(`UPDATE queries SET request = 'mix water + water', hash = '%s' WHERE id = 3`, computeHash(&r))
			}
			if _, err := raw.Exec(stmt); err != nil {
				t.Fatalf("edit: %v", err)
			}
			rep, err := db.Verify(ctx)
			if err != nil {
				t.Fatal(err)
			}
			if rep.OK || rep.BrokenID != tc.brokeAt || !strings.Contains(rep.Problem, tc.problem) {
				t.Errorf("Verify = OK %v, broken at %d: %q; want broken at %d mentioning %q",
					rep.OK, rep.BrokenID, rep.Problem, tc.brokeAt, tc.problem)
			}
		})
	}
}

// TestVerifyTailDeletedThenLogged deletes the newest rows by hand, then logs
// on: the gap in ids gives it away.
func TestVerifyTailDeletedThenLogged(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		c := newClock(t0)
		db, path := b.mustOpen(t, c.Now)
		ctx := context.Background()
		logN(t, db, c, 5)
		if _, err := b.raw(t, path).Exec(`DELETE FROM queries WHERE id >= 4`); err != nil {
			t.Fatal(err)
		}
		logN(t, db, c, 1)
		rep, _ := db.Verify(ctx)
		if rep.OK || rep.BrokenID != 6 || !strings.Contains(rep.Problem, "rows 4–5 are missing") {
			t.Errorf("Verify = %+v; want rows 4–5 reported missing at row 6", rep)
		}
	})
}

func TestPruneKeepsChain(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		c := newClock(t0)
		db, path := b.mustOpen(t, c.Now)
		ctx := context.Background()
		logN(t, db, c, 10) // 06:00 … 06:09
		mustRecord(t, db, 2)

		n, err := db.Prune(ctx, t0.Add(4*time.Minute), "safety.lead")
		if err != nil || n != 4 {
			t.Fatalf("Prune = %d, %v; want 4 deleted", n, err)
		}
		rep, err := db.Verify(ctx)
		if err != nil || !rep.OK {
			t.Fatalf("Verify after prune = %+v, %v", rep, err)
		}
		if rep.FirstID != 5 || rep.LastID != 11 || rep.Queries != 6 || rep.Prunes != 1 || rep.AnchorID != 4 {
			t.Errorf("Verify = %+v; want rows 5–11, 6 queries, 1 prune, anchor 4", rep)
		}
		ps, err := db.Prunes(ctx)
		if err != nil || len(ps) != 1 || ps[0].By != "safety.lead" || ps[0].Deleted != 4 || !ps[0].Before.Equal(t0.Add(4*time.Minute)) {
			t.Fatalf("Prunes = %+v, %v", ps, err)
		}
		var fts, hz, del int
		raw := b.raw(t, path)
		raw.QueryRow(`SELECT count(*) FROM query_fts WHERE docid <= 4`).Scan(&fts)
		raw.QueryRow(`SELECT count(*) FROM query_hazards WHERE query_id <= 4`).Scan(&hz)
		raw.QueryRow(`SELECT count(*) FROM deliveries WHERE query_id <= 4`).Scan(&del)
		if fts+hz+del != 0 {
			t.Errorf("pruned rows left %d index, %d hazard and %d delivery rows", fts, hz, del)
		}

		// A prune that deletes nothing is recorded and keeps the anchor.
		if n, err := db.Prune(ctx, t0, "safety.lead"); err != nil || n != 0 {
			t.Fatalf("second Prune = %d, %v", n, err)
		}
		// Logging goes on after a prune.
		logN(t, db, c, 2)
		if n, err := db.Prune(ctx, t0.Add(8*time.Minute), "safety.lead"); err != nil || n != 4 {
			t.Fatalf("third Prune = %d, %v; want rows 5–8 deleted", n, err)
		}
		rep, err = db.Verify(ctx)
		if err != nil || !rep.OK || rep.FirstID != 9 || rep.Prunes != 3 || rep.AnchorID != 8 {
			t.Fatalf("Verify after three prunes = %+v, %v", rep, err)
		}

		// Deleting a remaining row by hand is still caught.
		if _, err := raw.Exec(`DELETE FROM queries WHERE id = 9`); err != nil {
			t.Fatal(err)
		}
		rep, _ = db.Verify(ctx)
		if rep.OK || rep.BrokenID != 10 {
			t.Errorf("Verify after deleting the oldest kept row = %+v; want broken at 10", rep)
		}
	})
}

func TestPruneAnchorTampered(t *testing.T) {
	c := newClock(t0)
	db, path := mustOpen(t, c.Now)
	ctx := context.Background()
	logN(t, db, c, 6)
	if _, err := db.Prune(ctx, t0.Add(3*time.Minute), "safety.lead"); err != nil {
		t.Fatal(err)
	}
	// Deleting more old rows and pointing the prune record at them is
	// caught: the prune record's own hash no longer matches.
	raw := rawDB(t, path)
	var anchor string
	raw.QueryRow(`SELECT hash FROM queries WHERE id = 4`).Scan(&anchor)
	if _, err := raw.Exec(`DELETE FROM queries WHERE id = 4;
		UPDATE queries SET result = json_set(result, '$.anchor_id', 4, '$.anchor_hash', ?) WHERE kind = 'prune'`, anchor); err != nil {
		t.Fatal(err)
	}
	rep, _ := db.Verify(ctx)
	if rep.OK || rep.BrokenID != 7 || !strings.Contains(rep.Problem, "content does not match") {
		t.Errorf("Verify = %+v; want the prune record (7) reported as edited", rep)
	}
}

func TestPruneEverything(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		c := newClock(t0)
		db, _ := b.mustOpen(t, c.Now)
		ctx := context.Background()
		logN(t, db, c, 3)
		if n, err := db.Prune(ctx, t0.Add(time.Hour), "safety.lead"); err != nil || n != 3 {
			t.Fatalf("Prune = %d, %v", n, err)
		}
		rep, err := db.Verify(ctx)
		if err != nil || !rep.OK || rep.Rows != 1 || rep.Prunes != 1 || rep.AnchorID != 3 {
			t.Fatalf("Verify = %+v, %v; want just the prune record, anchored at 3", rep, err)
		}
		// Pruning everything again removes the first prune record as well.
		c.Add(2 * time.Hour)
		logN(t, db, c, 2)
		if n, err := db.Prune(ctx, c.Now().Add(time.Hour), "safety.lead"); err != nil || n != 3 {
			t.Fatalf("second Prune = %d, %v; want the 2 queries and the first prune record", n, err)
		}
		rep, err = db.Verify(ctx)
		if err != nil || !rep.OK || rep.Rows != 1 || rep.FirstID != 7 || rep.AnchorID != 6 {
			t.Fatalf("Verify = %+v, %v; want only prune record 7, anchored at 6", rep, err)
		}
		if _, err := db.Prune(ctx, t0, ""); !errors.Is(err, ErrInvalid) {
			t.Errorf("Prune without a name = %v, want ErrInvalid", err)
		}
	})
}

func mustRecord(t *testing.T, db *DB, id int64) {
	t.Helper()
	if err := db.RecordDelivery(context.Background(), id, true, "posted"); err != nil {
		t.Fatal(err)
	}
}

func TestRecordDelivery(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		c := newClock(t0)
		db, _ := b.mustOpen(t, c.Now)
		ctx := context.Background()
		id := mustLog(t, db, demoQuery())
		if err := db.RecordDelivery(ctx, id, false, "rate limited"); err != nil {
			t.Fatal(err)
		}
		c.Add(time.Second)
		if err := db.RecordDelivery(ctx, id, true, ""); err != nil {
			t.Fatal(err)
		}
		ds, err := db.Deliveries(ctx, id)
		if err != nil || len(ds) != 2 || ds[0].OK || ds[0].Detail != "rate limited" || !ds[1].OK || !ds[1].Time.Equal(t0.Add(time.Second)) {
			t.Errorf("Deliveries = %+v, %v", ds, err)
		}
		if err := db.RecordDelivery(ctx, 42, true, ""); !errors.Is(err, ErrNotFound) {
			t.Errorf("RecordDelivery(unknown) = %v, want ErrNotFound", err)
		}
		// Deliveries are outside the chain.
		if rep, _ := db.Verify(ctx); !rep.OK {
			t.Errorf("Verify after deliveries = %+v", rep)
		}
	})
}

func TestHashEncodingUnambiguous(t *testing.T) {
	// Moving text from one field to its neighbour must change the hash.
	a := &row{ID: 1, Kind: kindQuery, UserID: "U1", UserName: "ab", Channel: "c"}
	b := &row{ID: 1, Kind: kindQuery, UserID: "U1", UserName: "a", Channel: "bc"}
	if computeHash(a) == computeHash(b) {
		t.Error("hash does not separate fields")
	}
	c := &row{ID: 1, Kind: kindQuery}
	d := &row{ID: 1, Kind: kindQuery}
	d.Result.Valid = true // "" is not NULL
	if computeHash(c) == computeHash(d) {
		t.Error("hash does not tell NULL result from empty result")
	}
	e := &row{ID: 2, Kind: kindQuery}
	if computeHash(c) == computeHash(e) {
		t.Error("hash does not cover the id")
	}
}

func TestVerifyFileReadOnly(t *testing.T) {
	c := newClock(t0)
	db, path := mustOpen(t, c.Now)
	logN(t, db, c, 3)
	db.Close()
	rep, err := VerifyFile(context.Background(), path)
	if err != nil || !rep.OK || rep.Rows != 3 {
		t.Errorf("VerifyFile = %+v, %v", rep, err)
	}
	if _, err := VerifyFile(context.Background(), filepath.Join(t.TempDir(), "missing.db")); err == nil {
		t.Error("VerifyFile(missing) succeeded")
	}
}
