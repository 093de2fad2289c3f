package store

import (
	"context"
	"errors"
	"testing"
	"time"
)

// copyFixture fills db with rows of two sites, a prune, deliveries,
// catalogue changes, a digest sent, a button press and a channel name.
func copyFixture(t *testing.T, db *DB, other *DB, c *clock) {
	t.Helper()
	ctx := context.Background()
	logN(t, db, c, 6)
	for i := 0; i < 3; i++ {
		q := demoQuery()
		q.Request = "mix T-102 + water at the other site"
		c.Add(time.Minute)
		mustLog(t, other, q)
	}
	mustRecord(t, db, 7)
	if err := db.RecordPress(ctx, Press{QueryID: 7, Action: PressPour, UserID: "U02", Channel: "C1", Transport: "http", Key: "9.1/U02"}); err != nil {
		t.Fatal(err)
	}
	if err := db.NoteName(ctx, "C1", "#tank-farm", t0); err != nil {
		t.Fatal(err)
	}
	if _, err := db.Prune(ctx, t0.Add(2*time.Minute), "safety.lead"); err != nil {
		t.Fatal(err)
	}
	for _, s := range []*DB{db, other} {
		if err := s.SetStream(ctx, "T-102", "200 L NaOCl 12.5 %", "", "op"); err != nil {
			t.Fatal(err)
		}
	}
	if err := other.RemoveStream(ctx, "T-102", "op"); err != nil {
		t.Fatal(err)
	}
	c.Set(t0.Add(12 * time.Hour))
	if _, err := newSched(t, db, c, &recorder{}).RunDue(ctx); err != nil {
		t.Fatal(err)
	}
}

// TestCopyLog copies a log to the other backend and back: ids, hashes,
// sites, prune anchor, catalogue, digests, presses and names survive, each copy verifies,
// and a copy into a log that holds rows is refused.
func TestCopyLog(t *testing.T) {
	eachBackend(t, func(t *testing.T, there backend) {
		ctx := context.Background()
		c := newClock(t0)
		src, srcDSN := sqliteBackend.mustOpenWith(t, Options{Now: c.Now})
		north, err := Open(ctx, srcDSN, Options{Now: c.Now, Site: "north"})
		if err != nil {
			t.Fatal(err)
		}
		defer north.Close()
		copyFixture(t, src, north, c)
		want := exportAll(t, src)

		mid, _ := there.mustOpenWith(t, Options{Now: c.Now})
		rep, err := CopyLog(ctx, src, mid)
		if err != nil || !rep.Verify.OK || rep.Verify.DigestAnchors != 1 || rep.Deliveries != 1 || rep.StreamChanges != 3 || rep.Digests != 1 ||
			rep.Presses != 1 || rep.Names != 1 {
			t.Fatalf("CopyLog sqlite → %s = %+v, %v", there.name, rep, err)
		}
		back, _ := sqliteBackend.mustOpenWith(t, Options{Now: c.Now})
		if rep, err := CopyLog(ctx, mid, back); err != nil || !rep.Verify.OK || rep.Rows != int64(len(want)) {
			t.Fatalf("CopyLog %s → sqlite = %+v, %v", there.name, rep, err)
		}
		for _, db := range []*DB{mid, back} {
			got := exportAll(t, db)
			if len(got) != len(want) {
				t.Fatalf("copy has %d rows, want %d", len(got), len(want))
			}
			for i := range want {
				if got[i] != want[i] {
					t.Errorf("row %d: copy %+v, want %+v", i, got[i], want[i])
				}
			}
			if s, err := db.Stream(ctx, "T-102"); err != nil || s.Stream != "200 L NaOCl 12.5 %" {
				t.Errorf("copy: main's T-102 = %+v, %v", s, err)
			}
			if ds, err := db.Deliveries(ctx, 7); err != nil || len(ds) != 1 {
				t.Errorf("copy: deliveries of 7 = %+v, %v", ds, err)
			}
			if ps, err := db.Presses(ctx, 7); err != nil || len(ps) != 1 || ps[0].Action != PressPour {
				t.Errorf("copy: presses of 7 = %+v, %v", ps, err)
			}
			if n, err := db.NameAt(ctx, "C1", t0.Add(time.Hour)); err != nil || n != "#tank-farm" {
				t.Errorf("copy: name of C1 = %q, %v", n, err)
			}
			page, err := db.Search(ctx, SearchOptions{Terms: "other site", Site: "north"})
			if err != nil || len(page.Queries) != 3 {
				t.Errorf("copy: search of the other site = %d rows, %v; want 3", len(page.Queries), err)
			}
			// The copy goes on from where the source stopped.
			id := mustLog(t, db, demoQuery())
			if id != want[len(want)-1].id+1 {
				t.Errorf("next id on the copy = %d, want %d", id, want[len(want)-1].id+1)
			}
			if rep, err := db.Verify(ctx); err != nil || !rep.OK {
				t.Errorf("copy after logging = %+v, %v", rep, err)
			}
		}
		if _, err := CopyLog(ctx, src, mid); !errors.Is(err, ErrInvalid) {
			t.Errorf("CopyLog into a log with rows = %v; want ErrInvalid", err)
		}
	})
}

type exported struct {
	id         int64
	hash, site string
	kind       string
}

func exportAll(t *testing.T, db *DB) []exported {
	t.Helper()
	var out []exported
	err := db.Export(context.Background(), time.Time{}, time.Time{}, func(e *Entry) error {
		out = append(out, exported{e.ID, e.Hash, e.Site, e.Kind})
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	return out
}
