package bot

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"io"
	"log/slog"
	"mixward/store"
	"net"
	"strings"
	"sync"
	"time"

	"github.com/slack-go/slack"
	"golang.org/x/time/rate"
)

// SlackAPI is the part of the Slack Web API the bot calls. *slack.Client
// implements it.
type SlackAPI interface {
	PostMessageContext(ctx context.Context, channelID string, options ...slack.MsgOption) (string, string, error)
	UploadFileContext(ctx context.Context, params slack.UploadFileParameters) (*slack.FileSummary, error)
	PostEphemeralContext(ctx context.Context, channelID, userID string, options ...slack.MsgOption) (string, error)
	GetConversationRepliesContext(ctx context.Context, params *slack.GetConversationRepliesParameters) ([]slack.Message, bool, string, error)
	GetConversationHistoryContext(ctx context.Context, params *slack.GetConversationHistoryParameters) (*slack.GetConversationHistoryResponse, error)
}

// Backoff is the retry policy for Slack calls that failed in a way worth
// retrying (network errors, 5xx, rate limits).
type Backoff struct {
	Attempts int           // total tries of one call; 0 means 10
	Base     time.Duration // first wait; 0 means 1 s
	Max      time.Duration // longest wait; 0 means 2 min
}

func (b Backoff) attempts() int {
	if b.Attempts <= 0 {
		return 10
	}
	return b.Attempts
}

// Wait is the wait before retry number n (n = 1 after the first failure).
func (b Backoff) Wait(n int) time.Duration {
	base, most := b.Base, b.Max
	if base <= 0 {
		base = time.Second
	}
	if most <= 0 {
		most = 2 * time.Minute
	}
	d := base
	for i := 1; i < n && d < most; i++ {
		d *= 2
	}
	return min(d, most)
}

// Poster sends messages and files to Slack through a per-channel rate
// limiter, honours Slack's Retry-After on HTTP 429 for the whole channel,
// and retries transient failures with backoff. The clock and the sleep are
// injected so tests never wait.
type Poster struct {
	API     SlackAPI
	Rate    rate.Limit // posts per second per channel; 0 means 1
	Burst   int        // 0 means 3
	Backoff Backoff
	Now     func() time.Time
	Sleep   func(ctx context.Context, d time.Duration) error // nil means a real timer
	Metrics *Metrics
	Log     *slog.Logger

	mu       sync.Mutex
	channels map[string]*channelGate
}

type channelGate struct {
	lim   *rate.Limiter
	until time.Time // Slack asked us to hold posts to this channel until then
}

// Message is one Slack message: blocks with their plain-text fallback.
type Message struct {
	Text   string
	Blocks []slack.Block
	Meta   *slack.SlackMetadata // carried with the message, so a restarted bot can find it
}

// SleepContext waits for d or until ctx ends.
func SleepContext(ctx context.Context, d time.Duration) error {
	if d <= 0 {
		return ctx.Err()
	}
	t := time.NewTimer(d)
	defer t.Stop()
	select {
	case <-t.C:
		return nil
	case <-ctx.Done():
		return ctx.Err()
	}
}

func (p *Poster) now() time.Time {
	if p.Now != nil {
		return p.Now()
	}
	return time.Now()
}

func (p *Poster) sleep(ctx context.Context, d time.Duration) error {
	if p.Sleep != nil {
		return p.Sleep(ctx, d)
	}
	return SleepContext(ctx, d)
}

func (p *Poster) gate(channel string) *channelGate {
	p.mu.Lock()
	defer p.mu.Unlock()
	if p.channels == nil {
		p.channels = map[string]*channelGate{}
	}
	g, ok := p.channels[channel]
	if !ok {
		r, b := p.Rate, p.Burst
		if r == 0 {
			r = 1
		}
		if b <= 0 {
			b = 3
		}
		g = &channelGate{lim: rate.NewLimiter(r, b)}
		p.channels[channel] = g
	}
	return g
}

// wait blocks until channel may take one more call.
func (p *Poster) wait(ctx context.Context, channel string) error {
	g := p.gate(channel)
	p.mu.Lock()
	hold := g.until.Sub(p.now())
	p.mu.Unlock()
	if hold > 0 {
		if err := p.sleep(ctx, hold); err != nil {
			return err
		}
	}
	now := p.now()
	r := g.lim.ReserveN(now, 1)
	if !r.OK() {
		return fmt.Errorf("rate limiter for %s refuses any post (burst 0)", channel)
	}
	if d := r.DelayFrom(now); d > 0 {
		if err := p.sleep(ctx, d); err != nil {
			r.CancelAt(p.now())
			return err
		}
	}
	return nil
}

