package bot

import (
	"fmt"
	"regexp"
	"strconv"
	"strings"
	"time"
)

// Kind is what a message asks for.
type Kind string

// The kinds of message the bot understands.
const (
	KindHelp    Kind = "help"
	KindMix     Kind = "mix"
	KindStreams Kind = "streams"
	KindSearch  Kind = "search"
	KindDigest  Kind = "digest"
	KindReview  Kind = "review"
)

// Command is one parsed message.
type Command struct {
	Kind Kind
	Text string // the cleaned message: the mix request for KindMix

	// streams
	Action string // list, show, set, remove, history
	Tag    string
	Stream string
	Note   string

	// search
	Search SearchQuery

	// digest
	Hours int // "digest 24h": the last 24 hours; 0 means the current shift
}

// SearchQuery is a parsed "search" command.
type SearchQuery struct {
	Terms   []string
	Since   time.Time // zero: no lower bound
	Until   time.Time // zero: no upper bound
	User    string
	Verdict string
	Hazard  string
	Page    int // 1-based
}

// UsageError is a command the bot could not read; Message says what was
// wrong and Example shows a correct form.
type UsageError struct {
	Message string
	Example string
}

func (e *UsageError) Error() string { return e.Message }

var (
	userMention = regexp.MustCompile(`<@([UW][A-Z0-9]+)(?:\|[^>]*)?>`)
	slackLink   = regexp.MustCompile(`<([^@!#>][^|>]*)(?:\|([^>]*))?>`)
	tagPattern  = regexp.MustCompile(`^[A-Za-z][A-Za-z0-9]*-[A-Za-z0-9][A-Za-z0-9-]*$`)
)

// CleanText turns Slack message text into what the operator typed: it drops
// mentions of the bot (when botUser is not known, any mention at the very
// start or end), unwraps links, and undoes Slack's &amp; &lt; &gt; escaping.
func CleanText(s, botUser string) string {
	s = strings.TrimSpace(s)
	if botUser != "" {
		s = userMention.ReplaceAllStringFunc(s, func(m string) string {
			if userMention.FindStringSubmatch(m)[1] == botUser {
				return " "
			}
			return m
		})
	} else {
		// Not knowing which mention is the bot's, drop those that lead or
		// end the message; mentions inside it (search user:<@U…>) stay.
		for {
			loc := userMention.FindStringIndex(s)
			if loc == nil || loc[0] != 0 {
				break
			}
			s = strings.TrimSpace(s[loc[1]:])
		}
		for {
			all := userMention.FindAllStringIndex(s, -1)
			if len(all) == 0 {
				break
			}
			last := all[len(all)-1]
			if last[1] != len(s) || (last[0] > 0 && s[last[0]-1] != ' ') {
				break
			}
			s = strings.TrimSpace(s[:last[0]])
		}
	}
	s = slackLink.ReplaceAllStringFunc(s, func(m string) string {
		sm := slackLink.FindStringSubmatch(m)
		if sm[2] != "" {
			return sm[2]
		}
		return strings.TrimPrefix(sm[1], "mailto:")
	})
	s = strings.NewReplacer("&lt;", "<", "&gt;", ">", "&amp;", "&", "\u00a0", " ", "\u202f", " ").Replace(s)
	return strings.Join(strings.Fields(s), " ")
}

// ParseCommand reads a cleaned message. Anything that is not one of the
// command words is a mix request for the engine to read. loc is where
// dates in "search since:2026-01-31" are read.
func ParseCommand(text string, loc *time.Location) (Command, error) {
	text = strings.TrimSpace(text)
	word, rest, _ := strings.Cut(text, " ")
	rest = strings.TrimSpace(rest)
	switch strings.ToLower(word) {
	case "", "help", "?", "hello", "hi":
		return Command{Kind: KindHelp, Text: text}, nil
	case "digest":
		c := Command{Kind: KindDigest, Text: text}
		if rest != "" {
			h, err := strconv.Atoi(strings.TrimSuffix(strings.ToLower(rest), "h"))
			if err != nil || h < 1 || h > 24*31 {
				return c, &UsageError{Message: fmt.Sprintf("`digest` takes nothing (the current shift) or a number of hours up to 744, like `digest 24h`; got %q.", rest), Example: "digest 24h"}
			}
			c.Hours = h
		}
		return c, nil
	case "review":
		if rest != "" {
			return Command{Kind: KindReview, Text: text}, &UsageError{Message: "`review` takes no arguments: it judges every pair of the site's tagged streams.", Example: "review"}
		}
		return Command{Kind: KindReview, Text: text}, nil
	case "streams", "stream":
		return parseStreams(text, rest)
	case "search":
		q, err := parseSearch(rest, loc)
		return Command{Kind: KindSearch, Text: text, Search: q}, err
	}
	return Command{Kind: KindMix, Text: text}, nil
}

const streamsExample = "streams set T-101 200 L NaOH 5 % note: weekly top-up"

