package bot

import (
	"context"
	"errors"
	"fmt"
	"net"
	"net/url"
	"sync"
	"testing"
	"time"

	"github.com/slack-go/slack"
)

func TestBackoffWait(t *testing.T) {
	b := Backoff{Base: time.Second, Max: 10 * time.Second}
	want := []time.Duration{time.Second, 2 * time.Second, 4 * time.Second, 8 * time.Second, 10 * time.Second, 10 * time.Second}
	for i, w := range want {
		if got := b.Wait(i + 1); got != w {
			t.Errorf("Wait(%d) = %v, want %v", i+1, got, w)
		}
	}
	if got := (Backoff{}).Wait(30); got != 2*time.Minute {
		t.Errorf("default Wait(30) = %v, want the 2 min cap", got)
	}
}

func TestRetryable(t *testing.T) {
	for _, tc := range []struct {
		err  error
		want bool
	}{
		{&slack.RateLimitedError{RetryAfter: time.Second}, true},
		{fmt.Errorf("GetUploadURLExternal: %w", &slack.RateLimitedError{}), true},
		{slack.StatusCodeError{Code: 503, Status: "503 Service Unavailable"}, true},
		{slack.StatusCodeError{Code: 429}, true},
		{slack.StatusCodeError{Code: 404}, false},
		{slack.SlackErrorResponse{Err: "channel_not_found"}, false},
		{slack.SlackErrorResponse{Err: "invalid_blocks"}, false},
		{slack.SlackErrorResponse{Err: "internal_error"}, true},
		{fmt.Errorf("CompleteUploadExternal: %w", slack.SlackErrorResponse{Err: "not_in_channel"}), false},
		{&url.Error{Op: "Post", URL: "https://slack.example.invalid", Err: &net.OpError{Op: "dial", Err: errors.New("connection refused")}}, true},
		{context.Canceled, false},
		{errors.New("json: cannot unmarshal"), false},
	} {
		if got := Retryable(tc.err); got != tc.want {
			t.Errorf("Retryable(%v) = %v, want %v", tc.err, got, tc.want)
		}
	}
}

// stepClock is a clock whose sleeps advance it.
type stepClock struct {
	mu    sync.Mutex
	now   time.Time
	slept []time.Duration
}

func (c *stepClock) Now() time.Time { c.mu.Lock(); defer c.mu.Unlock(); return c.now }

func (c *stepClock) Sleep(ctx context.Context, d time.Duration) error {
	c.mu.Lock()
	defer c.mu.Unlock()
	c.slept = append(c.slept, d)
	c.now = c.now.Add(d)
	return ctx.Err()
}

// countingAPI fails the first calls as told and counts per channel.
type countingAPI struct {
	mu    sync.Mutex
	calls map[string]int
	fail  func(n int) error
}

func (a *countingAPI) PostMessageContext(ctx context.Context, ch string, _ ...slack.MsgOption) (string, string, error) {
	a.mu.Lock()
	defer a.mu.Unlock()
	if a.calls == nil {
		a.calls = map[string]int{}
	}
	a.calls[ch]++
	if a.fail != nil {
		if err := a.fail(a.calls[ch]); err != nil {
			return "", "", err
		}
	}
	return ch, fmt.Sprint(a.calls[ch]), nil
}

func (a *countingAPI) PostEphemeralContext(ctx context.Context, ch, user string, _ ...slack.MsgOption) (string, error) {
	_, ts, err := a.PostMessageContext(ctx, ch)
	return ts, err
}

func (a *countingAPI) GetConversationRepliesContext(ctx context.Context, p *slack.GetConversationRepliesParameters) ([]slack.Message, bool, string, error) {
	return nil, false, "", nil
}

func (a *countingAPI) GetConversationHistoryContext(ctx context.Context, p *slack.GetConversationHistoryParameters) (*slack.GetConversationHistoryResponse, error) {
	return &slack.GetConversationHistoryResponse{}, nil
}

func (a *countingAPI) UploadFileContext(ctx context.Context, p slack.UploadFileParameters) (*slack.FileSummary, error) {
	_, _, err := a.PostMessageContext(ctx, p.Channel)
	return &slack.FileSummary{ID: "F"}, err
}

func TestPosterRateLimitsPerChannel(t *testing.T) {
	clk := &stepClock{now: time.Unix(1700000000, 0)}
	p := &Poster{API: &countingAPI{}, Rate: 1, Burst: 2, Now: clk.Now, Sleep: clk.Sleep}
	start := clk.Now()
	for range 5 {
		if _, err := p.Post(context.Background(), "C1", "", Message{Text: "x"}); err != nil {
			t.Fatal(err)
		}
	}
	// Two at once (burst), then one a second: the fifth goes at +3 s.
	if got := clk.Now().Sub(start); got != 3*time.Second {
		t.Errorf("five posts to one channel took %v of clock, want 3s (slept %v)", got, clk.slept)
	}
	// Another channel has its own allowance.
	before := clk.Now()
	p.Post(context.Background(), "C2", "", Message{Text: "x"})
	p.Post(context.Background(), "C2", "", Message{Text: "x"})
	if clk.Now() != before {
		t.Errorf("posts to a fresh channel waited %v", clk.Now().Sub(before))
	}
}

func TestPosterHonoursRetryAfterForTheChannel(t *testing.T) {
	clk := &stepClock{now: time.Unix(1700000000, 0)}
	api := &countingAPI{fail: func(n int) error {
		if n == 1 {
			return &slack.RateLimitedError{RetryAfter: 30 * time.Second}
		}
		return nil
	}}
	p := &Poster{API: api, Rate: 1000, Burst: 10, Now: clk.Now, Sleep: clk.Sleep}
	start := clk.Now()
	if _, err := p.Post(context.Background(), "C1", "", Message{Text: "x"}); err != nil {
		t.Fatal(err)
	}
	if got := clk.Now().Sub(start); got < 30*time.Second || got > 31*time.Second {
		t.Errorf("retry after a 429 with Retry-After 30 s came at +%v", got)
	}
	if api.calls["C1"] != 2 {
		t.Errorf("%d calls, want 2", api.calls["C1"])
	}
}

func TestPosterGivesUp(t *testing.T) {
	clk := &stepClock{now: time.Unix(1700000000, 0)}
	outage := slack.StatusCodeError{Code: 503, Status: "503 Service Unavailable"}
	api := &countingAPI{fail: func(int) error { return outage }}
	p := &Poster{API: api, Backoff: Backoff{Attempts: 4}, Now: clk.Now, Sleep: clk.Sleep}
	_, err := p.Post(context.Background(), "C1", "", Message{Text: "x"})
	if !errors.Is(err, outage) || api.calls["C1"] != 4 {
		t.Errorf("err %v after %d calls; want the outage after 4", err, api.calls["C1"])
	}
	api2 := &countingAPI{fail: func(int) error { return slack.SlackErrorResponse{Err: "channel_not_found"} }}
	p.API = api2
	if _, err := p.Post(context.Background(), "C9", "", Message{Text: "x"}); err == nil || api2.calls["C9"] != 1 {
		t.Errorf("a permanent error was retried: %d calls", api2.calls["C9"])
	}
}
