package main

import (
	"context"
	"fmt"
	"net/http"
	"path/filepath"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"
)

// TestServeRestartsAnswerEveryEventOnce runs the real binary against the
// fake Slack, and stops it in the middle of bursts: SIGKILL first, then
// SIGTERM with a drain timeout too short to finish, then a third process
// that runs to the end. The client behaves like Slack: an event not
// acknowledged (a refused connection while no process listens, a 503) is
// delivered again, and some acknowledged events are redelivered after the
// restarts as well. Every event must be answered exactly once and logged
// exactly once.
func TestServeRestartsAnswerEveryEventOnce(t *testing.T) {
	bin := mixwardBinary(t)
	const total, channels = 600, 10
	slack := newLoopSlack(t)
	slack.delay = 2 * time.Millisecond
	dbPath := filepath.Join(t.TempDir(), "restart.db")
	addr := freeAddr(t)
	env := map[string]string{
		"SLACK_BOT_TOKEN": testBotToken, "SLACK_SIGNING_SECRET": testSecret,
		"MIXWARD_SLACK_API_URL": slack.srv.URL + "/api/", "MIXWARD_DB": dbPath,
		// Slow enough per channel that work is queued when the process stops.
		"MIXWARD_POST_RATE": "20", "MIXWARD_POST_BURST": "5",
	}
	client := &slackClient{addr: func() string { return "http://" + addr }, hc: &http.Client{Timeout: 5 * time.Second}}
	ctx, cancel := context.WithTimeout(context.Background(), 4*time.Minute)
	defer cancel()

	var ids []string
	bodies := map[string][]byte{}
	perChannel := make([][]string, channels)
	for c := range channels {
		for k := 0; k*channels+c < total; k++ {
			id := fmt.Sprintf("EvR-%02d-%04d", c, k)
			perChannel[c] = append(perChannel[c], id)
			bodies[id] = mixEvent(id, fmt.Sprintf("C%02d", c), fmt.Sprintf("1700000000.%02d%04d", c, k%3), k+1)
		}
		ids = append(ids, perChannel[c]...)
	}
	var wg sync.WaitGroup
	errs := make(chan error, channels)
	for _, mine := range perChannel {
		wg.Go(func() {
			for _, id := range mine {
				if err := client.deliver(ctx, id, bodies[id]); err != nil {
					errs <- err
					return
				}
			}
		})
	}
	acked := func() int {
		n := 0
		client.acked.Range(func(any, any) bool { n++; return true })
		return n
	}
	waitAcked := func(n int) {
		t.Helper()
		for acked() < n {
			if ctx.Err() != nil {
				t.Fatalf("only %d of %d events acknowledged", acked(), n)
			}
			time.Sleep(2 * time.Millisecond)
		}
	}

	p1 := startProc(t, bin, addr, env)
	waitAcked(150)
	p1.stop(t, syscall.SIGKILL)
	killedAt := len(slack.answers())

	p2 := startProc(t, bin, addr, env, "--drain-timeout", "300ms")
	waitAcked(350)
	p2.stop(t, syscall.SIGTERM)
	termAt := len(slack.answers())

	p3 := startProc(t, bin, addr, env)
	wg.Wait()
	close(errs)
	for err := range errs {
		t.Fatal(err)
	}
	// Slack redelivers some events it had an answer for (a slow 200).
	for i := 0; i < total; i += 12 {
		if err := client.deliver(ctx, ids[i], bodies[ids[i]]); err != nil {
			t.Fatal(err)
		}
	}
	got := waitAnswered(t, slack, ids, 3*time.Minute)
	time.Sleep(500 * time.Millisecond) // let stray duplicates, if any, arrive
	p3.stop(t, syscall.SIGTERM)
	got = slack.answers()

	once, twice, never := 0, 0, 0
	for _, id := range ids {
		switch n := got[id]; {
		case n == 1:
			once++
		case n == 0:
			never++
		default:
			twice++
			t.Errorf("event %s answered %d times", id, n)
		}
	}
	logged := countLogged(t, dbPath)
	for _, id := range ids {
		if logged[id] != 1 {
			t.Errorf("event %s logged %d times, want 1", id, logged[id])
		}
	}
	if n := pendingInbox(t, dbPath); n != 0 {
		t.Errorf("%d messages still owed in the inbox at the end", n)
	}
	owed := func(p *proc) string {
		for _, line := range strings.Split(p.stderr.String(), "\n") {
			if _, rest, ok := strings.Cut(line, `"answering messages owed from before the last stop","messages":`); ok {
				return strings.TrimSuffix(rest, "}") + " owed"
			}
		}
		return "none owed"
	}
	t.Logf("%d events, %d deliveries: answered once %d, more than once %d, never %d; answers posted when killed %d, when stopped %d; "+
		"%d threads looked up for answers in doubt; second start: %s; third start: %s",
		total, client.tries.get(), once, twice, never, killedAt, termAt, slack.lookups, owed(p2), owed(p3))
}
