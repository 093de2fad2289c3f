package bot_test

import (
	"context"
	"crypto/sha256"
	"encoding/json"
	"errors"
	"fmt"
	"net/http/httptest"
	"strings"
	"testing"
	"time"

	"mixward/bot"
	"mixward/engine"
	"mixward/store"
)

var _ bot.Journal = (*store.DB)(nil)

// withJournal gives the env's Slack the store as its inbox.
func withJournal(e *env) { e.sl.Journal = e.db }

// threadPosts counts the posts in a thread.
func (e *env) threadPosts(thread string) int {
	n := 0
	for _, p := range e.slack.postsNow() {
		if p.ThreadTS == thread {
			n++
		}
	}
	return n
}

func (e *env) inboxState(eventID string) string {
	e.t.Helper()
	ent, err := e.db.InboxEntryFor(context.Background(), eventID)
	if err != nil {
		e.t.Fatalf("inbox entry %s: %v", eventID, err)
	}
	return ent.State
}

// restart is a second process on the same database and fake Slack: a new
// Slack with its own queue, journal writer and memory of events.
func (e *env) restart(j bot.Journal) *bot.Slack {
	s2 := &bot.Slack{Bot: e.bot, Poster: e.sl.Poster, Queue: bot.NewQueue(64, nil), Journal: j, Now: e.clock.Now,
		Logger: e.sl.Logger, Metrics: e.sl.Metrics}
	e.t.Cleanup(func() { s2.Close(context.Background()) })
	return s2
}

// TestInboxOwedAnswerPostedAfterRestart: Slack is down for the whole life
// of the first process, which took (acknowledged) the message; the next
// process finds it owed in the inbox and answers it, once.
func TestInboxOwedAnswerPostedAfterRestart(t *testing.T) {
	e := newEnv(t, withJournal)
	e.slack.fault = func(method string, n int) *fakeFault {
		if method == "chat.postMessage" {
			return &fakeFault{Status: 503}
		}
		return nil
	}
	ev, _ := json.Marshal(mentionPayload("EvOwed", "CPLANT", "UOP", "1700000200.000100", "<@UBOT> mix 1 L NaOCl 12.5 % + 1 L HCl 10 %"))
	h := e.sl.HTTPHandler(bot.NewVerifier(e.secret, e.clock.Now))
	if w := postEvents(t, h, signedRequest(t, "POST", "/slack/events", "application/json", ev, e.secret, e.clock.Now())); w.Code != 200 {
		t.Fatalf("event answered %d", w.Code)
	}
	if err := e.sl.Close(context.Background()); err != nil {
		t.Fatal(err)
	}
	if st := e.inboxState("EvOwed"); st != store.InboxPending {
		t.Fatalf("after an outage the inbox says %q, want pending", st)
	}

	e.slack.fault = nil
	s2 := e.restart(e.db)
	n, err := s2.Resume(context.Background())
	if err != nil || n != 1 {
		t.Fatalf("Resume = %d, %v; want 1 owed message", n, err)
	}
	if err := s2.Close(context.Background()); err != nil {
		t.Fatal(err)
	}
	if got := e.threadPosts("1700000200.000100"); got != 1 {
		t.Errorf("%d answers in the thread, want 1", got)
	}
	if st := e.inboxState("EvOwed"); st != store.InboxPosted {
		t.Errorf("inbox says %q after the resumed answer, want posted", st)
	}
	// A redelivery to a third process is not answered again.
	s3 := e.restart(e.db)
	w := postEvents(t, s3.HTTPHandler(bot.NewVerifier(e.secret, e.clock.Now)), signedRequest(t, "POST", "/slack/events", "application/json", ev, e.secret, e.clock.Now()))
	s3.Close(context.Background())
	if w.Code != 200 || e.threadPosts("1700000200.000100") != 1 {
		t.Errorf("redelivery after restarts: status %d, %d answers; want 200 and still 1", w.Code, e.threadPosts("1700000200.000100"))
	}
	if qs := e.queries(); len(qs) != 1 {
		t.Errorf("%d queries logged, want 1", len(qs))
	}
}

// forgetful is a journal whose outcome records never reach the disk, as
// when the process is killed right after posting.
type forgetful struct{ *store.DB }

