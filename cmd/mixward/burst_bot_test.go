package main

import (
	"context"
	"fmt"
	"net/http"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"
)

// TestServeBurstBoundedMemory runs the real binary against the fake Slack
// on loopback and sends a burst of signed events over 100 channels (five
// events to a thread, each channel's events in order). Every event must be
// answered and logged exactly once, threads in order, and the process's
// peak resident memory must stay within 60 MB plus 120 KB an event (300 MB
// at 2,000 events). MIXWARD_BURST_EVENTS sets the count: 300 by default
// (CI), 2000 for the full figure.
func TestServeBurstBoundedMemory(t *testing.T) {
	bin := mixwardBinary(t)
	total := envInt(os.Getenv, "MIXWARD_BURST_EVENTS", 300)
	const channels, perThread = 100, 5
	slack := newLoopSlack(t)
	dbPath := filepath.Join(t.TempDir(), "burst.db")
	env := map[string]string{
		"SLACK_BOT_TOKEN": testBotToken, "SLACK_SIGNING_SECRET": testSecret,
		"MIXWARD_SLACK_API_URL": slack.srv.URL + "/api/", "MIXWARD_DB": dbPath,
		"MIXWARD_POST_RATE": "1000", "MIXWARD_POST_BURST": "1000",
	}
	// MIXWARD_BURST_POST_RATE runs it at a real rate limit instead (Slack
	// allows about one message a second per channel).
	if r := os.Getenv("MIXWARD_BURST_POST_RATE"); r != "" {
		env["MIXWARD_POST_RATE"], env["MIXWARD_POST_BURST"] = r, "3"
	}
	p := startProc(t, bin, freeAddr(t), env)
	client := &slackClient{addr: func() string { return p.events }, hc: &http.Client{Timeout: 10 * time.Second}}
	ctx, cancel := context.WithTimeout(context.Background(), 5*time.Minute)
	defer cancel()

	var ids []string
	var wg sync.WaitGroup
	errs := make(chan error, channels)
	start := time.Now()
	for c := range channels {
		var mine []string
		for k := 0; k*channels+c < total; k++ {
			mine = append(mine, fmt.Sprintf("EvB-%03d-%04d", c, k))
		}
		ids = append(ids, mine...)
		wg.Go(func() {
			for k, id := range mine {
				thread := fmt.Sprintf("1700000000.%03d%03d", c, k/perThread)
				if err := client.deliver(ctx, id, mixEvent(id, fmt.Sprintf("C%03d", c), thread, k+1)); err != nil {
					errs <- err
					return
				}
			}
		})
	}
	wg.Wait()
	accepted := time.Since(start)
	close(errs)
	for err := range errs {
		t.Fatal(err)
	}
	got := waitAnswered(t, slack, ids, 4*time.Minute)
	answered := time.Since(start)
	peak := p.peakRSS()
	p.stop(t, syscall.SIGTERM)

	for _, id := range ids {
		if got[id] != 1 {
			t.Errorf("event %s answered %d times, want 1", id, got[id])
		}
	}
	logged := countLogged(t, dbPath)
	for _, id := range ids {
		if logged[id] != 1 {
			t.Errorf("event %s logged %d times, want 1", id, logged[id])
		}
	}
	if len(logged) != len(ids) {
		t.Errorf("%d events logged, want %d", len(logged), len(ids))
	}
	for thread, evs := range slack.order() {
		if !slices.IsSorted(evs) {
			t.Errorf("thread %s answered out of order: %v", thread, evs)
		}
	}
	if n := pendingInbox(t, dbPath); n != 0 {
		t.Errorf("%d messages still owed in the inbox after the burst", n)
	}
	limit := int64(60<<20 + total*120<<10)
	t.Logf("burst of %d events over %d channels: all acknowledged in %v, all answered in %v (%.0f answers/s); "+
		"%d deliveries (%d refused with 503); %d pictures uploaded; peak RSS %.1f MB (limit %.0f MB)",
		total, channels, accepted.Round(time.Millisecond), answered.Round(time.Millisecond), float64(total)/answered.Seconds(),
		client.tries.get(), client.refuse.get(), slack.uploadsNow(), float64(peak)/(1<<20), float64(limit)/(1<<20))
	if peak <= 0 || peak > limit {
		t.Errorf("peak RSS %d bytes, want at most %d", peak, limit)
	}
	if strings.Contains(p.stderr.String(), `"level":"ERROR"`) {
		t.Errorf("errors logged during the burst:\n%s", firstLines(p.stderr.String(), 20))
	}
}

func (s *loopSlack) uploadsNow() int {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.uploads
}

func firstLines(s string, n int) string {
	lines := strings.SplitN(s, "\n", n+1)
	return strings.Join(lines[:min(n, len(lines))], "\n")
}
