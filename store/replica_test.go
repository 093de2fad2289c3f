package store

import (
	"context"
	"errors"
	"fmt"
	"sync"
	"sync/atomic"
	"testing"
	"time"
)

// replicas opens n handles on one new database, each its own pool and
// replica name with an inbox lease: the store as n processes see it.
func replicas(t *testing.T, b backend, c *clock, n int) []*DB {
	t.Helper()
	first, dsn := b.mustOpenWith(t, Options{Now: c.Now, Replica: "replica-0", InboxLease: time.Minute})
	dbs := []*DB{first}
	for i := 1; i < n; i++ {
		db, err := Open(context.Background(), dsn, Options{Now: c.Now, Replica: fmt.Sprintf("replica-%d", i), InboxLease: time.Minute})
		if err != nil {
			t.Fatal(err)
		}
		t.Cleanup(func() { db.Close() })
		dbs = append(dbs, db)
	}
	return dbs
}

// TestReplicasSameBurst delivers the same 500 events to two replicas at
// once, each working with several goroutines as the bot does: every event
// is taken by one replica, logged once and answered once, and the chain
// verifies without gaps.
func TestReplicasSameBurst(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		const events, workers = 500, 8
		ctx := context.Background()
		c := newClock(t0)
		dbs := replicas(t, b, c, 2)
		var taken, logged, dup [2]atomic.Int64
		var answered sync.Map // event id → replica
		var wg sync.WaitGroup
		errs := make(chan error, 2*workers)
		for r, db := range dbs {
			for w := 0; w < workers; w++ {
				wg.Go(func() {
					for i := w; i < events; i += workers {
						ev := fmt.Sprintf("Ev%04d", i)
						fresh, err := db.AcceptMessages(ctx, []InboxEntry{{EventID: ev, Thread: "C1/" + ev, Message: []byte(`{}`)}})
						if err != nil {
							errs <- fmt.Errorf("replica %d accept %s: %w", r, ev, err)
							return
						}
						if !fresh[0] {
							continue // the other replica has it
						}
						taken[r].Add(1)
						if prev, loaded := answered.LoadOrStore(ev, r); loaded {
							errs <- fmt.Errorf("%s taken by replica %d and %d", ev, prev, r)
							return
						}
						q := demoQuery()
						q.EventID = ev
						id, err := db.LogQuery(ctx, q)
						switch {
						case errors.Is(err, ErrDuplicate):
							dup[r].Add(1)
						case err != nil:
							errs <- fmt.Errorf("replica %d log %s: %w", r, ev, err)
							return
						default:
							logged[r].Add(1)
						}
						if err := db.FinishMessages(ctx, []Outcome{{EventID: ev, QueryID: id, State: InboxPosted}}); err != nil {
							errs <- fmt.Errorf("replica %d finish %s: %w", r, ev, err)
							return
						}
					}
				})
			}
		}
		wg.Wait()
		close(errs)
		for err := range errs {
			t.Error(err)
		}
		t.Logf("%s: replica 0 answered %d, replica 1 answered %d", b.name, taken[0].Load(), taken[1].Load())
		if got := taken[0].Load() + taken[1].Load(); got != events {
			t.Errorf("events taken = %d, want %d (each once)", got, events)
		}
		if got := logged[0].Load() + logged[1].Load(); got != events || dup[0].Load()+dup[1].Load() != 0 {
			t.Errorf("logged %d, duplicates %d; want %d logged once each", got, dup[0].Load()+dup[1].Load(), events)
		}
		rep, err := dbs[1].Verify(ctx)
		if err != nil || !rep.OK || rep.Queries != events || rep.FirstID != 1 || rep.LastID != events {
			t.Errorf("Verify = %+v, %v; want OK, ids 1–%d", rep, err, events)
		}
		for r, db := range dbs {
			if p, err := db.PendingMessages(ctx, 0, 10); err != nil || len(p) != 0 {
				t.Errorf("replica %d: pending after the burst = %d, %v; want none", r, len(p), err)
			}
		}
	})
}

// TestReplicasLogSameEvent: two replicas logging one event id at the same
// moment write it once; the other gets ErrDuplicate with the id.
func TestReplicasLogSameEvent(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		ctx := context.Background()
		c := newClock(t0)
		dbs := replicas(t, b, c, 2)
		for i := 0; i < 50; i++ {
			ev := fmt.Sprintf("Ev%d", i)
			var wg sync.WaitGroup
			ids, errs := [2]int64{}, [2]error{}
			for r, db := range dbs {
				wg.Go(func() {
					q := demoQuery()
					q.EventID = ev
					ids[r], errs[r] = db.LogQuery(ctx, q)
				})
			}
			wg.Wait()
			dups := 0
			for r := range errs {
				if errors.Is(errs[r], ErrDuplicate) {
					dups++
				} else if errs[r] != nil {
					t.Fatalf("%s replica %d: %v", ev, r, errs[r])
				}
			}
			if dups != 1 || ids[0] != ids[1] || ids[0] != int64(i+1) {
				t.Fatalf("%s: ids %v, errors %v; want one write (id %d) and one ErrDuplicate naming it", ev, ids, errs, i+1)
			}
		}
		if rep, err := dbs[0].Verify(ctx); err != nil || !rep.OK || rep.Queries != 50 {
			t.Errorf("Verify = %+v, %v", rep, err)
		}
	})
}

