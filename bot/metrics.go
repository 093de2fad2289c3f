package bot

import (
	"context"
	"encoding/json"
	"net/http"
	"slices"
	"sync"
	"sync/atomic"
	"time"

	"github.com/prometheus/client_golang/prometheus"
	"github.com/prometheus/client_golang/prometheus/promhttp"
)

// Metrics are the bot's Prometheus series. A nil *Metrics records nothing.
type Metrics struct {
	reg        *prometheus.Registry
	requests   *prometheus.CounterVec   // by transport and kind
	verdicts   *prometheus.CounterVec   // by verdict
	errors     *prometheus.CounterVec   // by stage
	duplicates prometheus.Counter       // redeliveries answered before
	post       *prometheus.HistogramVec // Slack call latency by call and outcome
	reply      prometheus.Histogram     // event received → answer posted
	depth      prometheus.Gauge         // jobs accepted and not finished
	refused    *prometheus.CounterVec   // access refusals by right
}

// NewMetrics makes the series on a registry of their own (plus the Go and
// process collectors), so that two bots in one test never collide.
func NewMetrics() *Metrics {
	reg := prometheus.NewRegistry()
	m := &Metrics{
		reg: reg,
		requests: prometheus.NewCounterVec(prometheus.CounterOpts{
			Name: "mixward_requests_total", Help: "Messages taken from Slack or the console, by transport and kind (mix, streams, search, digest, help).",
		}, []string{"transport", "kind"}),
		verdicts: prometheus.NewCounterVec(prometheus.CounterOpts{
			Name: "mixward_verdicts_total", Help: "Mix requests answered, by verdict (error for requests that did not parse).",
		}, []string{"verdict"}),
		errors: prometheus.NewCounterVec(prometheus.CounterOpts{
			Name: "mixward_errors_total", Help: "Failures by stage: request (bad request), engine, log, post, upload, verify, queue.",
		}, []string{"stage"}),
		duplicates: prometheus.NewCounter(prometheus.CounterOpts{
			Name: "mixward_duplicate_deliveries_total", Help: "Slack redeliveries of an event already taken, answered once.",
		}),
		post: prometheus.NewHistogramVec(prometheus.HistogramOpts{
			Name: "mixward_slack_post_seconds", Help: "Latency of Slack Web API calls, by call and outcome.",
			Buckets: []float64{.005, .01, .025, .05, .1, .25, .5, 1, 2.5, 5, 10},
		}, []string{"call", "outcome"}),
		reply: prometheus.NewHistogram(prometheus.HistogramOpts{
			Name: "mixward_reply_seconds", Help: "Time from receiving a message to its answer being posted.",
			Buckets: []float64{.01, .025, .05, .1, .25, .5, 1, 2.5, 5, 10, 30, 60},
		}),
		depth: prometheus.NewGauge(prometheus.GaugeOpts{
			Name: "mixward_queue_depth", Help: "Messages accepted and not yet fully answered.",
		}),
		refused: prometheus.NewCounterVec(prometheus.CounterOpts{
			Name: "mixward_access_refused_total", Help: "Commands refused for lack of a right, by right (supervisor, reviewer).",
		}, []string{"right"}),
	}
	reg.MustRegister(m.requests, m.verdicts, m.errors, m.duplicates, m.post, m.reply, m.depth, m.refused,
		prometheus.NewGoCollector(), prometheus.NewProcessCollector(prometheus.ProcessCollectorOpts{}))
	return m
}

// Registry is where the series live, for /metrics or for tests.
func (m *Metrics) Registry() *prometheus.Registry { return m.reg }

func (m *Metrics) request(transport, kind string) {
	if m != nil {
		m.requests.WithLabelValues(transport, kind).Inc()
	}
}

func (m *Metrics) verdict(v string) {
	if m != nil {
		m.verdicts.WithLabelValues(v).Inc()
	}
}

func (m *Metrics) failed(stage string) {
	if m != nil {
		m.errors.WithLabelValues(stage).Inc()
	}
}

func (m *Metrics) duplicate() {
	if m != nil {
		m.duplicates.Inc()
	}
}

func (m *Metrics) refusal(right string) {
	if m != nil {
		m.refused.WithLabelValues(right).Inc()
	}
}

