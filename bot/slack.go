package bot

import (
	"context"
	"errors"
	"fmt"
	"log/slog"
	"strings"
	"sync"
	"sync/atomic"
	"time"

	"github.com/slack-go/slack"
	"github.com/slack-go/slack/slackevents"

	"mixward/store"
)

// Slack connects a Bot to Slack. Messages are acknowledged at once, then
// queued per thread (Queue) and answered by workers that log before they
// post; posts go through Poster. The same Slack serves Socket Mode and the
// HTTP Events API.
type Slack struct {
	Bot           *Bot
	Poster        *Poster
	Queue         *Queue
	Plot          Plotter // may be nil: no picture
	BotUserID     string  // the bot's own user id (auth.test), if known before start; see SetBotUser
	DigestChannel string  // where scheduled digests go
	AckWait       time.Duration
	Health        *Health
	Now           func() time.Time
	Logger        *slog.Logger
	Metrics       *Metrics

	seen    seenSet
	botUser atomic.Value // string set by SetBotUser
}

// SetBotUser records the bot's own user id once it is known (auth.test may
// answer after the transports started). Safe to call concurrently.
func (s *Slack) SetBotUser(id string) { s.botUser.Store(id) }

// me is the bot's own user id, "" when not known.
func (s *Slack) me() string {
	if id, _ := s.botUser.Load().(string); id != "" {
		return id
	}
	return s.BotUserID
}

func (s *Slack) now() time.Time {
	if s.Now != nil {
		return s.Now()
	}
	return time.Now()
}

func (s *Slack) logger() *slog.Logger {
	if s.Logger != nil {
		return s.Logger
	}
	return slog.New(slog.DiscardHandler)
}

// seenSet remembers recent event ids so a redelivery that arrives while the
// first is still queued is not queued twice. The query log's unique event
// id is the durable guard; this one only covers the gap before logging.
type seenSet struct {
	mu  sync.Mutex
	ids map[string]time.Time
}

const seenTTL = time.Hour

// claim records id and reports whether it was new.
func (s *seenSet) claim(id string, now time.Time) bool {
	s.mu.Lock()
	defer s.mu.Unlock()
	if s.ids == nil {
		s.ids = map[string]time.Time{}
	}
	if t, ok := s.ids[id]; ok && now.Sub(t) < seenTTL {
		return false
	}
	if len(s.ids) > 10000 {
		for k, t := range s.ids {
			if now.Sub(t) >= seenTTL {
				delete(s.ids, k)
			}
		}
	}
	s.ids[id] = now
	return true
}

func (s *seenSet) release(id string) {
	s.mu.Lock()
	delete(s.ids, id)
	s.mu.Unlock()
}

// Submit queues a message for answering. It returns nil for a redelivery of
// an event already taken (nothing to do), and an error when the queue did
// not take the message before ctx ended; the caller then must not
// acknowledge it, so that Slack delivers it again.
func (s *Slack) Submit(ctx context.Context, in Incoming) error {
	if in.Received.IsZero() {
		in.Received = s.now()
	}
	if in.EventID != "" && !s.seen.claim(in.EventID, s.now()) {
		s.Metrics.duplicate()
		s.logger().Info("redelivery of a taken event ignored", "event_id", in.EventID, "retry", in.Retry)
		return nil
	}
	err := s.Queue.Submit(ctx, in.Key(), func(ctx context.Context) { s.process(ctx, in) })
	if err != nil {
		if in.EventID != "" {
			s.seen.release(in.EventID)
		}
		s.Metrics.failed("queue")
		return err
	}
	return nil
}

// process answers one message and posts the answer.
func (s *Slack) process(ctx context.Context, in Incoming) {
	reply := s.Bot.Answer(ctx, in)
	if reply.Duplicate {
		return
	}
	detail, err := s.post(ctx, in, reply)
	if err == nil {
		took := s.now().Sub(in.Received)
		s.Metrics.observeReply(took)
		s.logger().Info("answered", "kind", reply.Kind, "query_id", reply.QueryID, "transport", in.Transport,
			"channel", in.Channel, "user", in.UserID, "event_id", in.EventID, "retry", in.Retry, "took", took)
	} else {
		s.Metrics.failed("post")
		s.logger().Error("answer not posted", "channel", in.Channel, "thread", in.ThreadTS, "query_id", reply.QueryID, "err", err)
	}
	if reply.QueryID > 0 && s.Bot.Log != nil {
		// Record the outcome even when the work context is being
		// cancelled by a shutdown that ran out of time.
		rctx, cancel := context.WithTimeout(context.WithoutCancel(ctx), 10*time.Second)
		defer cancel()
		if rerr := s.Bot.Log.RecordDelivery(rctx, reply.QueryID, err == nil, detail); rerr != nil {
			s.Metrics.failed("log")
			s.logger().Error("delivery not recorded", "query_id", reply.QueryID, "err", rerr)
		}
	}
}

