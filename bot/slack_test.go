package bot_test

import (
	"context"
	"encoding/json"
	"fmt"
	"net/http"
	"net/http/httptest"
	"slices"
	"sort"
	"strings"
	"sync"
	"testing"
	"time"

	"mixward/bot"
	"mixward/store"
)

func TestMentionGetsShortAnswerThenDetailsOnDemand(t *testing.T) {
	e := newEnv(t)
	e.sl.BotUserID = "UBOT"
	e.runSocket()
	e.slack.waitConn(1)

	e.slack.send(mentionEnvelope("env-1", "Ev1", "CPLANT", "UOP", "1700000100.000100", "<@UBOT> mix 200 L NaOCl 12.5 % + 50 L HCl 10 %", 0))
	e.slack.waitAck("env-1")
	posts := e.slack.waitPosts(1)
	e.drain()

	p := posts[0]
	if p.Channel != "CPLANT" || p.ThreadTS != "1700000100.000100" {
		t.Errorf("reply went to channel %q thread %q, want CPLANT thread 1700000100.000100", p.Channel, p.ThreadTS)
	}
	if len(p.Blocks) == 0 || p.Blocks[0]["type"] != "header" || len(p.Blocks) > bot.ShortMaxBlocks {
		t.Fatalf("short answer: %d blocks, first %v; want a header first and at most %d", len(p.Blocks), p.Blocks[0], bot.ShortMaxBlocks)
	}
	text := p.blockText()
	for _, want := range []string{"SPONTANEOUS", "DANGER", "chlorine gas is released", "HOCl + H+ + Cl- → Cl2(g) + H2O",
		"Query #1", "Details", "E–pH picture", "Pour order", "not a permit"} {
		if !strings.Contains(text, want) {
			t.Errorf("short answer lacks %q\n%s", want, text)
		}
	}
	for _, notYet := range []string{"Species present", "Half-reactions"} {
		if strings.Contains(text, notYet) {
			t.Errorf("short answer already holds %q, which belongs under Details", notYet)
		}
	}
	if strings.Contains(text, "<@UBOT>") {
		t.Errorf("the mention was passed on as part of the request:\n%s", text)
	}
	// No picture on the answer path.
	time.Sleep(50 * time.Millisecond)
	if ups := e.slack.uploadsNow(); len(ups) != 0 {
		t.Errorf("a picture was uploaded with the answer: %+v", ups)
	}

	// Details: the full answer in the same thread.
	e.slack.send(interactiveEnvelope("env-d", buttonPayload(bot.ActionDetails, "1", "CPLANT", p.ThreadTS, p.TS, "UOP2", "1700000200.1")))
	if a := e.slack.waitAck("env-d"); len(a.Payload) > 0 && string(a.Payload) != "null" {
		t.Errorf("button ack carries %s, want nothing", a.Payload)
	}
	posts = e.slack.waitPosts(2)
	e.drain()
	full := posts[1]
	if full.ThreadTS != p.ThreadTS {
		t.Errorf("details went to thread %q, want %q", full.ThreadTS, p.ThreadTS)
	}
	ftext := full.blockText()
	for _, want := range []string{"Species present", "HOCl(aq)", "Half-reactions", "2 Cl- → Cl2(g) + 2 e-", "Net ionic equation",
		"E°cell = +0.270 V", "Gas: Cl2(g)", "Heat released", "Hazards", "Caveats", "rates are not predicted", "not a permit"} {
		if !strings.Contains(ftext, want) {
			t.Errorf("details lack %q\n%s", want, ftext)
		}
	}
	if d, w := strings.Index(ftext, "DANGER"), strings.Index(ftext, "*warning*"); d < 0 || w < 0 || d > w {
		t.Errorf("danger hazard not listed before the warning:\n%s", ftext)
	}

	// E–pH picture: one upload into the thread, drawn on request.
	e.slack.send(interactiveEnvelope("env-p", buttonPayload(bot.ActionPicture, "1", "CPLANT", p.ThreadTS, p.TS, "UOP", "1700000201.1")))
	e.slack.waitAck("env-p")
	ups := e.slack.waitUploads(1)
	e.drain()
	if len(ups) != 1 || ups[0].Channel != "CPLANT" || ups[0].ThreadTS != p.ThreadTS {
		t.Errorf("uploads = %+v, want one E–pH picture in the thread", ups)
	}
	// The same press delivered again is answered once.
	e.slack.send(interactiveEnvelope("env-p2", buttonPayload(bot.ActionPicture, "1", "CPLANT", p.ThreadTS, p.TS, "UOP", "1700000201.1")))
	e.slack.waitAck("env-p2")
	e.drain()

	q := e.queries()
	if len(q) != 1 || q[0].EventID != "Ev1" || q[0].UserID != "UOP" || q[0].Verdict != "spontaneous" {
		t.Fatalf("logged queries = %+v, want the one request", q)
	}
	ps, err := e.db.Presses(context.Background(), q[0].ID)
	if err != nil || len(ps) != 2 || ps[0].Action != "details" || ps[0].UserID != "UOP2" || ps[1].Action != "picture" || ps[0].Transport != "socket" {
		t.Errorf("presses = %+v, %v; want details by UOP2 then picture by UOP, over socket", ps, err)
	}
	time.Sleep(50 * time.Millisecond)
	if n := len(e.slack.uploadsNow()); n != 1 {
		t.Errorf("%d uploads after the press was delivered twice, want 1", n)
	}
	ds, err := e.db.Deliveries(context.Background(), q[0].ID)
	if err != nil || len(ds) != 1 || !ds[0].OK || !strings.Contains(ds[0].Detail, "posted in CPLANT thread 1700000100.000100") {
		t.Errorf("deliveries = %+v, %v; want one ok in the thread", ds, err)
	}
}

