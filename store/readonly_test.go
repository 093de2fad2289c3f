package store

import (
	"context"
	"database/sql"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestPrintable(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{"mix 200 L NaOCl 12.5 % + 50 L HCl 10 %", "mix 200 L NaOCl 12.5 % + 50 L HCl 10 %"},
		{"Fe²⁺ → Fe³⁺, 25 °C, café", "Fe²⁺ → Fe³⁺, 25 °C, café"},
		{"\x1b[2J\x1b[H\x1b[32mSAFE\x1b[0m", `\x1b[2J\x1b[H\x1b[32mSAFE\x1b[0m`},
		{"a\rb\nc\td\a\x00\x7f", `a\rb\nc\td\x07\x00\x7f`},
		{"\u009b31m C1 CSI", `\u009b31m C1 CSI`},
		{"abc\u202egnp.exe \u2066x\u2069 \u200f", `abc\u202egnp.exe \u2066x\u2069 \u200f`},
		{"line\u2028sep", `line\u2028sep`},
		{"bad \xff byte", `bad \xff byte`},
		{`a\x1b stays`, `a\x1b stays`},
	} {
		if got := Printable(tc.in); got != tc.want {
			t.Errorf("Printable(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

func FuzzPrintable(f *testing.F) {
	f.Add("\x1b]0;title\x07 \u202e")
	f.Fuzz(func(t *testing.T, s string) {
		p := Printable(s)
		if strings.IndexFunc(p, needsEscape) >= 0 {
			t.Fatalf("Printable(%q) = %q still holds a control character", s, p)
		}
		if Printable(p) != p {
			t.Fatalf("Printable is not idempotent on %q", s)
		}
	})
}

func TestOpenReadOnly(t *testing.T) {
	ctx := context.Background()
	dir := t.TempDir()
	if _, err := OpenReadOnly(ctx, filepath.Join(dir, "missing.db"), Options{}); !errors.Is(err, ErrNoDatabase) {
		t.Errorf("OpenReadOnly(missing) = %v, want ErrNoDatabase", err)
	}
	if _, err := OpenReadOnly(ctx, dir, Options{}); !errors.Is(err, ErrInvalid) {
		t.Errorf("OpenReadOnly(directory) = %v, want ErrInvalid", err)
	}
	if es, _ := os.ReadDir(dir); len(es) != 0 {
		t.Fatalf("OpenReadOnly created %v", es)
	}
	db, path := mustOpen(t, nil)
	mustLog(t, db, demoQuery())
	db.Close()
	ro, err := OpenReadOnly(ctx, path, Options{})
	if err != nil {
		t.Fatal(err)
	}
	defer ro.Close()
	if !ro.ReadOnly() {
		t.Error("ReadOnly() = false")
	}
	for name, err := range map[string]error{
		"LogQuery":  func() error { _, err := ro.LogQuery(ctx, demoQuery()); return err }(),
		"SetStream": ro.SetStream(ctx, "T-101", "200 L NaOCl 12.5 %", "", "op"),
		"Prune":     func() error { _, err := ro.Prune(ctx, t0, "op"); return err }(),
	} {
		if !errors.Is(err, ErrReadOnly) {
			t.Errorf("%s on a read-only DB = %v, want ErrReadOnly", name, err)
		}
	}
	if rep, err := ro.Verify(ctx); err != nil || !rep.OK || rep.Rows != 1 {
		t.Errorf("Verify read-only = %+v, %v", rep, err)
	}
}

// TestReadOnlyImmutable: where the directory cannot be written (and so no
// writer can be active) the file is opened immutable and nothing is
// created beside it. Tests run as root cannot make a directory unwritable,
// so the choice is tested through its function.
func TestReadOnlyImmutable(t *testing.T) {
	db, path := mustOpen(t, nil)
	mustLog(t, db, demoQuery())
	db.Close()
	never := func(string) bool { return false }
	if got := readOnlyDSN(path, never); !strings.Contains(got, "immutable=1") {
		t.Fatalf("readOnlyDSN(unwritable dir, no WAL) = %s", got)
	}
	if got := readOnlyDSN(path, func(string) bool { return true }); strings.Contains(got, "immutable") {
		t.Errorf("readOnlyDSN(writable dir) = %s", got)
	}
	os.WriteFile(path+"-wal", nil, 0o600)
	if got := readOnlyDSN(path, never); strings.Contains(got, "immutable") {
		t.Errorf("readOnlyDSN(WAL present) = %s; a writer may be active", got)
	}
	os.Remove(path + "-wal")
	r, err := sql.Open("sqlite3", readOnlyDSN(path, never))
	if err != nil {
		t.Fatal(err)
	}
	var n int
	if err := r.QueryRow(`SELECT count(*) FROM queries`).Scan(&n); err != nil || n != 1 {
		t.Errorf("immutable read: %d, %v", n, err)
	}
	r.Close()
	if es, _ := os.ReadDir(filepath.Dir(path)); len(es) != 1 {
		t.Errorf("immutable read left %d files beside the database", len(es)-1)
	}
}

// TestReadOnlySearchSeesUnindexedRows: rows the live writer has not yet
// indexed (it indexes in batches) are found by a read-only search, which
// indexes them in a temporary table, and paging runs across both.
func TestReadOnlySearchSeesUnindexedRows(t *testing.T) {
	ctx := context.Background()
	c := newClock(t0)
	db, path := mustOpen(t, c.Now)
	n := indexBatch + 6
	logN(t, db, c, n) // the writer stays open: 6 rows wait for the index
	var done int64
	rawDB(t, path).QueryRow(`SELECT indexed_upto FROM search_state`).Scan(&done)
	if done != int64(indexBatch) {
		t.Fatalf("indexed_upto = %d, want %d (the test needs unindexed rows)", done, indexBatch)
	}
	ro, err := OpenReadOnly(ctx, path, Options{})
	if err != nil {
		t.Fatal(err)
	}
	defer ro.Close()
	var got []int64
	for off := 0; ; {
		page, err := ro.Search(ctx, SearchOptions{Terms: "HCl chlorine", Limit: 4, Offset: off})
		if err != nil {
			t.Fatal(err)
		}
		got = append(got, ids(page.Queries)...)
		if !page.HasMore {
			break
		}
		off = page.NextOffset
	}
	if len(got) != n || got[0] != int64(n) || got[n-1] != 1 {
		t.Fatalf("read-only search pages = %d ids %v…; want %d to 1", len(got), got[:min(len(got), 8)], n)
	}
	for i := 1; i < len(got); i++ {
		if got[i] != got[i-1]-1 {
			t.Fatalf("ids out of order or repeated at %d: %v", i, got)
		}
	}
	page, err := ro.Search(ctx, SearchOptions{Terms: "T-170", Hazard: "CL2-GAS"})
	if err != nil || len(page.Queries) != 1 || page.Queries[0].ID != 70 {
		t.Errorf("read-only search of an unindexed row = %v, %v; want row 70", ids(page.Queries), err)
	}
	// The unindexed rows have no hazard rows yet (schema 10): the hazard
	// search reads their hashed hazards.
	page, err = ro.Search(ctx, SearchOptions{Hazard: "cl2-gas", Limit: n})
	if got := ids(page.Queries); err != nil || len(got) != n || got[0] != int64(n) || got[n-1] != 1 {
		t.Errorf("read-only hazard search = %d rows %v…, %v; want %d down to 1", len(got), got[:min(len(got), 8)], err, n)
	}
	rawDB(t, path).QueryRow(`SELECT indexed_upto FROM search_state`).Scan(&done)
	if done != int64(indexBatch) {
		t.Errorf("a read-only search moved indexed_upto to %d", done)
	}
}
