package bot

import (
	"context"
	"errors"
	"fmt"
	"strings"
	"time"

	"github.com/slack-go/slack"

	"mixward/engine/advice"
	"mixward/engine/hazard"
	"mixward/store"
)

// Digester summarises the query log for a period. *store.DB implements it.
type Digester interface {
	Digest(ctx context.Context, since, until time.Time) (*store.Digest, error)
}

// nameReader reads the name an id was seen under at a time (store.DB has
// it); search results name channels with it.
type nameReader interface {
	NameAt(ctx context.Context, id string, at time.Time) (string, error)
}

// searchPageSize is how many queries one search reply lists.
const searchPageSize = 10

// refuse is the polite refusal for a missing right, shown to the person
// alone. right is the metrics label; allowed names the roles that have it.
func (b *Bot) refuse(k Kind, right, allowed, what string) Reply {
	b.Metrics.refusal(right)
	return Reply{Kind: k, Private: true, Text: fmt.Sprintf("Sorry, %s is open to %s only, and you are not on those lists. "+
		"If you need it, ask whoever runs mixward on site to add you (by Slack user id or user group).", what, allowed)}
}

func (b *Bot) help() Reply {
	var s strings.Builder
	s.WriteString("I check whether streams may be mixed: I list the species present, pick the strongest oxidizing and reducing agents, " +
		"write both half-reactions and the net ionic equation, say whether the reaction is spontaneous, and estimate gas, heat and hazards.\n\n")
	s.WriteString("Mix request:  mix 200 L NaOCl 12.5 % + 50 L HCl 10 %\n")
	s.WriteString("  stream    = [amount] chemical [number unit][, chemical [number unit]]...  or a stream tag like T-101\n")
	s.WriteString("  amount    = 200 L, 500 mL, 2 m3, 25 kg, 500 g\n")
	s.WriteString("  units     = M, mol/L, mmol/L, %, % w/w, % w/v, g/L, mg/L, ppm; also pH 11.5 inside a stream\n")
	s.WriteString("  at the end: at 40 C, at 2 bar, at pH 3 (a stated pH overrides the computed one)\n\n")
	s.WriteString("Other commands:\n")
	s.WriteString("  streams                          list the site stream catalogue\n")
	s.WriteString("  streams show T-101               one stream; streams history T-101 for its changes\n")
	s.WriteString("  streams set T-101 STREAM [note: TEXT]   define a tag (supervisors)\n")
	s.WriteString("  streams remove T-101             retire a tag (supervisors)\n")
	s.WriteString("  search WORDS [since:2026-11-01] [until:2026-11-30] [user:U123] [verdict:spontaneous] [hazard:CODE] [page:2]\n")
	s.WriteString("                                   search the query log (reviewers)\n")
	s.WriteString("  review                           every pair of the site's tagged streams, worst first\n")
	s.WriteString("  digest [12h]                     shift summary so far, or for the last hours (supervisors and reviewers)\n")
	s.WriteString("  help                             this text\n\n")
	if b.ConsoleHelp {
		s.WriteString("At the console also: details, pour, picture (the full answer, the pour order and the E–pH picture of the last request; " +
			"details 12 for logged query #12).\n\n")
		s.WriteString("This is the local console: you are the operator at this terminal, so every command is open to you, " +
			"and your requests are logged as user \"console\".\n\n")
	} else {
		s.WriteString("Mention me in a channel, write to me directly, or use /mixward. I answer in a thread with a short answer and buttons: " +
			"Details (the full answer), E–pH picture and Pour order. /mixward on its own (or New mix) opens a form to pick tanks. " +
			"Every request and every button press is logged.\n\n")
	}
	s.WriteString(Advisory)
	text := s.String()
	bl := helpBlocks(text)
	if !b.ConsoleHelp {
		bl = append(bl, slack.NewActionBlock("mixward_help", slack.NewButtonBlockElement(ActionNewMix, "new",
			slack.NewTextBlockObject(slack.PlainTextType, "New mix (form)", false, false))))
	}
	// Help is for the person who asked: shown to them alone in a channel.
	return Reply{Kind: KindHelp, Text: text, Blocks: bl, Private: true}
}

