package bot

import (
	"context"
	"fmt"
	"log/slog"
	"math"
	"sync"

	lru "github.com/hashicorp/golang-lru/v2"

	"mixward/engine"
)

// Pictures draws and uploads E–pH pictures off the answer's path. The
// answer is posted first; its picture is then offered to a small pool of
// workers with a bounded queue, and skipped when that queue is full, so a
// burst of requests costs at most Workers pictures in memory at once and
// never holds up an answer. PNGs are kept in a bounded LRU cache keyed by
// the two couples and the conditions rounded as the picture shows them
// (pH to 0.01, potentials to 1 mV, temperature to 0.1 °C); the picture is
// drawn from the rounded values, so a cached PNG is exactly what a new
// drawing would give.
type Pictures struct {
	Plot    Plotter
	Poster  *Poster
	Workers int // drawing and uploading at once; 0 means 1
	Queue   int // pictures waiting; 0 means 16
	Cache   int // PNGs kept; 0 means 64
	Logger  *slog.Logger
	Metrics *Metrics

	once   sync.Once
	jobs   chan pictureJob
	cache  *lru.Cache[string, []byte]
	wg     sync.WaitGroup
	mu     sync.Mutex
	closed bool
	work   context.Context
	cancel context.CancelFunc
}

type pictureJob struct {
	channel, thread string
	queryID         int64
	result          *engine.Result
}

func (p *Pictures) start() {
	p.once.Do(func() {
		n, q, c := p.Workers, p.Queue, p.Cache
		if n <= 0 {
			n = 1
		}
		if q <= 0 {
			q = 16
		}
		if c <= 0 {
			c = 64
		}
		p.cache, _ = lru.New[string, []byte](c) // only fails for a size below 1
		p.jobs = make(chan pictureJob, q)
		p.work, p.cancel = context.WithCancel(context.Background())
		for range n {
			p.wg.Go(func() {
				for j := range p.jobs {
					p.upload(p.work, j)
				}
			})
		}
	})
}

func (p *Pictures) logger() *slog.Logger {
	if p.Logger != nil {
		return p.Logger
	}
	return slog.New(slog.DiscardHandler)
}

// Offer queues the picture of r for the thread, unless the queue is full or
// closed; it never blocks and reports whether the picture was taken.
func (p *Pictures) Offer(channel, thread string, queryID int64, r *engine.Result) bool {
	if p == nil || p.Plot == nil || r == nil || r.Oxidizer == nil || r.Reducer == nil {
		return false
	}
	p.start()
	p.mu.Lock()
	defer p.mu.Unlock()
	if p.closed {
		return false
	}
	select {
	case p.jobs <- pictureJob{channel, thread, queryID, r}:
		return true
	default:
		p.Metrics.failed("picture-skipped")
		p.logger().Info("E–pH picture skipped: picture queue full", "query_id", queryID)
		return false
	}
}

// PNG returns the picture of r, from the cache when it was drawn before.
// ok is false when r has nothing to draw.
func (p *Pictures) PNG(r *engine.Result) (png []byte, ok bool, err error) {
	p.start()
	rr, key := roundedForPicture(r)
	if png, ok := p.cache.Get(key); ok {
		return png, true, nil
	}
	png, ok, err = p.Plot.Plot(rr)
	if err == nil && ok {
		p.cache.Add(key, png)
	}
	return png, ok, err
}

func (p *Pictures) upload(ctx context.Context, j pictureJob) {
	if ctx.Err() != nil {
		return
	}
	png, ok, err := p.PNG(j.result)
	switch {
	case err != nil:
		p.logger().Warn("E–pH picture not drawn", "query_id", j.queryID, "err", err)
		return
	case !ok || len(png) == 0:
		return
	}
	name := fmt.Sprintf("mixward-eph-%d.png", j.queryID)
	title := "E–pH picture: " + truncate(j.result.Request, 200)
	alt := "E–pH diagram of the oxidizing and reducing couples with the mix pH marked"
	if err := p.Poster.Upload(ctx, j.channel, j.thread, name, title, alt, png); err != nil {
		p.Metrics.failed("upload")
		p.logger().Warn("E–pH picture not uploaded", "query_id", j.queryID, "err", err)
	}
}

// Close stops taking pictures and waits for those queued, until ctx ends;
// then the uploads still going are cancelled (a picture is never owed).
func (p *Pictures) Close(ctx context.Context) {
	if p == nil {
		return
	}
	p.start()
	p.mu.Lock()
	if !p.closed {
		p.closed = true
		close(p.jobs)
	}
	p.mu.Unlock()
	done := make(chan struct{})
	go func() { p.wg.Wait(); close(done) }()
	select {
	case <-done:
	case <-ctx.Done():
		p.cancel()
		<-done
	}
	p.cancel()
}

// Idle reports whether no picture is waiting (tests use it to settle).
func (p *Pictures) Idle() bool { return p == nil || p.jobs == nil || len(p.jobs) == 0 }

// roundedForPicture returns a copy of r with the values the picture shows
// rounded, and the cache key made of them.
func roundedForPicture(r *engine.Result) (*engine.Result, string) {
	round := func(x, step float64) float64 { return math.Round(x/step) * step }
	rr := *r
	ox, red := *r.Oxidizer, *r.Reducer
	ox.E, red.E = round(ox.E, 0.001), round(red.E, 0.001)
	rr.Oxidizer, rr.Reducer = &ox, &red
	rr.Conditions.PH = round(r.Conditions.PH, 0.01)
	rr.Conditions.TemperatureC = round(r.Conditions.TemperatureC, 0.1)
	rr.Conditions.TemperatureK = rr.Conditions.TemperatureC + 273.15
	key := fmt.Sprintf("%s|%s|%s|%s|%.3f|%.3f|%.2f|%.1f|%s", ox.ID, red.ID, ox.Species, red.Species,
		ox.E, red.E, rr.Conditions.PH, rr.Conditions.TemperatureC, r.Verdict)
	return &rr, key
}
