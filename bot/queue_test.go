package bot

import (
	"context"
	"errors"
	"fmt"
	"runtime"
	"sync"
	"sync/atomic"
	"testing"
	"time"
)

func TestQueueKeepsOrderPerKeyAndRunsKeysConcurrently(t *testing.T) {
	q := NewPool(2, 100, nil)
	ka, kb := "a", "b"
	var mu sync.Mutex
	got := map[string][]int{}
	// Key a blocks until key b has run: if they shared a worker this
	// would deadlock.
	bDone := make(chan struct{})
	for i := range 20 {
		key := []string{ka, kb}[i%2]
		err := q.Submit(context.Background(), key, func(context.Context) {
			if key == ka && i == 0 {
				<-bDone
			}
			mu.Lock()
			got[key] = append(got[key], i)
			n := len(got[kb])
			mu.Unlock()
			if key == kb && n == 10 {
				close(bDone)
			}
		})
		if err != nil {
			t.Fatal(err)
		}
	}
	ctx, cancel := context.WithTimeout(context.Background(), 5*time.Second)
	defer cancel()
	if err := q.Close(ctx); err != nil {
		t.Fatalf("Close: %v (keys blocked each other?)", err)
	}
	for key, ns := range got {
		for i := 1; i < len(ns); i++ {
			if ns[i] < ns[i-1] {
				t.Errorf("key %s ran out of order: %v", key, ns)
			}
		}
		if len(ns) != 10 {
			t.Errorf("key %s ran %d jobs, want 10", key, len(ns))
		}
	}
}

func TestQueueBoundsConcurrency(t *testing.T) {
	const workers = 3
	q := NewPool(workers, 1000, nil)
	var running, peak atomic.Int32
	for i := range 300 {
		q.Submit(context.Background(), fmt.Sprint("thread-", i), func(context.Context) {
			n := running.Add(1)
			for {
				p := peak.Load()
				if n <= p || peak.CompareAndSwap(p, n) {
					break
				}
			}
			time.Sleep(100 * time.Microsecond)
			running.Add(-1)
		})
	}
	if err := q.Close(context.Background()); err != nil {
		t.Fatal(err)
	}
	if p := peak.Load(); p > workers || p < 2 {
		t.Errorf("%d jobs ran at once over 300 keys, want between 2 and the %d workers", p, workers)
	}
	if n := runtime.NumGoroutine(); n > 50 {
		t.Errorf("%d goroutines after Close; workers left behind?", n)
	}
}

func TestQueueBackpressureNeverDrops(t *testing.T) {
	var depths []int
	var dmu sync.Mutex
	q := NewQueue(2, func(n int) { dmu.Lock(); depths = append(depths, n); dmu.Unlock() })
	release := make(chan struct{})
	ran := make(chan int, 10)
	job := func(i int) func(context.Context) {
		return func(context.Context) { <-release; ran <- i }
	}
	for i := range 2 {
		if err := q.Submit(context.Background(), fmt.Sprint(i), job(i)); err != nil {
			t.Fatal(err)
		}
	}
	// Full: a third submit waits, and gives up only when its context ends.
	ctx, cancel := context.WithTimeout(context.Background(), 30*time.Millisecond)
	err := q.Submit(ctx, "x", job(99))
	cancel()
	if !errors.Is(err, context.DeadlineExceeded) {
		t.Fatalf("Submit on a full queue = %v, want it to wait until the deadline", err)
	}
	submitted := make(chan error)
	go func() { submitted <- q.Submit(context.Background(), "2", job(2)) }()
	select {
	case err := <-submitted:
		t.Fatalf("Submit returned %v while the queue was full", err)
	case <-time.After(20 * time.Millisecond):
	}
	close(release)
	if err := <-submitted; err != nil {
		t.Fatal(err)
	}
	if err := q.Close(context.Background()); err != nil {
		t.Fatal(err)
	}
	close(ran)
	seen := map[int]bool{}
	for i := range ran {
		seen[i] = true
	}
	if !seen[0] || !seen[1] || !seen[2] || seen[99] || q.Depth() != 0 {
		t.Errorf("ran %v, depth %d; want 0, 1 and 2 run, the withdrawn job not", seen, q.Depth())
	}
	dmu.Lock()
	defer dmu.Unlock()
	if len(depths) == 0 || depths[len(depths)-1] != 0 {
		t.Errorf("depth reports %v, want them to end at 0", depths)
	}
}

func TestQueueCloseDrainsThenRefuses(t *testing.T) {
	q := NewQueue(10, nil)
	var n int
	var mu sync.Mutex
	for range 5 {
		q.Submit(context.Background(), "k", func(context.Context) {
			time.Sleep(time.Millisecond)
			mu.Lock()
			n++
			mu.Unlock()
		})
	}
	if err := q.Close(context.Background()); err != nil {
		t.Fatal(err)
	}
	if n != 5 {
		t.Errorf("Close returned with %d of 5 jobs done", n)
	}
	if err := q.Submit(context.Background(), "k", func(context.Context) {}); !errors.Is(err, ErrClosed) {
		t.Errorf("Submit after Close = %v, want ErrClosed", err)
	}
}

func TestQueueCloseTimeoutCancelsJobs(t *testing.T) {
	q := NewQueue(10, nil)
	cancelled := make(chan struct{})
	q.Submit(context.Background(), "k", func(ctx context.Context) {
		<-ctx.Done() // a retry loop waiting out a Slack outage
		close(cancelled)
	})
	ctx, cancel := context.WithTimeout(context.Background(), 20*time.Millisecond)
	defer cancel()
	if err := q.Close(ctx); !errors.Is(err, context.DeadlineExceeded) {
		t.Errorf("Close = %v, want the deadline", err)
	}
	select {
	case <-cancelled:
	default:
		t.Error("the job's context was not cancelled when the drain timed out")
	}
}

func TestQueueSurvivesPanic(t *testing.T) {
	q := NewQueue(10, nil)
	var panicked any
	q.OnPanic = func(key string, v any) { panicked = v }
	ok := make(chan bool, 1)
	q.Submit(context.Background(), "k", func(context.Context) { panic("boom") })
	q.Submit(context.Background(), "k", func(context.Context) { ok <- true })
	q.Close(context.Background())
	if panicked != "boom" || len(ok) != 1 {
		t.Errorf("panicked %v, next job ran %v", panicked, len(ok) == 1)
	}
}

func BenchmarkQueue(b *testing.B) {
	q := NewQueue(1024, nil)
	for i := 0; b.Loop(); i++ {
		q.Submit(context.Background(), fmt.Sprint(i%64), func(context.Context) {})
	}
	q.Close(context.Background())
}
