package store

import (
	"context"
	"database/sql"
	"fmt"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// testKey is the key of keyed test logs (32 bytes).
func testKey(t testing.TB) *ChainKey {
	t.Helper()
	k, err := NewChainKey([]byte("harrowgate-test-key-0123456789ab"))
	if err != nil {
		t.Fatal(err)
	}
	return k
}

// rehash rewrites, as an attacker with the file would, the hashes of every
// row from id from on so that each links to the one before: keyed with
// key, or as plain rows when key is nil.
func rehash(t *testing.T, raw *sql.DB, from int64, key *ChainKey) {
	t.Helper()
	var prev string
	if err := raw.QueryRow(`SELECT coalesce((SELECT hash FROM queries WHERE id = ?), '')`, from-1).Scan(&prev); err != nil {
		t.Fatal(err)
	}
	rows, err := raw.Query(`SELECT `+rowColumns+` FROM queries WHERE id >= ? ORDER BY id`, from)
	if err != nil {
		t.Fatal(err)
	}
	var rs []row
	for rows.Next() {
		var r row
		if err := rows.Scan(r.scanDest()...); err != nil {
			t.Fatal(err)
		}
		rs = append(rs, r)
	}
	rows.Close()
	for _, r := range rs {
		r.PrevHash = prev
		seal(&r, key)
		if _, err := raw.Exec(`UPDATE queries SET prev_hash = ?, hash = ?, chain = ?, key_id = ? WHERE id = ?`,
			r.PrevHash, r.Hash, r.Chain, r.KeyID, r.ID); err != nil {
			t.Fatal(err)
		}
		prev = r.Hash
	}
}

// forgeAppend adds a row after the newest one, copying row 2's content
// with a new request, hashed as the attacker can (plain, or keyed with a
// stolen key).
func forgeAppend(t *testing.T, raw *sql.DB, key *ChainKey, madeUpHash bool) {
	t.Helper()
	var r, head row
	raw.QueryRow(`SELECT ` + rowColumns + ` FROM queries WHERE id = 2`).Scan(r.scanDest()...)
	if err := raw.QueryRow(`SELECT ` + rowColumns + ` FROM queries ORDER BY id DESC LIMIT 1`).Scan(head.scanDest()...); err != nil {
		t.Fatal(err)
	}
	ht, _ := parseTime(head.Time)
	r.ID, r.PrevHash, r.Request, r.EventID = head.ID+1, head.Hash, "mix 10 L water + 10 L water", ""
	r.Time = formatTime(ht.Add(time.Minute))
	seal(&r, key)
	if madeUpHash {
		r.Hash = strings.Repeat("ab", 32)
	}
	_, err := raw.Exec(`INSERT INTO queries (`+rowColumns+`) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
		r.ID, r.Kind, r.Time, r.UserID, r.UserName, r.Channel, r.EventID, r.Request, r.Resolved, r.Verdict, r.Error,
		r.Species, r.Oxidizer, r.Reducer, r.ECellV, r.ECellStandardV, r.Hazards, r.Streams, r.Result, r.EngineVersion,
		r.DataHash, r.PrevHash, r.Hash, r.Chain, r.KeyID, r.Site)
	if err != nil {
		t.Fatal(err)
	}
	if madeUpHash {
		return
	}
	// A careful attacker adds the derived rows too.
	_, err = raw.Exec(`INSERT INTO query_hazards (query_id, pos, code, severity, message)
		SELECT ?, pos, code, severity, message FROM query_hazards WHERE query_id = 2;
		INSERT INTO query_fts (docid, request, species, hazards) SELECT `+ftsDocColumns+` FROM queries q WHERE q.id = ?;
		INSERT INTO query_keys (id, site, time, kind, user_id, user_name, level) SELECT `+keyColumns+` FROM queries q WHERE q.id = ?;
		UPDATE search_state SET indexed_upto = ?`, r.ID, r.ID, r.ID, r.ID)
	if err != nil {
		t.Fatal(err)
	}
}

// cutTail deletes rows after keep with everything derived from them and
// rewinds the record of deleted ids, as a careful attacker would.
const cutTail = `DELETE FROM queries WHERE id > 4; DELETE FROM query_hazards WHERE query_id > 4; DELETE FROM query_keys WHERE id > 4;
	UPDATE query_ids SET retired_upto = 4; UPDATE search_state SET indexed_upto = min(indexed_upto, 4)`

// TestTamperMethods tries each way of changing the log with the file (and
// sometimes the key) in hand against Verify: with and without the key,
// with and without an anchor (the head hash noted before the change, as a
// digest carries it). A case marked not detected documents a limit that
// the README states.
func TestTamperMethods(t *testing.T) {
	sqlStep := func(s string) func(*testing.T, *sql.DB, *ChainKey) {
		return func(t *testing.T, raw *sql.DB, _ *ChainKey) {
			if _, err := raw.Exec(s); err != nil {
				t.Fatalf("tamper: %v", err)
			}
		}
	}
	// A careful attacker edits the search index's copy too.
	editRow3 := sqlStep(`UPDATE queries SET request = 'mix water + water' WHERE id = 3;
		UPDATE query_fts SET request = 'mix water + water ' || (SELECT resolved FROM queries WHERE id = 3) WHERE docid = 3`)
	for _, tc := range []struct {
		name      string
		keyed     bool // the log was written with the key
		tamper    func(*testing.T, *sql.DB, *ChainKey)
		verifyKey bool // verify with the key
		anchor    bool // verify with the head noted before the change
		detected  bool
		problem   string
	}{
		{name: "edit", tamper: editRow3, detected: true, problem: "row 3: content does not match its hash"},
		{name: "edit keyed, verified with the key", keyed: true, tamper: editRow3, verifyKey: true, detected: true, problem: "row 3: content does not match its keyed hash"},
		{name: "edit keyed, verified without the key (content not checked, says so)", keyed: true, tamper: editRow3},
		{name: "delete", tamper: sqlStep(`DELETE FROM queries WHERE id = 3`), detected: true, problem: "row 4: rows 3–3 are missing"},
		{name: "insert with a made-up hash", tamper: func(t *testing.T, raw *sql.DB, _ *ChainKey) { forgeAppend(t, raw, nil, true) },
			detected: true, problem: "row 7: content does not match"},
		{name: "insert re-hashed, plain chain (not detected)", tamper: func(t *testing.T, raw *sql.DB, _ *ChainKey) { forgeAppend(t, raw, nil, false) }},
		{name: "insert re-hashed, plain chain, with anchor (an append keeps the anchor: not detected)", anchor: true,
			tamper: func(t *testing.T, raw *sql.DB, _ *ChainKey) { forgeAppend(t, raw, nil, false) }},
		{name: "insert into a keyed log without the key", keyed: true,
			tamper: func(t *testing.T, raw *sql.DB, _ *ChainKey) { forgeAppend(t, raw, nil, false) }, detected: true, problem: "row 7: is a plain (unkeyed) row after keyed row 1"},
		{name: "reorder", tamper: sqlStep(`UPDATE queries SET id = id + 100 WHERE id IN (2, 3); UPDATE queries SET id = 5 - (id - 100) WHERE id > 100`),
			detected: true, problem: "row 2: content does not match"},
		{name: "re-hash the tail, plain chain, no anchor (not detected)", tamper: func(t *testing.T, raw *sql.DB, _ *ChainKey) {
			editRow3(t, raw, nil)
			rehash(t, raw, 3, nil)
		}},
		{name: "re-hash the tail, plain chain, with anchor", anchor: true, tamper: func(t *testing.T, raw *sql.DB, _ *ChainKey) {
			editRow3(t, raw, nil)
			rehash(t, raw, 3, nil)
		}, detected: true, problem: "re-hashed"},
		{name: "re-hash the tail of a keyed log without the key", keyed: true, tamper: func(t *testing.T, raw *sql.DB, _ *ChainKey) {
			editRow3(t, raw, nil)
			rehash(t, raw, 3, nil)
		}, detected: true, problem: "row 3: is a plain (unkeyed) row after keyed row 1"},
		{name: "re-hash every keyed row as plain, verified with the key", keyed: true, verifyKey: true, tamper: func(t *testing.T, raw *sql.DB, _ *ChainKey) {
			editRow3(t, raw, nil)
			rehash(t, raw, 1, nil)
		}, detected: true, problem: "the newest row is not keyed although a key is given"},
		{name: "re-hash every keyed row as plain, verified without the key (not detected)", keyed: true, tamper: func(t *testing.T, raw *sql.DB, _ *ChainKey) {
			editRow3(t, raw, nil)
			rehash(t, raw, 1, nil)
		}},
		{name: "re-hash the tail with a stolen key, no anchor (not detected)", keyed: true, verifyKey: true, tamper: func(t *testing.T, raw *sql.DB, k *ChainKey) {
			editRow3(t, raw, nil)
			rehash(t, raw, 3, k)
		}},
		{name: "re-hash the tail with a stolen key, with anchor", keyed: true, verifyKey: true, anchor: true, tamper: func(t *testing.T, raw *sql.DB, k *ChainKey) {
			editRow3(t, raw, nil)
			rehash(t, raw, 3, k)
		}, detected: true, problem: "row 6: has hash"},
		{name: "cut the tail and rewind the retired ids, no anchor (not detected)", tamper: sqlStep(cutTail)},
		{name: "cut the tail and rewind the retired ids, with anchor", anchor: true, tamper: sqlStep(cutTail),
			detected: true, problem: "row 6: is noted in an anchor but the log ends at row 4: the newest rows were cut off"},
		{name: "cut the tail, rewind the retired ids, derived rows left", tamper: sqlStep(`DELETE FROM queries WHERE id > 4; UPDATE query_ids SET retired_upto = 4`),
			detected: true, problem: "hazard rows of query 5 remain"},
		{name: "delete flagged hazard rows", tamper: sqlStep(`DELETE FROM query_hazards WHERE severity IN ('danger', 'warning')`),
			detected: true, problem: "row 1: hazard 1 (CL2-GAS) is missing from the hazard table"},
		{name: "delete every hazard row", tamper: sqlStep(`DELETE FROM query_hazards`),
			detected: true, problem: "row 1: hazard 1 (CL2-GAS) is missing from the hazard table"},
		{name: "edit a hazard row", tamper: sqlStep(`UPDATE query_hazards SET severity = 'info' WHERE query_id = 2 AND pos = 0`),
			detected: true, problem: "row 2: hazard 1 in the hazard table differs"},
		{name: "delete a search document", tamper: sqlStep(`DELETE FROM query_fts WHERE docid = 3`),
			detected: true, problem: "row 3: is missing from the search index"},
		{name: "edit a search document", tamper: sqlStep(`UPDATE query_fts SET hazards = '' WHERE docid = 2`),
			detected: true, problem: "row 2: its search-index text differs"},
		{name: "empty the search index's word lists", tamper: sqlStep(`DELETE FROM query_fts_segdir`),
			detected: true, problem: "the search index's entries for the word"},
		{name: "delete a look-up row", tamper: sqlStep(`DELETE FROM query_keys WHERE id = 3`),
			detected: true, problem: "row 3: is missing from the look-up table"},
		{name: "move a look-up row to another user", tamper: sqlStep(`UPDATE query_keys SET user_id = 'U0000', user_name = 'someone' WHERE id = 2`),
			detected: true, problem: "row 2: its look-up row (time, site, user or level) differs"},
		{name: "move a look-up row out of its day", tamper: sqlStep(`UPDATE query_keys SET time = '2001-01-01T00:00:00Z' WHERE id = 2`),
			detected: true, problem: "row 2: its look-up row (time, site, user or level) differs"},
		{name: "lower a look-up row's level", tamper: sqlStep(`UPDATE query_keys SET level = 'no-concern' WHERE id = 1`),
			detected: true, problem: "row 1: its look-up row (time, site, user or level) differs"},
		{name: "add a look-up row above the mark", tamper: sqlStep(`UPDATE search_state SET indexed_upto = 4; DELETE FROM query_fts WHERE docid > 4;
			DELETE FROM query_hazards WHERE query_id > 4`),
			detected: true, problem: "row 5: has a look-up row but is not indexed yet"},
		{name: "raise the indexed mark", tamper: sqlStep(`UPDATE search_state SET indexed_upto = 99`),
			detected: true, problem: "the search state says rows up to 99 are indexed"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			ctx := context.Background()
			key := testKey(t)
			c := newClock(t0)
			path := filepath.Join(t.TempDir(), "mixward.db")
			opt := Options{Now: c.Now}
			if tc.keyed {
				opt.ChainKey = key
			}
			db, err := Open(ctx, path, opt)
			if err != nil {
				t.Fatal(err)
			}
			logN(t, db, c, 6)
			before, err := db.Verify(ctx)
			db.Close()
			if err != nil || !before.OK || before.LastID != 6 {
				t.Fatalf("Verify before = %+v, %v", before, err)
			}
			tc.tamper(t, rawDB(t, path), key)
			var vkey *ChainKey
			if tc.verifyKey {
				vkey = key
			}
			var anchors []Anchor
			if tc.anchor {
				anchors = []Anchor{{ID: before.LastID, Hash: before.HeadHash}}
			}
			rep, err := VerifyFileWith(ctx, path, vkey, anchors...)
			if err != nil {
				t.Fatal(err)
			}
			if rep.OK == tc.detected {
				t.Fatalf("Verify = OK %v (%s); want detected %v", rep.OK, rep.Problem, tc.detected)
			}
			if tc.detected && !strings.Contains(rep.Problem, tc.problem) {
				t.Errorf("Problem = %q, want it to say %q", rep.Problem, tc.problem)
			}
			if tc.keyed && !tc.verifyKey && rep.OK && rep.KeyedRows > 0 && rep.UncheckedRows != rep.KeyedRows {
				t.Errorf("UncheckedRows = %d of %d keyed; without the key none can be checked", rep.UncheckedRows, rep.KeyedRows)
			}
		})
	}
}

func TestKeyedChain(t *testing.T) {
	ctx := context.Background()
	key := testKey(t)
	c := newClock(t0)
	path := filepath.Join(t.TempDir(), "mixward.db")
	// Plain rows first, then the key is configured: the older rows stay
	// plain and are protected by the first keyed row's link.
	db, err := Open(ctx, path, Options{Now: c.Now})
	if err != nil {
		t.Fatal(err)
	}
	logN(t, db, c, 2)
	db.Close()
	db, err = Open(ctx, path, Options{Now: c.Now, ChainKey: key})
	if err != nil {
		t.Fatal(err)
	}
	logN(t, db, c, 3)
	if _, err := db.Prune(ctx, t0.Add(time.Minute), "safety.lead"); err != nil {
		t.Fatal(err)
	}
	rep, err := db.Verify(ctx)
	if err != nil || !rep.OK || rep.KeyedRows != 4 || rep.FirstKeyedID != 3 || rep.KeyID != key.ID() || rep.UncheckedRows != 0 {
		t.Fatalf("Verify with key = %+v, %v; want rows 3–6 keyed and checked", rep, err)
	}
	db.Close()
	rep, err = VerifyFile(ctx, path)
	if err != nil || !rep.OK || rep.UncheckedRows != 4 {
		t.Fatalf("VerifyFile without key = %+v, %v; want OK with 4 unchecked keyed rows", rep, err)
	}
	// Rewriting row 2 (plain, re-hashed) needs the first keyed row to link
	// to its new hash, which without the key breaks that row's own hash.
	raw := rawDB(t, path)
	var r row
	raw.QueryRow(`SELECT ` + rowColumns + ` FROM queries WHERE id = 2`).Scan(r.scanDest()...)
	r.Request = "mix water + water"
	seal(&r, nil)
	raw.Exec(`UPDATE queries SET request = ?, hash = ? WHERE id = 2; UPDATE queries SET prev_hash = ? WHERE id = 3`, r.Request, r.Hash, r.Hash)
	rep, _ = VerifyFileWith(ctx, path, key)
	if rep.OK || !strings.Contains(rep.Problem, "row 3: content does not match its keyed hash") {
		t.Errorf("Verify after rewriting the plain rows before the keyed ones = %+v", rep)
	}

	// A keyed log is not opened for writing without its key, or with another.
	for _, k := range []*ChainKey{nil, mustKey(t, strings.Repeat("z", 40))} {
		if _, err := Open(ctx, path, Options{ChainKey: k}); err == nil || !strings.Contains(err.Error(), "keyed") {
			t.Errorf("Open(keyed log, key %v) = %v; want a chain key error", k != nil, err)
		}
	}
}

func mustKey(t *testing.T, s string) *ChainKey {
	t.Helper()
	k, err := NewChainKey([]byte(s))
	if err != nil {
		t.Fatal(err)
	}
	return k
}

func TestChainKeyFile(t *testing.T) {
	if _, err := NewChainKey([]byte("short")); err == nil {
		t.Error("NewChainKey(5 bytes) succeeded")
	}
	a, b := mustKey(t, strings.Repeat("a", 32)), mustKey(t, strings.Repeat("b", 32))
	if a.ID() == b.ID() || len(a.ID()) != 16 || strings.Contains(a.ID(), "aaaa") {
		t.Errorf("key ids %q and %q", a.ID(), b.ID())
	}
	r := row{ID: 1, Kind: kindQuery, Time: formatTime(t0), Species: "[]", Hazards: "[]", Streams: "[]"}
	if keyedHash(&r, a) == keyedHash(&r, b) || keyedHash(&r, a) == computeHash(&r) {
		t.Error("keyed hashes do not depend on the key")
	}
}

// TestTimeOrderStateChecked: search_state.time_order_broken cleared after
// the clock stepped back would let a date search miss rows.
func TestTimeOrderStateChecked(t *testing.T) {
	c := newClock(t0)
	db, path := mustOpen(t, c.Now)
	logN(t, db, c, 3)
	c.Add(-10 * time.Minute)
	logN(t, db, c, 1)
	if rep, err := db.Verify(context.Background()); err != nil || !rep.OK {
		t.Fatalf("Verify = %+v, %v", rep, err)
	}
	rawDB(t, path).Exec(`UPDATE search_state SET time_order_broken = 0`)
	rep, _ := db.Verify(context.Background())
	if rep.OK || rep.BrokenID != 4 || !strings.Contains(rep.Problem, "times never went back") {
		t.Errorf("Verify = %+v; want row 4 reported", rep)
	}
}

// TestDerivedEditsHideNothing: with the flagged hazard rows deleted, the
// digest still shows every flagged mix, because it reads the hashed rows;
// the hazard search, which walks the hazard-code index of those rows (issue
// 13: a page of a common code must not read every row), misses them until
// log reindex rebuilds them, and Verify reports the edit meanwhile.
func TestDerivedEditsHideNothing(t *testing.T) {
	c := newClock(t0)
	db, path := mustOpen(t, c.Now)
	ctx := context.Background()
	logN(t, db, c, 4)
	// The hazard rows are written with the search index (schema 10): index
	// the four rows, as a batch or Close would, before deleting theirs.
	if err := db.syncIndex(ctx); err != nil {
		t.Fatal(err)
	}
	rawDB(t, path).Exec(`DELETE FROM query_hazards WHERE severity IN ('danger', 'warning')`)
	d, err := db.Digest(ctx, t0, t0.Add(time.Hour))
	if err != nil || len(d.Flagged) != 4 || d.Flagged[0].Hazards[0].Code != "CL2-GAS" {
		t.Fatalf("Digest flagged = %+v, %v; want 4", d.Flagged, err)
	}
	page, err := db.Search(ctx, SearchOptions{Hazard: "cl2-gas"})
	if err != nil || len(page.Queries) != 0 {
		t.Fatalf("Search(--hazard) with the hazard rows deleted = %d, %v; want none until reindexed", len(page.Queries), err)
	}
	page, err = db.Search(ctx, SearchOptions{Hazard: "CL2"})
	if err != nil || len(page.Queries) != 0 {
		t.Errorf("Search(--hazard CL2) = %d, %v; want none (codes match whole)", len(page.Queries), err)
	}
	if d.HeadID != 4 {
		t.Errorf("digest head = %d, want 4", d.HeadID)
	}
	last, _ := db.Get(ctx, 4)
	if d.HeadHash != last.Hash || !strings.Contains(d.Text(), last.Hash) {
		t.Errorf("digest head hash %q, text lacks row 4's hash %s", d.HeadHash, last.Hash)
	}
	rep, _ := db.Verify(ctx, Anchor{Hash: d.HeadHash})
	if rep.OK {
		t.Error("Verify passed with the hazard rows deleted")
	}
	if err := db.RebuildDerived(ctx); err != nil {
		t.Fatal(err)
	}
	if page, err := db.Search(ctx, SearchOptions{Hazard: "cl2-gas"}); err != nil || len(page.Queries) != 4 {
		t.Errorf("Search(--hazard) after reindexing = %d, %v; want 4", len(page.Queries), err)
	}
	if rep, err := db.Verify(ctx); err != nil || !rep.OK {
		t.Errorf("Verify after reindexing = %+v, %v", rep, err)
	}
}

func TestParseAnchors(t *testing.T) {
	h := strings.Repeat("0a", 32)
	got, err := ParseAnchors(strings.NewReader(fmt.Sprintf("# noted at 06:00\n\n12 %s\n%s\n13:%s\n", h, strings.ToUpper(h), h)))
	if err != nil || len(got) != 3 || got[0] != (Anchor{12, h}) || got[1] != (Anchor{0, h}) || got[2] != (Anchor{13, h}) {
		t.Fatalf("ParseAnchors = %+v, %v", got, err)
	}
	for _, bad := range []string{"12", "x " + h, "12 " + h[:60], "1 2 3", "-4 " + h} {
		if _, err := ParseAnchor(bad); err == nil {
			t.Errorf("ParseAnchor(%q) succeeded", bad)
		}
	}
}

// TestDigestHeadsChecked: the head each sent digest carried is checked like
// an anchor, so cutting the tail is caught unless the digest records are
// found and edited too.
func TestDigestHeadsChecked(t *testing.T) {
	ctx := context.Background()
	c := newClock(t0) // 06:00
	db, path := mustOpen(t, c.Now)
	logN(t, db, c, 6) // 06:00 … 06:05
	c.Set(t0.Add(12 * time.Hour))
	var sent *Digest
	s, err := NewScheduler(db, DefaultShifts, time.UTC, PublisherFunc(func(_ context.Context, d *Digest) error { sent = d; return nil }), c.Now)
	if err != nil {
		t.Fatal(err)
	}
	if n, err := s.RunDue(ctx); err != nil || n != 1 || sent.HeadID != 6 {
		t.Fatalf("RunDue = %d, %v; digest head %d, want 6", n, err, sent.HeadID)
	}
	rep, err := db.Verify(ctx)
	if err != nil || !rep.OK || rep.DigestAnchors != 1 || len(rep.Anchors) != 0 {
		t.Fatalf("Verify = %+v, %v; want OK with 1 digest head checked", rep, err)
	}
	db.Close()
	if _, err := rawDB(t, path).Exec(cutTail); err != nil {
		t.Fatal(err)
	}
	rep, _ = VerifyFile(ctx, path)
	if rep.OK || !strings.Contains(rep.Problem, "row 6: is noted in the digest recorded as sent for the shift ending 2026-12-01T18:00") ||
		!strings.Contains(rep.Problem, "cut off") {
		t.Errorf("Verify after cutting the tail = %+v; want the digest's head reported", rep)
	}
}

// TestRebuildDerived: after derived tables were tampered with, rebuilding
// them from the hashed rows makes the log verify again.
func TestRebuildDerived(t *testing.T) {
	c := newClock(t0)
	db, path := mustOpen(t, c.Now)
	ctx := context.Background()
	logN(t, db, c, 5)
	c.Add(-time.Hour)
	logN(t, db, c, 2) // the clock stepped back
	if _, err := rawDB(t, path).Exec(`DELETE FROM query_hazards WHERE query_id = 2; DELETE FROM query_fts WHERE docid = 3;
		UPDATE query_fts SET request = 'x' WHERE docid = 4; DELETE FROM query_fts_segdir WHERE level = 0;
		UPDATE search_state SET time_order_broken = 0, indexed_upto = 99`); err != nil {
		t.Fatal(err)
	}
	if rep, _ := db.Verify(ctx); rep.OK {
		t.Fatal("Verify passed after the derived tables were edited")
	}
	if err := db.RebuildDerived(ctx); err != nil {
		t.Fatal(err)
	}
	rep, err := db.Verify(ctx)
	if err != nil || !rep.OK || !rep.DerivedChecked {
		t.Fatalf("Verify after RebuildDerived = %+v, %v", rep, err)
	}
	page, err := db.Search(ctx, SearchOptions{Terms: "T-103"})
	if err != nil || len(page.Queries) != 1 || page.Queries[0].ID != 3 {
		t.Errorf("Search(T-103) after rebuild = %v, %v", ids(page.Queries), err)
	}
}
