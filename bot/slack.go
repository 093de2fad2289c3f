package bot

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
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
	Plot          Plotter   // may be nil: no picture
	Pictures      *Pictures // draws and uploads pictures; nil means one worker over Plot
	Journal       Journal   // durable inbox; nil keeps taken messages in memory only
	BotUserID     string    // the bot's own user id (auth.test), if known before start; see SetBotUser
	DigestChannel string    // where scheduled digests go
	Views         ViewsAPI  // opens the request form; nil means no form (help instead)
	Names         *Names    // names people and channels; nil keeps the ids
	AckWait       time.Duration
	Health        *Health
	Now           func() time.Time
	Logger        *slog.Logger
	Metrics       *Metrics

	seen    seenSet
	botUser atomic.Value // string set by SetBotUser
	jwOnce  sync.Once
	jw      *journalWriter
	picOnce sync.Once
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

// has reports whether id was claimed within seenTTL of now.
func (s *seenSet) has(id string, now time.Time) bool {
	s.mu.Lock()
	defer s.mu.Unlock()
	t, ok := s.ids[id]
	return ok && now.Sub(t) < seenTTL
}

func (s *seenSet) release(id string) {
	s.mu.Lock()
	delete(s.ids, id)
	s.mu.Unlock()
}

// intake says what a queued job is to do once the message is (or is not)
// in the inbox.
type intake int

const (
	intakeRun    intake = iota // a new message: answer it
	intakeResume               // owed from before: check what was posted, then answer
	intakeSkip                 // not taken after all (the inbox write failed, or it was answered before)
)

// Submit takes a message for answering. It returns nil once the message is
// queued and, when the Slack has a Journal, written to the inbox: only then
// may the transport acknowledge it. A redelivery of an event this process
// already took, or one already answered, returns nil with nothing to do.
// An error means the message was not taken (queue full until ctx ended, or
// the inbox could not be written); the caller must not acknowledge it, so
// that Slack delivers it again.
func (s *Slack) Submit(ctx context.Context, in Incoming) error {
	if in.Received.IsZero() {
		in.Received = s.now()
	}
	if in.EventID != "" && !s.seen.claim(in.EventID, s.now()) {
		s.Metrics.duplicate()
		s.logger().Info("redelivery of a taken event ignored", "event_id", in.EventID, "retry", in.Retry)
		return nil
	}
	if in.PrevEventID != "" && s.seenBefore(ctx, in.PrevEventID) {
		s.Metrics.duplicate()
		s.logger().Info("replay of a slash command ignored", "event_id", in.EventID, "first_as", in.PrevEventID)
		return nil
	}
	gate := make(chan intake, 1)
	err := s.Queue.Submit(ctx, in.Key(), func(ctx context.Context) { s.process(ctx, in, gate) })
	if err != nil {
		if in.EventID != "" {
			s.seen.release(in.EventID)
		}
		s.Metrics.failed("queue")
		return err
	}
	if s.Journal == nil || in.EventID == "" {
		gate <- intakeRun
		return nil
	}
	how, err := s.record(ctx, in)
	if err != nil {
		gate <- intakeSkip
		s.seen.release(in.EventID)
		return err
	}
	gate <- how
	return nil
}

// seenBefore reports whether id was taken, by this process or (in the
// inbox) an earlier one.
func (s *Slack) seenBefore(ctx context.Context, id string) bool {
	if s.seen.has(id, s.now()) {
		return true
	}
	if s.Journal == nil {
		return false
	}
	_, err := s.Journal.InboxEntryFor(ctx, id)
	return err == nil
}

// record writes in to the inbox and says what its job is to do.
func (s *Slack) record(ctx context.Context, in Incoming) (intake, error) {
	msg, err := json.Marshal(in)
	if err != nil {
		return intakeSkip, fmt.Errorf("encode message: %w", err)
	}
	fresh, err := s.journal().accept(ctx, store.InboxEntry{EventID: in.EventID, Received: in.Received, Thread: in.Key(), Message: msg})
	if err != nil {
		s.logger().Warn("message not written to the inbox; asking Slack to redeliver", "event_id", in.EventID, "err", err)
		return intakeSkip, err
	}
	if fresh {
		return intakeRun, nil
	}
	// In the inbox already: taken by an earlier process (or by this one
	// before a failed hand-over). Answer it only if it is still owed.
	e, err := s.Journal.InboxEntryFor(ctx, in.EventID)
	if err != nil {
		return intakeSkip, err
	}
	if e.State == store.InboxPosted {
		s.Metrics.duplicate()
		s.logger().Info("redelivery of an answered event ignored", "event_id", in.EventID)
		return intakeSkip, nil
	}
	if e.LeasedElsewhere {
		// Another replica took it and is answering it now; if that
		// replica stops first, the sweep of owed answers (Resume) takes
		// it over once its lease runs out.
		s.Metrics.duplicate()
		s.logger().Info("event taken by another replica", "event_id", in.EventID)
		return intakeSkip, nil
	}
	// Pending (owed from an earlier process) or failed (Slack refused the
	// post, e.g. the bot was not in the channel): this delivery is the
	// chance to answer.
	return intakeResume, nil
}

