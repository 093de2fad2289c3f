package bot

import (
	"bufio"
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/json"
	"fmt"
	"io"
	"strconv"
	"strings"
	"sync"
	"time"

	"mixward/engine"
	"mixward/engine/advice"
	"mixward/store"
)

// ConsoleUser is the user id and name the console logs requests under.
const ConsoleUser = "console"

// Console is the local terminal front end: it reads one message per line
// (the same messages as the Slack channel), answers in plain text and logs
// to the same store as user "console". It also prints digests handed to
// PublishDigest. Everyone at the console may do everything: it is the
// operator's own terminal.
type Console struct {
	Bot         *Bot
	In          io.Reader
	Out         io.Writer
	Interactive bool // print a banner and prompts
	Now         func() time.Time
	// Query reads a logged query by id, for `details <id>`; nil means
	// only the last answer can be shown in full.
	Query func(ctx context.Context, id int64) (*store.Query, error)

	mu   sync.Mutex     // serialises writes to Out (answers and digests)
	last *engine.Result // the last mix answer, for `details`
}

// Prompt is shown before each line in interactive mode.
const Prompt = "mixward> "

func (c *Console) print(s string) {
	c.mu.Lock()
	defer c.mu.Unlock()
	io.WriteString(c.Out, s)
}

// Run reads and answers lines until the input ends, "quit" or "exit" is
// typed (interactive only), or ctx ends.
func (c *Console) Run(ctx context.Context) error {
	lines := make(chan consoleLine)
	readErr := make(chan error, 1)
	go func() { readErr <- readLines(ctx, c.In, lines) }()
	if c.Interactive {
		c.print("mixward console. Type a mix request such as\n  " + RequestExample +
			"\nor help, details, review, streams, search, digest. quit or Ctrl-D leaves.\n" + Advisory + "\n\n" + Prompt)
	}
	for {
		select {
		case <-ctx.Done():
			if c.Interactive {
				c.print("\n")
			}
			return nil
		case err := <-readErr:
			if c.Interactive {
				c.print("\n")
			}
			if err != nil {
				return fmt.Errorf("reading the console input: %w", err)
			}
			return nil
		case line := <-lines:
			text := strings.TrimSpace(line.text)
			if text == "" || strings.HasPrefix(text, "#") {
				if c.Interactive {
					c.print(Prompt)
				}
				continue
			}
			if c.Interactive && (text == "quit" || text == "exit") {
				return nil
			}
			if word, rest, _ := strings.Cut(text, " "); strings.EqualFold(word, "details") {
				c.print(c.details(ctx, strings.TrimSpace(rest)) + "\n")
				if c.Interactive {
					c.print(Prompt)
				}
				continue
			}
			now := time.Now
			if c.Now != nil {
				now = c.Now
			}
			r := c.Bot.Answer(ctx, Incoming{
				Transport:  "console",
				Channel:    ConsoleUser,
				UserID:     ConsoleUser,
				UserName:   ConsoleUser,
				Text:       CleanText(text, ""),
				Received:   now(),
				FullBytes:  line.full,
				FullSHA256: line.sum,
			})
			c.answer(r)
		}
	}
}

// details is the full answer of the last request, or of a logged query.
func (c *Console) details(ctx context.Context, arg string) string {
	if arg == "" {
		c.mu.Lock()
		r := c.last
		c.mu.Unlock()
		if r == nil {
			return "No mix answer yet: ask a mix request first, or say `details 12` for logged query #12."
		}
		return advice.RenderDetails(r)
	}
	id, err := strconv.ParseInt(strings.TrimPrefix(arg, "#"), 10, 64)
	if err != nil || id <= 0 {
		return fmt.Sprintf("`details` takes nothing (the last answer) or a query number like `details 12`; got %q.", arg)
	}
	if c.Query == nil {
		return "The query log cannot be read here."
	}
	q, err := c.Query(ctx, id)
	if err != nil {
		return fmt.Sprintf("I could not read query #%d from the log: %v.", id, err)
	}
	if len(q.Result) == 0 {
		return fmt.Sprintf("Query #%d has no answer on record (%s): %s", id, q.Verdict, q.Error)
	}
	var r engine.Result
	if err := json.Unmarshal(q.Result, &r); err != nil {
		return fmt.Sprintf("Query #%d's answer on record could not be read: %v.", id, err)
	}
	return fmt.Sprintf("Query #%d, asked %s by %s:\n", id, q.Time.Format("2006-01-02 15:04 MST"), q.UserName) + advice.RenderDetails(&r)
}

func (c *Console) answer(r Reply) {
	if r.Result != nil {
		c.mu.Lock()
		c.last = r.Result
		c.mu.Unlock()
	}
	var b strings.Builder
	b.WriteString(strings.TrimRight(r.Text, "\n"))
	b.WriteString("\n")
	if r.Result != nil && r.QueryID > 0 {
		fmt.Fprintf(&b, "(logged as query #%d)\n", r.QueryID)
	}
	b.WriteString("\n")
	if c.Interactive {
		b.WriteString(Prompt)
	}
	c.print(b.String())
}

// PublishDigest prints a digest that fell due. It implements
// store.Publisher.
func (c *Console) PublishDigest(ctx context.Context, d *store.Digest) error {
	text := "\n--- shift digest ---\n" + strings.TrimRight(d.Text(), "\n") + "\n--- end of digest ---\n\n"
	if c.Interactive {
		text += Prompt
	}
	c.print(text)
	return nil
}

var _ store.Publisher = (*Console)(nil)

// MaxConsoleLine is the most of one console line kept in memory; a longer
// line is read to its end (counted and hashed) and answered with the
// request limit, and the console carries on.
const MaxConsoleLine = 1 << 20

// consoleLine is one line of console input. full and sum are its length
// and SHA-256 when it was longer than MaxConsoleLine and text holds only
// its start.
type consoleLine struct {
	text string
	full int
	sum  string
}

// readLines sends the lines of r until it ends (nil) or fails, or ctx ends.
func readLines(ctx context.Context, r io.Reader, out chan<- consoleLine) error {
	br := bufio.NewReaderSize(r, 64*1024)
	for {
		var kept []byte
		h := sha256.New()
		n := 0
		var err error
		for {
			var frag []byte
			frag, err = br.ReadSlice('\n')
			if err == nil {
				frag = bytes.TrimSuffix(bytes.TrimSuffix(frag, []byte("\n")), []byte("\r"))
			}
			n += len(frag)
			h.Write(frag)
			if room := MaxConsoleLine - len(kept); room > 0 {
				kept = append(kept, frag[:min(len(frag), room)]...)
			}
			if err != bufio.ErrBufferFull {
				break
			}
		}
		if err != nil && n == 0 {
			if err == io.EOF {
				return nil
			}
			return err
		}
		line := consoleLine{text: string(kept)}
		if n > MaxConsoleLine {
			line.full, line.sum = n, fmt.Sprintf("%x", h.Sum(nil))
		}
		select {
		case out <- line:
		case <-ctx.Done():
			return nil
		}
		if err == io.EOF {
			return nil
		}
		if err != nil {
			return err
		}
	}
}
