package store

import (
	"context"
	"errors"
	"reflect"
	"strings"
	"testing"
	"time"
)

func TestStreamCatalogue(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		c := newClock(t0)
		db, path := b.mustOpen(t, c.Now)
		ctx := context.Background()

		if err := db.SetStream(ctx, "t-101", " 200 L NaOCl 12.5 % ", "bleach day tank", "op.north"); err != nil {
			t.Fatal(err)
		}
		c.Add(time.Hour)
		if err := db.SetStream(ctx, "RINSE-2", "500 L water", "", "op.south"); err != nil {
			t.Fatal(err)
		}
		c.Add(time.Hour)
		if err := db.SetStream(ctx, "T-101", "200 L NaOCl 10 %", "diluted after audit", "shift.lead"); err != nil {
			t.Fatal(err)
		}

		s, err := db.Stream(ctx, "T-101")
		want := Stream{Tag: "T-101", Stream: "200 L NaOCl 10 %", Note: "diluted after audit", By: "shift.lead", Time: t0.Add(2 * time.Hour), Version: 2}
		if err != nil || !reflect.DeepEqual(s, want) {
			t.Errorf("Stream(T-101) = %+v, %v\nwant %+v", s, err, want)
		}
		if s2, err := db.Stream(ctx, "t-101"); err != nil || s2.Stream != s.Stream {
			t.Errorf("tags are not case-insensitive: %+v, %v", s2, err)
		}
		all, err := db.Streams(ctx)
		if err != nil || len(all) != 2 || all[0].Tag != "RINSE-2" || all[1].Tag != "T-101" {
			t.Errorf("Streams = %+v, %v", all, err)
		}

		c.Add(time.Hour)
		if err := db.RemoveStream(ctx, "rinse-2", "op.south"); err != nil {
			t.Fatal(err)
		}
		if _, err := db.Stream(ctx, "RINSE-2"); !errors.Is(err, ErrNotFound) {
			t.Errorf("Stream(removed) = %v, want ErrNotFound", err)
		}
		if err := db.RemoveStream(ctx, "RINSE-2", "op.south"); !errors.Is(err, ErrNotFound) {
			t.Errorf("RemoveStream twice = %v, want ErrNotFound", err)
		}
		if all, _ := db.Streams(ctx); len(all) != 1 {
			t.Errorf("Streams after remove = %+v", all)
		}
		m, err := db.StreamMap(ctx)
		if err != nil || !reflect.DeepEqual(m, map[string]string{"T-101": "200 L NaOCl 10 %"}) {
			t.Errorf("StreamMap = %v, %v", m, err)
		}

		// The history keeps every change, removals included.
		h, err := db.StreamHistory(ctx, "T-101")
		if err != nil || len(h) != 2 || h[0].Stream != "200 L NaOCl 12.5 %" || h[0].By != "op.north" || h[1].By != "shift.lead" {
			t.Errorf("StreamHistory(T-101) = %+v, %v", h, err)
		}
		h, err = db.StreamHistory(ctx, "RINSE-2")
		if err != nil || len(h) != 2 || h[1].Action != "remove" || !h[1].Time.Equal(t0.Add(3*time.Hour)) {
			t.Errorf("StreamHistory(RINSE-2) = %+v, %v", h, err)
		}
		// A removed tag can be defined again.
		if err := db.SetStream(ctx, "RINSE-2", "400 L water", "", "op.south"); err != nil {
			t.Fatal(err)
		}
		if s, err := db.Stream(ctx, "RINSE-2"); err != nil || s.Version != 2 {
			t.Errorf("re-set tag = %+v, %v", s, err)
		}
		if _, err := db.StreamHistory(ctx, "T-999"); !errors.Is(err, ErrNotFound) {
			t.Errorf("StreamHistory(never defined) = %v", err)
		}

		// History cannot be rewritten with plain SQL either.
		raw := b.raw(t, path)
		if _, err := raw.Exec(`UPDATE stream_changes SET stream = 'water' WHERE tag = 'T-101'`); err == nil || !strings.Contains(err.Error(), "append-only") {
			t.Errorf("UPDATE of history = %v, want append-only refusal", err)
		}
		if _, err := raw.Exec(`DELETE FROM stream_changes`); err == nil {
			t.Error("DELETE of history succeeded")
		}
	})
}

func TestStreamValidation(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		db, _ := b.mustOpen(t, nil)
		ctx := context.Background()
		for _, tc := range []struct {
			name, tag, stream, note, by string
		}{
			{"empty tag", "", "water", "", "x"},
			{"tag too long", strings.Repeat("T", 33), "water", "", "x"},
			{"tag with space", "T 101", "water", "", "x"},
			{"tag with dot", "T.101", "water", "", "x"},
			{"tag starting with dash", "-T101", "water", "", "x"},
			{"tag with unicode", "TÄNK", "water", "", "x"},
			{"tag with quote", `T"1`, "water", "", "x"},
			{"empty stream", "T-1", "  ", "", "x"},
			{"multi-line stream", "T-1", "water\n+ acid", "", "x"},
			{"stream too long", "T-1", strings.Repeat("w", 501), "", "x"},
			{"note too long", "T-1", "water", strings.Repeat("n", 501), "x"},
			{"no author", "T-1", "water", "", ""},
		} {
			t.Run(tc.name, func(t *testing.T) {
				if err := db.SetStream(ctx, tc.tag, tc.stream, tc.note, tc.by); !errors.Is(err, ErrInvalid) {
					t.Errorf("SetStream = %v, want ErrInvalid", err)
				}
			})
		}
		if all, _ := db.Streams(ctx); len(all) != 0 {
			t.Errorf("invalid sets wrote %+v", all)
		}
		for _, ok := range []string{"T-101", "rinse_2", "A", strings.Repeat("Z", 32), "9-X"} {
			if _, err := NormalizeTag(ok); err != nil {
				t.Errorf("NormalizeTag(%q) = %v", ok, err)
			}
		}
	})
}

func FuzzNormalizeTag(f *testing.F) {
	for _, s := range []string{"T-101", "rinse_2", "", "-x", "T 1", "ß"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		tag, err := NormalizeTag(s)
		if err != nil {
			return
		}
		if len(tag) == 0 || len(tag) > 32 || tag != strings.ToUpper(tag) || !strings.EqualFold(tag, s) {
			t.Errorf("NormalizeTag(%q) = %q", s, tag)
		}
		for _, c := range tag {
			if !(c >= 'A' && c <= 'Z' || c >= '0' && c <= '9' || c == '-' || c == '_') {
				t.Errorf("NormalizeTag(%q) = %q holds %q", s, tag, c)
			}
		}
		if again, err := NormalizeTag(tag); err != nil || again != tag {
			t.Errorf("NormalizeTag is not idempotent on %q: %q, %v", tag, again, err)
		}
	})
}
