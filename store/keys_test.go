package store

import (
	"context"
	"encoding/json"
	"fmt"
	"path/filepath"
	"testing"
	"time"
)

// keysQuery is the i-th query of a varied demo log (invented plant): three
// operators (one name in two cases), two sites, every verdict, answers
// with and without a stored decision level.
func keysQuery(i int) *Query {
	q := demoQuery()
	users := [][2]string{{"U0TK1", "op.north"}, {"U0TK2", "Op.South"}, {"U0TK3", "op.east"}, {"U0TK4", "OP.NORTH"}}
	u := users[i%len(users)]
	q.UserID, q.UserName = u[0], u[1]
	q.Request = fmt.Sprintf("mix T-%d + 40 L HCl 1 M", 101+i%9)
	q.Verdict = Verdicts[i%len(Verdicts)]
	if q.Verdict == VerdictError {
		q.Error = "unknown stream"
	}
	if i%3 == 0 {
		q.Site = "east-yard"
	}
	levels := []string{LevelDoNotMix, LevelWithPrecautions, LevelNoConcern, ""}
	if l := levels[i%len(levels)]; l != "" {
		q.Result = json.RawMessage(fmt.Sprintf(`{"verdict":%q,"decision":{"level":%q}}`, q.Verdict, l))
	}
	if i%5 == 0 {
		q.Hazards = q.Hazards[1:]
	}
	return q
}

// keysCases are searches by time, site and asker (with and without words,
// verdicts and hazards) that go through query_keys, paged into the tail.
func keysCases() []SearchOptions {
	day := t0.Add(30 * time.Minute)
	return []SearchOptions{
		{}, {Limit: 7, Offset: 3},
		{User: "op.north"}, {User: "OP.north", Limit: 5, Offset: 10}, {User: "U0TK2"}, {User: "nobody"},
		{Site: "east-yard"}, {Site: "main", Limit: 9, Offset: 25}, {Site: "east-yard", User: "op.east"},
		{Since: day}, {Until: day}, {Since: day, Until: day.Add(70 * time.Minute), Limit: 10, Offset: 20},
		{Since: t0.Add(400 * time.Hour)}, {Until: t0.Add(-time.Hour)},
		{Since: day, Verdict: VerdictError}, {User: "op.east", Hazard: "cl2-gas"},
		{Terms: "HCl", User: "op.south"}, {Terms: "T-104", Since: day}, {Terms: "chlorine", Site: "east-yard", Limit: 4, Offset: 6},
	}
}

// keysResults renders what the readers of query_keys return on db: every
// search case, the digests of two windows for both sites, the export of a
// window, and (words) the searches by words.
func keysResults(t *testing.T, db *DB, words bool) string {
	t.Helper()
	ctx := context.Background()
	var out []any
	search := func(words bool) {
		for _, o := range keysCases() {
			if (o.Terms != "") != words {
				continue
			}
			page, err := db.Search(ctx, o)
			if err != nil {
				t.Fatalf("Search(%+v): %v", o, err)
			}
			out = append(out, page)
		}
	}
	search(false)
	for _, site := range []string{"main", "east-yard"} {
		db.site = site
		for _, w := range [][2]time.Time{{t0, t0.Add(24 * time.Hour)}, {t0.Add(20 * time.Minute), t0.Add(90 * time.Minute)}} {
			d, err := db.Digest(ctx, w[0], w[1])
			if err != nil {
				t.Fatalf("Digest: %v", err)
			}
			d.Location = nil
			out = append(out, d)
		}
	}
	db.site = DefaultSite
	var exported []int64
	if err := db.Export(ctx, t0.Add(25*time.Minute), t0.Add(80*time.Minute), func(e *Entry) error {
		exported = append(exported, e.ID)
		return nil
	}); err != nil {
		t.Fatalf("Export: %v", err)
	}
	out = append(out, exported)
	if words { // last: a search by words indexes the rows above the mark
		search(true)
	}
	b, err := json.Marshal(out)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// TestQueryKeysSameResults logs the same queries into a file kept at the
// schema before query_keys (its indexes on queries), a file of that schema
// migrated halfway with rows not yet indexed, and a new file, and checks
// that every search, digest and export gives the same answer on all three
// with the indexed mark at several places, and with a clock stepped back.
func TestQueryKeysSameResults(t *testing.T) {
	ctx := context.Background()
	dir := t.TempDir()
	clocks := []*clock{newClock(t0), newClock(t0), newClock(t0)}
	ref, err := openAt(ctx, filepath.Join(dir, "ref.db"), Options{Now: clocks[0].Now}, keysVersion-1)
	if err != nil {
		t.Fatal(err)
	}
	defer ref.Close()
	migPath := filepath.Join(dir, "mig.db")
	mig, err := openAt(ctx, migPath, Options{Now: clocks[1].Now}, keysVersion-1)
	if err != nil {
		t.Fatal(err)
	}
	cur, curPath := mustOpen(t, clocks[2].Now)
	dbs := []*DB{ref, mig, cur}
	n := 0
	logTo := func(k int, back bool) {
		t.Helper()
		for range k {
			for i, db := range dbs {
				if back && n%17 == 0 {
					clocks[i].Add(-5 * time.Minute)
				}
				mustLog(t, db, keysQuery(n))
				clocks[i].Add(time.Minute)
			}
			n++
		}
	}
	same := func(when string, want int64, words bool) {
		t.Helper()
		r0 := keysResults(t, ref, words)
		for i, db := range dbs[1:] {
			if got := keysResults(t, db, words); got != r0 {
				t.Errorf("%s: file %d answers differently from the file without query_keys:\n got %.600s\nwant %.600s", when, i+1, got, r0)
			}
			if rep, err := db.Verify(ctx); err != nil || !rep.OK || rep.Rows != want {
				t.Errorf("%s: file %d: Verify = %+v, %v; want OK with %d rows", when, i+1, rep, err, want)
			}
		}
	}
	logTo(indexBatch+36, false) // the mark at indexBatch, 36 rows above it
	same("before migrating", indexBatch+36, false)

	// Stopped without Close, so the 36 rows above the mark stay unindexed, then migrated.
	mig.ws.close()
	mig.r.Close()
	mig.w.Close()
	if mig, err = Open(ctx, migPath, Options{Now: clocks[1].Now}); err != nil {
		t.Fatalf("Open upgraded file: %v", err)
	}
	defer mig.Close()
	dbs[1] = mig
	var above int64
	if err := mig.r.QueryRow(`SELECT count(*) FROM queries WHERE id > (SELECT indexed_upto FROM search_state)`).Scan(&above); err != nil || above != 36 {
		t.Fatalf("migrated file: %d rows above the mark, %v; want 36 (the test needs them)", above, err)
	}
	same("after migrating", indexBatch+36, true)
	logTo(indexBatch-36, false) // the mark at 2*indexBatch, none above
	same("at a batch", 2*indexBatch, true)
	logTo(40, true) // times step back now and then
	// A read-only reader sees the 40 rows above the mark without indexing them.
	ro, err := OpenReadOnly(ctx, curPath, Options{Now: clocks[2].Now})
	if err != nil {
		t.Fatal(err)
	}
	defer ro.Close()
	if got, want := keysResults(t, ro, true), keysResults(t, ref, true); got != want {
		t.Errorf("read-only file answers differently from the file without query_keys:\n got %.600s\nwant %.600s", got, want)
	}
	same("with the clock stepped back", 2*indexBatch+40, true)
}