// holdChannel keeps every worker off channel until Slack's Retry-After passed.
func (p *Poster) holdChannel(channel string, d time.Duration) {
	g := p.gate(channel)
	p.mu.Lock()
	if t := p.now().Add(d); t.After(g.until) {
		g.until = t
	}
	p.mu.Unlock()
}

// call runs one Slack call for channel with rate limiting and retries.
func (p *Poster) call(ctx context.Context, channel, what string, f func(ctx context.Context) error) error {
	var err error
	n := p.Backoff.attempts()
	for attempt := 1; ; attempt++ {
		if err = p.wait(ctx, channel); err != nil {
			return err
		}
		start := p.now()
		err = f(ctx)
		p.Metrics.observePost(what, p.now().Sub(start), err)
		if err == nil {
			return nil
		}
		if attempt >= n || !Retryable(err) {
			return err
		}
		wait := p.Backoff.Wait(attempt)
		if rl, ok := errors.AsType[*slack.RateLimitedError](err); ok {
			wait = max(rl.RetryAfter, time.Second)
			p.holdChannel(channel, wait)
			wait = 0 // the hold makes the next wait() sleep
		}
		if p.Log != nil {
			p.Log.Warn("slack call failed, retrying", "call", what, "channel", channel, "attempt", attempt, "err", err, "retry_in", wait)
		}
		if err := p.sleep(ctx, wait); err != nil {
			return fmt.Errorf("%s: %w (gave up waiting to retry: %v)", what, err, ctx.Err())
		}
	}
}

// Retryable reports whether a failed Slack call may succeed if tried again.
func Retryable(err error) bool {
	if err == nil {
		return false
	}
	if errors.Is(err, context.Canceled) || errors.Is(err, context.DeadlineExceeded) {
		return false
	}
	if _, ok := errors.AsType[*slack.RateLimitedError](err); ok {
		return true
	}
	if sc, ok := errors.AsType[slack.StatusCodeError](err); ok {
		return sc.Retryable()
	}
	if se, ok := errors.AsType[slack.SlackErrorResponse](err); ok {
		switch se.Err {
		case "ratelimited", "internal_error", "fatal_error", "service_unavailable", "request_timeout":
			return true
		}
		return false
	}
	if _, ok := errors.AsType[net.Error](err); ok {
		return true // includes *url.Error: connection refused, reset, timeouts
	}
	return errors.Is(err, io.ErrUnexpectedEOF) || errors.Is(err, io.EOF)
}

// Post sends msg to channel, in the thread threadTS when not empty, and
// returns the timestamp of the posted message.
func (p *Poster) Post(ctx context.Context, channel, threadTS string, msg Message) (string, error) {
	opts := []slack.MsgOption{slack.MsgOptionText(chatText(msg.Text), false)}
	if len(msg.Blocks) > 0 {
		opts = append(opts, slack.MsgOptionBlocks(msg.Blocks...))
	}
	if threadTS != "" {
		opts = append(opts, slack.MsgOptionTS(threadTS))
	}
	if msg.Meta != nil {
		opts = append(opts, slack.MsgOptionMetadata(*msg.Meta))
	}
	var ts string
	err := p.call(ctx, channel, "chat.postMessage", func(ctx context.Context) error {
		var err error
		_, ts, err = p.API.PostMessageContext(ctx, channel, opts...)
		return err
	})
	return ts, err
}

// Ephemeral shows msg in channel (in thread threadTS when not empty) to
// user alone.
func (p *Poster) Ephemeral(ctx context.Context, channel, user, threadTS string, msg Message) error {
	opts := []slack.MsgOption{slack.MsgOptionText(chatText(msg.Text), false)}
	if len(msg.Blocks) > 0 {
		opts = append(opts, slack.MsgOptionBlocks(msg.Blocks...))
	}
	if threadTS != "" {
		opts = append(opts, slack.MsgOptionTS(threadTS))
	}
	return p.call(ctx, channel, "chat.postEphemeral", func(ctx context.Context) error {
		_, err := p.API.PostEphemeralContext(ctx, channel, user, opts...)
		return err
	})
}