func TestSlashCommandOverSocket(t *testing.T) {
	e := newEnv(t)
	e.runSocket()
	e.slack.waitConn(1)
	payload, _ := json.Marshal(map[string]string{
		"channel_id": "CPLANT", "user_id": "UOP", "user_name": "op", "command": "/mixward",
		"text": "mix 10 L NaOCl 12.5 % + 2 L HCl 10 %", "trigger_id": "trig-1", "response_url": "https://hooks.example.invalid/1",
	})
	e.slack.send(fmt.Sprintf(`{"type":"slash_commands","envelope_id":"env-s","accepts_response_payload":true,"payload":%s}`, payload))
	ack := e.slack.waitAck("env-s")
	if !strings.Contains(string(ack.Payload), `"ephemeral"`) {
		t.Errorf("slash command ack payload = %s, want an ephemeral note", ack.Payload)
	}
	posts := e.slack.waitPosts(2)
	e.drain()
	anchor, answer := posts[0], posts[1]
	if anchor.ThreadTS != "" || !strings.Contains(anchor.Text, "<@UOP> asked") {
		t.Errorf("first post = %+v, want a top-level request message", anchor)
	}
	if answer.ThreadTS != anchor.TS || !strings.Contains(answer.blockText(), "SPONTANEOUS") {
		t.Errorf("answer thread %q (want %q), text %q", answer.ThreadTS, anchor.TS, answer.blockText())
	}
	if qs := e.queries(); len(qs) != 1 || qs[0].EventID != "cmd:trig-1" || qs[0].UserName != "op" {
		t.Errorf("queries = %+v", qs)
	}
}

func postEvents(t *testing.T, h http.Handler, r *http.Request) *httptest.ResponseRecorder {
	t.Helper()
	w := httptest.NewRecorder()
	h.ServeHTTP(w, r)
	return w
}

func TestSlashCommandOverHTTP(t *testing.T) {
	e := newEnv(t)
	h := e.sl.HTTPHandler(bot.NewVerifier(e.secret, e.clock.Now))
	body := []byte(slashForm("CPLANT", "UOP", "mix 10 L NaOCl 12.5 % + 2 L HCl 10 %", "trig-9").Encode())
	w := postEvents(t, h, signedRequest(t, "POST", "/slack/commands", "application/x-www-form-urlencoded", body, e.secret, e.clock.Now()))
	if w.Code != 200 || !strings.Contains(w.Body.String(), "ephemeral") {
		t.Fatalf("slash command answered %d %q", w.Code, w.Body.String())
	}
	posts := e.slack.waitPosts(2)
	e.drain()
	if posts[1].ThreadTS != posts[0].TS || !strings.Contains(posts[1].Text, "Verdict: SPONTANEOUS") {
		t.Errorf("answer %+v is not in the thread of %s", posts[1], posts[0].TS)
	}
	if qs := e.queries(); len(qs) != 1 || qs[0].Channel != "CPLANT" {
		t.Errorf("queries = %+v", qs)
	}
}

func TestURLVerification(t *testing.T) {
	e := newEnv(t)
	h := e.sl.HTTPHandler(bot.NewVerifier(e.secret, e.clock.Now))
	body := []byte(`{"token":"x","challenge":"3eZbrw1aBm2rZgRNFdxV2595E9CY3gmdALWMmHkvFXO7tYXAYM8P","type":"url_verification"}`)
	w := postEvents(t, h, signedRequest(t, "POST", "/slack/events", "application/json", body, e.secret, e.clock.Now()))
	if w.Code != 200 || !strings.Contains(w.Body.String(), "3eZbrw1aBm2rZgRNFdxV2595E9CY3gmdALWMmHkvFXO7tYXAYM8P") {
		t.Errorf("url_verification answered %d %q", w.Code, w.Body.String())
	}
}