func (forgetful) FinishMessages(ctx context.Context, outs []store.Outcome) error {
	return errors.New("killed before the outcome was written")
}

// TestInboxPostedButUnrecordedNotPostedTwice: the first process posted the
// answer (both parts) but stopped before recording it; the next one looks
// in the thread, finds the parts by their metadata, and posts nothing.
func TestInboxPostedButUnrecordedNotPostedTwice(t *testing.T) {
	e := newEnv(t)
	e.sl.Journal = forgetful{e.db}
	ev, _ := json.Marshal(mentionPayload("EvDoubt", "CPLANT", "UOP", "1700000300.000100", "<@UBOT> mix 2 L NaOCl 12.5 % + 1 L HCl 10 %"))
	h := e.sl.HTTPHandler(bot.NewVerifier(e.secret, e.clock.Now))
	if w := postEvents(t, h, signedRequest(t, "POST", "/slack/events", "application/json", ev, e.secret, e.clock.Now())); w.Code != 200 {
		t.Fatalf("event answered %d", w.Code)
	}
	e.slack.waitPosts(1)
	ctx, cancel := context.WithTimeout(context.Background(), 50*time.Millisecond)
	e.sl.Close(ctx)
	cancel()
	if st := e.inboxState("EvDoubt"); st != store.InboxPending {
		t.Fatalf("inbox says %q, want pending (the outcome was lost)", st)
	}
	before := e.threadPosts("1700000300.000100")

	s2 := e.restart(e.db)
	if n, err := s2.Resume(context.Background()); err != nil || n != 1 {
		t.Fatalf("Resume = %d, %v", n, err)
	}
	s2.Close(context.Background())
	if got := e.threadPosts("1700000300.000100"); got != before {
		t.Errorf("%d posts in the thread after the restart, want the %d from before", got, before)
	}
	if e.slack.callCount("conversations.replies") == 0 {
		t.Error("the thread was not looked at before deciding")
	}
	if st := e.inboxState("EvDoubt"); st != store.InboxPosted {
		t.Errorf("inbox says %q, want posted", st)
	}
}

// TestSlashWithoutTriggerReplayedOnce: the same slash command without a
// trigger_id, replayed three times within the window, is answered once;
// after the window the same words are a new command.
func TestSlashWithoutTriggerReplayedOnce(t *testing.T) {
	e := newEnv(t, withJournal)
	h := e.sl.HTTPHandler(bot.NewVerifier(e.secret, e.clock.Now))
	body := []byte(slashForm("CPLANT", "UOP", "mix 3 L NaOCl 12.5 % + 1 L HCl 10 %", "").Encode())
	for i, wait := range []time.Duration{0, 2 * time.Minute, 4 * time.Minute} {
		e.clock.Sleep(context.Background(), wait)
		w := postEvents(t, h, signedRequest(t, "POST", "/slack/commands", "application/x-www-form-urlencoded", body, e.secret, e.clock.Now()))
		if w.Code != 200 {
			t.Fatalf("delivery %d answered %d", i+1, w.Code)
		}
	}
	e.drain()
	answers := func() int {
		n := 0
		for _, p := range e.slack.postsNow() {
			if strings.Contains(p.Text, "Request: mix 3 L NaOCl") {
				n++
			}
		}
		return n
	}
	if got := answers(); got != 1 {
		t.Fatalf("%d answers to a command sent three times, want 1", got)
	}
	// 11 minutes after the last: a new command.
	e.clock.Sleep(context.Background(), 11*time.Minute)
	postEvents(t, h, signedRequest(t, "POST", "/slack/commands", "application/x-www-form-urlencoded", body, e.secret, e.clock.Now()))
	e.slack.waitPosts(4)
	e.drain()
	if got := answers(); got != 2 {
		t.Errorf("%d answers after the window, want 2", got)
	}
}

