package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"log/slog"
	"net"
	"net/http"
	"strconv"
	"strings"
	"sync"
	"time"
	_ "time/tzdata" // MIXWARD_TZ works in minimal images

	"github.com/slack-go/slack"
	"github.com/slack-go/slack/socketmode"
	"golang.org/x/time/rate"

	"mixward/bot"
	"mixward/engine"
	"mixward/engine/advice"
	"mixward/engine/eph"
	"mixward/store"
)

// siteFlags are the settings the console and the bot share.
type siteFlags struct {
	db     string
	site   string
	tz     string
	shifts string
	getenv func(string) string // for MIXWARD_CHAIN_KEY_FILE
}

func (s *siteFlags) register(fs *flag.FlagSet, getenv func(string) string) {
	s.getenv = getenv
	fs.StringVar(&s.db, "db", envOr(getenv, "MIXWARD_DB", "mixward.db"), "query log and stream catalogue: a SQLite file, or a postgres:// URL (env MIXWARD_DB)")
	fs.StringVar(&s.site, "site", envOr(getenv, envSite, store.DefaultSite), "the site (plant) this process serves: its stream tags, queries and digests (env MIXWARD_SITE)")
	fs.StringVar(&s.tz, "tz", getenv("MIXWARD_TZ"), "site time zone for digests and dates, e.g. Europe/London; empty means UTC (env MIXWARD_TZ)")
	fs.StringVar(&s.shifts, "shifts", envOr(getenv, "MIXWARD_SHIFTS", store.DefaultShifts), "shift changes as a 5-field cron spec in the site zone; a digest is made at each (env MIXWARD_SHIFTS)")
}

// location reads --tz.
// location is the site time zone; unset means UTC, as for every other
// subcommand, so the bot and the command line show the same times.
func (s *siteFlags) location() (*time.Location, error) {
	return siteLocation(s.tz)
}

// site is what both front ends open: engine, store, clock and zone.
type site struct {
	eng    *engine.Engine
	adv    *advice.Advisor
	db     *store.DB
	loc    *time.Location
	shifts string
}

func openSite(ctx context.Context, s siteFlags) (*site, error) {
	loc, err := s.location()
	if err != nil {
		return nil, err
	}
	if _, err := store.ParseShifts(s.shifts); err != nil {
		return nil, &exitError{exitUsage, fmt.Errorf("--shifts: %w", err)}
	}
	eng, err := loadEngine()
	if err != nil {
		return nil, err
	}
	adv, err := loadAdvisor(eng)
	if err != nil {
		return nil, err
	}
	key, err := chainKey(s.getenv)
	if err != nil {
		return nil, err
	}
	opt, err := storeOptions(s.getenv, s.db)
	if err != nil {
		return nil, err
	}
	opt.Location, opt.ChainKey, opt.Site = loc, key, s.site
	db, err := store.Open(ctx, s.db, opt)
	if err != nil {
		return nil, err
	}
	return &site{eng: eng, adv: adv, db: db, loc: loc, shifts: s.shifts}, nil
}

// newBot wires the transport-independent bot to the site.
func (st *site) newBot(logger *slog.Logger, metrics *bot.Metrics, access *bot.Access) *bot.Bot {
	sched, _ := store.ParseShifts(st.shifts)
	return &bot.Bot{
		Engine:      st.adv,
		Render:      advice.RenderShort,
		CheckStream: func(text string) error { return checkStream(st.eng, text) },
		Log:         st.db,
		Catalogue:   st.db,
		Searcher:    st.db,
		Digests:     st.db,
		Access:      access,
		Location:    st.loc,
		ShiftStart: func(now time.Time) time.Time {
			_, until, err := store.LastShift(sched, st.loc, now)
			if err != nil {
				return now.Add(-12 * time.Hour)
			}
			return until
		},
		Logger:        logger,
		Metrics:       metrics,
		EngineVersion: engine.Version,
		DataHash:      st.eng.Tables.Hash,
	}
}

