// Package bot answers mix requests where operators talk: in Slack (Socket
// Mode, or the HTTP Events API with a slash command) and in a local
// terminal console. It is the only package that imports slack-go.
//
// The pieces: Bot turns one message into a Reply (engine call, query log,
// stream catalogue, search, digest, access rules) without knowing the
// transport; Slack takes messages from Slack, queues them on a fixed pool of
// workers (Queue), writes them to a durable inbox (Journal) and only then
// acknowledges them, and posts the replies as Block Kit through a
// rate-limited, retrying Poster, with the E–pH picture after the answer from
// a small pool of its own (Pictures); Console reads lines from a terminal or
// a pipe and prints the same replies as plain text.
package bot

import (
	"context"
	"crypto/sha256"
	"encoding/json"
	"errors"
	"fmt"
	"log/slog"
	"regexp"
	"strings"
	"sync"
	"time"
	"unicode/utf8"

	"github.com/slack-go/slack"

	"mixward/engine"
	"mixward/store"
)

// Answerer answers mix requests. *engine.Engine implements it.
type Answerer interface {
	Ask(text string, opt engine.AskOptions) (*engine.Result, error)
}

// QueryLog is the query log: every mix request is written before it is
// answered, and the outcome of posting the answer is recorded after.
// *store.DB implements it.
type QueryLog interface {
	LogQuery(ctx context.Context, q *store.Query) (int64, error)
	RecordDelivery(ctx context.Context, queryID int64, ok bool, detail string) error
}

// Searcher searches the query log (reviewers only). *store.DB implements it.
type Searcher interface {
	Search(ctx context.Context, o store.SearchOptions) (store.SearchPage, error)
}

// Catalogue is the site stream catalogue. *store.DB implements it.
type Catalogue interface {
	SetStream(ctx context.Context, tag, stream, note, by string) error
	RemoveStream(ctx context.Context, tag, by string) error
	Stream(ctx context.Context, tag string) (store.Stream, error)
	Streams(ctx context.Context) ([]store.Stream, error)
	StreamHistory(ctx context.Context, tag string) ([]store.StreamChange, error)
}

// Plotter draws the E–pH picture of a result as PNG; ok is false when the
// result has no pair to draw.
type Plotter interface {
	Plot(r *engine.Result) (png []byte, ok bool, err error)
}

// Incoming is one message to the bot, from any transport.
type Incoming struct {
	Transport   string // "socket", "http" or "console"
	EventID     string // Slack event id (or slash-command trigger id); "" when none
	Retry       int    // Slack's redelivery attempt number, 0 for the first delivery
	Channel     string // Slack channel id, or "console"
	ThreadTS    string // thread to answer in; "" for a slash command (a thread is started)
	UserID      string
	UserName    string
	Text        string // as typed, Slack escaping undone and bot mention removed
	Command     string // "/mixward" when it came as a slash command
	ResponseURL string
	Received    time.Time

	// FullBytes and FullSHA256 describe the whole message when the
	// transport kept only its start in Text (a console line over 1 MiB);
	// zero and "" when Text is the whole message.
	FullBytes  int
	FullSHA256 string
	// PrevEventID is the id the same slash command (without trigger_id)
	// had in the previous time slot; a message seen under it is a replay.
	PrevEventID string
}

// Key is the ordering key: replies with the same key are posted in order.
func (in Incoming) Key() string {
	if in.ThreadTS != "" {
		return in.Channel + "/" + in.ThreadTS
	}
	return in.Channel + "/@" + in.UserID
}

// Reply is what the bot answers to one message.
type Reply struct {
	Kind      Kind
	Text      string         // the whole answer as plain text: console output, Slack fallback
	Fallback  string         // Slack's notification text when not Text ("" means Text)
	Blocks    []slack.Block  // Block Kit form for Slack; nil means Text as sections
	Result    *engine.Result // the mix answer, for the picture; nil otherwise
	QueryID   int64          // id in the query log; 0 when nothing was logged
	Duplicate bool           // the event was already answered: post nothing
	Again     bool           // the query was logged before under this event id and may have been posted
	Private   bool           // in a channel, show only to the person who asked (search results, help, refusals)
	File      *File          // a text file posted after the message in Slack (the full digest); nil when none
}

