package store

import (
	"context"
	"errors"
	"io"
	"log/slog"
	"path/filepath"
	"sync"
	"testing"
	"time"
)

func TestLastShift(t *testing.T) {
	ldn := london(t)
	ny, err := time.LoadLocation("America/New_York")
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name         string
		spec         string
		loc          *time.Location
		now          time.Time
		since, until time.Time
	}{
		{"midday", DefaultShifts, ldn, time.Date(2026, 12, 1, 12, 0, 0, 0, ldn),
			time.Date(2026, 11, 30, 18, 0, 0, 0, ldn), time.Date(2026, 12, 1, 6, 0, 0, 0, ldn)},
		{"at the change", DefaultShifts, ldn, time.Date(2026, 12, 1, 18, 0, 0, 0, ldn),
			time.Date(2026, 12, 1, 6, 0, 0, 0, ldn), time.Date(2026, 12, 1, 18, 0, 0, 0, ldn)},
		{"just before the change", DefaultShifts, ldn, time.Date(2026, 12, 1, 17, 59, 59, 0, ldn),
			time.Date(2026, 11, 30, 18, 0, 0, 0, ldn), time.Date(2026, 12, 1, 6, 0, 0, 0, ldn)},
		{"new year", DefaultShifts, ldn, time.Date(2027, 1, 1, 1, 0, 0, 0, ldn),
			time.Date(2026, 12, 31, 6, 0, 0, 0, ldn), time.Date(2026, 12, 31, 18, 0, 0, 0, ldn)},
		// Clocks go forward at 02:00 on 8 March 2026 in New York: the night
		// shift is 11 hours long.
		{"short night", DefaultShifts, ny, time.Date(2026, 3, 8, 7, 0, 0, 0, ny),
			time.Date(2026, 3, 7, 18, 0, 0, 0, ny), time.Date(2026, 3, 8, 6, 0, 0, 0, ny)},
		{"three shifts", "0 6,14,22 * * *", ldn, time.Date(2026, 12, 1, 23, 0, 0, 0, ldn),
			time.Date(2026, 12, 1, 14, 0, 0, 0, ldn), time.Date(2026, 12, 1, 22, 0, 0, 0, ldn)},
		{"weekly", "0 6 * * MON", ldn, time.Date(2026, 12, 3, 9, 0, 0, 0, ldn), // Thursday
			time.Date(2026, 11, 23, 6, 0, 0, 0, ldn), time.Date(2026, 11, 30, 6, 0, 0, 0, ldn)},
		{"spec zone", "CRON_TZ=America/New_York 0 6,18 * * *", time.UTC, time.Date(2026, 12, 1, 12, 0, 0, 0, time.UTC),
			time.Date(2026, 11, 30, 18, 0, 0, 0, ny), time.Date(2026, 12, 1, 6, 0, 0, 0, ny)},
	} {
		t.Run(tc.name, func(t *testing.T) {
			sched, err := ParseShifts(tc.spec)
			if err != nil {
				t.Fatal(err)
			}
			since, until, err := LastShift(sched, tc.loc, tc.now)
			if err != nil || !since.Equal(tc.since) || !until.Equal(tc.until) {
				t.Errorf("LastShift(%s) = %v – %v, %v; want %v – %v", tc.now, since, until, err, tc.since, tc.until)
			}
		})
	}
	for _, bad := range []string{"", "every day", "61 6 * * *", "@every 8h", "0 6 * *"} {
		if _, err := ParseShifts(bad); !errors.Is(err, ErrInvalid) {
			t.Errorf("ParseShifts(%q) = %v, want ErrInvalid", bad, err)
		}
	}
}

// recorder is a Publisher that remembers what it was given.
type recorder struct {
	mu   sync.Mutex
	got  []*Digest
	fail int // fail this many calls first
}

func (r *recorder) PublishDigest(ctx context.Context, d *Digest) error {
	r.mu.Lock()
	defer r.mu.Unlock()
	if r.fail > 0 {
		r.fail--
		return errors.New("chat is down")
	}
	r.got = append(r.got, d)
	return nil
}

func (r *recorder) periods() []string {
	r.mu.Lock()
	defer r.mu.Unlock()
	var out []string
	for _, d := range r.got {
		out = append(out, d.Since.Format("02 15:04")+"–"+d.Until.Format("02 15:04"))
	}
	return out
}