// TestReplicasOneDigestPerSlot: two replicas' schedulers run every slot
// of three days at once; each slot is published once in all.
func TestReplicasOneDigestPerSlot(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		ctx := context.Background()
		c := newClock(t0)
		dbs := replicas(t, b, c, 2)
		logN(t, dbs[0], c, 5)
		pubs := []*recorder{{}, {}}
		var scheds []*Scheduler
		for r, db := range dbs {
			scheds = append(scheds, newSched(t, db, c, pubs[r]))
		}
		for step := 0; step < 6; step++ { // six shift changes, 12 h apart
			c.Add(12 * time.Hour)
			var wg sync.WaitGroup
			for _, s := range scheds {
				wg.Go(func() {
					if _, err := s.RunDue(ctx); err != nil {
						t.Error(err)
					}
				})
			}
			wg.Wait()
		}
		got := append(pubs[0].periods(), pubs[1].periods()...)
		seen := map[string]int{}
		for _, p := range got {
			seen[p]++
		}
		for p, n := range seen {
			if n != 1 {
				t.Errorf("slot %s published %d times", p, n)
			}
		}
		if len(seen) != 6 {
			t.Errorf("slots published: %v; want 6 distinct", got)
		}
		recs, err := dbs[0].DigestRecords(ctx, 0)
		if err != nil || len(recs) != 6 {
			t.Fatalf("DigestRecords = %d, %v; want 6", len(recs), err)
		}
		for _, r := range recs {
			if r.Status != "sent" || r.Attempts != 1 {
				t.Errorf("digest %s: %s after %d attempts; want sent once", r.Slot, r.Status, r.Attempts)
			}
		}
	})
}

// TestReplicasSweepOwedAnswers: the answers owed by a replica that
// stopped stay with it while its lease runs (it may be restarting), then
// go to the others, each to one replica, even when two sweep at once.
func TestReplicasSweepOwedAnswers(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		ctx := context.Background()
		c := newClock(t0)
		dbs := replicas(t, b, c, 3)
		var entries []InboxEntry
		for i := 0; i < 300; i++ {
			entries = append(entries, InboxEntry{EventID: fmt.Sprintf("Ev%03d", i), Thread: "C1/1.0", Message: []byte(`{}`)})
		}
		if _, err := dbs[0].AcceptMessages(ctx, entries); err != nil {
			t.Fatal(err)
		}
		// Another replica receiving the same event sees it is being answered.
		if e, err := dbs[1].InboxEntryFor(ctx, "Ev007"); err != nil || !e.LeasedElsewhere {
			t.Errorf("replica 1: InboxEntryFor = %+v, %v; want leased elsewhere", e, err)
		}
		if e, err := dbs[0].InboxEntryFor(ctx, "Ev007"); err != nil || e.LeasedElsewhere {
			t.Errorf("replica 0: InboxEntryFor = %+v, %v; want its own", e, err)
		}
		// Replica 0 stops before answering. Its lease still runs.
		if p, err := dbs[1].PendingMessages(ctx, 0, 1000); err != nil || len(p) != 0 {
			t.Fatalf("sweep during the lease = %d entries, %v; want none", len(p), err)
		}
		// Replica 0 restarting under the same name takes its own at once.
		if p, err := dbs[0].PendingMessages(ctx, 0, 5); err != nil || len(p) != 5 || p[0].EventID != "Ev000" || p[4].EventID != "Ev004" {
			t.Fatalf("own sweep = %+v, %v; want Ev000–Ev004 in order", p, err)
		}
		c.Add(2 * time.Minute) // the lease has run out
		if e, err := dbs[1].InboxEntryFor(ctx, "Ev007"); err != nil || e.LeasedElsewhere {
			t.Errorf("replica 1 after the lease: InboxEntryFor = %+v, %v; want free", e, err)
		}
		var wg sync.WaitGroup
		var mu sync.Mutex
		owner := map[string]int{}
		for r := 1; r < 3; r++ {
			wg.Go(func() {
				var after int64
				for {
					p, err := dbs[r].PendingMessages(ctx, after, 7)
					if err != nil {
						t.Error(err)
						return
					}
					if len(p) == 0 {
						return
					}
					mu.Lock()
					for _, e := range p {
						if o, ok := owner[e.EventID]; ok {
							t.Errorf("%s swept by replica %d and %d", e.EventID, o, r)
						}
						owner[e.EventID] = r
						after = e.Seq
					}
					mu.Unlock()
				}
			})
		}
		wg.Wait()
		if len(owner) != len(entries) {
			t.Errorf("swept %d entries, want all %d once", len(owner), len(entries))
		}
	})
}