// helpBlocks shows the help with its syntax lines in a code block.
func helpBlocks(text string) []slack.Block {
	intro, rest, _ := strings.Cut(text, "\n\n")
	syntax, tail, _ := strings.Cut(rest, "\n\nThis is")
	if tail != "" {
		tail = "This is" + tail
	} else {
		syntax, tail, _ = strings.Cut(rest, "\n\nMention")
		if tail != "" {
			tail = "Mention" + tail
		}
	}
	var bl []slack.Block
	bl = append(bl, TextBlocks(esc(intro))...)
	bl = append(bl, TextBlocks("```"+esc(syntax)+"```")...)
	if tail != "" {
		bl = append(bl, TextBlocks(esc(tail))...)
	}
	return bl
}

func (b *Bot) streams(ctx context.Context, in Incoming, c Command) Reply {
	if b.Catalogue == nil {
		return Reply{Kind: KindStreams, Text: "The stream catalogue is not available here."}
	}
	fail := func(err error) Reply {
		if errors.Is(err, store.ErrNotFound) {
			return Reply{Kind: KindStreams, Text: fmt.Sprintf("There is no stream %s in the catalogue. Say `streams` for the list.", c.Tag)}
		}
		if errors.Is(err, store.ErrInvalid) {
			return Reply{Kind: KindStreams, Text: "The catalogue refused that: " + strings.TrimPrefix(err.Error(), "invalid argument: ") + "."}
		}
		b.Metrics.failed("catalogue")
		b.logger().Error("stream catalogue failed", "action", c.Action, "tag", c.Tag, "err", err)
		return Reply{Kind: KindStreams, Text: "I could not reach the stream catalogue just now; please try again in a minute."}
	}
	switch c.Action {
	case "list":
		ss, err := b.Catalogue.Streams(ctx)
		if err != nil {
			return fail(err)
		}
		if len(ss) == 0 {
			return Reply{Kind: KindStreams, Text: "The stream catalogue is empty. A supervisor can add streams with `" + streamsExample + "`."}
		}
		var s strings.Builder
		fmt.Fprintf(&s, "%d stream%s in the catalogue:\n", len(ss), plural(len(ss)))
		for _, st := range ss {
			fmt.Fprintf(&s, "%s  %s", st.Tag, st.Stream)
			if st.Note != "" {
				fmt.Fprintf(&s, "  (%s)", st.Note)
			}
			s.WriteString("\n")
		}
		s.WriteString("Use a tag in a mix request: mix T-101 + T-204")
		return codeReply(KindStreams, s.String())
	case "show":
		st, err := b.Catalogue.Stream(ctx, c.Tag)
		if err != nil {
			return fail(err)
		}
		text := fmt.Sprintf("%s  %s\n", st.Tag, st.Stream)
		if st.Note != "" {
			text += "note: " + st.Note + "\n"
		}
		text += fmt.Sprintf("version %d, set by %s on %s", st.Version, st.By, st.Time.In(b.loc()).Format("2006-01-02 15:04 MST"))
		return codeReply(KindStreams, text)
	case "history":
		hs, err := b.Catalogue.StreamHistory(ctx, c.Tag)
		if err != nil {
			return fail(err)
		}
		var s strings.Builder
		fmt.Fprintf(&s, "History of %s, oldest first:\n", c.Tag)
		for _, h := range hs {
			fmt.Fprintf(&s, "%s  %-6s by %s", h.Time.In(b.loc()).Format("2006-01-02 15:04"), h.Action, h.By)
			if h.Stream != "" {
				fmt.Fprintf(&s, ": %s", h.Stream)
			}
			if h.Note != "" {
				fmt.Fprintf(&s, "  (%s)", h.Note)
			}
			s.WriteString("\n")
		}
		return codeReply(KindStreams, strings.TrimRight(s.String(), "\n"))
	case "set", "remove":
		if !b.Access.IsSupervisor(ctx, in.UserID) {
			return b.refuse(KindStreams, "supervisor", "supervisors", "changing the stream catalogue")
		}
		by := in.UserID
		if in.UserName != "" && in.UserName != in.UserID {
			by = in.UserName + " (" + in.UserID + ")"
		}
		if c.Action == "remove" {
			if err := b.Catalogue.RemoveStream(ctx, c.Tag, by); err != nil {
				return fail(err)
			}
			return Reply{Kind: KindStreams, Text: fmt.Sprintf("Removed %s from the catalogue. Its history is kept (`streams history %s`).", c.Tag, c.Tag)}
		}
		if b.CheckStream != nil {
			if err := b.CheckStream(c.Stream); err != nil {
				return Reply{Kind: KindStreams, Text: fmt.Sprintf("I did not save %s: the stream does not read as a stream of a mix request: %v.\nFor example: `%s`", c.Tag, err, streamsExample)}
			}
		}
		if err := b.Catalogue.SetStream(ctx, c.Tag, c.Stream, c.Note, by); err != nil {
			return fail(err)
		}
		return Reply{Kind: KindStreams, Text: fmt.Sprintf("Saved %s as: %s\nUse it in a request: mix %s + ...", c.Tag, c.Stream, c.Tag)}
	}
	return usageReply(KindStreams, &UsageError{Message: "I don't know that streams command.", Example: streamsExample})
}