// checkStream accepts text for the catalogue if it reads as exactly one
// stream of a mix request, without request-wide conditions.
func checkStream(eng *engine.Engine, text string) error {
	req, err := engine.ParseRequest(text, eng.Tables, nil)
	if err != nil {
		return err
	}
	if len(req.Streams) != 1 {
		return fmt.Errorf("it holds %d streams; a tag names one stream (leave out \"+\")", len(req.Streams))
	}
	if req.TempStated || req.PH != nil || req.PressureKPa != engine.StandardPressureKPa {
		return errors.New(`conditions ("at 40 C", "at pH 3") belong in the mix request, not in the stream`)
	}
	return nil
}

// plotterFor returns the E–pH plotter for answers, drawn from the
// engine's half-reaction table.
func plotterFor(eng *engine.Engine) bot.Plotter {
	return eph.Plotter{Tables: eng.Tables}
}

// newLogger makes the structured log on stderr.
func newLogger(w io.Writer, level, format string) (*slog.Logger, error) {
	var lv slog.Level
	if err := lv.UnmarshalText([]byte(level)); err != nil {
		return nil, &exitError{exitUsage, fmt.Errorf("--log-level %q: use debug, info, warn or error", level)}
	}
	opts := &slog.HandlerOptions{Level: lv}
	switch format {
	case "json":
		return slog.New(slog.NewJSONHandler(w, opts)), nil
	case "text":
		return slog.New(slog.NewTextHandler(w, opts)), nil
	}
	return nil, &exitError{exitUsage, fmt.Errorf("--log-format %q: use json or text", format)}
}

// syncWriter serialises writes from several goroutines.
type syncWriter struct {
	mu sync.Mutex
	w  io.Writer
}

func (s *syncWriter) Write(p []byte) (int, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.w.Write(p)
}

// defaultAdminAddr is where /healthz and /metrics are served unless told
// otherwise (`mixward healthcheck` asks there too).
const defaultAdminAddr = "127.0.0.1:9464"

// serveConfig is everything `mixward serve` is told.
type serveConfig struct {
	site          siteFlags
	httpAddr      string
	adminAddr     string
	supervisors   string
	reviewers     string
	digestChannel string
	apiURL        string
	postRate      float64
	postBurst     int
	queueSize     int
	workers       int
	picWorkers    int
	drainTimeout  time.Duration
	logLevel      string
	logFormat     string

	// secrets: from the environment only
	appToken      string
	botToken      string
	signingSecret string
}

func envFloat(getenv func(string) string, key string, def float64) float64 {
	if v, err := strconv.ParseFloat(getenv(key), 64); err == nil {
		return v
	}
	return def
}

func envInt(getenv func(string) string, key string, def int) int {
	if v, err := strconv.Atoi(getenv(key)); err == nil {
		return v
	}
	return def
}

func envDuration(getenv func(string) string, key string, def time.Duration) time.Duration {
	if v, err := time.ParseDuration(getenv(key)); err == nil {
		return v
	}
	return def
}

