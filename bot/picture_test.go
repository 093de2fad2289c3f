package bot_test

import (
	"context"
	"sync"
	"sync/atomic"
	"testing"
	"time"

	"mixward/bot"
	"mixward/engine"
)

// countingPlotter counts drawings; while hold is not nil each drawing
// waits for it.
type countingPlotter struct {
	n    atomic.Int32
	hold chan struct{}
	mu   sync.Mutex
	seen []float64 // mix pH of each drawing
}

func (p *countingPlotter) Plot(r *engine.Result) ([]byte, bool, error) {
	p.n.Add(1)
	p.mu.Lock()
	p.seen = append(p.seen, r.Conditions.PH)
	p.mu.Unlock()
	if p.hold != nil {
		<-p.hold
	}
	return []byte("\x89PNG\r\n\x1a\nfake"), true, nil
}

func TestPicturesCachedByRoundedConditions(t *testing.T) {
	cp := &countingPlotter{}
	pics := &bot.Pictures{Plot: cp, Cache: 2}
	defer pics.Close(context.Background())
	withPH := func(ph float64) *engine.Result {
		r := sampleResult()
		r.Conditions.PH = ph
		return r
	}
	for _, tc := range []struct {
		name  string
		r     *engine.Result
		draws int32
	}{
		{"first drawing", withPH(1.2), 1},
		{"same conditions: from the cache", withPH(1.2), 1},
		{"pH differing below the rounding: from the cache", withPH(1.2004), 1},
		{"another pH: drawn", withPH(1.5), 2},
		{"a third, pushing the first out of a cache of two", withPH(2.5), 3},
		{"the first again: drawn again", withPH(1.2), 4},
	} {
		if _, ok, err := pics.PNG(tc.r); !ok || err != nil {
			t.Fatalf("%s: PNG = %v, %v", tc.name, ok, err)
		}
		if got := cp.n.Load(); got != tc.draws {
			t.Errorf("%s: %d drawings so far, want %d", tc.name, got, tc.draws)
		}
	}
	// Drawn from the rounded value, so the cached picture is exact.
	cp.mu.Lock()
	defer cp.mu.Unlock()
	if cp.seen[0] != 1.2 {
		t.Errorf("drawn at pH %v, want the rounded 1.2", cp.seen[0])
	}
}

func TestPicturesSkippedWhenQueueFull(t *testing.T) {
	e := newEnv(t)
	cp := &countingPlotter{hold: make(chan struct{})}
	pics := &bot.Pictures{Plot: cp, Poster: e.sl.Poster, Workers: 1, Queue: 1}
	r := sampleResult()
	if !pics.Offer("CPLANT", "1.1", 1, r) {
		t.Fatal("first picture refused by an idle pool")
	}
	// Wait until the worker holds it, then one more fits in the queue.
	for cp.n.Load() == 0 {
		time.Sleep(time.Millisecond)
	}
	if !pics.Offer("CPLANT", "1.2", 2, r) {
		t.Fatal("second picture refused with room in the queue")
	}
	if pics.Offer("CPLANT", "1.3", 3, r) {
		t.Error("third picture taken with the queue full; want it skipped")
	}
	if pics.Offer("CPLANT", "1.4", 4, &engine.Result{}) {
		t.Error("a result without a pair was offered a picture")
	}
	close(cp.hold)
	pics.Close(context.Background())
	if ups := e.slack.uploadsNow(); len(ups) != 2 {
		t.Errorf("%d pictures uploaded, want the 2 taken", len(ups))
	}
	if pics.Offer("CPLANT", "1.5", 5, r) {
		t.Error("picture taken after Close")
	}
}
