package store

import (
	"context"
	"encoding/json"
	"errors"
	"strings"
	"testing"
	"time"
)

func TestRecordPress(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		ctx := context.Background()
		db, _ := b.mustOpen(t, nil)
		id := mustLog(t, db, &Query{UserID: "U01", Channel: "C1", Request: "mix T-102 + T-204", Verdict: VerdictNoReaction})
		p := Press{QueryID: id, Action: PressDetails, UserID: "U02", UserName: "op.south", Channel: "C1", Transport: "http", Key: "1.2/U02"}
		if err := db.RecordPress(ctx, p); err != nil {
			t.Fatal(err)
		}
		if err := db.RecordPress(ctx, p); !errors.Is(err, ErrDuplicate) {
			t.Errorf("same press again: %v, want ErrDuplicate", err)
		}
		p.Key, p.Action = "", PressPicture
		if err := db.RecordPress(ctx, p); err != nil {
			t.Fatal(err)
		}
		for _, bad := range []Press{{QueryID: id + 100, Action: PressPour}, {QueryID: id, Action: "delete"}} {
			if err := db.RecordPress(ctx, bad); err == nil {
				t.Errorf("RecordPress(%+v) = nil, want an error", bad)
			}
		}
		ps, err := db.Presses(ctx, id)
		if err != nil || len(ps) != 2 || ps[0].Action != PressDetails || ps[1].Action != PressPicture || ps[0].UserName != "op.south" {
			t.Errorf("Presses = %+v, %v; want details then picture", ps, err)
		}
		if rep, err := db.Verify(ctx); err != nil || !rep.OK {
			t.Errorf("verify after presses: %+v, %v", rep, err)
		}
	})
}

func TestNameAt(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		ctx := context.Background()
		db, _ := b.mustOpen(t, nil)
		day := func(d int) time.Time { return time.Date(2026, 12, d, 8, 0, 0, 0, time.UTC) }
		for _, n := range []struct {
			name string
			at   time.Time
		}{{"#finishing", day(1)}, {"#finishing", day(3)}, {"#finishing-line-2", day(5)}, {"", day(6)}} {
			if err := db.NoteName(ctx, "C0SHIFT", n.name, n.at); err != nil {
				t.Fatal(err)
			}
		}
		for _, tc := range []struct {
			at   time.Time
			want string
		}{{day(1).Add(-time.Hour), "#finishing"}, {day(2), "#finishing"}, {day(4), "#finishing"}, {day(9), "#finishing-line-2"}} {
			if got, err := db.NameAt(ctx, "C0SHIFT", tc.at); err != nil || got != tc.want {
				t.Errorf("NameAt(%v) = %q, %v; want %q", tc.at, got, err, tc.want)
			}
		}
		if got, _ := db.NameAt(ctx, "CNEVER", day(1)); got != "" {
			t.Errorf("NameAt of an id never seen = %q, want empty", got)
		}
	})
}

// TestDigestOnePersonAndDecisions: a person logged under an id alone and
// under a name is one asker, named; every do-not-mix and with-precautions
// decision is listed whatever the redox verdict, a repeated mix is one
// line with its count, and no entry line is longer than DigestLineWidth.
func TestDigestOnePersonAndDecisions(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		ctx := context.Background()
		db, _ := b.mustOpen(t, nil)
		at := func(h int) time.Time { return time.Date(2026, 12, 2, h, 0, 0, 0, time.UTC) }
		decided := func(level string) json.RawMessage {
			return json.RawMessage(`{"request":"x","decision":{"level":"` + level + `","title":"t"}}`)
		}
		long := strings.Repeat("NaOCl 12.5 % with a very long note ", 6)
		for _, q := range []*Query{
			{Time: at(7), UserID: "UOP1", Request: "mix T-7 + T-9", Verdict: VerdictNoReaction, Streams: []string{"NaCN 5 %", "HCl 10 %"}, Result: decided(LevelDoNotMix)},
			{Time: at(8), UserID: "UOP1", UserName: "op.north", Request: "mix T-7 + T-9", Verdict: VerdictNoReaction, Streams: []string{"HCl 10 %", "NaCN 5 %"}, Result: decided(LevelDoNotMix)},
			{Time: at(9), UserID: "UOP2", UserName: "op.east", Request: "mix", Verdict: VerdictNonSpontaneous, Streams: []string{"NaOH 50 %", "water"}, Result: decided(LevelWithPrecautions)},
			{Time: at(10), UserID: "UOP2", UserName: "op.east", Request: "mix", Verdict: VerdictNoReaction, Streams: []string{long, "water"}, Result: decided(LevelNoConcern)},
		} {
			mustLog(t, db, q)
		}
		if err := db.NoteName(ctx, "UOP2", "East shift lead", at(9)); err != nil {
			t.Fatal(err)
		}
		d, err := db.Digest(ctx, at(6), at(12))
		if err != nil {
			t.Fatal(err)
		}
		if len(d.Askers) != 2 || d.Askers[0].UserName != "East shift lead" || d.Askers[0].Queries != 2 || d.Askers[1].UserName != "op.north" {
			t.Errorf("askers = %+v, want East shift lead ×2 (newest name noted) and op.north ×2, one line each", d.Askers)
		}
		if d.Levels != (LevelCounts{DoNotMix: 2, WithPrecautions: 1, NoConcern: 1}) {
			t.Errorf("levels = %+v", d.Levels)
		}
		if len(d.Mixes) != 3 || d.Mixes[0].Level != LevelDoNotMix || d.Mixes[0].Count != 2 || d.Mixes[0].Mix != "HCl 10 % + NaCN 5 %" {
			t.Errorf("mixes = %+v, want the cyanide pair first, once, counted 2", d.Mixes)
		}
		for _, l := range strings.Split(d.Text(), "\n") {
			if strings.HasPrefix(l, "DO NOT MIX") || strings.HasPrefix(l, "WITH") || strings.HasPrefix(l, "no concern") {
				if n := len([]rune(l)); n > DigestLineWidth {
					t.Errorf("entry of %d characters: %q", n, l)
				}
			}
		}
		if text := d.Text(); strings.Contains(text, "UOP1") || !strings.Contains(text, "2 people") {
			t.Errorf("digest text names ids or miscounts people:\n%s", text)
		}
	})
}