func (m *Metrics) observePost(call string, d time.Duration, err error) {
	if m == nil {
		return
	}
	outcome := "ok"
	if err != nil {
		outcome = "error"
	}
	m.post.WithLabelValues(call, outcome).Observe(d.Seconds())
}

func (m *Metrics) observeReply(d time.Duration) {
	if m != nil {
		m.reply.Observe(d.Seconds())
	}
}

// QueueDepth sets the queue-depth gauge; hand it to NewQueue.
func (m *Metrics) QueueDepth(n int) {
	if m != nil {
		m.depth.Set(float64(n))
	}
}

// Health is the state /healthz reports: ready while the bot serves (not
// while starting or draining) and every transport it runs is up.
type Health struct {
	ready atomic.Bool

	mu         sync.Mutex
	transports map[string]string // transport → state; see Up

	// Depth, if set, reports the queue depth in the health answer.
	Depth func() int
	// Database, if set, checks the database at each health check: the bot
	// is not ready while it fails. DatabaseKind names it ("sqlite",
	// "postgres") in the answer.
	Database     func(ctx context.Context) error
	DatabaseKind string
}

// SetReady marks the bot as serving (true) or draining (false).
func (h *Health) SetReady(ok bool) { h.ready.Store(ok) }

// Expect registers a transport the bot runs ("socket", "http") in state
// "not connected": the bot is not ready until it reports itself up.
func (h *Health) Expect(transport string) { h.SetTransport(transport, "not connected") }

// SetTransport records a transport's state. "connected" and "listening"
// count as up; anything else (connecting, reconnecting, invalid auth) as
// down.
func (h *Health) SetTransport(transport, state string) {
	h.mu.Lock()
	defer h.mu.Unlock()
	if h.transports == nil {
		h.transports = map[string]string{}
	}
	h.transports[transport] = state
}

// SetSocket records the Socket Mode connection state (connecting, connected, ...).
func (h *Health) SetSocket(state string) { h.SetTransport("socket", state) }

func up(state string) bool { return state == "connected" || state == "listening" }

// Status reports whether the bot is ready, each transport's state, and
// the transports that are down, sorted.
func (h *Health) Status() (ready bool, states map[string]string, down []string) {
	h.mu.Lock()
	defer h.mu.Unlock()
	states = map[string]string{}
	for t, s := range h.transports {
		states[t] = s
		if !up(s) {
			down = append(down, t)
		}
	}
	slices.Sort(down)
	return h.ready.Load() && len(down) == 0, states, down
}

// AdminHandler serves /healthz (JSON; 200 while ready, 503 while starting or
// draining) and /metrics (Prometheus text format).
func AdminHandler(m *Metrics, h *Health) http.Handler {
	mux := http.NewServeMux()
	mux.Handle("GET /metrics", promhttp.HandlerFor(m.Registry(), promhttp.HandlerOpts{}))
	mux.HandleFunc("GET /healthz", h.ServeHTTP)
	return mux
}

// ServeHTTP answers a health check: JSON with "ready", each transport's
// state under "transports" (and Socket Mode's also under "socket"), the
// transports that are down under "down", and the queue depth; 200 when
// ready, 503 otherwise.
func (h *Health) ServeHTTP(w http.ResponseWriter, r *http.Request) {
	ready, states, down := h.Status()
	body := map[string]any{"ready": ready, "serving": h.ready.Load(), "transports": states, "down": down}
	if h.Database != nil {
		ctx, cancel := context.WithTimeout(r.Context(), 2*time.Second)
		start := time.Now()
		err := h.Database(ctx)
		cancel()
		db := map[string]any{"kind": h.DatabaseKind, "ok": err == nil, "latency_ms": time.Since(start).Milliseconds()}
		if err != nil {
			db["error"] = err.Error()
			down = append(down, "database")
			ready = false
			body["ready"], body["down"] = false, down
		}
		body["database"] = db
	}
	if down == nil {
		body["down"] = []string{}
	}
	if s, ok := states["socket"]; ok {
		body["socket"] = s
	}
	if h.Depth != nil {
		body["queue_depth"] = h.Depth()
	}
	w.Header().Set("Content-Type", "application/json")
	if !ready {
		w.WriteHeader(http.StatusServiceUnavailable)
	}
	_ = json.NewEncoder(w).Encode(body)
}