// Respond sends msg to a slash command's response URL, seen only by the
// person who asked. It is how the bot answers in a channel it is not a
// member of. The rate limit of channel applies.
func (p *Poster) Respond(ctx context.Context, channel, responseURL string, msg Message) error {
	opts := []slack.MsgOption{slack.MsgOptionText(msg.Text, false), slack.MsgOptionResponseURL(responseURL, slack.ResponseTypeEphemeral)}
	if len(msg.Blocks) > 0 {
		opts = append(opts, slack.MsgOptionBlocks(msg.Blocks...))
	}
	return p.call(ctx, channel, "response_url", func(ctx context.Context) error {
		_, _, err := p.API.PostMessageContext(ctx, channel, opts...)
		return err
	})
}

// Upload puts a PNG into channel's thread threadTS.
func (p *Poster) Upload(ctx context.Context, channel, threadTS, filename, title, alt string, png []byte) error {
	return p.call(ctx, channel, "files.upload", func(ctx context.Context) error {
		_, err := p.API.UploadFileContext(ctx, slack.UploadFileParameters{
			Reader:          bytes.NewReader(png),
			FileSize:        len(png),
			Filename:        filename,
			Title:           title,
			AltTxt:          alt,
			Channel:         channel,
			ThreadTimestamp: threadTS,
		})
		return err
	})
}

// The metadata event types the bot marks its messages with.
const (
	metaAnswer  = "mixward_answer"  // one part of an answer; payload event_id, part
	metaRequest = "mixward_request" // a slash command's request message; payload event_id
)

func answerMeta(eventID string, part int) *slack.SlackMetadata {
	if eventID == "" {
		return nil
	}
	return &slack.SlackMetadata{EventType: metaAnswer, EventPayload: map[string]any{"event_id": eventID, "part": part}}
}

func metaEvent(m slack.SlackMetadata, typ string) (eventID string, part int) {
	if m.EventType != typ {
		return "", 0
	}
	id, _ := m.EventPayload["event_id"].(string)
	if f, ok := m.EventPayload["part"].(float64); ok {
		part = int(f)
	}
	return id, part
}

// lookupPages bounds how many pages of history a lookup reads.
const lookupPages = 10

// PostedParts finds the parts of the answer to eventID already in thread
// threadTS (the bot's messages carrying the event id in their metadata):
// what a process that stopped between posting and recording left behind.
// It needs the conversations history scopes (channels:history,
// groups:history, im:history, mpim:history).
func (p *Poster) PostedParts(ctx context.Context, channel, threadTS, eventID string) (map[int]bool, error) {
	parts := map[int]bool{}
	params := &slack.GetConversationRepliesParameters{ChannelID: channel, Timestamp: threadTS, Limit: 200, IncludeAllMetadata: true}
	for range lookupPages {
		var msgs []slack.Message
		var more bool
		var next string
		err := p.call(ctx, channel, "conversations.replies", func(ctx context.Context) error {
			var err error
			msgs, more, next, err = p.API.GetConversationRepliesContext(ctx, params)
			return err
		})
		if err != nil {
			return nil, err
		}
		for _, m := range msgs {
			if id, part := metaEvent(m.Metadata, metaAnswer); id == eventID {
				parts[part] = true
			}
		}
		if !more || next == "" {
			break
		}
		params.Cursor = next
	}
	return parts, nil
}

// PostedRequest finds the request message the bot posted for a slash
// command (eventID) in channel since since; "" when there is none.
func (p *Poster) PostedRequest(ctx context.Context, channel, eventID string, since time.Time) (string, error) {
	params := &slack.GetConversationHistoryParameters{ChannelID: channel, Limit: 200, IncludeAllMetadata: true,
		Oldest: fmt.Sprintf("%d.000000", since.Unix())}
	for range lookupPages {
		var resp *slack.GetConversationHistoryResponse
		err := p.call(ctx, channel, "conversations.history", func(ctx context.Context) error {
			var err error
			resp, err = p.API.GetConversationHistoryContext(ctx, params)
			return err
		})
		if err != nil {
			return "", err
		}
		for _, m := range resp.Messages {
			if id, _ := metaEvent(m.Metadata, metaRequest); id == eventID {
				return m.Timestamp, nil
			}
		}
		if !resp.HasMore || resp.ResponseMetaData.NextCursor == "" {
			break
		}
		params.Cursor = resp.ResponseMetaData.NextCursor
	}
	return "", nil
}

// chatText shows control, escape and bidi characters of a message's plain
// text escaped, line by line, keeping its line breaks.
func chatText(s string) string {
	lines := strings.Split(s, "\n")
	for i, l := range lines {
		lines[i] = store.Printable(l)
	}
	return strings.Join(lines, "\n")
}
