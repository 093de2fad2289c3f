package store

import (
	"context"
	"testing"
	"time"
)

// TestAppendFastHead appends through the cached head (appendFast) while the
// log changes under it in every way another writer can change it, and
// checks each new row gets the id and link a transaction reading the head
// would have given it: a stale head must cost a transaction, never a wrong
// link or a reused id.
func TestAppendFastHead(t *testing.T) {
	ctx := context.Background()
	clk := newClock(t0)
	db, path := sqliteBackend.mustOpen(t, clk.Now)
	raw := rawDB(t, path)
	other, err := Open(ctx, path, Options{Now: clk.Now})
	if err != nil {
		t.Fatal(err)
	}
	defer other.Close()
	head := func() (id int64, hash string) {
		t.Helper()
		if err := raw.QueryRow(`SELECT id, hash FROM queries ORDER BY id DESC LIMIT 1`).Scan(&id, &hash); err != nil {
			t.Fatal(err)
		}
		return id, hash
	}
	logged := func(d *DB, name string) *Query {
		t.Helper()
		clk.t = clk.t.Add(time.Minute)
		q := demoQuery()
		q.Request = name
		mustLog(t, d, q)
		return q
	}
	for _, step := range []struct {
		name   string
		change func()
		wantID int64 // 0: one more than the newest row
	}{
		{name: "first row (no head known)"},
		{name: "second row (through the cached head)"},
		{name: "another handle appended", change: func() { logged(other, "mix T-204 + T-102") }},
		{name: "the newest row's hash edited", change: func() {
			raw.Exec(`UPDATE queries SET hash = 'edited' WHERE id = (SELECT max(id) FROM queries)`)
		}},
		{name: "ids issued beyond the newest row", change: func() {
			raw.Exec(`UPDATE query_ids SET retired_upto = 40`)
		}, wantID: 41},
		{name: "the newest row deleted", change: func() {
			raw.Exec(`DELETE FROM queries WHERE id = (SELECT max(id) FROM queries)`)
		}, wantID: 42},
		{name: "a row added by hand", change: func() {
			if _, err := raw.Exec(`INSERT INTO queries (id, kind, time, prev_hash, hash, site)
				SELECT id + 1, kind, time, hash, 'by hand', site FROM queries ORDER BY id DESC LIMIT 1`); err != nil {
				t.Fatal(err)
			}
		}},
		{name: "after the changes (through the cached head again)"},
	} {
		if step.change != nil {
			step.change()
		}
		prevID, prevHash := int64(0), ""
		if step.name != "first row (no head known)" {
			prevID, prevHash = head()
		}
		q := logged(db, step.name)
		want := step.wantID
		if want == 0 {
			want = prevID + 1
		}
		if q.ID != want || (prevID > 0 && q.PrevHash != prevHash) {
			t.Errorf("%s: logged id %d after %q, want id %d after %q (the stored newest row)", step.name, q.ID, q.PrevHash, want, prevHash)
		}
		if db.head.id != q.ID || db.head.hash != q.Hash {
			t.Errorf("%s: cached head %d %q, want the row just logged (%d %q)", step.name, db.head.id, db.head.hash, q.ID, q.Hash)
		}
	}
}

// TestAppendFastEarlierRow: a row earlier than the head is appended by the
// transaction that marks the time order broken, not by appendFast.
func TestAppendFastEarlierRow(t *testing.T) {
	ctx := context.Background()
	db, _ := sqliteBackend.mustOpen(t, nil)
	for _, min := range []int{0, 10, 10, 5} {
		q := demoQuery()
		q.Time = t0.Add(time.Duration(min) * time.Minute)
		mustLog(t, db, q)
		var broken bool
		if err := db.w.QueryRowContext(ctx, `SELECT time_order_broken FROM search_state`).Scan(&broken); err != nil {
			t.Fatal(err)
		}
		if want := min == 5; broken != want {
			t.Errorf("after a row at +%d min: time_order_broken = %v, want %v", min, broken, want)
		}
	}
	if rep, err := db.Verify(ctx); err != nil || !rep.OK {
		t.Errorf("Verify = %+v, %v", rep, err)
	}
}