func (s *Slack) journal() *journalWriter {
	s.jwOnce.Do(func() {
		s.jw = newJournalWriter(s.Journal, s.logger(), s.Metrics, nil)
	})
	return s.jw
}

// Resume queues every message the inbox still owes an answer, oldest
// first, so that answers left by a process that stopped (SIGTERM past the
// drain timeout, a crash, a Slack outage) are posted, once and in order
// per thread. Call it before the transports start; called again later, it
// queues only what this process has not taken within the last hour.
func (s *Slack) Resume(ctx context.Context) (int, error) {
	if s.Journal == nil {
		return 0, nil
	}
	var after int64
	n := 0
	for {
		es, err := s.Journal.PendingMessages(ctx, after, journalBatch)
		if err != nil {
			return n, fmt.Errorf("resume owed answers: %w", err)
		}
		if len(es) == 0 {
			return n, nil
		}
		for _, e := range es {
			after = e.Seq
			var in Incoming
			if err := json.Unmarshal(e.Message, &in); err != nil {
				s.logger().Error("owed message unreadable; marking it failed", "event_id", e.EventID, "err", err)
				s.journal().finish(store.Outcome{EventID: e.EventID, State: store.InboxFailed, Detail: "stored message unreadable: " + err.Error()})
				continue
			}
			if !s.seen.claim(e.EventID, s.now()) {
				continue
			}
			gate := make(chan intake, 1)
			gate <- intakeResume
			if err := s.Queue.Submit(ctx, in.Key(), func(ctx context.Context) { s.process(ctx, in, gate) }); err != nil {
				s.seen.release(e.EventID)
				return n, fmt.Errorf("resume owed answers: %w", err)
			}
			n++
		}
	}
}

// process answers one message and posts the answer.
func (s *Slack) process(ctx context.Context, in Incoming, gate <-chan intake) {
	how := <-gate
	if how == intakeSkip || ctx.Err() != nil {
		// Skipped, or the drain timed out: the inbox still owes it, and
		// the next start answers it.
		return
	}
	s.nameSender(&in)
	reply := s.Bot.Answer(ctx, in)
	if ctx.Err() != nil {
		return
	}
	if reply.Duplicate {
		s.outcome(in, store.Outcome{EventID: in.EventID, QueryID: 0, State: store.InboxPosted, Detail: "answered before"})
		return
	}
	var done map[int]bool
	thread := in.ThreadTS
	if how == intakeResume && (reply.QueryID == 0 || reply.Again) {
		// It may have been posted by a process that stopped before
		// recording it: post only the parts that are not in Slack.
		var err error
		thread, done, err = s.alreadyPosted(ctx, in)
		if err != nil {
			s.logger().Warn("could not check what was posted before the restart; posting the whole answer",
				"event_id", in.EventID, "err", err)
			thread, done = in.ThreadTS, nil
		}
	}
	thread, detail, err := s.post(ctx, in, thread, reply, done)
	o := store.Outcome{EventID: in.EventID, QueryID: reply.QueryID, State: store.InboxPosted, Detail: detail}
	switch {
	case err == nil:
		took := s.now().Sub(in.Received)
		s.Metrics.observeReply(took)
		s.logger().Info("answered", "kind", reply.Kind, "query_id", reply.QueryID, "transport", in.Transport,
			"channel", in.Channel, "user", in.UserID, "event_id", in.EventID, "retry", in.Retry, "took", took)
	case ctx.Err() != nil || Retryable(err):
		o.State = store.InboxPending
		s.Metrics.failed("post")
		s.logger().Warn("answer not posted yet; the next start tries again", "channel", in.Channel, "query_id", reply.QueryID, "err", err)
	default:
		o.State = store.InboxFailed
		s.Metrics.failed("post")
		s.logger().Error("answer not posted", "channel", in.Channel, "thread", in.ThreadTS, "query_id", reply.QueryID, "err", err)
	}
	s.outcome(in, o)
}

