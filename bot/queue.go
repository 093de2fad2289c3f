package bot

import (
	"context"
	"errors"
	"hash/maphash"
	"sync"
	"sync/atomic"
)

// ErrClosed is returned by Submit once the queue has begun shutting down.
var ErrClosed = errors.New("bot: queue closed, not accepting new work")

// DefaultWorkers is the number of answer workers NewQueue starts.
const DefaultWorkers = 32

// Queue runs jobs on a fixed pool of workers. A job's key picks its worker
// (a hash of the key), so jobs with the same key (a Slack channel) run one
// after another in submission order, and at most Workers jobs run at once
// however many keys are busy. At most Capacity jobs wait or run at once;
// Submit blocks when the queue is full (back-pressure) and never drops a
// job. A worker serves its keys in turn: a job that waits (a channel held
// by Slack's rate limit) delays the other keys of that worker only.
type Queue struct {
	slots  chan struct{}    // one token per accepted, unfinished job
	shards []chan queuedJob // one per worker; each can hold Capacity jobs
	seed   maphash.Seed
	closed atomic.Bool

	mu      sync.Mutex // orders Submit against Close, and depth reports
	workers sync.WaitGroup

	work   context.Context // handed to jobs; cancelled only when draining times out
	cancel context.CancelFunc

	onDepth func(int) // called with the number of unfinished jobs after each change

	// OnPanic, if set, is told about a job that panicked; the worker
	// carries on with its next job.
	OnPanic func(key string, v any)
}

type queuedJob struct {
	key string
	run func(context.Context)
}

// NewQueue returns a queue of DefaultWorkers workers holding at most
// capacity unfinished jobs. onDepth, if not nil, is told the depth after
// every change.
func NewQueue(capacity int, onDepth func(int)) *Queue {
	return NewPool(DefaultWorkers, capacity, onDepth)
}

// NewPool returns a queue of workers workers holding at most capacity
// unfinished jobs.
func NewPool(workers, capacity int, onDepth func(int)) *Queue {
	workers, capacity = max(workers, 1), max(capacity, 1)
	work, cancel := context.WithCancel(context.Background())
	q := &Queue{
		slots:   make(chan struct{}, capacity),
		shards:  make([]chan queuedJob, workers),
		seed:    maphash.MakeSeed(),
		work:    work,
		cancel:  cancel,
		onDepth: onDepth,
	}
	for i := range q.shards {
		q.shards[i] = make(chan queuedJob, capacity)
		q.workers.Go(func() { q.run(q.shards[i]) })
	}
	return q
}

// Depth is the number of jobs accepted and not yet finished.
func (q *Queue) Depth() int { return len(q.slots) }

// Capacity is the most jobs the queue holds at once.
func (q *Queue) Capacity() int { return cap(q.slots) }

// Workers is the number of workers.
func (q *Queue) Workers() int { return len(q.shards) }

// Submit adds a job under key. It blocks while the queue is full, until ctx
// ends (returning ctx's error; the job is then not queued) or the queue
// closes (ErrClosed).
func (q *Queue) Submit(ctx context.Context, key string, job func(context.Context)) error {
	if q.closed.Load() {
		return ErrClosed
	}
	select {
	case q.slots <- struct{}{}:
	case <-ctx.Done():
		return ctx.Err()
	}
	q.mu.Lock()
	defer q.mu.Unlock()
	if q.closed.Load() {
		<-q.slots
		return ErrClosed
	}
	// Never blocks: each shard holds Capacity jobs and a slot is held.
	q.shards[q.shardOf(key)] <- queuedJob{key, job}
	q.depthChanged()
	return nil
}

// shardOf is the worker that runs key's jobs.
func (q *Queue) shardOf(key string) int {
	return int(maphash.String(q.seed, key) % uint64(len(q.shards)))
}

// run is one worker: it takes its shard's jobs in order until the shard is
// closed and empty.
func (q *Queue) run(shard chan queuedJob) {
	for j := range shard {
		q.runOne(j)
		q.mu.Lock()
		<-q.slots
		q.depthChanged()
		q.mu.Unlock()
	}
}

func (q *Queue) runOne(j queuedJob) {
	defer func() {
		// A panicking job must not take the worker (and the keys it
		// serves) down with it.
		if v := recover(); v != nil && q.OnPanic != nil {
			q.OnPanic(j.key, v)
		}
	}()
	j.run(q.work)
}

// depthChanged reports the depth; called with q.mu held so that reports
// arrive in order.
func (q *Queue) depthChanged() {
	if q.onDepth != nil {
		q.onDepth(len(q.slots))
	}
}

// Close stops accepting jobs and waits for every accepted job to finish.
// If ctx ends first, the jobs' context is cancelled (jobs still waiting then
// run with it, and should give up at once) and Close returns ctx's error
// after the workers have returned.
func (q *Queue) Close(ctx context.Context) error {
	q.mu.Lock()
	if !q.closed.Swap(true) {
		for _, s := range q.shards {
			close(s)
		}
	}
	q.mu.Unlock()
	done := make(chan struct{})
	go func() { q.workers.Wait(); close(done) }()
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