func (a *app) cmdServe(ctx context.Context, args []string) error {
	fs := a.newFlags("serve", "serve [--http ADDR] [--admin-addr ADDR] [flags]\n\n"+
		"Runs the Slack bot: Socket Mode when SLACK_APP_TOKEN is set, the HTTP Events API and /mixward\n"+
		"slash command on --http (POST /slack/events, POST /slack/commands) with SLACK_SIGNING_SECRET.\n"+
		"Both need SLACK_BOT_TOKEN. Tokens and the signing secret are read from the environment only.")
	var c serveConfig
	g := a.getenv
	c.site.register(fs, g)
	fs.StringVar(&c.httpAddr, "http", g("MIXWARD_HTTP_ADDR"), "serve the Events API and slash command on this address, e.g. :8080 (env MIXWARD_HTTP_ADDR)")
	fs.StringVar(&c.adminAddr, "admin-addr", envOr(g, "MIXWARD_ADMIN_ADDR", defaultAdminAddr), "serve /healthz and /metrics on this address; \"off\" for none (env MIXWARD_ADMIN_ADDR)")
	fs.StringVar(&c.supervisors, "supervisors", g("MIXWARD_SUPERVISORS"), "who may change the stream catalogue: comma list of Slack user ids (U…) and user-group ids (S…) (env MIXWARD_SUPERVISORS)")
	fs.StringVar(&c.reviewers, "reviewers", g("MIXWARD_REVIEWERS"), "who may search the query log: comma list of user and user-group ids (env MIXWARD_REVIEWERS)")
	fs.StringVar(&c.digestChannel, "digest-channel", g("MIXWARD_DIGEST_CHANNEL"), "channel id the shift digests are posted to; empty: no digests (env MIXWARD_DIGEST_CHANNEL)")
	fs.StringVar(&c.apiURL, "slack-api-url", envOr(g, "MIXWARD_SLACK_API_URL", slack.APIURL), "Slack Web API base URL, for on-site proxies and tests (env MIXWARD_SLACK_API_URL)")
	fs.Float64Var(&c.postRate, "post-rate", envFloat(g, "MIXWARD_POST_RATE", 1), "messages per second per channel (env MIXWARD_POST_RATE)")
	fs.IntVar(&c.postBurst, "post-burst", envInt(g, "MIXWARD_POST_BURST", 3), "messages a channel may take at once before the rate applies (env MIXWARD_POST_BURST)")
	fs.IntVar(&c.queueSize, "queue-size", envInt(g, "MIXWARD_QUEUE_SIZE", 2048), "messages held at once; beyond it intake waits (env MIXWARD_QUEUE_SIZE)")
	fs.IntVar(&c.workers, "workers", envInt(g, "MIXWARD_WORKERS", bot.DefaultWorkers), "answer workers: messages worked on at once; one thread's messages always go to the same worker, in order (env MIXWARD_WORKERS)")
	fs.IntVar(&c.picWorkers, "picture-workers", envInt(g, "MIXWARD_PICTURE_WORKERS", 1), "E–pH pictures drawn and uploaded at once, after the answers; 0 turns pictures off (env MIXWARD_PICTURE_WORKERS)")
	fs.DurationVar(&c.drainTimeout, "drain-timeout", envDuration(g, "MIXWARD_DRAIN_TIMEOUT", 30*time.Second), "on SIGTERM, how long to finish queued answers (env MIXWARD_DRAIN_TIMEOUT)")
	fs.StringVar(&c.logLevel, "log-level", envOr(g, "MIXWARD_LOG_LEVEL", "info"), "debug, info, warn or error (env MIXWARD_LOG_LEVEL)")
	fs.StringVar(&c.logFormat, "log-format", envOr(g, "MIXWARD_LOG_FORMAT", "json"), "json or text (env MIXWARD_LOG_FORMAT)")
	rest, err := parseFlags(fs, args)
	if err != nil {
		return err
	}
	if len(rest) > 0 {
		return &exitError{exitUsage, fmt.Errorf("serve takes no arguments, got %q", strings.Join(rest, " "))}
	}
	c.appToken, c.botToken, c.signingSecret = g("SLACK_APP_TOKEN"), g("SLACK_BOT_TOKEN"), g("SLACK_SIGNING_SECRET")
	if err := c.check(); err != nil {
		return err
	}
	logger, err := newLogger(&syncWriter{w: a.stderr}, c.logLevel, c.logFormat)
	if err != nil {
		return err
	}
	return serve(ctx, c, logger)
}

// check reports a configuration that cannot work, before anything starts.
func (c *serveConfig) check() error {
	usage := func(format string, args ...any) error { return &exitError{exitUsage, fmt.Errorf(format, args...)} }
	if c.botToken == "" {
		return usage("SLACK_BOT_TOKEN is not set: the bot needs its xoxb- token to post answers (or run 'mixward console' for the local console)")
	}
	if c.httpAddr == "" && c.appToken == "" {
		return usage("nothing to serve: set SLACK_APP_TOKEN for Socket Mode, or give --http ADDR with SLACK_SIGNING_SECRET for the Events API")
	}
	if c.httpAddr != "" && c.signingSecret == "" {
		return usage("--http needs SLACK_SIGNING_SECRET: every request from Slack is checked against it")
	}
	if c.postRate <= 0 || c.postBurst < 1 {
		return usage("--post-rate must be above 0 and --post-burst at least 1")
	}
	if c.queueSize < 1 {
		return usage("--queue-size must be at least 1")
	}
	if c.workers < 1 || c.workers > 1024 {
		return usage("--workers must be from 1 to 1024")
	}
	if c.picWorkers < 0 || c.picWorkers > 16 {
		return usage("--picture-workers must be from 0 (no pictures) to 16")
	}
	if !strings.HasSuffix(c.apiURL, "/") {
		c.apiURL += "/"
	}
	return nil
}