func newSched(t *testing.T, db *DB, c *clock, pub Publisher) *Scheduler {
	t.Helper()
	s, err := NewScheduler(db, DefaultShifts, time.UTC, pub, c.Now)
	if err != nil {
		t.Fatal(err)
	}
	s.Log = slog.New(slog.NewTextHandler(io.Discard, nil))
	return s
}

func equalStrings(a, b []string) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

func TestSchedulerCatchUpAfterDowntime(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		c := newClock(time.Date(2026, 12, 1, 18, 0, 5, 0, time.UTC))
		db, _ := b.mustOpen(t, c.Now)
		ctx, cancel := context.WithCancel(context.Background())
		defer cancel()

		// Queries during the day shift.
		for _, h := range []int{7, 9, 16} {
			q := demoQuery()
			q.Time = time.Date(2026, 12, 1, h, 0, 0, 0, time.UTC)
			mustLog(t, db, q)
		}
		// The service runs at 18:00:05 and sends the day-shift digest.
		pub := &recorder{}
		s := newSched(t, db, c, pub)
		if err := s.Start(ctx); err != nil {
			t.Fatal(err)
		}
		s.Stop()
		if got := pub.periods(); !equalStrings(got, []string{"01 06:00–01 18:00"}) {
			t.Fatalf("first start published %v, want the day shift just ended", got)
		}
		if pub.got[0].Queries != 3 {
			t.Errorf("day-shift digest has %d queries, want 3", pub.got[0].Queries)
		}

		// It is down from 18:01 until 07:30 on the 3rd: three shifts missed.
		c.Set(time.Date(2026, 12, 3, 7, 30, 0, 0, time.UTC))
		pub2 := &recorder{}
		s2 := newSched(t, db, c, pub2)
		if err := s2.Start(ctx); err != nil {
			t.Fatal(err)
		}
		s2.Stop()
		want := []string{"01 18:00–02 06:00", "02 06:00–02 18:00", "02 18:00–03 06:00"}
		if got := pub2.periods(); !equalStrings(got, want) {
			t.Errorf("catch-up published %v, want %v", got, want)
		}
		if next := s2.Next(); !next.Equal(time.Date(2026, 12, 3, 18, 0, 0, 0, time.UTC)) {
			t.Errorf("Next = %v, want 18:00 on the 3rd", next)
		}

		// A restart at the same time sends nothing again.
		pub3 := &recorder{}
		s3 := newSched(t, db, c, pub3)
		if err := s3.Start(ctx); err != nil {
			t.Fatal(err)
		}
		s3.Stop()
		if len(pub3.got) != 0 {
			t.Errorf("restart re-sent %v", pub3.periods())
		}
		recs, err := db.DigestRecords(ctx, 0)
		if err != nil || len(recs) != 4 {
			t.Fatalf("DigestRecords = %+v, %v; want 4", recs, err)
		}
		for _, r := range recs {
			if r.Status != "sent" || r.Attempts != 1 {
				t.Errorf("record %v: status %s attempts %d, want sent once", r.Slot, r.Status, r.Attempts)
			}
		}
	})
}

func TestSchedulerCatchUpCapped(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		c := newClock(time.Date(2026, 12, 1, 6, 0, 0, 0, time.UTC))
		db, _ := b.mustOpen(t, c.Now)
		ctx := context.Background()
		s := newSched(t, db, c, &recorder{})
		if _, err := s.RunDue(ctx); err != nil {
			t.Fatal(err)
		}
		c.Set(time.Date(2026, 12, 31, 6, 0, 0, 0, time.UTC)) // 60 shifts later
		pub := &recorder{}
		s2 := newSched(t, db, c, pub)
		s2.MaxCatchUp = 3
		n, err := s2.RunDue(ctx)
		if err != nil || n != 3 {
			t.Fatalf("RunDue = %d, %v; want the 3 newest", n, err)
		}
		want := []string{"30 06:00–30 18:00", "30 18:00–31 06:00"}
		if got := pub.periods(); !equalStrings(got[1:], want) {
			t.Errorf("published %v, want …%v", got, want)
		}
	})
}