// TestOversizedRequest: a message over 4,000 bytes is logged cut to the
// limit with its length and hash, and answered with the limit, not echoed.
func TestOversizedRequest(t *testing.T) {
	e := newEnv(t)
	text := "mix 1 L NaOCl 12.5 % + " + strings.Repeat("1 L HCl 10 % + ", 60000) + "1 L water"
	r := e.bot.Answer(context.Background(), bot.Incoming{Transport: "http", EventID: "EvBig", Channel: "CPLANT", UserID: "UOP", Text: text})
	if !strings.Contains(r.Text, fmt.Sprintf("%d bytes", len(text))) || !strings.Contains(r.Text, "4000 bytes") || len(r.Text) > 1000 {
		t.Errorf("answer (%d bytes) = %q; want the length and the 4000-byte limit, short", len(r.Text), r.Text[:min(len(r.Text), 300)])
	}
	qs := e.queries()
	if len(qs) != 1 {
		t.Fatalf("%d queries logged, want 1", len(qs))
	}
	q := qs[0]
	sum := fmt.Sprintf("%x", sha256.Sum256([]byte(text)))
	if len(q.Request) != bot.MaxRequestBytes || !strings.HasPrefix(text, q.Request) || q.Verdict != store.VerdictError ||
		!strings.Contains(q.Error, fmt.Sprint(len(text))) || !strings.Contains(q.Error, sum) {
		t.Errorf("logged request of %d bytes, verdict %q, error %q; want the first %d bytes, the length %d and SHA-256 %s",
			len(q.Request), q.Verdict, q.Error, bot.MaxRequestBytes, len(text), sum)
	}
	// Cut on a character boundary.
	r2 := e.bot.Answer(context.Background(), bot.Incoming{Channel: "console", UserID: "u", Text: strings.Repeat("é", 2500)})
	if qs := e.queries(); len(qs) != 2 || len(qs[1].Request) != 4000 || !strings.HasSuffix(qs[1].Request, "é") || r2.QueryID != qs[1].ID {
		t.Errorf("multi-byte request logged as %d bytes", len(qs[len(qs)-1].Request))
	}
	// At the limit it is read as usual.
	ok := e.bot.Answer(context.Background(), bot.Incoming{Channel: "console", UserID: "u", Text: "mix 1 L NaOCl 12.5 % + 1 L HCl 10 %" + strings.Repeat(" ", 0)})
	if ok.Result == nil {
		t.Errorf("a short request was not answered: %q", ok.Text)
	}
}

// TestConsoleSurvivesLongLine: a line over 1 MiB is answered with the limit
// and the console reads the next line.
func TestConsoleSurvivesLongLine(t *testing.T) {
	e := newEnv(t)
	long := strings.Repeat("x", bot.MaxConsoleLine+12345)
	in := strings.NewReader(long + "\r\nhelp\n")
	var out strings.Builder
	c := &bot.Console{Bot: e.bot, In: in, Out: &syncStringWriter{b: &out}}
	if err := c.Run(context.Background()); err != nil {
		t.Fatalf("Run = %v, want the console to carry on", err)
	}
	text := out.String()
	if !strings.Contains(text, fmt.Sprintf("That message is %d bytes long", len(long))) || !strings.Contains(text, "mix request") {
		t.Errorf("console output lacks the limit answer and then help:\n%.600s", text)
	}
	qs := e.queries()
	if len(qs) != 1 || !strings.Contains(qs[0].Error, fmt.Sprintf("%x", sha256.Sum256([]byte(long)))) {
		t.Errorf("logged %d queries; the long line's hash is not in its record", len(qs))
	}
}

type syncStringWriter struct{ b *strings.Builder }

func (w *syncStringWriter) Write(p []byte) (int, error) { return w.b.Write(p) }

// TestHealthNeedsEveryTransport: not ready until Socket Mode has connected,
// and the answer says which transport is down.
func TestHealthNeedsEveryTransport(t *testing.T) {
	h := &bot.Health{}
	h.SetReady(true)
	h.SetTransport("http", "listening")
	h.Expect("socket")
	check := func(wantCode int, wantDown string) {
		t.Helper()
		w := httptest.NewRecorder()
		h.ServeHTTP(w, httptest.NewRequest("GET", "/healthz", nil))
		var body struct {
			Ready bool     `json:"ready"`
			Down  []string `json:"down"`
		}
		if err := json.Unmarshal(w.Body.Bytes(), &body); err != nil {
			t.Fatal(err)
		}
		if w.Code != wantCode || strings.Join(body.Down, ",") != wantDown || body.Ready != (wantCode == 200) {
			t.Errorf("/healthz = %d %s; want %d with down %q", w.Code, w.Body.String(), wantCode, wantDown)
		}
	}
	check(503, "socket")
	h.SetSocket("connecting")
	check(503, "socket")
	h.SetSocket("connected")
	check(200, "")
	h.SetSocket("reconnecting")
	check(503, "socket")
	h.SetSocket("connected")
	h.SetReady(false) // draining
	check(503, "")
}