// serve runs the bot until ctx ends, then drains.
func serve(ctx context.Context, c serveConfig, logger *slog.Logger) error {
	st, err := openSite(ctx, c.site)
	if err != nil {
		return err
	}
	defer st.db.Close()

	metrics := bot.NewMetrics()
	health := newHealth(st.db)
	opts := []slack.Option{slack.OptionAPIURL(c.apiURL)}
	if c.appToken != "" {
		opts = append(opts, slack.OptionAppLevelToken(c.appToken))
	}
	api := slack.New(c.botToken, opts...)

	sl := newSlack(c, st, api, logger, metrics, health)
	queue := sl.Queue
	defer func() {
		// On an early return (a listener that cannot bind): stop the
		// workers the resume below started; what they leave stays owed.
		ctx, cancel := context.WithTimeout(context.Background(), 5*time.Second)
		defer cancel()
		_ = sl.Close(ctx)
	}()

	// Answers owed by the process before this one go first, so that each
	// thread keeps its order.
	owed, err := sl.Resume(ctx)
	if err != nil {
		return err
	}
	if owed > 0 {
		logger.Info("answering messages owed from before the last stop", "messages", owed)
	}
	pruneInbox(ctx, st.db, logger)

	runCtx, stopRun := context.WithCancel(ctx)
	defer stopRun()
	errc := make(chan error, 4)
	var wg sync.WaitGroup

	admin, err := startAdmin(c, metrics, health, logger, &wg, errc)
	if err != nil {
		return err
	}
	events, err := startEvents(c, sl, health, logger, &wg, errc)
	if err != nil {
		return err
	}

	if c.appToken != "" {
		health.Expect("socket") // not ready until Socket Mode has connected
		wg.Go(func() {
			if err := sl.RunSocket(runCtx, socketmode.New(api)); err != nil {
				errc <- err
			}
		})
	}

	sched, err := startDigests(runCtx, c, st, sl, logger, &wg)
	if err != nil {
		return err
	}

	wg.Go(func() { keepInbox(runCtx, sl, st.db, sweepEvery(st.db.InboxLease()), logger) })

	// Who am I: not needed to answer, so the transports do not wait for it.
	wg.Go(func() { learnIdentity(runCtx, api, sl, logger) })

	health.SetReady(true)
	logger.Info("mixward serving", "engine", engine.Version, "data", shortHash(st.eng.Tables.Hash),
		"socket_mode", c.appToken != "", "http", c.httpAddr != "", "db", c.site.db)

	var runErr error
	select {
	case <-ctx.Done():
		logger.Info("shutting down: finishing queued answers", "queued", queue.Depth(), "drain_timeout", c.drainTimeout)
	case runErr = <-errc:
		logger.Error("stopping", "err", runErr)
	}
	health.SetReady(false)

	drain(ctx, c.drainTimeout, events, admin, sl, stopRun, &wg, sched, logger)
	if runErr != nil {
		return runErr
	}
	return nil
}

// drain stops a serving bot: intake first, then the queue within timeout
// (what is not posted stays owed in the inbox), then the rest.
func drain(ctx context.Context, timeout time.Duration, events, admin *http.Server, sl *bot.Slack, stopRun func(), wg *sync.WaitGroup, sched *store.Scheduler, logger *slog.Logger) {
	shutdownCtx, cancelShutdown := context.WithTimeout(context.WithoutCancel(ctx), timeout)
	defer cancelShutdown()
	if events != nil {
		_ = events.Shutdown(shutdownCtx)
	}
	stopRun()
	if err := sl.Close(shutdownCtx); err != nil {
		logger.Error("drain timed out; the answers not posted stay owed in the inbox and are posted at the next start",
			"err", err, "queued", sl.Queue.Depth())
	}
	if admin != nil {
		_ = admin.Shutdown(shutdownCtx)
	}
	wg.Wait()
	if sched != nil {
		sched.Stop() // Start has returned (wg), so its cron is set
	}
	logger.Info("mixward stopped")
}