// File is a text file attached to a reply.
type File struct {
	Name, Title string
	Content     []byte
}

// Bot answers messages. Its fields are set once before use; it is safe for
// concurrent use afterwards.
type Bot struct {
	Engine      Answerer
	Render      func(*engine.Result) string // plain text of an answer; nil means engine.RenderText
	CheckStream func(text string) error     // validates "streams set" text; nil accepts anything
	Log         QueryLog
	Catalogue   Catalogue
	Searcher    Searcher
	Digests     Digester
	Access      *Access
	Now         func() time.Time
	Sleep       func(ctx context.Context, d time.Duration) error // waits between log retries
	Location    *time.Location                                   // site time zone for dates
	ShiftStart  func(now time.Time) time.Time                    // start of the shift now is in; nil means 12 h ago
	Logger      *slog.Logger
	Metrics     *Metrics

	EngineVersion string
	DataHash      string
	ConsoleHelp   bool // help says the console user may do everything
}

func (b *Bot) now() time.Time {
	if b.Now != nil {
		return b.Now()
	}
	return time.Now()
}

func (b *Bot) loc() *time.Location {
	if b.Location != nil {
		return b.Location
	}
	return time.UTC
}

func (b *Bot) logger() *slog.Logger {
	if b.Logger != nil {
		return b.Logger
	}
	return slog.New(slog.DiscardHandler)
}

// Answer works out the reply to one message. It never fails: every problem
// becomes text for the person who asked, and internals go to the log only.
func (b *Bot) Answer(ctx context.Context, in Incoming) Reply {
	if in.FullBytes > MaxRequestBytes || len(in.Text) > MaxRequestBytes {
		b.Metrics.request(in.Transport, string(KindMix))
		return b.oversize(ctx, in)
	}
	cmd, err := ParseCommand(in.Text, b.loc())
	b.Metrics.request(in.Transport, string(cmd.Kind))
	if err != nil {
		return usageReply(cmd.Kind, err)
	}
	switch cmd.Kind {
	case KindHelp:
		return b.help()
	case KindStreams:
		return b.streams(ctx, in, cmd)
	case KindSearch:
		return b.search(ctx, in, cmd.Search)
	case KindDigest:
		return b.digest(ctx, in, cmd.Hours)
	case KindReview:
		return b.review(ctx)
	}
	return b.mix(ctx, in, cmd.Text)
}

// MaxRequestBytes is the longest message the bot works out, in bytes (the
// engine's own limit on a request; chat messages are far shorter).
const MaxRequestBytes = 4000

// oversize answers a message over MaxRequestBytes: it is logged cut to the
// limit, with its full length and SHA-256, and the answer names the limit
// without echoing the message.
func (b *Bot) oversize(ctx context.Context, in Incoming) Reply {
	n, sum := in.FullBytes, in.FullSHA256
	if sum == "" {
		n, sum = len(in.Text), fmt.Sprintf("%x", sha256.Sum256([]byte(in.Text)))
	}
	kept := cutUTF8(in.Text, MaxRequestBytes)
	q := &store.Query{
		Time: b.now(), UserID: in.UserID, UserName: in.UserName, Channel: in.Channel, EventID: in.EventID,
		Request: kept, Verdict: store.VerdictError, EngineVersion: b.EngineVersion, DataHash: b.DataHash,
		Error: oversizeNote(n, sum, len(kept)),
	}
	b.Metrics.failed("request")
	b.Metrics.verdict(q.Verdict)
	id, err := b.logQuery(ctx, q)
	again := false
	if errors.Is(err, store.ErrDuplicate) {
		if b.answeredBefore(ctx, id) {
			b.Metrics.duplicate()
			return Reply{Kind: KindMix, QueryID: id, Duplicate: true}
		}
		err, again = nil, true
	}
	logged := ""
	if err != nil {
		b.Metrics.failed("log")
		b.logger().Error("oversized request not logged", "event_id", in.EventID, "bytes", n, "err", err)
	} else {
		logged = fmt.Sprintf(" (Logged as query #%d, cut to the limit, with its length and SHA-256.)", id)
	}
	text := fmt.Sprintf("That message is %d bytes long; I read requests of up to %d bytes, so I have not worked it out. "+
		"Please send one mix request per message, for example: %s%s", n, MaxRequestBytes, RequestExample, logged)
	return Reply{Kind: KindMix, Text: text, QueryID: id, Again: again}
}