// TestInboxFailedAnswerTriedAgainOnRedelivery: a post Slack refused for
// good (the bot was not in the channel) is tried again when Slack
// redelivers the event, and then posted once.
func TestInboxFailedAnswerTriedAgainOnRedelivery(t *testing.T) {
	e := newEnv(t, withJournal)
	refusing := true
	e.slack.fault = func(method string, n int) *fakeFault {
		if method == "chat.postMessage" && refusing {
			return &fakeFault{Error: "not_in_channel"}
		}
		return nil
	}
	ev, _ := json.Marshal(mentionPayload("EvFail", "CPLANT", "UOP", "1700000400.000100", "<@UBOT> mix 4 L NaOCl 12.5 % + 1 L HCl 10 %"))
	send := func(s *bot.Slack) {
		t.Helper()
		w := postEvents(t, s.HTTPHandler(bot.NewVerifier(e.secret, e.clock.Now)), signedRequest(t, "POST", "/slack/events", "application/json", ev, e.secret, e.clock.Now()))
		if w.Code != 200 {
			t.Fatalf("delivery answered %d", w.Code)
		}
		if err := s.Close(context.Background()); err != nil {
			t.Fatal(err)
		}
	}
	send(e.sl)
	if st := e.inboxState("EvFail"); st != store.InboxFailed {
		t.Fatalf("inbox says %q after a refused post, want failed", st)
	}
	refusing = false
	send(e.restart(e.db))
	send(e.restart(e.db))
	if got := e.threadPosts("1700000400.000100"); got != 1 {
		t.Errorf("%d answers after two redeliveries, want 1", got)
	}
	if st := e.inboxState("EvFail"); st != store.InboxPosted {
		t.Errorf("inbox says %q, want posted", st)
	}
}

// TestRecordCutsOversizedRequests: every front end's log row (mixward ask
// goes through Record) holds at most MaxRequestBytes of a request.
func TestRecordCutsOversizedRequests(t *testing.T) {
	e := newEnv(t)
	text := "mix " + strings.Repeat("1 L HCl 10 % + ", 500) + "1 L water"
	_, id, _, err := e.bot.Record(context.Background(), bot.Incoming{Transport: "cli", Channel: "cli", UserID: "u"}, text)
	if err != nil {
		t.Fatal(err)
	}
	q, err := e.db.Get(context.Background(), id)
	if err != nil {
		t.Fatal(err)
	}
	if len(q.Request) != bot.MaxRequestBytes || !strings.Contains(q.Error, fmt.Sprintf("request of %d bytes", len(text))) ||
		!strings.Contains(q.Error, fmt.Sprintf("%x", sha256.Sum256([]byte(text)))) {
		t.Errorf("logged %d bytes with error %q", len(q.Request), q.Error)
	}
}

// TestInboxWrittenBeforeAcknowledged: by the time Slack has its
// acknowledgement (a Socket Mode ack, an HTTP 200) the message is in the
// inbox, so a process killed right after still owes its answer.
func TestInboxWrittenBeforeAcknowledged(t *testing.T) {
	e := newEnv(t, withJournal)
	e.runSocket()
	e.slack.waitConn(1)
	e.slack.send(mentionEnvelope("env-j", "EvSock", "CPLANT", "UOP", "1700000500.000100", "<@UBOT> mix 5 L NaOCl 12.5 % + 1 L HCl 10 %", 0))
	e.slack.waitAck("env-j")
	if _, err := e.db.InboxEntryFor(context.Background(), "EvSock"); err != nil {
		t.Errorf("Socket Mode: acknowledged, but not in the inbox: %v", err)
	}
	ev, _ := json.Marshal(mentionPayload("EvHTTP", "CPLANT", "UOP", "1700000500.000200", "<@UBOT> mix 6 L NaOCl 12.5 % + 1 L HCl 10 %"))
	h := e.sl.HTTPHandler(bot.NewVerifier(e.secret, e.clock.Now))
	if w := postEvents(t, h, signedRequest(t, "POST", "/slack/events", "application/json", ev, e.secret, e.clock.Now())); w.Code != 200 {
		t.Fatalf("event answered %d", w.Code)
	}
	if _, err := e.db.InboxEntryFor(context.Background(), "EvHTTP"); err != nil {
		t.Errorf("HTTP: answered 200, but not in the inbox: %v", err)
	}
	e.slack.waitPosts(2)
	e.drain()
}