// nameSender puts the display name of the sender, when known, into in (the
// log keeps the id and the name seen at the time) and refreshes the
// sender's and the channel's names in the background.
func (s *Slack) nameSender(in *Incoming) {
	if s.Names == nil {
		return
	}
	if n := s.Names.Known(in.UserID); n != "" {
		in.UserName = n
	}
	s.Names.Refresh(in.UserID, true)
	if !strings.HasPrefix(in.Channel, "D") {
		s.Names.Refresh(in.Channel, false)
	}
}

// outcome records what came of an answer: in the inbox (with its delivery)
// through the journal writer, or straight into the query log when there
// is no journal.
func (s *Slack) outcome(in Incoming, o store.Outcome) {
	if s.Journal != nil && in.EventID != "" {
		s.journal().finish(o)
		return
	}
	if o.QueryID == 0 || s.Bot.Log == nil || o.Detail == "answered before" {
		return
	}
	ctx, cancel := context.WithTimeout(context.Background(), 30*time.Second)
	defer cancel()
	if err := s.Bot.Log.RecordDelivery(ctx, o.QueryID, o.State == store.InboxPosted, o.Detail); err != nil {
		s.Metrics.failed("log")
		s.logger().Error("delivery not recorded", "query_id", o.QueryID, "err", err)
	}
}

// alreadyPosted finds the thread of a message owed from before (for a
// slash command, the request message the bot posted, "" when none) and
// the answer parts already in it.
func (s *Slack) alreadyPosted(ctx context.Context, in Incoming) (string, map[int]bool, error) {
	thread := in.ThreadTS
	if thread == "" {
		ts, err := s.Poster.PostedRequest(ctx, in.Channel, in.EventID, in.Received.Add(-time.Minute))
		if err != nil || ts == "" {
			return "", nil, err
		}
		thread = ts
	}
	parts, err := s.Poster.PostedParts(ctx, in.Channel, thread, in.EventID)
	return thread, parts, err
}

// Close finishes the work taken, until ctx ends: the answers queued, then
// the pictures, then the outcome records. What is left unposted stays owed
// in the inbox for the next start.
func (s *Slack) Close(ctx context.Context) error {
	err := s.Queue.Close(ctx)
	s.pictures().Close(ctx)
	if s.Journal != nil {
		s.journal().close(ctx)
	}
	return err
}

func (s *Slack) pictures() *Pictures {
	s.picOnce.Do(func() {
		if s.Pictures == nil && s.Plot != nil {
			s.Pictures = &Pictures{Plot: s.Plot, Poster: s.Poster, Logger: s.Logger, Metrics: s.Metrics}
		}
	})
	return s.Pictures
}

// post sends a reply into the message's thread (starting one for a slash
// command, unless thread already names it) and returns the thread. Parts
// in done are already in Slack and are not posted again. detail describes
// the outcome for the log.
func (s *Slack) post(ctx context.Context, in Incoming, thread string, reply Reply, done map[int]bool) (string, string, error) {
	if reply.Private && !strings.HasPrefix(in.Channel, "D") {
		d, err := s.postPrivate(ctx, in, reply)
		return "", d, err
	}
	if thread == "" {
		// A slash command leaves no message to answer under: post the
		// request, then answer in its thread.
		anchor := fmt.Sprintf("<@%s> asked: `%s %s`", in.UserID, esc(orDefault(in.Command, "/mixward")), esc(truncate(in.Text, 500)))
		var meta *slack.SlackMetadata
		if in.EventID != "" {
			meta = &slack.SlackMetadata{EventType: metaRequest, EventPayload: map[string]any{"event_id": in.EventID}}
		}
		ts, err := s.Poster.Post(ctx, in.Channel, "", Message{Text: anchor, Blocks: []slack.Block{section(anchor)}, Meta: meta})
		if err != nil && in.ResponseURL != "" && notMember(err) {
			d, err := s.respondPrivately(ctx, in, reply, err)
			return "", d, err
		}
		if err != nil {
			return "", "request message not posted: " + errText(err), err
		}
		thread = ts
	}
	blocks := replyBlocks(reply)
	msgs := SplitMessages(orDefault(reply.Fallback, reply.Text), blocks)
	var parts []string
	for i, m := range msgs {
		if done[i+1] {
			parts = append(parts, "(posted before)")
			continue
		}
		m.Meta = answerMeta(in.EventID, i+1)
		ts, err := s.Poster.Post(ctx, in.Channel, thread, m)
		if err != nil {
			return thread, fmt.Sprintf("part %d of %d not posted: %s", i+1, len(msgs), errText(err)), err
		}
		parts = append(parts, ts)
	}
	if f := reply.File; f != nil && !done[len(msgs)+1] {
		if err := s.Poster.Upload(ctx, in.Channel, thread, f.Name, f.Title, "", f.Content); err != nil {
			return thread, fmt.Sprintf("posted in %s thread %s as %s; file %s not uploaded: %s", in.Channel, thread,
				strings.Join(parts, ","), f.Name, errText(err)), err
		}
		parts = append(parts, "file "+f.Name)
	}
	return thread, fmt.Sprintf("posted in %s thread %s as %s", in.Channel, thread, strings.Join(parts, ",")), nil
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
	} else {
		// No trigger id (Slack always sends one; a replay or a hand-made
		// request may not): the command is known by a hash of its fields
		// within a time slot, so a replay is answered once.
		in.EventID, in.PrevEventID = commandSum(c, in.Received)
	}
	return in
}

