package bot

import (
	"context"
	"errors"
	"sync"
)

// ErrClosed is returned by Submit once the queue has begun shutting down.
var ErrClosed = errors.New("bot: queue closed, not accepting new work")

// Queue runs jobs with one worker per key: jobs with the same key (a Slack
// thread) run one after another in submission order, jobs with different
// keys run concurrently. At most Capacity jobs wait or run at once; Submit
// blocks when the queue is full (backpressure) and never drops a job.
type Queue struct {
	slots chan struct{} // one token per accepted, unfinished job

	mu      sync.Mutex
	keys    map[string][]func(context.Context)
	closed  bool
	pending sync.WaitGroup

	work   context.Context // handed to jobs; cancelled only when draining times out
	cancel context.CancelFunc

	onDepth func(int) // called with the number of unfinished jobs after each change

	// OnPanic, if set, is told about a job that panicked; the worker
	// carries on with the next job of its key.
	OnPanic func(key string, v any)
}

// NewQueue returns a queue holding at most capacity unfinished jobs.
// onDepth, if not nil, is told the depth after every change.
func NewQueue(capacity int, onDepth func(int)) *Queue {
	if capacity < 1 {
		capacity = 1
	}
	work, cancel := context.WithCancel(context.Background())
	return &Queue{
		slots:   make(chan struct{}, capacity),
		keys:    map[string][]func(context.Context){},
		work:    work,
		cancel:  cancel,
		onDepth: onDepth,
	}
}

// Depth is the number of jobs accepted and not yet finished.
func (q *Queue) Depth() int { return len(q.slots) }

// Submit adds a job under key. It blocks while the queue is full, until ctx
// ends (returning ctx's error; the job is then not queued) or the queue
// closes (ErrClosed).
func (q *Queue) Submit(ctx context.Context, key string, job func(context.Context)) error {
	q.mu.Lock()
	closed := q.closed
	q.mu.Unlock()
	if closed {
		return ErrClosed
	}
	select {
	case q.slots <- struct{}{}:
	case <-ctx.Done():
		return ctx.Err()
	}
	q.mu.Lock()
	if q.closed {
		q.mu.Unlock()
		<-q.slots
		return ErrClosed
	}
	q.pending.Add(1)
	waiting, running := q.keys[key]
	q.keys[key] = append(waiting, job)
	q.depthChanged()
	q.mu.Unlock()
	if !running {
		go q.run(key)
	}
	return nil
}

// run is the worker for one key: it takes that key's jobs in order until
// none is left, then exits.
func (q *Queue) run(key string) {
	for {
		q.mu.Lock()
		jobs := q.keys[key]
		if len(jobs) == 0 {
			delete(q.keys, key)
			q.mu.Unlock()
			return
		}
		job := jobs[0]
		jobs[0] = nil
		q.keys[key] = jobs[1:]
		q.mu.Unlock()

		q.runOne(key, job)
		q.mu.Lock()
		<-q.slots
		q.depthChanged()
		q.mu.Unlock()
		q.pending.Done()
	}
}

func (q *Queue) runOne(key string, job func(context.Context)) {
	defer func() {
		// A panicking job must not take the worker (and the rest of its
		// thread) down with it.
		if v := recover(); v != nil && q.OnPanic != nil {
			q.OnPanic(key, v)
		}
	}()
	job(q.work)
}

// depthChanged reports the depth; called with q.mu held so that reports
// arrive in order.
func (q *Queue) depthChanged() {
	if q.onDepth != nil {
		q.onDepth(len(q.slots))
	}
}

// Close stops accepting jobs and waits for every accepted job to finish.
// If ctx ends first, the jobs' context is cancelled (so retries stop) and
// Close returns ctx's error after the workers have returned.
func (q *Queue) Close(ctx context.Context) error {
	q.mu.Lock()
	q.closed = true
	q.mu.Unlock()
	done := make(chan struct{})
	go func() { q.pending.Wait(); close(done) }()
	select {
	case <-done:
		q.cancel()
		return nil
	case <-ctx.Done():
		q.cancel()
		<-done
		return ctx.Err()
	}
}
