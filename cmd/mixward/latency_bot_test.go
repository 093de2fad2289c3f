package main

import (
	"fmt"
	"net/http"
	"path/filepath"
	"slices"
	"strconv"
	"sync"
	"testing"
	"time"
)

// BenchmarkServeEventToReply measures, through a running `mixward serve
// --http` with the real engine and store, the time from posting a signed
// app_mention to the fake Slack receiving the threaded answer.
func BenchmarkServeEventToReply(b *testing.B) {
	slack := newMiniSlack(b)
	slack.hit = make(chan string, 1024)
	env := map[string]string{
		"SLACK_BOT_TOKEN": testBotToken, "SLACK_SIGNING_SECRET": testSecret,
		"MIXWARD_SLACK_API_URL": slack.srv.URL + "/api/", "MIXWARD_DB": filepath.Join(b.TempDir(), "bench.db"),
		"MIXWARD_POST_RATE": "100000", "MIXWARD_POST_BURST": "1000",
	}
	s := startServe(b, env, "--http", "127.0.0.1:0", "--admin-addr", "127.0.0.1:0")
	var lat []time.Duration
	i := 0
	for b.Loop() {
		thread := fmt.Sprintf("1700000000.%06d", i)
		body := mentionBody(fmt.Sprint("EvL", i), "CPLANT", thread, "<@UBOT> mix 200 L NaOCl 12.5 % + 50 L HCl 10 %")
		start := time.Now()
		signedPost(b, s.events+"/slack/events", "application/json", testSecret, body, time.Now())
		for got := range slack.hit {
			if got == thread {
				break
			}
		}
		lat = append(lat, time.Since(start))
		i++
	}
	b.StopTimer()
	slices.Sort(lat)
	b.ReportMetric(float64(lat[len(lat)/2].Microseconds())/1000, "p50-ms")
	b.ReportMetric(float64(lat[len(lat)*99/100].Microseconds())/1000, "p99-ms")
}

// BenchmarkServeBurst500 sends 500 signed mentions over 25 threads as fast
// as the client can, and measures until all 500 answers are posted.
func BenchmarkServeBurst500(b *testing.B) {
	for range b.N {
		b.StopTimer()
		slack := newMiniSlack(b)
		slack.hit = make(chan string, 1024)
		env := map[string]string{
			"SLACK_BOT_TOKEN": testBotToken, "SLACK_SIGNING_SECRET": testSecret,
			"MIXWARD_SLACK_API_URL": slack.srv.URL + "/api/", "MIXWARD_DB": filepath.Join(b.TempDir(), "burst.db"),
			"MIXWARD_POST_RATE": "100000", "MIXWARD_POST_BURST": "1000",
		}
		s := startServe(b, env, "--http", "127.0.0.1:0", "--admin-addr", "127.0.0.1:0")
		b.StartTimer()
		start := time.Now()
		var wg sync.WaitGroup
		for g := range 25 {
			wg.Go(func() {
				for k := range 20 {
					i := k*25 + g
					body := mentionBody(fmt.Sprint("EvB", i), "CPLANT", fmt.Sprintf("1700000000.%06d", g),
						fmt.Sprintf("<@UBOT> mix %d L NaOCl 12.5 %% + 50 L HCl 10 %%", k+1))
					postUntilAccepted(b, s.events+"/slack/events", body)
				}
			})
		}
		wg.Wait()
		accepted := time.Since(start)
		timeout := time.After(5 * time.Minute)
		for i := range 500 {
			select {
			case <-slack.hit:
			case <-timeout:
				b.Fatalf("%d of 500 answers posted after 5 minutes", i)
			}
		}
		answered := time.Since(start)
		b.StopTimer()
		b.ReportMetric(accepted.Seconds()*1000, "all-accepted-ms")
		b.ReportMetric(answered.Seconds()*1000, "all-answered-ms")
		s.stop()
		if n := len(slack.postsNow()); n != 500 {
			b.Fatalf("%d answers posted, want 500", n)
		}
	}
}

// postUntilAccepted posts a signed event and, as Slack does, sends it again
// when the bot sheds load (503 with Retry-After) until it is taken; it waits
// a tenth of the Retry-After seconds so that the benchmark measures the bot,
// not the wait.
func postUntilAccepted(b *testing.B, target string, body []byte) {
	for try := 0; ; try++ {
		resp := signedPost(b, target, "application/json", testSecret, body, time.Now())
		if resp.StatusCode != http.StatusServiceUnavailable {
			if resp.StatusCode != http.StatusOK {
				b.Fatalf("event refused with %s", resp.Status)
			}
			return
		}
		if try == 100 {
			b.Fatal("event shed 100 times in a row")
		}
		wait, _ := strconv.Atoi(resp.Header.Get("Retry-After"))
		time.Sleep(time.Duration(max(wait, 1)) * 100 * time.Millisecond)
	}
}