// codeReply is a reply whose Slack form is a code block (for aligned text).
func codeReply(k Kind, text string) Reply {
	return Reply{Kind: k, Text: text, Blocks: TextBlocks("```" + esc(text) + "```")}
}

func (b *Bot) search(ctx context.Context, in Incoming, q SearchQuery) Reply {
	if !b.Access.IsReviewer(ctx, in.UserID) {
		return b.refuse(KindSearch, "reviewer", "reviewers", "searching the query log")
	}
	if b.Searcher == nil {
		return Reply{Kind: KindSearch, Text: "The query log cannot be searched here."}
	}
	var codes []string
	if q.Hazard != "" {
		codes = hazard.Equivalent(q.Hazard) // renamed codes find older records too
	}
	page, err := b.Searcher.Search(ctx, store.SearchOptions{
		HazardAny: codes,
		Terms:     strings.Join(q.Terms, " "),
		Since:     q.Since,
		Until:     q.Until,
		User:      q.User,
		Verdict:   q.Verdict,
		Limit:     searchPageSize,
		Offset:    (q.Page - 1) * searchPageSize,
	})
	if err != nil {
		if errors.Is(err, store.ErrInvalid) {
			return usageReply(KindSearch, &UsageError{Message: "The log refused that search: " + err.Error() + ".", Example: searchExample})
		}
		b.Metrics.failed("search")
		b.logger().Error("search failed", "err", err)
		return Reply{Kind: KindSearch, Text: "I could not search the query log just now; please try again in a minute."}
	}
	if len(page.Queries) == 0 {
		if q.Page > 1 {
			return Reply{Kind: KindSearch, Text: fmt.Sprintf("No more matches: page %d is past the end.", q.Page)}
		}
		return Reply{Kind: KindSearch, Text: "No logged query matches that search."}
	}
	var s strings.Builder
	first := page.Offset + 1
	fmt.Fprintf(&s, "Matches %d–%d, newest first:\n", first, page.Offset+len(page.Queries))
	for _, lq := range page.Queries {
		who := lq.UserName
		if who == "" {
			who = lq.UserID
		}
		if lq.Site != "" && lq.Site != store.DefaultSite {
			who += " at " + lq.Site // the search covers every site
		}
		where := lq.Channel
		if nr, ok := b.Searcher.(nameReader); ok {
			if n, err := nr.NameAt(ctx, lq.Channel, lq.Time); err == nil && n != "" {
				where = n
			}
		}
		fmt.Fprintf(&s, "#%d  %s  %s in %s  %s  %s", lq.ID, lq.Time.In(b.loc()).Format("2006-01-02 15:04"), who, where, lq.Verdict, truncate(lq.Request, 120))
		for _, h := range lq.Hazards {
			if h.Severity == "danger" {
				fmt.Fprintf(&s, "  [DANGER %s]", h.Code)
			}
		}
		s.WriteString("\n")
	}
	if page.HasMore {
		fmt.Fprintf(&s, "More: add page:%d to the search.", q.Page+1)
	}
	r := codeReply(KindSearch, strings.TrimRight(s.String(), "\n"))
	// Log records name people and requests: in a channel, only the
	// reviewer who searched sees them.
	r.Private = true
	return r
}

