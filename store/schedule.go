package store

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"log/slog"
	"strings"
	"sync"
	"time"

	"github.com/robfig/cron/v3"
)

// Publisher hands a digest to people: the bot posts it, the console prints it.
type Publisher interface {
	PublishDigest(ctx context.Context, d *Digest) error
}

// PublisherFunc adapts a function to Publisher.
type PublisherFunc func(ctx context.Context, d *Digest) error

// PublishDigest calls f.
func (f PublisherFunc) PublishDigest(ctx context.Context, d *Digest) error { return f(ctx, d) }

// DefaultShifts is the default shift-change schedule: 06:00 and 18:00.
const DefaultShifts = "0 6,18 * * *"

// Scheduler produces the digest of each shift when it ends. Shift changes
// are a standard 5-field cron spec (robfig/cron) in the site time zone; the
// digest at slot t covers [previous slot, t). Each slot is claimed in the
// digests table before it is published, so a digest is never sent twice,
// even by two processes sharing the file; a slot whose publisher failed is
// retried on the next run, one whose outcome is unknown (the process died
// while publishing) is not, so it is at most once. Start first produces
// every slot missed while the service was down (at most MaxCatchUp of the
// most recent), then follows the schedule.
type Scheduler struct {
	db    *DB
	spec  string
	sched cron.Schedule
	loc   *time.Location
	pub   Publisher
	now   func() time.Time

	// MaxCatchUp caps how many missed slots Start produces (the newest
	// ones); default 14, a week of two shifts a day.
	MaxCatchUp int
	// Log receives errors and catch-up notes; nil means slog.Default().
	Log *slog.Logger

	mu   sync.Mutex // one RunDue at a time
	cron *cron.Cron
}

// NewScheduler returns a scheduler for spec in loc (nil means UTC); now nil
// means time.Now.
func NewScheduler(db *DB, spec string, loc *time.Location, pub Publisher, now func() time.Time) (*Scheduler, error) {
	if loc == nil {
		loc = time.UTC
	}
	if now == nil {
		now = time.Now
	}
	if pub == nil {
		return nil, fmt.Errorf("digest schedule: %w: no publisher", ErrInvalid)
	}
	sched, err := ParseShifts(spec)
	if err != nil {
		return nil, err
	}
	return &Scheduler{db: db, spec: spec, sched: sched, loc: loc, pub: pub, now: now, MaxCatchUp: 14}, nil
}

// ParseShifts parses a shift-change spec (standard 5-field cron, optionally
// with CRON_TZ=Area/City, or a descriptor such as @daily).
func ParseShifts(spec string) (cron.Schedule, error) {
	if strings.Contains(spec, "@every") {
		return nil, fmt.Errorf("shift changes %q: %w: @every has no fixed clock times; give times such as %q",
			spec, ErrInvalid, DefaultShifts)
	}
	s, err := cron.ParseStandard(spec)
	if err != nil {
		return nil, fmt.Errorf("shift changes %q: %w: %v (want 5 cron fields, e.g. %q)", spec, ErrInvalid, err, DefaultShifts)
	}
	return s, nil
}

// LastShift returns the most recent shift that ended at or before now: the
// period [since, until) between the two latest shift changes. loc is the
// site time zone the spec is read in.
func LastShift(sched cron.Schedule, loc *time.Location, now time.Time) (since, until time.Time, err error) {
	until, err = prevSlot(sched, now.In(loc), true)
	if err != nil {
		return time.Time{}, time.Time{}, err
	}
	since, err = prevSlot(sched, until, false)
	return since, until, err
}

// prevSlot returns the latest slot before t (at or before t when incl).
// cron schedules only step forward, so it steps forward from ever earlier
// starting points.
func prevSlot(sched cron.Schedule, t time.Time, incl bool) (time.Time, error) {
	limit := t
	if incl {
		limit = t.Add(time.Nanosecond)
	}
	for _, back := range []time.Duration{time.Hour, 25 * time.Hour, 8 * 24 * time.Hour, 32 * 24 * time.Hour, 367 * 24 * time.Hour, 5 * 367 * 24 * time.Hour} {
		n := sched.Next(t.Add(-back))
		if n.IsZero() || !n.Before(limit) {
			continue
		}
		for {
			m := sched.Next(n)
			if m.IsZero() || !m.Before(limit) {
				return n, nil
			}
			n = m
		}
	}
	return time.Time{}, fmt.Errorf("shift changes: no slot in the five years before %s", t.Format(time.RFC3339))
}