// post sends a reply into the message's thread (starting one for a slash
// command) and uploads the E–pH picture. detail describes the outcome for
// the log.
func (s *Slack) post(ctx context.Context, in Incoming, reply Reply) (detail string, err error) {
	if reply.Private && !strings.HasPrefix(in.Channel, "D") {
		return s.postPrivate(ctx, in, reply)
	}
	thread := in.ThreadTS
	if thread == "" {
		// A slash command leaves no message to answer under: post the
		// request, then answer in its thread.
		anchor := fmt.Sprintf("<@%s> asked: `%s %s`", in.UserID, esc(orDefault(in.Command, "/mixward")), esc(in.Text))
		ts, err := s.Poster.Post(ctx, in.Channel, "", Message{Text: anchor, Blocks: []slack.Block{section(anchor)}})
		if err != nil && in.ResponseURL != "" && notMember(err) {
			return s.respondPrivately(ctx, in, reply, err)
		}
		if err != nil {
			return "request message not posted: " + errText(err), err
		}
		thread = ts
	}
	blocks := replyBlocks(reply)
	msgs := SplitMessages(reply.Text, blocks)
	var parts []string
	for i, m := range msgs {
		ts, err := s.Poster.Post(ctx, in.Channel, thread, m)
		if err != nil {
			return fmt.Sprintf("part %d of %d not posted: %s", i+1, len(msgs), errText(err)), err
		}
		parts = append(parts, ts)
	}
	detail = fmt.Sprintf("posted in %s thread %s as %s", in.Channel, thread, strings.Join(parts, ","))
	if reply.Result != nil && s.Plot != nil {
		png, ok, perr := s.Plot.Plot(reply.Result)
		switch {
		case perr != nil:
			s.logger().Warn("E–pH picture not drawn", "query_id", reply.QueryID, "err", perr)
			detail += "; picture not drawn"
		case ok && len(png) > 0:
			name := fmt.Sprintf("mixward-eph-%d.png", reply.QueryID)
			title := "E–pH picture: " + truncate(reply.Result.Request, 200)
			alt := "E–pH diagram of the oxidizing and reducing couples with the mix pH marked"
			if uerr := s.Poster.Upload(ctx, in.Channel, thread, name, title, alt, png); uerr != nil {
				s.Metrics.failed("upload")
				s.logger().Warn("E–pH picture not uploaded", "query_id", reply.QueryID, "err", uerr)
				detail += "; picture not uploaded: " + errText(uerr)
			} else {
				detail += "; picture uploaded"
			}
		}
	}
	return detail, nil
}

func orDefault(s, d string) string {
	if s == "" {
		return d
	}
	return s
}

// errText is an error as recorded in the log: Slack's error code or the
// transport failure, never a token (slack-go never puts one in errors).
func errText(err error) string {
	return truncate(err.Error(), 300)
}

// FromEvent turns an Events API callback into a message for the bot. ok is
// false for events the bot does not answer: its own or other bots'
// messages, edits, and channel messages that do not mention it (those
// arrive as app_mention).
func (s *Slack) FromEvent(ev slackevents.EventsAPIEvent, transport string, retry int) (Incoming, bool) {
	if ev.Type != slackevents.CallbackEvent {
		return Incoming{}, false
	}
	cb, _ := ev.Data.(*slackevents.EventsAPICallbackEvent)
	in := Incoming{Transport: transport, Retry: retry, Received: s.now()}
	me := s.me()
	if cb != nil {
		in.EventID = cb.EventID
	}
	switch e := ev.InnerEvent.Data.(type) {
	case *slackevents.AppMentionEvent:
		if e.BotID != "" || (me != "" && e.User == me) || e.User == "" {
			return Incoming{}, false
		}
		in.Channel, in.UserID, in.Text = e.Channel, e.User, CleanText(e.Text, me)
		in.ThreadTS = orDefault(e.ThreadTimeStamp, e.TimeStamp)
	case *slackevents.MessageEvent:
		if e.ChannelType != "im" || e.SubType != "" || e.BotID != "" || e.User == "" || (me != "" && e.User == me) {
			return Incoming{}, false
		}
		in.Channel, in.UserID, in.Text = e.Channel, e.User, CleanText(e.Text, me)
		in.ThreadTS = orDefault(e.ThreadTimeStamp, e.TimeStamp)
	default:
		return Incoming{}, false
	}
	if in.ThreadTS == "" {
		return Incoming{}, false
	}
	return in, true
}