// CommandWindow is the time slot within which a slash command without a
// trigger_id counts as a replay of one with the same fields: the current
// and the previous slot are checked, so a replay between 5 and 10 minutes
// after the first is caught too. It matches the signature window, the
// longest a signed request can be replayed.
const CommandWindow = SignatureWindow

// commandSum is the id of a slash command without trigger_id in the slot
// of at, and in the slot before: "cmd-sum:" + the first 32 hex digits of
// the SHA-256 of team, channel, user, command, text and response URL, +
// "@" + the slot number.
func commandSum(c slack.SlashCommand, at time.Time) (id, prev string) {
	h := sha256.New()
	for _, f := range []string{c.TeamID, c.ChannelID, c.UserID, c.Command, c.Text, c.ResponseURL} {
		h.Write([]byte(f))
		h.Write([]byte{0})
	}
	sum := hex.EncodeToString(h.Sum(nil))[:32]
	slot := at.Unix() / int64(CommandWindow/time.Second)
	return fmt.Sprintf("cmd-sum:%s@%d", sum, slot), fmt.Sprintf("cmd-sum:%s@%d", sum, slot-1)
}

// commandAck is the immediate, private answer to a slash command: it says
// where the answer will appear, truthfully for each kind of command.
func commandAck(in Incoming) map[string]string {
	cmd, _ := ParseCommand(in.Text, nil)
	text := "Working on it: I will post your request in this channel and answer in its thread " +
		"(if I am not a member of this channel, only you will see the answer)."
	switch {
	case cmd.Kind == KindHelp || cmd.Kind == KindSearch:
		text = "Working on it: only you will see the answer, here in a moment."
	case strings.HasPrefix(in.Channel, "D"):
		text = "Working on it: the answer will appear here in a moment."
	case cmd.Kind == KindDigest || (cmd.Kind == KindStreams && (cmd.Action == "set" || cmd.Action == "remove")):
		text = "Working on it: I will post your request in this channel and answer in its thread; " +
			"if the command is not open to you, only you will see my reply."
	}
	return map[string]string{"response_type": "ephemeral", "text": text}
}

// PublishDigest posts a scheduled digest to the supervisors' channel: the
// summary message, then the whole digest as a text file in its thread. It
// implements store.Publisher.
func (s *Slack) PublishDigest(ctx context.Context, d *store.Digest) error {
	if s.DigestChannel == "" {
		return errors.New("no digest channel configured (set MIXWARD_DIGEST_CHANNEL)")
	}
	r := DigestReply(d)
	ts, err := s.Poster.Post(ctx, s.DigestChannel, "", SplitMessages(r.Fallback, r.Blocks)[0])
	if err != nil {
		return fmt.Errorf("post digest to %s: %w", s.DigestChannel, err)
	}
	if err := s.Poster.Upload(ctx, s.DigestChannel, ts, r.File.Name, r.File.Title, "", r.File.Content); err != nil {
		return fmt.Errorf("attach the digest file in %s: %w", s.DigestChannel, err)
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