// dueSlots returns the slot ends to produce at now, oldest first.
func (s *Scheduler) dueSlots(ctx context.Context, now time.Time) ([]time.Time, error) {
	latest, err := prevSlot(s.sched, now.In(s.loc), true)
	if err != nil {
		return nil, err
	}
	var last sql.NullString
	if err := s.db.r.QueryRowContext(ctx, `SELECT max(slot) FROM digests WHERE site = ?`, s.db.site).Scan(&last); err != nil {
		return nil, fmt.Errorf("digest schedule: %w", err)
	}
	var slots []time.Time
	keep, skipped := max(s.MaxCatchUp, 1), 0
	if last.Valid {
		t, err := parseTime(last.String)
		if err != nil {
			return nil, err
		}
		for n := s.sched.Next(t.In(s.loc)); !n.IsZero() && !n.After(latest); n = s.sched.Next(n) {
			slots = append(slots, n)
			if len(slots) > keep {
				slots = slots[1:]
				skipped++
			}
		}
	} else {
		slots = []time.Time{latest} // first run: only the shift just ended
	}
	// Failed slots are retried.
	rows, err := s.db.r.QueryContext(ctx, `SELECT slot FROM digests WHERE site = ? AND status = 'failed' ORDER BY slot`, s.db.site)
	if err != nil {
		return nil, fmt.Errorf("digest schedule: %w", err)
	}
	defer rows.Close()
	var failed []time.Time
	for rows.Next() {
		var ts string
		if err := rows.Scan(&ts); err != nil {
			return nil, err
		}
		t, err := parseTime(ts)
		if err != nil {
			return nil, err
		}
		failed = append(failed, t)
	}
	if err := rows.Err(); err != nil {
		return nil, err
	}
	if skipped > 0 {
		s.logger().Warn("digest catch-up: too many missed shifts; producing only the newest",
			"skipped", skipped, "producing", len(slots))
	}
	return append(failed, slots...), nil
}

func (s *Scheduler) logger() *slog.Logger {
	if s.Log != nil {
		return s.Log
	}
	return slog.Default()
}

// RunDue produces and publishes every digest due at the scheduler's clock
// and not yet sent, oldest first, and returns how many it published.
func (s *Scheduler) RunDue(ctx context.Context) (int, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	slots, err := s.dueSlots(ctx, s.now())
	if err != nil {
		return 0, err
	}
	sent := 0
	var errs []error
	for _, slot := range slots {
		ok, err := s.runSlot(ctx, slot)
		if err != nil {
			errs = append(errs, err)
			continue
		}
		if ok {
			sent++
		}
	}
	return sent, errors.Join(errs...)
}

// runSlot claims, builds, publishes and records one slot. It reports false
// (and no error) when the slot was already claimed.
func (s *Scheduler) runSlot(ctx context.Context, slot time.Time) (bool, error) {
	since, err := prevSlot(s.sched, slot.In(s.loc), false)
	if err != nil {
		return false, err
	}
	claimed, err := s.db.claimDigest(ctx, slot, since)
	if err != nil || !claimed {
		return false, err
	}
	d, err := s.db.Digest(ctx, since, slot)
	if err == nil {
		d.Location = s.loc
		d.TimeZone = s.loc.String()
		err = s.pub.PublishDigest(ctx, d)
	}
	if err != nil {
		if rerr := s.db.finishDigest(ctx, slot, "failed", err.Error(), nil); rerr != nil {
			err = errors.Join(err, rerr)
		}
		return false, fmt.Errorf("digest for shift ending %s: %w", slot.In(s.loc).Format("2006-01-02 15:04 MST"), err)
	}
	if err := s.db.finishDigest(ctx, slot, "sent", "", d); err != nil {
		return true, err
	}
	return true, nil
}

