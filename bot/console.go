package bot

import (
	"bufio"
	"context"
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
	lines := make(chan string)
	readErr := make(chan error, 1)
	go func() {
		sc := bufio.NewScanner(c.In)
		sc.Buffer(make([]byte, 64*1024), 1<<20)
		for sc.Scan() {
			select {
			case lines <- sc.Text():
			case <-ctx.Done():
				readErr <- nil
				return
			}
		}
		readErr <- sc.Err()
	}()
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
			text := strings.TrimSpace(line)
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
				Transport: "console",
				Channel:   ConsoleUser,
				UserID:    ConsoleUser,
				UserName:  ConsoleUser,
				Text:      CleanText(text, ""),
				Received:  now(),
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
