package store

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"strings"
	"testing"
	"time"
)

// TestSites runs two sites on one database: tags resolve within each,
// queries and digests are per site, a reviewer searches one site or all,
// and the site is covered by the chain.
func TestSites(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		ctx := context.Background()
		c := newClock(t0)
		north, dsn := b.mustOpenWith(t, Options{Now: c.Now, Site: "North-Works"})
		south, err := Open(ctx, dsn, Options{Now: c.Now, Site: "south"})
		if err != nil {
			t.Fatal(err)
		}
		defer south.Close()
		if north.Site() != "north-works" || south.Site() != "south" {
			t.Fatalf("sites %q, %q; want north-works, south", north.Site(), south.Site())
		}

		// The same tag means different streams at each site.
		if err := north.SetStream(ctx, "T-102", "200 L NaOCl 12.5 %", "", "op.north"); err != nil {
			t.Fatal(err)
		}
		if err := south.SetStream(ctx, "T-102", "50 L HCl 10 %", "", "op.south"); err != nil {
			t.Fatal(err)
		}
		for _, tc := range []struct {
			db   *DB
			want string
		}{{north, "200 L NaOCl 12.5 %"}, {south, "50 L HCl 10 %"}} {
			s, err := tc.db.Stream(ctx, "t-102")
			if err != nil || s.Stream != tc.want || s.Version != 1 {
				t.Errorf("%s: Stream(T-102) = %+v, %v; want %q, version 1", tc.db.Site(), s, err, tc.want)
			}
			ss, err := tc.db.Streams(ctx)
			if err != nil || len(ss) != 1 {
				t.Errorf("%s: Streams = %+v, %v; want one", tc.db.Site(), ss, err)
			}
			h, err := tc.db.StreamHistory(ctx, "T-102")
			if err != nil || len(h) != 1 {
				t.Errorf("%s: StreamHistory = %+v, %v; want one change", tc.db.Site(), h, err)
			}
		}
		if err := south.RemoveStream(ctx, "T-102", "op.south"); err != nil {
			t.Fatal(err)
		}
		if _, err := south.Stream(ctx, "T-102"); !errors.Is(err, ErrNotFound) {
			t.Errorf("south Stream after remove = %v; want ErrNotFound", err)
		}
		if s, err := north.Stream(ctx, "T-102"); err != nil || s.Stream != "200 L NaOCl 12.5 %" {
			t.Errorf("north Stream after the south removed its own = %+v, %v", s, err)
		}

		// Queries carry their site; the chain is one, across sites.
		for i, db := range []*DB{north, south, north, south, south} {
			q := demoQuery()
			q.Request = "mix T-102 + water " + db.Site()
			c.Add(time.Minute)
			if _, err := db.LogQuery(ctx, q); err != nil || q.Site != db.Site() {
				t.Fatalf("LogQuery %d = %v, site %q", i, err, q.Site)
			}
		}
		for _, tc := range []struct {
			site string
			want int
		}{{"", 5}, {"north-works", 2}, {"SOUTH", 3}, {"west", 0}} {
			page, err := north.Search(ctx, SearchOptions{Terms: "water", Site: tc.site})
			if err != nil || len(page.Queries) != tc.want {
				t.Errorf("Search(site %q) = %d rows, %v; want %d", tc.site, len(page.Queries), err, tc.want)
				continue
			}
			for _, q := range page.Queries {
				if tc.site != "" && q.Site != strings.ToLower(tc.site) {
					t.Errorf("Search(site %q) returned query %d of site %q", tc.site, q.ID, q.Site)
				}
			}
		}
		if _, err := north.Search(ctx, SearchOptions{Site: "no site!"}); !errors.Is(err, ErrInvalid) {
			t.Errorf("Search(bad site) = %v; want ErrInvalid", err)
		}

		// Digests count their own site's queries.
		for _, tc := range []struct {
			db   *DB
			want int
		}{{north, 2}, {south, 3}} {
			d, err := tc.db.Digest(ctx, t0, t0.Add(time.Hour))
			if err != nil || d.Queries != tc.want || d.Site != tc.db.Site() {
				t.Errorf("%s: Digest = %+v, %v; want %d queries", tc.db.Site(), d, err, tc.want)
			}
			if !strings.Contains(d.Text(), ", site "+tc.db.Site()) {
				t.Errorf("%s: digest text does not name the site:\n%s", tc.db.Site(), d.Text())
			}
		}
		// One slot, claimed once per site.
		slot := t0.Add(12 * time.Hour)
		for _, db := range []*DB{north, south} {
			ok, err := db.claimDigest(ctx, slot, t0)
			if err != nil || !ok {
				t.Errorf("%s: claimDigest = %v, %v; want claimed", db.Site(), ok, err)
			}
			if ok, err := db.claimDigest(ctx, slot, t0); err != nil || ok {
				t.Errorf("%s: second claimDigest = %v, %v; want taken", db.Site(), ok, err)
			}
		}

		rep, err := north.Verify(ctx)
		if err != nil || !rep.OK || rep.Queries != 5 {
			t.Fatalf("Verify = %+v, %v", rep, err)
		}
		// Moving a row to another site breaks its hash, either way.
		for _, edit := range []string{`UPDATE queries SET site = 'main' WHERE id = 2`, `UPDATE queries SET site = 'south' WHERE id = 1`} {
			raw := b.raw(t, dsn)
			if _, err := raw.Exec(edit); err != nil {
				t.Fatal(err)
			}
			rep, err := north.Verify(ctx)
			if err != nil || rep.OK || !strings.Contains(rep.Problem, "content does not match") {
				t.Errorf("Verify after %q = %+v, %v; want a content mismatch", edit, rep, err)
			}
			raw.Exec(`UPDATE queries SET site = 'south' WHERE id = 2`)
			raw.Exec(`UPDATE queries SET site = 'north-works' WHERE id = 1`)
		}
	})
}