// Start produces the digests missed while the service was down, then runs
// the schedule in the background until ctx ends or Stop is called. Errors
// during catch-up are logged and returned; the schedule still starts.
func (s *Scheduler) Start(ctx context.Context) error {
	_, err := s.RunDue(ctx)
	if err != nil {
		s.logger().Error("digest catch-up", "err", err)
	}
	s.cron = cron.New(cron.WithLocation(s.loc), cron.WithChain(cron.Recover(cron.DiscardLogger), cron.SkipIfStillRunning(cron.DiscardLogger)))
	s.cron.Schedule(s.sched, cron.FuncJob(func() {
		if _, err := s.RunDue(ctx); err != nil {
			s.logger().Error("digest", "err", err)
		}
	}))
	s.cron.Start()
	go func() {
		<-ctx.Done()
		s.Stop()
	}()
	return err
}

// Stop stops the schedule and waits for a running digest to finish.
func (s *Scheduler) Stop() {
	if s.cron != nil {
		<-s.cron.Stop().Done()
	}
}

// Next is the next shift change after the scheduler's clock.
func (s *Scheduler) Next() time.Time { return s.sched.Next(s.now().In(s.loc)) }

// claimDigest records that slot is being produced; false means it already
// was (sent, in progress, or of unknown outcome). A failed slot is
// re-claimed.
func (db *DB) claimDigest(ctx context.Context, slot, since time.Time) (bool, error) {
	if err := db.writable("claim digest"); err != nil {
		return false, err
	}
	// One statement: a new slot is inserted, a failed one taken again, any
	// other left alone. Under concurrent replicas the primary key makes the
	// second claimant wait for the first and then find the slot taken.
	res, err := db.w.ExecContext(ctx, `INSERT INTO digests (site, slot, since, claimed_at, status, attempts) VALUES (?, ?, ?, ?, 'claimed', 1)
		ON CONFLICT (site, slot) DO UPDATE SET status = 'claimed', claimed_at = excluded.claimed_at, attempts = digests.attempts + 1
		WHERE digests.status = 'failed'`, db.site, formatTime(slot), formatTime(since), formatTime(db.now()))
	if err != nil {
		return false, fmt.Errorf("claim digest: %w", err)
	}
	n, err := res.RowsAffected()
	if err != nil {
		return false, fmt.Errorf("claim digest: %w", err)
	}
	return n == 1, nil
}

func (db *DB) finishDigest(ctx context.Context, slot time.Time, status, detail string, d *Digest) error {
	if err := db.writable("record digest"); err != nil {
		return err
	}
	body := ""
	if d != nil {
		b, err := d.JSON()
		if err != nil {
			return err
		}
		body = string(b)
	}
	_, err := db.w.ExecContext(ctx, `UPDATE digests SET status = ?, detail = ?, body = ? WHERE site = ? AND slot = ?`,
		status, clean(detail), body, db.site, formatTime(slot))
	if err != nil {
		return fmt.Errorf("record digest: %w", err)
	}
	return nil
}

// DigestRecord is one scheduled digest as recorded.
type DigestRecord struct {
	Slot      time.Time `json:"slot"` // end of the period
	Since     time.Time `json:"since"`
	ClaimedAt time.Time `json:"claimed_at"`
	Status    string    `json:"status"` // claimed (outcome unknown), sent or failed
	Attempts  int       `json:"attempts"`
	Detail    string    `json:"detail"`
}

// DigestRecords lists the digests recorded for the DB's site, newest first, at most limit (0 = 50).
func (db *DB) DigestRecords(ctx context.Context, limit int) ([]DigestRecord, error) {
	if limit <= 0 {
		limit = 50
	}
	rows, err := db.r.QueryContext(ctx, `SELECT slot, since, claimed_at, status, attempts, detail FROM digests WHERE site = ? ORDER BY slot DESC LIMIT ?`, db.site, limit)
	if err != nil {
		return nil, fmt.Errorf("list digests: %w", err)
	}
	defer rows.Close()
	out := []DigestRecord{}
	for rows.Next() {
		var r DigestRecord
		var a, b, c string
		if err := rows.Scan(&a, &b, &c, &r.Status, &r.Attempts, &r.Detail); err != nil {
			return nil, fmt.Errorf("list digests: %w", err)
		}
		for _, p := range []struct {
			s string
			t *time.Time
		}{{a, &r.Slot}, {b, &r.Since}, {c, &r.ClaimedAt}} {
			if *p.t, err = parseTime(p.s); err != nil {
				return nil, err
			}
		}
		out = append(out, r)
	}
	return out, rows.Err()
}
