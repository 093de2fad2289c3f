package bot

import (
	"bufio"
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/json"
	"fmt"
	"io"
	"os"
	"path/filepath"
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
	// Press records details, pour and picture against the query they show
	// (as button presses are in Slack); nil records nothing.
	Press func(ctx context.Context, p store.Press) error
	// Plot draws the E–pH picture for `picture`; PictureDir is where the
	// PNG is written ("" means the working directory).
	Plot       Plotter
	PictureDir string

	mu     sync.Mutex     // serialises writes to Out (answers and digests)
	last   *engine.Result // the last mix answer, for details, pour and picture
	lastID int64          // its query id, 0 when not logged
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
			"\nor help, details, pour, picture, review, streams, search, digest. quit or Ctrl-D leaves.\n" + Advisory + "\n\n" + Prompt)
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
			if word, rest, _ := strings.Cut(text, " "); isShowWord(word) {
				c.print(c.show(ctx, strings.ToLower(word), strings.TrimSpace(rest)) + "\n")
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

// isShowWord reports whether word is one of the console's commands that
// show more of an answer (the buttons under an answer in Slack).
func isShowWord(word string) bool {
	switch strings.ToLower(word) {
	case store.PressDetails, store.PressPour, store.PressPicture:
		return true
	}
	return false
}

// show answers details, pour or picture for the last answer, or for a
// logged query, and records it against the query.
func (c *Console) show(ctx context.Context, what, arg string) string {
	r, id, head, msg := c.resultFor(ctx, what, arg)
	if r == nil {
		return msg
	}
	if c.Press != nil && id > 0 {
		err := c.Press(ctx, store.Press{QueryID: id, Action: what, UserID: ConsoleUser, UserName: ConsoleUser, Channel: ConsoleUser, Transport: "console"})
		if err != nil {
			return fmt.Sprintf("I could not record this in the query log, so I am not showing it: %v.", err)
		}
	}
	switch what {
	case store.PressPour:
		return head + PourText(r)
	case store.PressPicture:
		return head + c.picture(r, id)
	}
	return head + advice.RenderDetails(r)
}

// resultFor finds the answer a show command is about: the last one, or
// logged query arg. msg explains when there is none.
func (c *Console) resultFor(ctx context.Context, what, arg string) (r *engine.Result, id int64, head, msg string) {
	if arg == "" {
		c.mu.Lock()
		r, id = c.last, c.lastID
		c.mu.Unlock()
		if r == nil {
			return nil, 0, "", fmt.Sprintf("No mix answer yet: ask a mix request first, or say `%s 12` for logged query #12.", what)
		}
		return r, id, "", ""
	}
	id, err := strconv.ParseInt(strings.TrimPrefix(arg, "#"), 10, 64)
	if err != nil || id <= 0 {
		return nil, 0, "", fmt.Sprintf("`%s` takes nothing (the last answer) or a query number like `%s 12`; got %q.", what, what, arg)
	}
	if c.Query == nil {
		return nil, 0, "", "The query log cannot be read here."
	}
	q, err := c.Query(ctx, id)
	if err != nil {
		return nil, 0, "", fmt.Sprintf("I could not read query #%d from the log: %v.", id, err)
	}
	if len(q.Result) == 0 {
		return nil, 0, "", fmt.Sprintf("Query #%d has no answer on record (%s): %s", id, q.Verdict, q.Error)
	}
	r = new(engine.Result)
	if err := json.Unmarshal(q.Result, r); err != nil {
		return nil, 0, "", fmt.Sprintf("Query #%d's answer on record could not be read: %v.", id, err)
	}
	return r, id, fmt.Sprintf("Query #%d, asked %s by %s:\n", id, q.Time.Format("2006-01-02 15:04 MST"), q.UserName), ""
}

// picture draws the E–pH picture of r into PictureDir and says where.
func (c *Console) picture(r *engine.Result, id int64) string {
	if c.Plot == nil {
		return "Pictures are not available here."
	}
	png, ok, err := c.Plot.Plot(r)
	switch {
	case err != nil:
		return fmt.Sprintf("The E–pH picture could not be drawn: %v.", err)
	case !ok:
		return "This answer has no oxidizing and reducing agent pair to draw."
	}
	name := filepath.Join(c.PictureDir, fmt.Sprintf("mixward-eph-%d.png", id))
	if id == 0 {
		name = filepath.Join(c.PictureDir, "mixward-eph.png")
	}
	if err := os.WriteFile(name, png, 0o644); err != nil {
		return fmt.Sprintf("The E–pH picture could not be written: %v.", err)
	}
	return fmt.Sprintf("E–pH picture written to %s (%d bytes).", name, len(png))
}

func (c *Console) answer(r Reply) {
	if r.Result != nil {
		c.mu.Lock()
		c.last, c.lastID = r.Result, r.QueryID
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