// learnIdentity asks Slack who the bot is, to tell its own messages and
// mentions apart; without it the bot carries on.
func learnIdentity(ctx context.Context, api *slack.Client, sl *bot.Slack, logger *slog.Logger) {
	actx, cancel := context.WithTimeout(ctx, 10*time.Second)
	defer cancel()
	at, err := api.AuthTestContext(actx)
	if err != nil {
		logger.Warn("auth.test failed; carrying on without knowing the bot's user id", "err", err)
		return
	}
	sl.SetBotUser(at.UserID)
	logger.Info("slack identity", "user_id", at.UserID, "bot_id", at.BotID, "team", at.Team)
}

// startAdmin serves /healthz and /metrics on --admin-addr, unless it is off;
// the default address taken (another instance, a test) runs without them.
func startAdmin(c serveConfig, metrics *bot.Metrics, health *bot.Health, logger *slog.Logger, wg *sync.WaitGroup, errc chan<- error) (*http.Server, error) {
	if c.adminAddr == "" || c.adminAddr == "off" {
		return nil, nil
	}
	ln, err := net.Listen("tcp", c.adminAddr)
	switch {
	case err != nil && c.adminAddr == defaultAdminAddr:
		logger.Warn("admin endpoints off: default address in use; set --admin-addr", "addr", c.adminAddr, "err", err)
		return nil, nil
	case err != nil:
		return nil, fmt.Errorf("--admin-addr %s: %w", c.adminAddr, err)
	}
	admin := newAdminServer(bot.AdminHandler(metrics, health))
	logger.Info("admin listening", "addr", ln.Addr().String(), "paths", "/healthz /metrics")
	wg.Go(func() {
		if err := admin.Serve(ln); err != nil && !errors.Is(err, http.ErrServerClosed) {
			errc <- fmt.Errorf("admin server: %w", err)
		}
	})
	return admin, nil
}

// startEvents serves the Events API, slash commands and interactivity on
// --http, when it is set.
func startEvents(c serveConfig, sl *bot.Slack, health *bot.Health, logger *slog.Logger, wg *sync.WaitGroup, errc chan<- error) (*http.Server, error) {
	if c.httpAddr == "" {
		return nil, nil
	}
	ln, err := net.Listen("tcp", c.httpAddr)
	if err != nil {
		return nil, fmt.Errorf("--http %s: %w", c.httpAddr, err)
	}
	events := &http.Server{
		Handler:           sl.HTTPHandler(bot.NewVerifier(c.signingSecret, nil)),
		ReadHeaderTimeout: 10 * time.Second,
		ReadTimeout:       30 * time.Second,
		WriteTimeout:      30 * time.Second,
	}
	health.SetTransport("http", "listening")
	logger.Info("events API listening", "addr", ln.Addr().String(), "paths", "POST /slack/events, POST /slack/commands, POST /slack/interactive")
	wg.Go(func() {
		if err := events.Serve(ln); err != nil && !errors.Is(err, http.ErrServerClosed) {
			errc <- fmt.Errorf("events server: %w", err)
		}
	})
	return events, nil
}

// startDigests schedules the shift digests when a digest channel is set.
func startDigests(ctx context.Context, c serveConfig, st *site, sl *bot.Slack, logger *slog.Logger, wg *sync.WaitGroup) (*store.Scheduler, error) {
	if c.digestChannel == "" {
		logger.Info("no digest channel: scheduled digests are off (set MIXWARD_DIGEST_CHANNEL)")
		return nil, nil
	}
	sched, err := store.NewScheduler(st.db, c.site.shifts, st.loc, sl, nil)
	if err != nil {
		return nil, &exitError{exitUsage, err}
	}
	sched.Log = logger
	wg.Go(func() { _ = sched.Start(ctx) })
	logger.Info("digests scheduled", "channel", c.digestChannel, "shifts", c.site.shifts, "zone", st.loc.String(), "next", sched.Next())
	return sched, nil
}