// cutUTF8 returns the longest prefix of s of at most n bytes that does not
// split a character.
func cutUTF8(s string, n int) string {
	if len(s) <= n {
		return s
	}
	for n > 0 && !utf8.RuneStart(s[n]) {
		n--
	}
	return s[:n]
}

// usageReply explains a command that could not be read.
func usageReply(k Kind, err error) Reply {
	var ue *UsageError
	text := "I couldn't read that command."
	example := ""
	if errors.As(err, &ue) {
		text, example = ue.Message, ue.Example
	}
	if example != "" {
		text += "\nFor example: `" + example + "`"
	}
	text += "\nSay `help` for everything I understand."
	return Reply{Kind: k, Text: text}
}

var tagWord = regexp.MustCompile(`\b[A-Za-z][A-Za-z0-9]*-[A-Za-z0-9][A-Za-z0-9_-]*\b`)

// Record answers a mix request with the engine and writes the query to
// the log before anything is shown: the one path of every front end (Slack,
// the console, mixward ask). askErr is the engine's error (a
// *engine.ParseError for a request that does not read); logErr is
// store.ErrDuplicate for a delivery already logged, or why the log write
// failed, in which case the answer must not be shown.
func (b *Bot) Record(ctx context.Context, in Incoming, text string) (res *engine.Result, id int64, askErr, logErr error) {
	var mu sync.Mutex
	resolved := map[string]string{}
	resolve := func(tag string) (string, bool) {
		if b.Catalogue == nil {
			return "", false
		}
		s, err := b.Catalogue.Stream(ctx, tag)
		if err != nil {
			if !errors.Is(err, store.ErrNotFound) && !errors.Is(err, store.ErrInvalid) {
				b.logger().Warn("stream lookup failed", "tag", tag, "err", err)
			}
			return "", false
		}
		mu.Lock()
		resolved[strings.ToUpper(tag)] = s.Stream
		mu.Unlock()
		return s.Stream, true
	}

	q := &store.Query{
		Time:          b.now(),
		UserID:        in.UserID,
		UserName:      in.UserName,
		Channel:       in.Channel,
		EventID:       in.EventID,
		Request:       text,
		EngineVersion: b.EngineVersion,
		DataHash:      b.DataHash,
	}
	tags := func() []string {
		if b.Catalogue == nil {
			return nil
		}
		ss, err := b.Catalogue.Streams(ctx)
		if err != nil {
			return nil
		}
		out := make([]string, len(ss))
		for i, s := range ss {
			out[i] = s.Tag
		}
		return out
	}
	res, askErr = b.ask(text, engine.AskOptions{Resolve: resolve, Tags: tags})
	if len(resolved) > 0 {
		q.Resolved = tagWord.ReplaceAllStringFunc(text, func(w string) string {
			if s, ok := resolved[strings.ToUpper(w)]; ok {
				return "(" + s + ")"
			}
			return w
		})
	}
	var pe *engine.ParseError
	switch {
	case askErr == nil:
		fillQuery(q, res)
	case errors.As(askErr, &pe):
		q.Verdict = store.VerdictError
		q.Error = pe.Error()
	default:
		b.logger().Error("engine failed", "request", text, "err", askErr)
		b.Metrics.failed("engine")
		q.Verdict = store.VerdictError
		q.Error = "internal error: " + askErr.Error()
	}
	if len(text) > MaxRequestBytes {
		// Never a request of any size in the log: its start, length and hash.
		q.Request, q.Resolved = cutUTF8(text, MaxRequestBytes), cutUTF8(q.Resolved, MaxRequestBytes)
		q.Error = strings.TrimSpace(q.Error + "; " + oversizeNote(len(text), fmt.Sprintf("%x", sha256.Sum256([]byte(text))), len(q.Request)))
	}
	b.Metrics.verdict(q.Verdict)
	id, logErr = b.logQuery(ctx, q)
	return res, id, askErr, logErr
}

