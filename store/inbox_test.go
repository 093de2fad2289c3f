package store

import (
	"context"
	"errors"
	"testing"
	"time"
)

func TestInboxLifecycle(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		clk := newClock(time.Date(2026, 11, 30, 9, 0, 0, 0, time.UTC))
		db, _ := b.mustOpen(t, clk.Now)
		ctx := context.Background()
		q := demoQuery()
		q.EventID = "Ev2"
		qid := mustLog(t, db, q)

		fresh, err := db.AcceptMessages(ctx, []InboxEntry{
			{EventID: "Ev1", Thread: "C1/1.0", Message: []byte(`{"text":"help"}`)},
			{EventID: "Ev2", Thread: "C1/1.0", Message: []byte(`{"text":"mix"}`)},
			{EventID: "Ev3", Thread: "C2/2.0", Message: []byte(`{"text":"mix"}`)},
		})
		if err != nil || len(fresh) != 3 || !fresh[0] || !fresh[1] || !fresh[2] {
			t.Fatalf("AcceptMessages = %v, %v; want three new", fresh, err)
		}
		// A redelivery is reported, not taken again.
		fresh, err = db.AcceptMessages(ctx, []InboxEntry{{EventID: "Ev2", Thread: "C1/1.0", Message: []byte(`{}`)}, {EventID: "Ev4", Thread: "C3/3.0"}})
		if err != nil || fresh[0] || !fresh[1] {
			t.Fatalf("AcceptMessages(redelivery) = %v, %v; want [false true]", fresh, err)
		}
		if _, err := db.AcceptMessages(ctx, []InboxEntry{{Thread: "x"}}); !errors.Is(err, ErrInvalid) {
			t.Errorf("entry without event id: err = %v, want ErrInvalid", err)
		}

		if err := db.FinishMessages(ctx, []Outcome{
			{EventID: "Ev1", State: InboxPosted, Detail: "posted"},
			{EventID: "Ev2", QueryID: qid, State: InboxPosted, Detail: "posted in C1"},
			{EventID: "Ev3", State: InboxPending, Detail: "slack down"},
		}); err != nil {
			t.Fatal(err)
		}
		if err := db.FinishMessages(ctx, []Outcome{{EventID: "Ev4", State: "lost"}}); !errors.Is(err, ErrInvalid) {
			t.Errorf("unknown state: err = %v, want ErrInvalid", err)
		}
		pend, err := db.PendingMessages(ctx, 0, 10)
		if err != nil {
			t.Fatal(err)
		}
		if len(pend) != 2 || pend[0].EventID != "Ev3" || pend[1].EventID != "Ev4" || pend[0].Attempts != 1 || pend[0].Detail != "slack down" {
			t.Fatalf("pending = %+v, want Ev3 (1 attempt) then Ev4", pend)
		}
		if pend, _ := db.PendingMessages(ctx, pend[0].Seq, 10); len(pend) != 1 || pend[0].EventID != "Ev4" {
			t.Errorf("pending after Ev3 = %+v, want Ev4 only", pend)
		}
		ds, err := db.Deliveries(ctx, qid)
		if err != nil || len(ds) != 1 || !ds[0].OK || ds[0].Detail != "posted in C1" {
			t.Errorf("deliveries of query %d = %+v, %v", qid, ds, err)
		}
		// A finished entry is not reopened by a later outcome.
		if err := db.FinishMessages(ctx, []Outcome{{EventID: "Ev1", State: InboxPending}}); err != nil {
			t.Fatal(err)
		}
		if e, err := db.InboxEntryFor(ctx, "Ev1"); err != nil || e.State != InboxPosted {
			t.Errorf("Ev1 = %+v, %v; want posted", e, err)
		}
		if _, err := db.InboxEntryFor(ctx, "nope"); !errors.Is(err, ErrNotFound) {
			t.Errorf("missing entry: err = %v, want ErrNotFound", err)
		}

		clk.Add(48 * time.Hour)
		n, err := db.PruneInbox(ctx, clk.Now().Add(-24*time.Hour))
		if err != nil || n != 2 {
			t.Errorf("PruneInbox = %d, %v; want the 2 finished entries", n, err)
		}
		if pend, _ := db.PendingMessages(ctx, 0, 10); len(pend) != 2 {
			t.Errorf("pruning took pending entries: %d left, want 2", len(pend))
		}
	})
}