func TestUnverifiedRequestsAreRefusedAndNotLogged(t *testing.T) {
	e := newEnv(t)
	h := e.sl.HTTPHandler(bot.NewVerifier(e.secret, e.clock.Now))
	ev, _ := json.Marshal(mentionPayload("EvX", "CPLANT", "UOP", "1700000100.000200", "<@UBOT> mix 1 L NaOCl 12.5 % + 1 L HCl 10 %"))
	cmd := []byte(slashForm("CPLANT", "UOP", "mix 1 L NaOCl 12.5 % + 1 L HCl 10 %", "t").Encode())
	now := e.clock.Now()
	cases := []struct {
		name string
		req  func() *http.Request
	}{
		{"unsigned event", func() *http.Request {
			r := httptest.NewRequest("POST", "/slack/events", strings.NewReader(string(ev)))
			return r
		}},
		{"forged event", func() *http.Request {
			return signedRequest(t, "POST", "/slack/events", "application/json", ev, "not-the-secret", now)
		}},
		{"stale event", func() *http.Request {
			return signedRequest(t, "POST", "/slack/events", "application/json", ev, e.secret, now.Add(-6*time.Minute))
		}},
		{"future event", func() *http.Request {
			return signedRequest(t, "POST", "/slack/events", "application/json", ev, e.secret, now.Add(6*time.Minute))
		}},
		{"tampered body", func() *http.Request {
			r := signedRequest(t, "POST", "/slack/events", "application/json", ev, e.secret, now)
			r.Body = httptestBody(strings.Replace(string(ev), "UOP", "UEVIL", 1))
			return r
		}},
		{"unsigned url_verification", func() *http.Request {
			return httptest.NewRequest("POST", "/slack/events", strings.NewReader(`{"type":"url_verification","challenge":"c"}`))
		}},
		{"forged command", func() *http.Request {
			return signedRequest(t, "POST", "/slack/commands", "application/x-www-form-urlencoded", cmd, "guess", now)
		}},
		{"stale command", func() *http.Request {
			return signedRequest(t, "POST", "/slack/commands", "application/x-www-form-urlencoded", cmd, e.secret, now.Add(-10*time.Minute))
		}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			w := postEvents(t, h, tc.req())
			if w.Code != http.StatusUnauthorized {
				t.Errorf("got %d %q, want 401", w.Code, w.Body.String())
			}
		})
	}
	e.drain()
	if qs := e.queries(); len(qs) != 0 {
		t.Errorf("%d queries logged from unverified requests", len(qs))
	}
	if n := len(e.slack.postsNow()); n != 0 {
		t.Errorf("%d messages posted for unverified requests", n)
	}
	// The same event, correctly signed, is taken.
	w := postEvents(t, h, signedRequest(t, "POST", "/slack/events", "application/json", ev, e.secret, now))
	if w.Code != 200 {
		t.Fatalf("signed event answered %d", w.Code)
	}
	e.slack.waitPosts(1)
	e.drain()
	if qs := e.queries(); len(qs) != 1 {
		t.Errorf("%d queries logged for the signed event, want 1", len(qs))
	}
}

func httptestBody(s string) *bodyCloser { return &bodyCloser{strings.NewReader(s)} }

type bodyCloser struct{ *strings.Reader }

func (bodyCloser) Close() error { return nil }

func TestDuplicateDeliveryAnsweredAndLoggedOnce(t *testing.T) {
	e := newEnv(t)
	h := e.sl.HTTPHandler(bot.NewVerifier(e.secret, e.clock.Now))
	ev, _ := json.Marshal(mentionPayload("EvDup", "CPLANT", "UOP", "1700000100.000300", "<@UBOT> mix 1 L NaOCl 12.5 % + 1 L HCl 10 %"))
	for retry := 0; retry < 3; retry++ {
		r := signedRequest(t, "POST", "/slack/events", "application/json", ev, e.secret, e.clock.Now())
		if retry > 0 {
			r.Header.Set("X-Slack-Retry-Num", fmt.Sprint(retry))
			r.Header.Set("X-Slack-Retry-Reason", "http_timeout")
		}
		if w := postEvents(t, h, r); w.Code != 200 {
			t.Fatalf("delivery %d answered %d", retry, w.Code)
		}
	}
	e.drain()

	// A restarted bot (nothing remembered in memory) on the same log gets
	// the redelivery too: the log's unique event id keeps it single.
	e2 := &bot.Slack{Bot: e.bot, Poster: e.sl.Poster, Queue: bot.NewQueue(4, nil), Now: e.clock.Now}
	r := signedRequest(t, "POST", "/slack/events", "application/json", ev, e.secret, e.clock.Now())
	r.Header.Set("X-Slack-Retry-Num", "3")
	if w := postEvents(t, e2.HTTPHandler(bot.NewVerifier(e.secret, e.clock.Now)), r); w.Code != 200 {
		t.Fatalf("redelivery to restarted bot answered %d", w.Code)
	}
	if err := e2.Queue.Close(context.Background()); err != nil {
		t.Fatal(err)
	}

	// Socket Mode redelivery of the same event id.
	e.runSocket()
	e.slack.waitConn(1)
	e.slack.send(mentionEnvelope("env-d", "EvDup", "CPLANT", "UOP", "1700000100.000300", "<@UBOT> mix 1 L NaOCl 12.5 % + 1 L HCl 10 %", 1))
	e.slack.waitAck("env-d")
	e.drain()

	if n := len(e.slack.postsNow()); n != 1 {
		t.Errorf("%d replies posted for one event delivered five times, want 1", n)
	}
	if qs := e.queries(); len(qs) != 1 {
		t.Errorf("%d queries logged for one event, want 1", len(qs))
	}
}