// oversizeNote is what the log says of a request over MaxRequestBytes.
func oversizeNote(n int, sum string, kept int) string {
	return fmt.Sprintf("request of %d bytes is over the %d-byte limit; stored cut to its first %d bytes; SHA-256 of the whole request: %s",
		n, MaxRequestBytes, kept, sum)
}

// deliveryLog is the part of the log that knows whether an answer was
// posted (store.DB has it).
type deliveryLog interface {
	Deliveries(ctx context.Context, queryID int64) ([]store.Delivery, error)
}

// answeredBefore reports whether the answer to a logged query was posted.
// When the log cannot tell, it says yes: a second answer is worse than a
// redelivery left unanswered by a log that cannot be read.
func (b *Bot) answeredBefore(ctx context.Context, id int64) bool {
	dl, ok := b.Log.(deliveryLog)
	if !ok || id == 0 {
		return true
	}
	ds, err := dl.Deliveries(ctx, id)
	if err != nil {
		return true
	}
	for _, d := range ds {
		if d.OK {
			return true
		}
	}
	return false
}

// mix answers a mix request: engine, then log, then reply.
func (b *Bot) mix(ctx context.Context, in Incoming, text string) Reply {
	res, id, askErr, err := b.Record(ctx, in, text)
	again := false
	var pe *engine.ParseError
	errors.As(askErr, &pe)
	if errors.Is(err, store.ErrDuplicate) {
		if !b.answeredBefore(ctx, id) {
			// Logged, but no post went through (the service stopped, or
			// Slack was down): this redelivery is the chance to answer.
			b.logger().Info("redelivery of a logged but unanswered query: answering now", "event_id", in.EventID, "query_id", id)
			err = nil
			again = true
		} else {
			b.Metrics.duplicate()
			b.logger().Info("duplicate delivery not answered again", "event_id", in.EventID, "query_id", id)
			return Reply{Kind: KindMix, QueryID: id, Duplicate: true}
		}
	}
	if err != nil {
		b.Metrics.failed("log")
		b.logger().Error("query not logged; not answering", "event_id", in.EventID, "err", err)
		return Reply{Kind: KindMix, Text: "I could not write this request to the query log, so I am not answering it: every answer has to be on record first. " +
			"Please try again in a minute; if it keeps happening, tell whoever runs mixward on site."}
	}

	var r Reply
	switch {
	case res != nil:
		r = Reply{Kind: KindMix, Text: b.render(res), Blocks: ShortBlocks(res, id), Result: res, QueryID: id}
	case pe != nil:
		b.Metrics.failed("request")
		r = parseErrorReply(text, pe, id)
	default:
		r = Reply{Kind: KindMix, QueryID: id, Text: fmt.Sprintf("Something went wrong on my side while working out this request, so I have no answer for it. "+
			"It is logged as query #%d; please tell whoever runs mixward on site.", id)}
	}
	r.Again = again
	return r
}

// checkRequest reads a request as the answer would (stream tags resolved
// from the catalogue) and returns the engine's parse error, if any; other
// failures are left to the answer.
func (b *Bot) checkRequest(ctx context.Context, text string) *engine.ParseError {
	resolve := func(tag string) (string, bool) {
		if b.Catalogue == nil {
			return "", false
		}
		s, err := b.Catalogue.Stream(ctx, tag)
		return s.Stream, err == nil
	}
	_, err := b.ask(text, engine.AskOptions{Resolve: resolve})
	var pe *engine.ParseError
	if errors.As(err, &pe) {
		return pe
	}
	return nil
}

