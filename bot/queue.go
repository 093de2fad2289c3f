package bot

import (
	"context"
	"errors"
	"sync"
	"sync/atomic"
)

// ErrClosed is returned by Submit once the queue has begun shutting down.
var ErrClosed = errors.New("bot: queue closed, not accepting new work")

// DefaultWorkers is the number of answer workers NewQueue starts.
const DefaultWorkers = 32

// Queue runs jobs on a fixed pool of workers. Jobs with the same key (a
// Slack thread) run one after another in submission order; jobs with
// different keys run concurrently, at most Workers at once however many
// keys are busy. A key with jobs waiting is handed to whichever worker is
// free next, and goes to the back of the line after each job, so busy
// threads take turns. At most Capacity jobs wait or run at once; Submit
// blocks when the queue is full (back-pressure) and never drops a job.
type Queue struct {
	slots   chan struct{} // one token per accepted, unfinished job
	ready   chan string   // keys with a job waiting and none running
	workers int

	mu      sync.Mutex // guards keys and closing; orders depth reports
	keys    map[string][]queuedJob
	closed  atomic.Bool
	pending sync.WaitGroup // accepted, unfinished jobs
	running sync.WaitGroup // workers
	stopped bool

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
		ready:   make(chan string, capacity), // a key is in it at most once and has a job holding a slot
		workers: workers,
		keys:    map[string][]queuedJob{},
		work:    work,
		cancel:  cancel,
		onDepth: onDepth,
	}
	for range workers {
		q.running.Go(q.run)
	}
	return q
}

// Depth is the number of jobs accepted and not yet finished.
func (q *Queue) Depth() int { return len(q.slots) }

// Capacity is the most jobs the queue holds at once.
func (q *Queue) Capacity() int { return cap(q.slots) }

// Workers is the number of workers.
func (q *Queue) Workers() int { return q.workers }

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
	q.pending.Add(1)
	waiting, active := q.keys[key]
	q.keys[key] = append(waiting, queuedJob{key, job})
	if !active {
		q.ready <- key // never blocks: fewer active keys than slots
	}
	q.depthChanged()
	return nil
}

// run is one worker: it takes the next ready key, runs that key's oldest
// job, and puts the key back in line if it has more.
func (q *Queue) run() {
	for key := range q.ready {
		q.mu.Lock()
		jobs := q.keys[key]
		j := jobs[0]
		jobs[0] = queuedJob{}
		q.keys[key] = jobs[1:]
		q.mu.Unlock()

		q.runOne(j)

		q.mu.Lock()
		<-q.slots
		if len(q.keys[key]) == 0 {
			delete(q.keys, key)
		} else {
			q.ready <- key
		}
		q.depthChanged()
		q.mu.Unlock()
		q.pending.Done()
	}
}

func (q *Queue) runOne(j queuedJob) {
	defer func() {
		// A panicking job must not take the worker (and its key's later
		// jobs) down with it.
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
	q.closed.Store(true)
	q.mu.Unlock()
	done := make(chan struct{})
	go func() { q.pending.Wait(); close(done) }()
	var err error
	select {
	case <-done:
	case <-ctx.Done():
		err = ctx.Err()
		q.cancel()
		<-done
	}
	q.cancel()
	q.mu.Lock()
	if !q.stopped {
		q.stopped = true
		close(q.ready)
	}
	q.mu.Unlock()
	q.running.Wait()
	return err
}