// TestRequestLimitMatchesEngine: the bot's limit is the engine's, so a
// request the bot takes is never refused by the engine for its length.
func TestRequestLimitMatchesEngine(t *testing.T) {
	_, err := engine.ParseRequest(strings.Repeat("x", bot.MaxRequestBytes+1), nil, nil)
	var pe *engine.ParseError
	if !errors.As(err, &pe) || pe.Code != "too-long" {
		t.Errorf("engine on %d bytes: %v; want its too-long error", bot.MaxRequestBytes+1, err)
	}
}

// TestInboxOwedAnswerRetriedLaterInTheSameProcess: after a Slack outage
// longer than the poster's retries, a later Resume (serve calls it hourly)
// posts the answer, once.
func TestInboxOwedAnswerRetriedLaterInTheSameProcess(t *testing.T) {
	e := newEnv(t, withJournal)
	down := true
	e.slack.fault = func(method string, n int) *fakeFault {
		if method == "chat.postMessage" && down {
			return &fakeFault{Status: 502}
		}
		return nil
	}
	ev, _ := json.Marshal(mentionPayload("EvLater", "CPLANT", "UOP", "1700000600.000100", "<@UBOT> mix 7 L NaOCl 12.5 % + 1 L HCl 10 %"))
	h := e.sl.HTTPHandler(bot.NewVerifier(e.secret, e.clock.Now))
	if w := postEvents(t, h, signedRequest(t, "POST", "/slack/events", "application/json", ev, e.secret, e.clock.Now())); w.Code != 200 {
		t.Fatalf("event answered %d", w.Code)
	}
	e.drain()
	if n, _ := e.sl.Resume(context.Background()); n != 0 {
		t.Errorf("Resume right away queued %d; the event is still this process's own", n)
	}
	down = false
	e.clock.Sleep(context.Background(), 61*time.Minute)
	deadline := time.Now().Add(10 * time.Second)
	for {
		ent, err := e.db.InboxEntryFor(context.Background(), "EvLater")
		if err == nil && ent.Attempts == 1 && ent.State == store.InboxPending {
			break
		}
		if time.Now().After(deadline) {
			t.Fatal("outcome of the failed post never recorded")
		}
		time.Sleep(time.Millisecond)
	}
	if n, err := e.sl.Resume(context.Background()); n != 1 || err != nil {
		t.Fatalf("Resume after an hour = %d, %v; want the owed answer", n, err)
	}
	e.slack.waitPosts(1)
	e.drain()
	if got := e.threadPosts("1700000600.000100"); got != 1 {
		t.Errorf("%d answers, want 1", got)
	}
}

// TestHealthReportsDatabase: /healthz names the database and is 503 with
// "database" down while it does not answer.
func TestHealthReportsDatabase(t *testing.T) {
	var dbErr error
	h := &bot.Health{DatabaseKind: "postgres", Database: func(context.Context) error { return dbErr }}
	h.SetReady(true)
	h.SetTransport("http", "listening")
	get := func() (int, map[string]any) {
		w := httptest.NewRecorder()
		h.ServeHTTP(w, httptest.NewRequest("GET", "/healthz", nil))
		var body map[string]any
		if err := json.Unmarshal(w.Body.Bytes(), &body); err != nil {
			t.Fatal(err)
		}
		return w.Code, body
	}
	code, body := get()
	db, _ := body["database"].(map[string]any)
	if code != 200 || db["kind"] != "postgres" || db["ok"] != true {
		t.Errorf("/healthz with the database up = %d %v", code, body)
	}
	dbErr = errors.New("connection refused")
	code, body = get()
	db, _ = body["database"].(map[string]any)
	if code != 503 || body["ready"] != false || db["ok"] != false || db["error"] != "connection refused" || fmt.Sprint(body["down"]) != "[database]" {
		t.Errorf("/healthz with the database down = %d %v", code, body)
	}
}
