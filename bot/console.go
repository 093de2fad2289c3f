package bot

import (
	"bufio"
	"bytes"
	"context"
	"crypto/sha256"
	"fmt"
	"io"
	"strings"
	"sync"
	"time"

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

	mu sync.Mutex // serialises writes to Out (answers and digests)
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
			"\nor help, streams, search, digest. quit or Ctrl-D leaves.\n" + Advisory + "\n\n" + Prompt)
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

func (c *Console) answer(r Reply) {
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