func TestNormalizeSite(t *testing.T) {
	for _, tc := range []struct {
		in, want string
		ok       bool
	}{
		{"", "main", true}, {"  ", "main", true}, {"North_Works-2", "north_works-2", true},
		{"-north", "", false}, {"north works", "", false}, {"nörth", "", false}, {strings.Repeat("a", 33), "", false},
	} {
		got, err := NormalizeSite(tc.in)
		if (err == nil) != tc.ok || got != tc.want {
			t.Errorf("NormalizeSite(%q) = %q, %v; want %q (ok %v)", tc.in, got, err, tc.want, tc.ok)
		}
		if err != nil && !errors.Is(err, ErrInvalid) {
			t.Errorf("NormalizeSite(%q) error %v does not wrap ErrInvalid", tc.in, err)
		}
	}
}

// TestDigestMixesPerSite: the digest's mix lines, decision counts and
// askers of one site hold only that site's queries, on both backends, and
// its heading names the site.
func TestDigestMixesPerSite(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		ctx := context.Background()
		c := newClock(t0)
		north, dsn := b.mustOpenWith(t, Options{Now: c.Now, Site: "north"})
		south, err := Open(ctx, dsn, Options{Now: c.Now, Site: "south"})
		if err != nil {
			t.Fatal(err)
		}
		defer south.Close()
		decided := func(level string) json.RawMessage {
			return json.RawMessage(`{"decision":{"level":"` + level + `"}}`)
		}
		for i, q := range []struct {
			db      *DB
			user    string
			streams []string
			level   string
		}{
			{north, "UN1", []string{"NaOCl 12.5 %", "HCl 10 %"}, LevelDoNotMix},
			{north, "UN2", []string{"HCl 10 %", "NaOCl 12.5 %"}, LevelDoNotMix},
			{south, "US1", []string{"NaOH 50 %", "water"}, LevelWithPrecautions},
			{south, "US1", []string{"NaCl 3 %", "water"}, LevelNoConcern},
			{south, "US2", []string{"NaCl 3 %", "water"}, LevelNoConcern},
		} {
			c.Add(time.Minute)
			mustLog(t, q.db, &Query{UserID: q.user, Request: fmt.Sprint("mix ", i), Verdict: VerdictNoReaction,
				Streams: q.streams, Result: decided(q.level)})
		}
		dn, err := north.Digest(ctx, t0, t0.Add(time.Hour))
		if err != nil {
			t.Fatal(err)
		}
		if dn.Levels != (LevelCounts{DoNotMix: 2}) || len(dn.Mixes) != 1 || dn.Mixes[0].Count != 2 || dn.Mixes[0].People != 2 ||
			dn.Mixes[0].Mix != "HCl 10 % + NaOCl 12.5 %" || len(dn.Askers) != 2 {
			t.Errorf("north digest: levels %+v, mixes %+v, askers %+v; want one do-not-mix line asked twice by two", dn.Levels, dn.Mixes, dn.Askers)
		}
		if !strings.Contains(dn.Heading(), "site north") {
			t.Errorf("north heading %q does not name the site", dn.Heading())
		}
		ds, err := south.Digest(ctx, t0, t0.Add(time.Hour))
		if err != nil {
			t.Fatal(err)
		}
		if ds.Levels != (LevelCounts{WithPrecautions: 1, NoConcern: 2}) || len(ds.Mixes) != 2 ||
			ds.Mixes[0].Level != LevelWithPrecautions || ds.Mixes[1].Count != 2 || ds.Mixes[1].People != 2 {
			t.Errorf("south digest: levels %+v, mixes %+v; want with-precautions first, then the brine asked twice", ds.Levels, ds.Mixes)
		}
	})
}