func TestRateLimitRetryAfterHonoured(t *testing.T) {
	e := newEnv(t)
	e.slack.fault = func(method string, n int) *fakeFault {
		if method == "chat.postMessage" && n <= 2 {
			return &fakeFault{Status: 429, RetryAfter: "7"}
		}
		return nil
	}
	e.runSocket()
	e.slack.waitConn(1)
	e.slack.send(mentionEnvelope("env-r", "EvRate", "CPLANT", "UOP", "1700000100.000400", "<@UBOT> mix 1 L NaOCl 12.5 % + 1 L HCl 10 %", 0))
	posts := e.slack.waitPosts(1)
	e.drain()
	if posts[0].ThreadTS != "1700000100.000400" {
		t.Errorf("reply thread = %q", posts[0].ThreadTS)
	}
	if n := e.slack.callCount("chat.postMessage"); n != 3 {
		t.Errorf("chat.postMessage called %d times, want 3 (two 429s, then the post)", n)
	}
	var waited []time.Duration
	for _, d := range e.clock.sleeps() {
		if d >= 7*time.Second {
			waited = append(waited, d)
		}
	}
	if len(waited) != 2 {
		t.Errorf("waits of at least Retry-After (7s): %v of all %v; want 2", waited, e.clock.sleeps())
	}
	q := e.queries()[0]
	ds, _ := e.db.Deliveries(context.Background(), q.ID)
	if len(ds) != 1 || !ds[0].OK {
		t.Errorf("deliveries = %+v, want one ok", ds)
	}
}

func TestSlackOutageRetriedAndFailureRecorded(t *testing.T) {
	e := newEnv(t)
	e.slack.fault = func(method string, n int) *fakeFault {
		if method == "chat.postMessage" && n <= 3 {
			return &fakeFault{Status: 503}
		}
		return nil
	}
	h := e.sl.HTTPHandler(bot.NewVerifier(e.secret, e.clock.Now))
	ev, _ := json.Marshal(mentionPayload("EvOut", "CPLANT", "UOP", "1700000100.000500", "<@UBOT> mix 1 L NaOCl 12.5 % + 1 L HCl 10 %"))
	postEvents(t, h, signedRequest(t, "POST", "/slack/events", "application/json", ev, e.secret, e.clock.Now()))
	e.slack.waitPosts(1)
	e.drain()
	want := []time.Duration{time.Second, 2 * time.Second, 4 * time.Second}
	var backoffs []time.Duration
	for _, d := range e.clock.sleeps() {
		if d > 0 {
			backoffs = append(backoffs, d)
		}
	}
	if !slices.Equal(backoffs, want) {
		t.Errorf("backoff waits = %v, want %v", backoffs, want)
	}

	// A channel that is gone cannot be posted to: the failure is logged.
	ev2, _ := json.Marshal(mentionPayload("EvGone", "CGONE", "UOP", "1700000100.000600", "<@UBOT> mix 1 L NaOCl 12.5 % + 1 L HCl 10 %"))
	postEvents(t, h, signedRequest(t, "POST", "/slack/events", "application/json", ev2, e.secret, e.clock.Now()))
	e.drain()
	qs := e.queries()
	if len(qs) != 2 {
		t.Fatalf("%d queries logged, want 2", len(qs))
	}
	ds, _ := e.db.Deliveries(context.Background(), qs[1].ID)
	if len(ds) != 1 || ds[0].OK || !strings.Contains(ds[0].Detail, "channel_not_found") {
		t.Errorf("deliveries of the unpostable answer = %+v, want one failure naming channel_not_found", ds)
	}
}

func TestSocketDroppedAndReconnectedLosesNothing(t *testing.T) {
	e := newEnv(t)
	e.runSocket()
	e.slack.waitConn(1)

	// The first request is answered on connection 1.
	e.slack.send(mentionEnvelope("env-a", "EvA", "CPLANT", "UOP", "1700000200.000100", "<@UBOT> mix 1 L NaOCl 12.5 % + 1 L HCl 10 %", 0))
	e.slack.waitAck("env-a")
	// The second is sent and the socket dies before Slack sees its ack, so
	// Slack sends it again after the reconnect, along with a third.
	e.slack.send(mentionEnvelope("env-b", "EvB", "CPLANT", "UOP", "1700000200.000200", "<@UBOT> mix 2 L NaOCl 12.5 % + 1 L HCl 10 %", 0))
	e.slack.drop()
	e.slack.waitConn(2)
	e.slack.send(mentionEnvelope("env-b2", "EvB", "CPLANT", "UOP", "1700000200.000200", "<@UBOT> mix 2 L NaOCl 12.5 % + 1 L HCl 10 %", 1))
	e.slack.send(mentionEnvelope("env-c", "EvC", "CPLANT", "UOP", "1700000200.000300", "<@UBOT> mix 3 L NaOCl 12.5 % + 1 L HCl 10 %", 0))
	e.slack.waitAck("env-c")
	e.slack.waitPosts(3)
	e.drain()

	threads := map[string]int{}
	for _, p := range e.slack.postsNow() {
		threads[p.ThreadTS]++
	}
	for _, ts := range []string{"1700000200.000100", "1700000200.000200", "1700000200.000300"} {
		if threads[ts] != 1 {
			t.Errorf("thread %s got %d replies, want 1 (all: %v)", ts, threads[ts], threads)
		}
	}
	if qs := e.queries(); len(qs) != 3 {
		t.Errorf("%d queries logged, want 3", len(qs))
	}
}