// FromCommand turns a slash command into a message for the bot.
func (s *Slack) FromCommand(c slack.SlashCommand, transport string) Incoming {
	in := Incoming{
		Transport:   transport,
		Channel:     c.ChannelID,
		UserID:      c.UserID,
		UserName:    c.UserName,
		Text:        CleanText(c.Text, s.me()),
		Command:     orDefault(c.Command, "/mixward"),
		ResponseURL: c.ResponseURL,
		Received:    s.now(),
	}
	if c.TriggerID != "" {
		in.EventID = "cmd:" + c.TriggerID
	}
	return in
}

// commandAck is the immediate, private answer to a slash command.
func commandAck(in Incoming) map[string]string {
	text := "Working on it; the answer will appear in a thread in this channel."
	if strings.TrimSpace(in.Text) == "" {
		text = "Asking for help; the answer will appear in a thread in this channel."
	}
	return map[string]string{"response_type": "ephemeral", "text": text}
}

// PublishDigest posts a scheduled digest to the supervisors' channel. It
// implements store.Publisher.
func (s *Slack) PublishDigest(ctx context.Context, d *store.Digest) error {
	if s.DigestChannel == "" {
		return errors.New("no digest channel configured (set MIXWARD_DIGEST_CHANNEL)")
	}
	r := DigestReply(d)
	for _, m := range SplitMessages(truncate(strings.SplitN(r.Text, "\n", 2)[0], 200), r.Blocks) {
		if _, err := s.Poster.Post(ctx, s.DigestChannel, "", m); err != nil {
			return fmt.Errorf("post digest to %s: %w", s.DigestChannel, err)
		}
	}
	return nil
}

var _ store.Publisher = (*Slack)(nil)

// notMember reports whether a post failed because the bot may not post in
// the channel (not invited, a private channel, a direct message between
// other people).
func notMember(err error) bool {
	se, ok := errors.AsType[slack.SlackErrorResponse](err)
	if !ok {
		return false
	}
	switch se.Err {
	case "not_in_channel", "channel_not_found", "restricted_action":
		return true
	}
	return false
}

// privateNote heads an answer sent through a slash command's response URL.
const privateNote = "Only you can see this answer: I am not a member of this channel, so I could not answer in it. " +
	"Invite me (`/invite @mixward`) to have answers posted in the channel. The query is in the log all the same."

// respondPrivately answers a slash command through its response URL when
// the bot cannot post in the channel.
func (s *Slack) respondPrivately(ctx context.Context, in Incoming, reply Reply, cause error) (string, error) {
	blocks := replyBlocks(reply)
	blocks = append([]slack.Block{contextBlock(privateNote)}, blocks...)
	msgs := SplitMessages(privateNote+"\n\n"+reply.Text, blocks)
	for i, m := range msgs {
		if err := s.Poster.Respond(ctx, in.Channel, in.ResponseURL, m); err != nil {
			return fmt.Sprintf("not a member of %s (%s); private answer part %d of %d not sent: %s", in.Channel, errText(cause), i+1, len(msgs), errText(err)), err
		}
	}
	return fmt.Sprintf("not a member of %s (%s); answered privately through the slash command's response URL in %d part(s)", in.Channel, errText(cause), len(msgs)), nil
}

// postPrivate shows a reply in the channel to the person who asked alone.
func (s *Slack) postPrivate(ctx context.Context, in Incoming, reply Reply) (string, error) {
	blocks := replyBlocks(reply)
	msgs := SplitMessages(reply.Text, blocks)
	for i, m := range msgs {
		if err := s.Poster.Ephemeral(ctx, in.Channel, in.UserID, in.ThreadTS, m); err != nil {
			return fmt.Sprintf("private reply part %d of %d not shown: %s", i+1, len(msgs), errText(err)), err
		}
	}
	return fmt.Sprintf("shown privately to %s in %s in %d part(s)", in.UserID, in.Channel, len(msgs)), nil
}

// replyBlocks is a reply's Block Kit form, its text as sections when it has
// none of its own.
func replyBlocks(reply Reply) []slack.Block {
	if reply.Blocks != nil {
		return reply.Blocks
	}
	return TextBlocks(esc(reply.Text))
}
