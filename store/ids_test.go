package store

import (
	"context"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// TestIDsNeverGoBack deletes the newest rows by hand and prunes the whole
// log, then logs again, through the cached head and from a new handle: no
// id is issued twice on either backend (SQLite: query_ids.retired_upto,
// raised by the delete trigger; PostgreSQL: chain_state.seq).
func TestIDsNeverGoBack(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		ctx := context.Background()
		clk := newClock(t0)
		db, dsn := b.mustOpen(t, clk.Now)
		raw := b.raw(t, dsn)
		logNext := func(d *DB) int64 {
			t.Helper()
			clk.t = clk.t.Add(time.Minute)
			return mustLog(t, d, demoQuery())
		}
		for range 5 {
			logNext(db)
		}
		if _, err := raw.Exec(`DELETE FROM queries WHERE id >= 4`); err != nil {
			t.Fatal(err)
		}
		if id := logNext(db); id != 6 {
			t.Errorf("after rows 4–5 were deleted, through the cached head: logged id %d, want 6", id)
		}
		if _, err := raw.Exec(`DELETE FROM queries WHERE id = 6`); err != nil {
			t.Fatal(err)
		}
		other, err := Open(ctx, dsn, Options{Now: clk.Now})
		if err != nil {
			t.Fatal(err)
		}
		defer other.Close()
		if id := logNext(other); id != 7 {
			t.Errorf("after row 6 was deleted, from a new handle: logged id %d, want 7", id)
		}
		clk.t = clk.t.Add(time.Hour)
		if n, err := db.Prune(ctx, clk.t, "op.north"); err != nil || n != 4 {
			t.Fatalf("Prune(everything) = %d, %v; want 4 rows deleted", n, err)
		}
		if _, err := raw.Exec(`DELETE FROM queries`); err != nil { // the prune record (id 8) too
			t.Fatal(err)
		}
		if id := logNext(db); id != 9 {
			t.Errorf("after a prune of every row and its record deleted: logged id %d, want 9", id)
		}
	})
}

// TestMigrateIDsRetired upgrades a file of schema version 12 (queries with
// AUTOINCREMENT) whose newest row was deleted by hand: the rebuild keeps
// the rows that refer to queries (foreign keys are off for the step, so
// DROP TABLE cascades nothing), retires the ids sqlite_sequence issued,
// Verify still sees the cut tail, and the next row takes the next id.
func TestMigrateIDsRetired(t *testing.T) {
	ctx := context.Background()
	path := filepath.Join(t.TempDir(), "v12.db")
	old, err := openAt(ctx, path, Options{Now: newClock(t0).Now}, idsVersion-1)
	if err != nil {
		t.Fatal(err)
	}
	for range 3 {
		logAsVersion(t, old, demoQuery(), idsVersion-1)
	}
	if err := old.RecordDelivery(ctx, 2, true, ""); err != nil {
		t.Fatal(err)
	}
	old.Close()
	raw := rawDB(t, path)
	count := func(q string) int64 {
		t.Helper()
		var n int64
		if err := raw.QueryRow(q).Scan(&n); err != nil {
			t.Fatalf("%s: %v", q, err)
		}
		return n
	}
	if _, err := raw.Exec(`DELETE FROM queries WHERE id = 3; DELETE FROM query_hazards WHERE query_id = 3;
		DELETE FROM query_keys WHERE id = 3; DELETE FROM query_fts WHERE docid = 3`); err != nil {
		t.Fatal(err)
	}
	before := map[string]int64{}
	refs := []string{"deliveries", "query_hazards", "query_keys", "query_fts"}
	for _, tbl := range refs {
		before[tbl] = count(`SELECT count(*) FROM ` + tbl)
	}

	db, err := Open(ctx, path, Options{Now: newClock(t0.Add(time.Hour)).Now})
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	for _, tbl := range refs {
		if n := count(`SELECT count(*) FROM ` + tbl); n != before[tbl] || n == 0 {
			t.Errorf("%s: %d rows after the upgrade, want %d (and some)", tbl, n, before[tbl])
		}
	}
	var schema string
	if err := raw.QueryRow(`SELECT sql FROM sqlite_master WHERE name = 'queries'`).Scan(&schema); err != nil || strings.Contains(schema, "AUTOINCREMENT") {
		t.Errorf("queries after the upgrade: %q, %v; want it without AUTOINCREMENT", schema, err)
	}
	if n := count(`SELECT retired_upto FROM query_ids`); n != 3 {
		t.Errorf("retired_upto = %d, want 3 (the highest id sqlite_sequence issued)", n)
	}
	var fk int
	if err := db.w.QueryRow(`PRAGMA foreign_keys`).Scan(&fk); err != nil || fk != 1 {
		t.Errorf("foreign_keys on the writer after the upgrade = %d, %v; want 1", fk, err)
	}
	rep, err := db.Verify(ctx)
	if err != nil || rep.OK || !strings.Contains(rep.Problem, "rows after 2 are missing: ids up to 3 were issued") {
		t.Errorf("Verify after the upgrade = %+v, %v; want the cut tail reported", rep, err)
	}
	if id := mustLog(t, db, demoQuery()); id != 4 {
		t.Errorf("first row after the upgrade: id %d, want 4", id)
	}
}

// TestQueriesIndexesUsed checks that each index on queries serves the
// statement it exists for (EXPLAIN QUERY PLAN): an index no statement
// uses is a B-tree page per logged query for nothing.
func TestQueriesIndexesUsed(t *testing.T) {
	db, _ := mustOpen(t, nil)
	rows, err := db.w.Query(`SELECT name FROM sqlite_master WHERE type = 'index' AND tbl_name = 'queries' AND sql IS NOT NULL`)
	if err != nil {
		t.Fatal(err)
	}
	var indexes []string
	for rows.Next() {
		var n string
		if err := rows.Scan(&n); err != nil {
			t.Fatal(err)
		}
		indexes = append(indexes, n)
	}
	rows.Close()
	users := map[string]string{"queries_event": newWriteStmts(false).event.sql}
	if len(indexes) != len(users) {
		t.Errorf("indexes on queries: %v; want exactly %d, each with a statement that uses it here", indexes, len(users))
	}
	for _, name := range indexes {
		stmt, ok := users[name]
		if !ok {
			t.Errorf("index %s on queries: no statement listed that uses it", name)
			continue
		}
		plan, err := db.w.Query(`EXPLAIN QUERY PLAN `+stmt, "Ev1")
		if err != nil {
			t.Fatal(err)
		}
		var detail []string
		for plan.Next() {
			var id, parent, notused int
			var d string
			if err := plan.Scan(&id, &parent, &notused, &d); err != nil {
				t.Fatal(err)
			}
			detail = append(detail, d)
		}
		plan.Close()
		if !strings.Contains(strings.Join(detail, "; "), "USING INDEX "+name) &&
			!strings.Contains(strings.Join(detail, "; "), "USING COVERING INDEX "+name) {
			t.Errorf("%s: plan %q does not use %s", stmt, detail, name)
		}
	}
}