func TestSearchIsForReviewersOnly(t *testing.T) {
	e := newEnv(t)
	e.slack.groups["SREVIEW"] = []string{"UGRP"}
	ctx := context.Background()
	for i, text := range []string{"mix 1 L NaOCl 12.5 % + 1 L HCl 10 %", "mix 2 L bad + 1 L HCl 10 %"} {
		r := e.bot.Answer(ctx, bot.Incoming{Transport: "test", Channel: "C1", UserID: "UOP", Text: text, EventID: fmt.Sprint("E", i)})
		if r.QueryID == 0 {
			t.Fatalf("request %q not logged", text)
		}
	}
	for _, tc := range []struct {
		user    string
		allowed bool
	}{
		{"UOP", false},  // an operator
		{"USUP", false}, // a supervisor is not a reviewer
		{"UREV", true},  // listed by user id
		{"UGRP", true},  // member of the reviewers' user group
	} {
		r := e.bot.Answer(ctx, bot.Incoming{Transport: "test", Channel: "C1", UserID: tc.user, Text: "search NaOCl"})
		refused := strings.Contains(r.Text, "Sorry, searching the query log is open to reviewers only")
		if refused == tc.allowed {
			t.Errorf("search by %s: %q (allowed %v)", tc.user, r.Text, tc.allowed)
		}
		if tc.allowed && !strings.Contains(r.Text, "mix 1 L NaOCl 12.5 % + 1 L HCl 10 %") {
			t.Errorf("reviewer %s search found: %q", tc.user, r.Text)
		}
	}
	// The group is looked up once and cached.
	e.bot.Answer(ctx, bot.Incoming{Transport: "test", Channel: "C1", UserID: "UGRP", Text: "search verdict:error"})
	if n := e.slack.callCount("usergroups.users.list"); n != 1 {
		t.Errorf("usergroups.users.list called %d times, want 1 (cached)", n)
	}
}

func TestBurstOf500(t *testing.T) {
	e := newEnv(t, func(e *env) { e.sl.Queue = bot.NewQueue(1000, nil) })
	// Slack pushes back now and then: a 429 every 97th post and a 500
	// every 89th.
	e.slack.fault = func(method string, n int) *fakeFault {
		switch {
		case method != "chat.postMessage":
		case n%97 == 0:
			return &fakeFault{Status: 429, RetryAfter: "1"}
		case n%89 == 0:
			return &fakeFault{Status: 500}
		}
		return nil
	}
	h := e.sl.HTTPHandler(bot.NewVerifier(e.secret, e.clock.Now))
	const total, threads = 500, 25
	sent := make([]time.Time, total)
	var wg sync.WaitGroup
	sem := make(chan struct{}, 16)
	start := time.Now()
	for i := range total {
		wg.Add(1)
		sem <- struct{}{}
		go func(i int) {
			defer wg.Done()
			defer func() { <-sem }()
			thread := fmt.Sprintf("1700001000.%06d", i%threads)
			channel := fmt.Sprintf("C%d", i%threads%3)
			// Requests in a thread are numbered by the amount of NaOCl.
			ev, _ := json.Marshal(mentionPayload(fmt.Sprint("EvBurst", i), channel, "UOP", thread, fmt.Sprintf("<@UBOT> mix %d L NaOCl 12.5 %% + 1 L HCl 10 %%", i/threads+1)))
			sent[i] = time.Now()
			w := postEvents(t, h, signedRequest(t, "POST", "/slack/events", "application/json", ev, e.secret, e.clock.Now()))
			if w.Code != 200 {
				t.Errorf("event %d answered %d", i, w.Code)
			}
		}(i)
		// Events in one thread are sent in order: wait for the previous
		// round before the next request of the same thread.
		if i%threads == threads-1 {
			wg.Wait()
		}
	}
	wg.Wait()
	posts := e.slack.waitPosts(total)
	e.drain()
	elapsed := time.Since(start)

	if len(posts) != total {
		t.Errorf("%d replies posted, want %d", len(posts), total)
	}
	byThread := map[string][]int{}
	var lat []time.Duration
	for _, p := range posts {
		var n int
		if _, err := fmt.Sscanf(p.Text, "Request: mix %d L", &n); err != nil {
			t.Fatalf("reply %q: %v", p.Text[:min(60, len(p.Text))], err)
		}
		key := p.Channel + "/" + p.ThreadTS
		byThread[key] = append(byThread[key], n)
		var idx int
		fmt.Sscanf(p.ThreadTS, "1700001000.%d", &idx)
		lat = append(lat, p.At.Sub(sent[(n-1)*threads+idx]))
	}
	for key, ns := range byThread {
		if !sort.IntsAreSorted(ns) || len(ns) != total/threads {
			t.Errorf("thread %s answered out of order or incompletely: %v", key, ns)
		}
	}
	if qs := e.queries(); len(qs) != total {
		t.Errorf("%d queries logged, want %d", len(qs), total)
	}
	slices.Sort(lat)
	t.Logf("burst of %d over HTTP: all answered in %v; event→reply latency p50 %v, p99 %v, max %v",
		total, elapsed.Round(time.Millisecond), lat[len(lat)/2].Round(time.Microsecond), lat[len(lat)*99/100].Round(time.Microsecond), lat[len(lat)-1].Round(time.Microsecond))
}