func (b *Bot) digest(ctx context.Context, in Incoming, hours int) Reply {
	if !b.Access.IsSupervisor(ctx, in.UserID) && !b.Access.IsReviewer(ctx, in.UserID) {
		return b.refuse(KindDigest, "supervisor", "supervisors and reviewers", "the shift digest")
	}
	if b.Digests == nil {
		return Reply{Kind: KindDigest, Text: "Digests are not available here."}
	}
	now := b.now()
	until := now.Add(time.Nanosecond) // "so far" includes this instant
	since := now.Add(-12 * time.Hour)
	switch {
	case hours > 0:
		since = now.Add(-time.Duration(hours) * time.Hour)
	case b.ShiftStart != nil:
		if t := b.ShiftStart(now); t.Before(until) {
			since = t
		}
	}
	d, err := b.Digests.Digest(ctx, since, until)
	if err != nil {
		b.Metrics.failed("digest")
		b.logger().Error("digest failed", "err", err)
		return Reply{Kind: KindDigest, Text: "I could not build the digest just now; please try again in a minute."}
	}
	return DigestReply(d)
}

// DigestReply renders a digest: the whole text for the console, and for
// Slack a compact summary (totals, the danger-first entries that fit, the
// log head) with the whole text attached as a file, so no entry is ever
// split between messages.
func DigestReply(d *store.Digest) Reply {
	text := d.Text()
	return Reply{Kind: KindDigest, Text: text, Fallback: d.Heading() + " · " + d.Totals(), Blocks: DigestSummaryBlocks(d),
		File: &File{Name: "mixward-digest-" + d.Until.UTC().Format("2006-01-02-1504") + "Z.txt", Title: d.Heading(), Content: []byte(text)}}
}

// digestSummaryLines is how many flagged entries the summary shows before
// pointing at the file.
const digestSummaryLines = 8

// DigestSummaryBlocks is the digest's Slack summary.
func DigestSummaryBlocks(d *store.Digest) []slack.Block {
	bl := []slack.Block{section("*" + esc(d.Heading()) + "*\n" + esc(d.Totals()))}
	var lines []string
	flagged := 0
	for _, m := range d.Mixes {
		if m.Level == store.LevelNoConcern {
			continue
		}
		flagged++
		if len(lines) < digestSummaryLines {
			lines = append(lines, esc(m.Line()))
		}
	}
	switch {
	case flagged == 0:
		bl = append(bl, section("No mix in this period was judged do-not-mix or with-precautions."))
	default:
		more := ""
		if flagged > len(lines) {
			more = fmt.Sprintf("\n… and %d more in the attached file.", flagged-len(lines))
		}
		bl = append(bl, section("*Do not mix / with precautions*, danger first:\n```"+strings.Join(lines, "\n")+"```"+more))
	}
	head := "Log head: none (nothing was logged before the end of the period)"
	if d.HeadHash != "" {
		head = fmt.Sprintf("Log head at the end of the period: row %d, hash `%s`", d.HeadID, d.HeadHash)
	}
	bl = append(bl, contextBlock(head+" · the full digest is attached as a text file"), contextBlock(esc(store.Advisory)))
	return bl
}

// Reviewer judges every pair of a catalogue's streams. *advice.Advisor
// implements it; the bot uses it when its Engine does.
type Reviewer interface {
	Review(streams []advice.Tagged) []advice.Pair
}

// review answers `review`: every pair of the site's tagged streams, worst
// first.
func (b *Bot) review(ctx context.Context) Reply {
	rv, ok := b.Engine.(Reviewer)
	if !ok || b.Catalogue == nil {
		return Reply{Kind: KindReview, Text: "The catalogue review is not available here."}
	}
	ss, err := b.Catalogue.Streams(ctx)
	if err != nil {
		b.Metrics.failed("catalogue")
		b.logger().Error("stream catalogue failed", "action", "review", "err", err)
		return Reply{Kind: KindReview, Text: "I could not reach the stream catalogue just now; please try again in a minute."}
	}
	if len(ss) < 2 {
		return Reply{Kind: KindReview, Text: "The catalogue needs at least two streams to review. A supervisor can add streams with `" + streamsExample + "`."}
	}
	ts := make([]advice.Tagged, len(ss))
	for i, s := range ss {
		ts[i] = advice.Tagged{Tag: s.Tag, Stream: s.Stream}
	}
	return codeReply(KindReview, strings.TrimRight(advice.RenderReview(rv.Review(ts)), "\n"))
}
