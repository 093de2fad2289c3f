package bot

import (
	"context"
	"errors"
	"log/slog"
	"sync"
	"time"

	"mixward/store"
)

// Journal is the durable inbox of acknowledged messages. *store.DB
// implements it.
type Journal interface {
	AcceptMessages(ctx context.Context, entries []store.InboxEntry) ([]bool, error)
	InboxEntryFor(ctx context.Context, eventID string) (store.InboxEntry, error)
	PendingMessages(ctx context.Context, afterSeq int64, limit int) ([]store.InboxEntry, error)
	FinishMessages(ctx context.Context, outs []store.Outcome) error
}

// journalBatch is the most entries written in one transaction.
const journalBatch = 256

// journalWriter writes to the Journal from two goroutines: one accepts
// messages in batches (a group commit: every message waiting when a
// transaction starts shares it), one records outcomes in batches and
// retries with backoff until they are written, so that an outcome is never
// dropped because the database was busy.
type journalWriter struct {
	j       Journal
	log     *slog.Logger
	metrics *Metrics
	sleep   func(ctx context.Context, d time.Duration) error

	accepts  chan acceptReq
	finishes chan store.Outcome
	stop     chan struct{}   // closed by close: flush and return
	life     context.Context // ends when close's deadline passes
	endLife  context.CancelFunc
	wg       sync.WaitGroup
	stopOnce sync.Once
}

type acceptReq struct {
	entry store.InboxEntry
	done  chan acceptRes
}

type acceptRes struct {
	fresh bool
	err   error
}

func newJournalWriter(j Journal, log *slog.Logger, m *Metrics, sleep func(context.Context, time.Duration) error) *journalWriter {
	if sleep == nil {
		sleep = SleepContext
	}
	w := &journalWriter{j: j, log: log, metrics: m, sleep: sleep,
		accepts: make(chan acceptReq, journalBatch), finishes: make(chan store.Outcome, 4*journalBatch),
		stop: make(chan struct{})}
	w.life, w.endLife = context.WithCancel(context.Background())
	w.wg.Go(w.acceptLoop)
	w.wg.Go(w.finishLoop)
	return w
}

// accept writes e to the inbox and reports whether it was new. It waits
// for the transaction that carries it, or until ctx ends.
func (w *journalWriter) accept(ctx context.Context, e store.InboxEntry) (bool, error) {
	req := acceptReq{e, make(chan acceptRes, 1)}
	select {
	case w.accepts <- req:
	case <-ctx.Done():
		return false, ctx.Err()
	case <-w.stop:
		return false, ErrClosed
	}
	select {
	case r := <-req.done:
		return r.fresh, r.err
	case <-ctx.Done():
		return false, ctx.Err()
	}
}

func (w *journalWriter) acceptLoop() {
	for {
		var first acceptReq
		select {
		case first = <-w.accepts:
		case <-w.stop:
			return
		}
		batch := []acceptReq{first}
	more:
		for len(batch) < journalBatch {
			select {
			case r := <-w.accepts:
				batch = append(batch, r)
			default:
				break more
			}
		}
		entries := make([]store.InboxEntry, len(batch))
		for i, r := range batch {
			entries[i] = r.entry
		}
		var fresh []bool
		var err error
		for attempt := 1; attempt <= 3; attempt++ {
			ctx, cancel := context.WithTimeout(context.Background(), 5*time.Second)
			fresh, err = w.j.AcceptMessages(ctx, entries)
			cancel()
			if err == nil || errors.Is(err, store.ErrInvalid) {
				break
			}
			w.log.Warn("inbox write failed, retrying", "attempt", attempt, "messages", len(entries), "err", err)
			_ = w.sleep(context.Background(), time.Duration(attempt)*50*time.Millisecond)
		}
		if err != nil {
			w.metrics.failed("log")
		}
		for i, r := range batch {
			res := acceptRes{err: err}
			if err == nil {
				res.fresh = fresh[i]
			}
			r.done <- res
		}
	}
}

// finish records an outcome. It never blocks for long: the writer takes it
// and keeps trying until it is written or the writer is closed.
func (w *journalWriter) finish(o store.Outcome) {
	select {
	case w.finishes <- o:
	case <-w.stop:
		w.log.Error("outcome not recorded: shutting down; the answer is checked again at the next start", "event_id", o.EventID, "query_id", o.QueryID)
	}
}

func (w *journalWriter) finishLoop() {
	for {
		var first store.Outcome
		select {
		case first = <-w.finishes:
		case <-w.stop:
			// Flush what is left, within the close deadline.
			for {
				select {
				case o := <-w.finishes:
					w.write(w.life, []store.Outcome{o})
				default:
					return
				}
			}
		}
		batch := []store.Outcome{first}
	more:
		for len(batch) < journalBatch {
			select {
			case o := <-w.finishes:
				batch = append(batch, o)
			default:
				break more
			}
		}
		w.write(w.life, batch)
	}
}

// write records outs, retrying with backoff (50 ms doubling to 5 s) until
// it succeeds or ctx (the writer's life) ends.
func (w *journalWriter) write(ctx context.Context, outs []store.Outcome) {
	wait := 50 * time.Millisecond
	for attempt := 1; ; attempt++ {
		tctx, cancel := context.WithTimeout(ctx, 10*time.Second)
		err := w.j.FinishMessages(tctx, outs)
		cancel()
		if err == nil {
			return
		}
		w.metrics.failed("log")
		if errors.Is(err, store.ErrInvalid) || ctx.Err() != nil {
			w.log.Error("outcomes not recorded; the answers are checked again at the next start", "outcomes", len(outs), "err", err)
			return
		}
		w.log.Warn("recording outcomes failed, retrying", "attempt", attempt, "outcomes", len(outs), "err", err, "retry_in", wait)
		if w.sleep(ctx, wait) != nil {
			return
		}
		wait = min(2*wait, 5*time.Second)
	}
}

// close stops taking work, writes the outcomes already handed over (until
// ctx ends) and waits for the writers.
func (w *journalWriter) close(ctx context.Context) {
	w.stopOnce.Do(func() { close(w.stop) })
	done := make(chan struct{})
	go func() { w.wg.Wait(); close(done) }()
	select {
	case <-done:
	case <-ctx.Done():
		w.endLife()
		<-done
	}
	w.endLife()
}