func TestErrorsGetHelpfulReplies(t *testing.T) {
	e := newEnv(t)
	ctx := context.Background()
	r := e.bot.Answer(ctx, bot.Incoming{Transport: "test", Channel: "C1", UserID: "UOP", Text: "mix 2 L bad + 1 L HCl 10 %", EventID: "Ebad"})
	for _, want := range []string{"couldn't read", "bad", "character 9", "Did you mean: NaBr", bot.RequestExample, "help"} {
		if !strings.Contains(r.Text, want) {
			t.Errorf("parse-error reply lacks %q:\n%s", want, r.Text)
		}
	}
	r = e.bot.Answer(ctx, bot.Incoming{Transport: "test", Channel: "C1", UserID: "UOP", Text: "mix 1 L boom", EventID: "Eboom"})
	if !strings.Contains(r.Text, "went wrong on my side") || strings.Contains(r.Text, "index out of range") {
		t.Errorf("internal failure reply = %q: must apologise and hide internals", r.Text)
	}
	qs := e.queries()
	if len(qs) != 2 || qs[0].Verdict != store.VerdictError || qs[1].Verdict != store.VerdictError || !strings.Contains(qs[1].Error, "panic") {
		t.Errorf("logged = %+v", qs)
	}
	r = e.bot.Answer(ctx, bot.Incoming{Transport: "test", Channel: "C1", UserID: "UOP", Text: "streams set T-1"})
	if !strings.Contains(r.Text, "streams set T-101 200 L NaOH 5 %") {
		t.Errorf("bad streams command reply = %q, want an example", r.Text)
	}
}

func TestStreamsCatalogue(t *testing.T) {
	e := newEnv(t)
	ctx := context.Background()
	say := func(user, text string) string {
		return e.bot.Answer(ctx, bot.Incoming{Transport: "test", Channel: "C1", UserID: user, UserName: strings.ToLower(user), Text: text}).Text
	}
	if got := say("UOP", "streams set T-101 200 L NaOH 5 %"); !strings.Contains(got, "supervisors only") {
		t.Errorf("operator set a stream: %q", got)
	}
	if got := say("USUP", "streams set T-101 200 L NaOH 5 % note: weekly top-up"); !strings.Contains(got, "Saved T-101") {
		t.Errorf("supervisor set: %q", got)
	}
	if got := say("UOP", "streams"); !strings.Contains(got, "T-101  200 L NaOH 5 %  (weekly top-up)") {
		t.Errorf("streams list: %q", got)
	}
	r := e.bot.Answer(ctx, bot.Incoming{Transport: "test", Channel: "C1", UserID: "UOP", Text: "mix T-101 + 5 L HCl 10 %", EventID: "Etag"})
	if r.Result == nil || r.Result.Streams[0].Text != "200 L NaOH 5 %" {
		t.Fatalf("tag not resolved: %+v", r.Result)
	}
	if q := e.queries()[0]; q.Resolved != "mix (200 L NaOH 5 %) + 5 L HCl 10 %" {
		t.Errorf("logged resolved request = %q", q.Resolved)
	}
	if got := say("USUP", "streams remove T-101"); !strings.Contains(got, "Removed T-101") {
		t.Errorf("remove: %q", got)
	}
	if got := say("UOP", "streams show T-101"); !strings.Contains(got, "no stream T-101") {
		t.Errorf("show removed: %q", got)
	}
	if got := say("UOP", "streams history T-101"); !strings.Contains(got, "remove by usup (USUP)") {
		t.Errorf("history: %q", got)
	}
}