func parseStreams(text, rest string) (Command, error) {
	c := Command{Kind: KindStreams, Text: text}
	action, args, _ := strings.Cut(rest, " ")
	args = strings.TrimSpace(args)
	switch strings.ToLower(action) {
	case "", "list":
		c.Action = "list"
		return c, nil
	case "show", "history", "remove", "delete", "rm":
		c.Action = strings.ToLower(action)
		if c.Action == "delete" || c.Action == "rm" {
			c.Action = "remove"
		}
		tag, extra, _ := strings.Cut(args, " ")
		if !tagPattern.MatchString(tag) || strings.TrimSpace(extra) != "" {
			return c, &UsageError{
				Message: fmt.Sprintf("`streams %s` takes one stream tag such as T-101; got %q.", c.Action, args),
				Example: "streams " + c.Action + " T-101",
			}
		}
		c.Tag = strings.ToUpper(tag)
		return c, nil
	case "set", "add":
		c.Action = "set"
		tag, stream, _ := strings.Cut(args, " ")
		stream = strings.TrimSpace(strings.TrimPrefix(strings.TrimSpace(stream), "="))
		if !tagPattern.MatchString(tag) {
			return c, &UsageError{
				Message: fmt.Sprintf("`streams set` needs a stream tag first (letters, a dash, digits, like T-101); got %q.", tag),
				Example: streamsExample,
			}
		}
		c.Tag = strings.ToUpper(tag)
		if i := indexFoldASCII(stream, "note:"); i >= 0 {
			c.Note = strings.TrimSpace(stream[i+len("note:"):])
			stream = strings.TrimSpace(stream[:i])
		}
		stream, c.Note = unquote(stream), unquote(c.Note)
		if stream == "" {
			return c, &UsageError{
				Message: fmt.Sprintf("`streams set %s` needs the stream written as in a mix request after the tag.", c.Tag),
				Example: streamsExample,
			}
		}
		c.Stream = stream
		return c, nil
	}
	if tagPattern.MatchString(action) && args == "" {
		c.Action, c.Tag = "show", strings.ToUpper(action)
		return c, nil
	}
	return c, &UsageError{
		Message: fmt.Sprintf("I don't know `streams %s`. I know: streams, streams show TAG, streams history TAG, streams set TAG STREAM [note: TEXT], streams remove TAG.", action),
		Example: streamsExample,
	}
}

const searchExample = "search hypochlorite since:2026-11-01 verdict:spontaneous"

func parseSearch(rest string, loc *time.Location) (SearchQuery, error) {
	if loc == nil {
		loc = time.UTC
	}
	q := SearchQuery{Page: 1}
	for _, f := range strings.Fields(rest) {
		key, val, ok := strings.Cut(f, ":")
		if !ok || val == "" {
			q.Terms = append(q.Terms, f)
			continue
		}
		var err error
		switch strings.ToLower(key) {
		case "since", "from":
			q.Since, err = parseDay(val, loc, false)
		case "until", "to":
			q.Until, err = parseDay(val, loc, true)
		case "user", "by":
			if ids := ParseIDList(val); len(ids) == 1 {
				q.User = ids[0]
			} else {
				err = fmt.Errorf("user:%s is not one Slack user id", val)
			}
		case "verdict":
			switch v := strings.ToLower(val); v {
			case "spontaneous", "non-spontaneous", "no-reaction", "error":
				q.Verdict = v
			default:
				err = fmt.Errorf("verdict:%s is not one of spontaneous, non-spontaneous, no-reaction, error", val)
			}
		case "hazard":
			q.Hazard = val
		case "page":
			q.Page, err = strconv.Atoi(val)
			if err != nil || q.Page < 1 {
				err = fmt.Errorf("page:%s is not a page number (1, 2, ...)", val)
			}
		default:
			q.Terms = append(q.Terms, f)
		}
		if err != nil {
			return q, &UsageError{Message: err.Error() + ".", Example: searchExample}
		}
	}
	if !q.Since.IsZero() && !q.Until.IsZero() && !q.Until.After(q.Since) {
		return q, &UsageError{Message: "`until:` must be after `since:`.", Example: searchExample}
	}
	return q, nil
}

// parseDay reads 2026-11-30 (a whole day in loc; end=true gives the start of
// the next day) or 2026-11-30T14:00.
func parseDay(s string, loc *time.Location, end bool) (time.Time, error) {
	if t, err := time.ParseInLocation("2006-01-02", s, loc); err == nil {
		if end {
			t = t.AddDate(0, 0, 1)
		}
		return t, nil
	}
	if t, err := time.ParseInLocation("2006-01-02T15:04", s, loc); err == nil {
		return t, nil
	}
	return time.Time{}, fmt.Errorf("%q is not a date like 2026-11-30 or 2026-11-30T14:00", s)
}

// unquote drops one pair of matching quotes around s ("…", '…', “…”,
// ‘…’ or `…`), as people write a stream text in chat.
func unquote(s string) string {
	s = strings.TrimSpace(s)
	for _, q := range [][2]string{{`"`, `"`}, {"'", "'"}, {"“", "”"}, {"‘", "’"}, {"`", "`"}, {"„", "“"}} {
		if len(s) >= len(q[0])+len(q[1]) && strings.HasPrefix(s, q[0]) && strings.HasSuffix(s, q[1]) {
			return strings.TrimSpace(s[len(q[0]) : len(s)-len(q[1])])
		}
	}
	return s
}

// indexFoldASCII is the byte offset of the first match of the ASCII word
// sub in s, ignoring ASCII case, or -1. Lower-casing s first would move
// offsets: some runes and invalid bytes change length under ToLower.
func indexFoldASCII(s, sub string) int {
	for i := 0; i+len(sub) <= len(s); i++ {
		if strings.EqualFold(s[i:i+len(sub)], sub) {
			return i
		}
	}
	return -1
}