// newSlack wires the bot, its worker pool, poster, pictures and inbox for
// `mixward serve`.
func newSlack(c serveConfig, st *site, api *slack.Client, logger *slog.Logger, metrics *bot.Metrics, health *bot.Health) *bot.Slack {
	access := &bot.Access{
		Supervisors: bot.ParseIDList(c.supervisors),
		Reviewers:   bot.ParseIDList(c.reviewers),
		Groups:      bot.SlackGroups{API: api},
		Log:         logger,
	}
	queue := bot.NewPool(c.workers, c.queueSize, metrics.QueueDepth)
	queue.OnPanic = func(key string, v any) { logger.Error("answer failed with a panic", "thread", key, "panic", v) }
	health.Depth = queue.Depth
	poster := &bot.Poster{API: api, Rate: rate.Limit(c.postRate), Burst: c.postBurst, Metrics: metrics, Log: logger}
	var pics *bot.Pictures
	if c.picWorkers > 0 {
		pics = &bot.Pictures{Plot: plotterFor(st.eng), Poster: poster, Workers: c.picWorkers, Logger: logger, Metrics: metrics}
	}
	return &bot.Slack{
		Bot:           st.newBot(logger, metrics, access),
		Poster:        poster,
		Queue:         queue,
		Pictures:      pics,
		Journal:       st.db,
		DigestChannel: c.digestChannel,
		Views:         api,
		Names:         &bot.Names{API: api, Note: st.db, Log: logger},
		Health:        health,
		Logger:        logger,
		Metrics:       metrics,
	}
}

// keepInbox prunes the inbox and queues again the answers still owed
// (Slack was down past the poster's retries, or another replica stopped
// while answering) every interval, until ctx ends.
func keepInbox(ctx context.Context, sl *bot.Slack, db inboxPruner, every time.Duration, logger *slog.Logger) {
	t := time.NewTicker(every)
	defer t.Stop()
	for {
		select {
		case <-ctx.Done():
			return
		case <-t.C:
			pruneInbox(ctx, db, logger)
			if n, err := sl.Resume(ctx); err != nil && ctx.Err() == nil {
				logger.Warn("owed answers not queued again", "err", err)
			} else if n > 0 {
				logger.Info("answering messages still owed", "messages", n)
			}
		}
	}
}

// newAdminServer serves /healthz and /metrics with timeouts, so that slow
// or idle clients cannot hold connections open.
func newAdminServer(h http.Handler) *http.Server {
	return &http.Server{
		Handler:           h,
		ReadHeaderTimeout: 5 * time.Second,
		ReadTimeout:       10 * time.Second,
		WriteTimeout:      30 * time.Second,
		IdleTimeout:       60 * time.Second,
		MaxHeaderBytes:    16 << 10,
	}
}

// pruneInbox (at start and hourly) drops inbox entries answered more than
// a day ago: Slack redelivers within the hour, so they are no longer
// needed to tell a redelivery from a new message.
func pruneInbox(ctx context.Context, db inboxPruner, logger *slog.Logger) {
	n, err := db.PruneInbox(ctx, time.Now().Add(-24*time.Hour))
	if err != nil {
		logger.Warn("inbox not pruned", "err", err)
	} else if n > 0 {
		logger.Info("inbox pruned", "entries", n)
	}
}

func shortHash(h string) string {
	if len(h) > 12 {
		return h[:12]
	}
	return h
}

// sweepEvery is how often a serving process looks for owed answers: hourly,
// or with inbox leases (several replicas) once a lease, so that the answers
// a stopped replica held are taken over soon after its lease runs out.
func sweepEvery(lease time.Duration) time.Duration {
	if lease > 0 && lease < time.Hour {
		return lease
	}
	return time.Hour
}