func TestDigestOnDemandAndPublished(t *testing.T) {
	e := newEnv(t)
	e.sl.DigestChannel = "CSUPERVISORS"
	ctx := context.Background()
	e.bot.Answer(ctx, bot.Incoming{Transport: "test", Channel: "C1", UserID: "UOP", Text: "mix 1 L NaOCl 12.5 % + 1 L HCl 10 %", EventID: "Ed"})
	if got := e.bot.Answer(ctx, bot.Incoming{Transport: "test", Channel: "C1", UserID: "UOP", Text: "digest"}).Text; !strings.Contains(got, "Sorry") {
		t.Errorf("operator got the digest: %q", got)
	}
	r := e.bot.Answer(ctx, bot.Incoming{Transport: "test", Channel: "C1", UserID: "USUP", Text: "digest"})
	if !strings.Contains(r.Text, "mix 1 L NaOCl 12.5 % + 1 L HCl 10 %") {
		t.Errorf("supervisor digest lacks the flagged mix:\n%s", r.Text)
	}
	d, err := e.db.Digest(ctx, e.clock.Now().Add(-time.Hour), e.clock.Now().Add(time.Second))
	if err != nil {
		t.Fatal(err)
	}
	if err := e.sl.PublishDigest(ctx, d); err != nil {
		t.Fatal(err)
	}
	posts := e.slack.postsNow()
	if len(posts) != 1 || posts[0].Channel != "CSUPERVISORS" || posts[0].ThreadTS != "" || !strings.Contains(posts[0].blockText(), "NaOCl") {
		t.Errorf("published digest posts = %+v", posts)
	}
}

func TestDirectMessagesAnsweredOthersIgnored(t *testing.T) {
	e := newEnv(t)
	e.sl.BotUserID = "UBOT"
	h := e.sl.HTTPHandler(bot.NewVerifier(e.secret, e.clock.Now))
	msg := func(id, channelType, user, botID, subtype, text string) []byte {
		ev := map[string]any{"type": "message", "channel": "D1", "channel_type": channelType, "user": user, "text": text, "ts": "1700000300.000100"}
		if botID != "" {
			ev["bot_id"] = botID
		}
		if subtype != "" {
			ev["subtype"] = subtype
		}
		b, _ := json.Marshal(map[string]any{"type": "event_callback", "event_id": id, "event": ev})
		return b
	}
	for _, body := range [][]byte{
		msg("Em1", "im", "UOP", "", "", "mix 1 L NaOCl 12.5 % + 1 L HCl 10 %"),      // answered
		msg("Em2", "im", "UBOT", "BBOT", "bot_message", "our own answer"),           // ignored
		msg("Em3", "channel", "UOP", "", "", "mix 1 L NaOCl 12.5 % + 1 L HCl 10 %"), // no mention: ignored
		msg("Em4", "im", "UOP", "", "message_changed", "edited"),                    // edits: ignored
		[]byte(`{"type":"event_callback","event_id":"Em5","event":{"type":"reaction_added","user":"UOP"}}`),
	} {
		if w := postEvents(t, h, signedRequest(t, "POST", "/slack/events", "application/json", body, e.secret, e.clock.Now())); w.Code != 200 {
			t.Errorf("event answered %d", w.Code)
		}
	}
	e.slack.waitPosts(1)
	e.drain()
	if posts := e.slack.postsNow(); len(posts) != 1 || posts[0].Channel != "D1" || posts[0].ThreadTS != "1700000300.000100" {
		t.Errorf("posts = %+v, want one answer in the direct message", posts)
	}
}

func TestUnknownSocketEnvelopeIsAcknowledged(t *testing.T) {
	e := newEnv(t)
	e.runSocket()
	e.slack.waitConn(1)
	e.slack.send(`{"type":"events_api","envelope_id":"env-odd","payload":{"type":"event_callback","event_id":"Ev9","event":{"type":"no_such_event_type"}}}`)
	e.slack.waitAck("env-odd")
	e.slack.send(`{"type":"interactive","envelope_id":"env-int","payload":{"type":"block_actions"}}`)
	e.slack.waitAck("env-int")
	if n := len(e.slack.postsNow()); n != 0 {
		t.Errorf("%d posts for events that ask nothing", n)
	}
}