func TestSchedulerRetriesFailedPublish(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		c := newClock(time.Date(2026, 12, 1, 18, 0, 0, 0, time.UTC))
		db, _ := b.mustOpen(t, c.Now)
		ctx := context.Background()
		pub := &recorder{fail: 1}
		s := newSched(t, db, c, pub)
		if n, err := s.RunDue(ctx); err == nil || n != 0 {
			t.Fatalf("RunDue with the chat down = %d, %v; want 0 and an error", n, err)
		}
		recs, _ := db.DigestRecords(ctx, 0)
		if len(recs) != 1 || recs[0].Status != "failed" || recs[0].Detail != "chat is down" {
			t.Fatalf("records = %+v", recs)
		}
		c.Add(time.Hour)
		if n, err := s.RunDue(ctx); err != nil || n != 1 {
			t.Fatalf("retry = %d, %v", n, err)
		}
		if n, err := s.RunDue(ctx); err != nil || n != 0 {
			t.Fatalf("third run = %d, %v; want nothing more", n, err)
		}
		recs, _ = db.DigestRecords(ctx, 0)
		if len(recs) != 1 || recs[0].Status != "sent" || recs[0].Attempts != 2 || len(pub.got) != 1 {
			t.Errorf("records = %+v, published %d", recs, len(pub.got))
		}
	})
}

func TestSchedulerNeverSendsTwice(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		c := newClock(time.Date(2026, 12, 1, 18, 0, 0, 0, time.UTC))
		ctx := context.Background()
		db, path := b.mustOpen(t, c.Now)
		// Two processes sharing the file, started together.
		db2, err := Open(ctx, cleanPath(b, path), Options{Now: c.Now})
		if err != nil {
			t.Fatal(err)
		}
		defer db2.Close()
		pub := &recorder{}
		var wg sync.WaitGroup
		for _, d := range []*DB{db, db2, db, db2} {
			s := newSched(t, d, c, pub)
			wg.Add(1)
			go func() {
				defer wg.Done()
				if _, err := s.RunDue(ctx); err != nil {
					t.Error(err)
				}
			}()
		}
		wg.Wait()
		if len(pub.got) != 1 {
			t.Errorf("published %d times, want once: %v", len(pub.got), pub.periods())
		}
	})
}

func TestSchedulerUnknownOutcomeNotResent(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		c := newClock(time.Date(2026, 12, 1, 18, 0, 0, 0, time.UTC))
		db, _ := b.mustOpen(t, c.Now)
		ctx := context.Background()
		// The process died after claiming the slot, maybe after posting it.
		slot := time.Date(2026, 12, 1, 18, 0, 0, 0, time.UTC)
		if ok, err := db.claimDigest(ctx, slot, slot.Add(-12*time.Hour)); err != nil || !ok {
			t.Fatal(ok, err)
		}
		pub := &recorder{}
		if n, err := newSched(t, db, c, pub).RunDue(ctx); err != nil || n != 0 || len(pub.got) != 0 {
			t.Errorf("RunDue = %d, %v, published %d; want nothing (at most once)", n, err, len(pub.got))
		}
	})
}

func TestSchedulerLocalZone(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		ldn := london(t)
		// 18:00 in London in July is 17:00 UTC.
		c := newClock(time.Date(2026, 7, 1, 17, 0, 1, 0, time.UTC))
		db, _ := b.mustOpen(t, c.Now)
		pub := &recorder{}
		s, err := NewScheduler(db, DefaultShifts, ldn, pub, c.Now)
		if err != nil {
			t.Fatal(err)
		}
		if _, err := s.RunDue(context.Background()); err != nil {
			t.Fatal(err)
		}
		if len(pub.got) != 1 || !pub.got[0].Until.Equal(time.Date(2026, 7, 1, 17, 0, 0, 0, time.UTC)) || pub.got[0].TimeZone != "Europe/London" {
			t.Errorf("published %+v", pub.got)
		}
		if _, err := NewScheduler(db, DefaultShifts, ldn, nil, c.Now); err == nil {
			t.Error("NewScheduler without a publisher succeeded")
		}
	})
}

// cleanPath spells a SQLite path another way (a second process may); a
// PostgreSQL URL stays as it is.
func cleanPath(b backend, dsn string) string {
	if b.name == "sqlite" {
		return filepath.Clean(dsn)
	}
	return dsn
}
