package main

import (
	"context"
	"database/sql"
	"fmt"
	"net/http"
	"os"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"

	"mixward/store"
)

// TestServeTwoReplicasPostgres runs two `mixward serve` processes on one
// PostgreSQL database (MIXWARD_TEST_POSTGRES) behind the fake Slack, and
// delivers the same burst of signed events to both at once, as Slack
// retrying through a load balancer might: every event is answered once and
// logged once, the chain verifies, no answer is left owed, and the shift
// digest due at start-up is sent by one of them. MIXWARD_REPLICA_EVENTS
// sets the burst: 100 by default (CI runs it with -race), 500 for the full
// figure.
func TestServeTwoReplicasPostgres(t *testing.T) {
	url := testPostgresURL(t)
	bin := mixwardBinary(t)
	total := envInt(os.Getenv, "MIXWARD_REPLICA_EVENTS", 100)
	const channels = 50
	slack := newLoopSlack(t)
	env := func(name string) map[string]string {
		return map[string]string{
			"SLACK_BOT_TOKEN": testBotToken, "SLACK_SIGNING_SECRET": testSecret,
			"MIXWARD_SLACK_API_URL": slack.srv.URL + "/api/", "MIXWARD_DB": url, "MIXWARD_REPLICA": name,
			"MIXWARD_POST_RATE": "1000", "MIXWARD_POST_BURST": "1000", "MIXWARD_PICTURE_WORKERS": "0",
			"MIXWARD_DIGEST_CHANNEL": "CDIGEST",
		}
	}
	var procs []*proc
	var mu sync.Mutex
	var startWG sync.WaitGroup
	for _, name := range []string{"replica-a", "replica-b"} {
		startWG.Go(func() {
			p := startProc(t, bin, freeAddr(t), env(name))
			mu.Lock()
			procs = append(procs, p)
			mu.Unlock()
		})
	}
	startWG.Wait()
	if t.Failed() || len(procs) != 2 {
		t.FailNow()
	}
	ctx, cancel := context.WithTimeout(context.Background(), 8*time.Minute)
	defer cancel()
	var ids []string
	for i := range total {
		ids = append(ids, fmt.Sprintf("EvR-%04d", i))
	}
	start := time.Now()
	var wg sync.WaitGroup
	errs := make(chan error, 2*channels)
	for _, p := range procs {
		client := &slackClient{addr: func() string { return p.events }, hc: &http.Client{Timeout: 10 * time.Second}}
		for c := range channels {
			wg.Go(func() {
				for i := c; i < total; i += channels {
					body := mixEvent(ids[i], fmt.Sprintf("C%02d", c), fmt.Sprintf("1700000000.%03d", i), i+1)
					if err := client.deliver(ctx, ids[i], body); err != nil {
						errs <- err
						return
					}
				}
			})
		}
	}
	wg.Wait()
	close(errs)
	for err := range errs {
		t.Fatal(err)
	}
	waitAnswered(t, slack, ids, 7*time.Minute)
	answered := time.Since(start)
	time.Sleep(time.Second) // a second answer, if any, has time to show
	for _, p := range procs {
		p.stop(t, syscall.SIGTERM)
	}
	got := slack.answers()
	for _, id := range ids {
		if got[id] != 1 {
			t.Errorf("event %s answered %d times, want 1", id, got[id])
		}
	}

	db, err := store.OpenReadOnly(context.Background(), url, store.Options{})
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	logged := map[string]int{}
	if err := db.Export(context.Background(), time.Time{}, time.Time{}, func(e *store.Entry) error {
		logged[e.EventID]++
		return nil
	}); err != nil {
		t.Fatal(err)
	}
	for _, id := range ids {
		if logged[id] != 1 {
			t.Errorf("event %s logged %d times, want 1", id, logged[id])
		}
	}
	rep, err := db.Verify(context.Background())
	if err != nil || !rep.OK || rep.Queries != int64(total) || rep.LastID != int64(total) {
		t.Errorf("Verify = %+v, %v; want %d queries, ids 1–%d", rep, err, total, total)
	}
	recs, err := db.DigestRecords(context.Background(), 0)
	if err != nil || len(recs) != 1 || recs[0].Status != "sent" || recs[0].Attempts != 1 {
		t.Errorf("digests recorded = %+v, %v; want the start-up slot sent once", recs, err)
	}
	raw, err := sql.Open("pgx", url)
	if err != nil {
		t.Fatal(err)
	}
	defer raw.Close()
	var owed int
	if err := raw.QueryRow(`SELECT count(*) FROM inbox WHERE state = 'pending'`).Scan(&owed); err != nil || owed != 0 {
		t.Errorf("answers still owed after the burst: %d, %v", owed, err)
	}
	var byReplica []string
	rows, err := raw.Query(`SELECT lease_owner, count(*) FROM inbox GROUP BY lease_owner ORDER BY lease_owner`)
	if err == nil {
		for rows.Next() {
			var o string
			var n int
			rows.Scan(&o, &n)
			byReplica = append(byReplica, fmt.Sprintf("%s %d", o, n))
		}
		rows.Close()
	}
	t.Logf("%d events delivered to both replicas: all answered once in %v (%.0f answers/s); taken: %s",
		total, answered.Round(time.Millisecond), float64(total)/answered.Seconds(), strings.Join(byReplica, ", "))
	for _, p := range procs {
		if strings.Contains(p.stderr.String(), `"level":"ERROR"`) {
			t.Errorf("errors logged:\n%s", firstLines(p.stderr.String(), 20))
		}
	}
}