// TestLoggedButUnansweredAnsweredOnRedelivery: a query logged whose answer
// never got through (Slack refused the post) is answered when Slack
// delivers the event again, even to a restarted bot, and still logged once;
// after an answer has gone through, a further redelivery is not answered.
func TestLoggedButUnansweredAnsweredOnRedelivery(t *testing.T) {
	e := newEnv(t)
	failing := true
	e.slack.fault = func(method string, n int) *fakeFault {
		if method == "chat.postMessage" && failing {
			return &fakeFault{Error: "channel_not_found"}
		}
		return nil
	}
	ev, _ := json.Marshal(mentionPayload("EvLost", "CPLANT", "UOP", "1700000100.000900", "<@UBOT> mix 1 L NaOCl 12.5 % + 1 L HCl 10 %"))
	h := e.sl.HTTPHandler(bot.NewVerifier(e.secret, e.clock.Now))
	if w := postEvents(t, h, signedRequest(t, "POST", "/slack/events", "application/json", ev, e.secret, e.clock.Now())); w.Code != 200 {
		t.Fatalf("first delivery answered %d", w.Code)
	}
	e.drain()
	qs := e.queries()
	if len(qs) != 1 {
		t.Fatalf("%d queries logged, want 1", len(qs))
	}
	ds, _ := e.db.Deliveries(context.Background(), qs[0].ID)
	if len(ds) == 0 || ds[len(ds)-1].OK {
		t.Fatalf("deliveries after a refused post = %+v, want a failure recorded", ds)
	}

	redeliver := func(retry int) {
		t.Helper()
		failing = false
		e2 := &bot.Slack{Bot: e.bot, Poster: e.sl.Poster, Queue: bot.NewQueue(4, nil), Now: e.clock.Now}
		r := signedRequest(t, "POST", "/slack/events", "application/json", ev, e.secret, e.clock.Now())
		r.Header.Set("X-Slack-Retry-Num", fmt.Sprint(retry))
		if w := postEvents(t, e2.HTTPHandler(bot.NewVerifier(e.secret, e.clock.Now)), r); w.Code != 200 {
			t.Fatalf("redelivery %d answered %d", retry, w.Code)
		}
		if err := e2.Queue.Close(context.Background()); err != nil {
			t.Fatal(err)
		}
	}
	redeliver(1)
	posted := 0
	for _, p := range e.slack.postsNow() {
		if p.ThreadTS == "1700000100.000900" {
			posted++
		}
	}
	if posted != 1 {
		t.Fatalf("%d answers posted after the redelivery, want 1", posted)
	}
	redeliver(2)
	again := 0
	for _, p := range e.slack.postsNow() {
		if p.ThreadTS == "1700000100.000900" {
			again++
		}
	}
	if again != 1 {
		t.Errorf("%d answers after a second redelivery, want still 1", again)
	}
	if qs := e.queries(); len(qs) != 1 {
		t.Errorf("%d queries logged, want 1", len(qs))
	}
}

// TestSlashCommandInChannelWithoutBot: a slash command from a channel the
// bot is not a member of is answered privately through the command's
// response URL, logged, and the private delivery recorded.
func TestSlashCommandInChannelWithoutBot(t *testing.T) {
	e := newEnv(t)
	h := e.sl.HTTPHandler(bot.NewVerifier(e.secret, e.clock.Now))
	form := slashForm("COUTSIDE", "UOP", "mix 10 L NaOCl 12.5 % + 2 L HCl 10 %", "trig-out")
	form.Set("response_url", e.slack.srv.URL+"/respond/1")
	body := []byte(form.Encode())
	if w := postEvents(t, h, signedRequest(t, "POST", "/slack/commands", "application/x-www-form-urlencoded", body, e.secret, e.clock.Now())); w.Code != 200 {
		t.Fatalf("slash command answered %d", w.Code)
	}
	e.drain()
	e.slack.mu.Lock()
	resp := append([]map[string]any(nil), e.slack.responses...)
	e.slack.mu.Unlock()
	if len(resp) == 0 {
		t.Fatalf("nothing sent to the response URL")
	}
	text, _ := resp[0]["text"].(string)
	if resp[0]["response_type"] != "ephemeral" || !strings.Contains(text, "not a member of this channel") || !strings.Contains(text, "SPONTANEOUS") {
		t.Errorf("private answer = %v", resp[0])
	}
	qs := e.queries()
	if len(qs) != 1 {
		t.Fatalf("%d queries logged, want 1", len(qs))
	}
	ds, _ := e.db.Deliveries(context.Background(), qs[0].ID)
	if len(ds) != 1 || !ds[0].OK || !strings.Contains(ds[0].Detail, "answered privately") {
		t.Errorf("deliveries = %+v, want one ok private answer", ds)
	}
}

// TestSearchResultsShownOnlyToTheReviewer: search results name people and
// requests, so in a channel they are shown to the reviewer alone.
func TestSearchResultsShownOnlyToTheReviewer(t *testing.T) {
	e := newEnv(t)
	ctx := context.Background()
	if r := e.bot.Answer(ctx, bot.Incoming{Transport: "test", Channel: "CPLANT", UserID: "UOP", Text: "mix 1 L NaOCl 12.5 % + 1 L HCl 10 %", EventID: "Eq"}); r.QueryID == 0 {
		t.Fatal("request not logged")
	}
	e.runSocket()
	e.slack.waitConn(1)
	e.slack.send(mentionEnvelope("env-q", "EvSearch", "CPLANT", "UREV", "1700000100.000700", "<@UBOT> search NaOCl", 0))
	e.slack.waitAck("env-q")
	e.drain()
	e.slack.mu.Lock()
	eph := append([]fakePost(nil), e.slack.ephemerals...)
	e.slack.mu.Unlock()
	if len(eph) != 1 || eph[0].User != "UREV" || eph[0].Channel != "CPLANT" || !strings.Contains(eph[0].Text, "NaOCl") {
		t.Fatalf("ephemeral posts = %+v, want the results shown to UREV alone", eph)
	}
	for _, p := range e.slack.postsNow() {
		if strings.Contains(p.Text, "Matches") {
			t.Errorf("search results posted for everyone: %+v", p)
		}
	}
}