// ask calls the engine, turning a panic into an error so one bad request
// cannot take the bot down.
func (b *Bot) ask(text string, opt engine.AskOptions) (res *engine.Result, err error) {
	defer func() {
		if v := recover(); v != nil {
			res, err = nil, fmt.Errorf("engine panic: %v", v)
		}
	}()
	return b.Engine.Ask(text, opt)
}

func (b *Bot) render(r *engine.Result) string {
	if b.Render != nil {
		return b.Render(r)
	}
	return engine.RenderText(r)
}

// logQuery writes q, retrying a few times when the database is busy.
func (b *Bot) logQuery(ctx context.Context, q *store.Query) (int64, error) {
	var id int64
	var err error
	for attempt := 1; attempt <= 3; attempt++ {
		cp := *q
		id, err = b.Log.LogQuery(ctx, &cp)
		if err == nil || errors.Is(err, store.ErrDuplicate) || errors.Is(err, store.ErrInvalid) || ctx.Err() != nil {
			return id, err
		}
		b.logger().Warn("logging query failed, retrying", "attempt", attempt, "err", err)
		sleep := b.Sleep
		if sleep == nil {
			sleep = SleepContext
		}
		if sleep(ctx, time.Duration(attempt)*200*time.Millisecond) != nil {
			break
		}
	}
	return id, err
}

// fillQuery copies the logged summary of a result into q.
func fillQuery(q *store.Query, r *engine.Result) {
	q.Verdict = string(r.Verdict)
	for _, s := range r.Species {
		q.Species = append(q.Species, s.Text)
	}
	if r.Oxidizer != nil {
		q.Oxidizer = r.Oxidizer.Species
	}
	if r.Reducer != nil {
		q.Reducer = r.Reducer.Species
	}
	q.ECellV, q.ECellStandardV = r.ECell, r.ECellStandard
	for _, h := range r.Hazards {
		q.Hazards = append(q.Hazards, store.Hazard{Code: h.Code, Severity: string(h.Severity), Message: h.Message})
	}
	for _, s := range r.Streams {
		q.Streams = append(q.Streams, s.Label)
	}
	if js, err := json.Marshal(r); err == nil {
		q.Result, q.ResultCompact = js, true
	}
}

// RequestExample is the example shown with every request error.
const RequestExample = "mix 200 L NaOCl 12.5 % + 50 L HCl 10 %"

// parseErrorReply explains a request the engine could not read, as plain
// text and as Slack mrkdwn.
func parseErrorReply(text string, pe *engine.ParseError, id int64) Reply {
	var plain, md strings.Builder
	both := func(format string, args ...any) {
		t := fmt.Sprintf(format, args...)
		plain.WriteString(t)
		md.WriteString(esc(t))
	}
	both("I couldn't read that mix request: %s", chatHints(pe.Message))
	if pe.Position > 0 {
		both(" (at character %d", pe.Position)
		if pe.Token != "" {
			both(", %q", pe.Token)
		}
		both(")")
	}
	both(".\n")
	if n := len([]rune(text)); pe.Position > 0 && pe.Position <= n+1 {
		caret := strings.Repeat(" ", pe.Position-1) + "^"
		fmt.Fprintf(&plain, "  %s\n  %s\n", text, caret)
		fmt.Fprintf(&md, "```%s\n%s```\n", esc(text), caret)
	}
	if len(pe.Suggestions) > 0 {
		both("Did you mean: %s?\n", strings.Join(pe.Suggestions, ", "))
	}
	fmt.Fprintf(&plain, "A request lists the streams joined by +, for example:\n  %s\n", RequestExample)
	fmt.Fprintf(&md, "A request lists the streams joined by +, for example: `%s`\n", RequestExample)
	both("Say `help` for the request language.")
	if id > 0 {
		both(" (Logged as query #%d.)", id)
	}
	return Reply{Kind: KindMix, Text: plain.String(), Blocks: TextBlocks(md.String()), QueryID: id}
}
