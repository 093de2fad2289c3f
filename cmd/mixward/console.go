package main

import (
	"bufio"
	"context"
	_ "embed"
	"errors"
	"fmt"
	"os"
	"strings"
	"time"

	"mixward/bot"
	"mixward/store"
)

// demoStreams is the invented demo site's stream catalogue, seeded into an
// empty catalogue on the console's first start.
//
//go:embed demo.txt
var demoStreams string

// demoStream is one line of demo.txt.
type demoStream struct {
	Tag, Stream, Note string
}

// parseDemo reads demo.txt: "tag | stream | note" lines, # comments.
func parseDemo(text string) ([]demoStream, error) {
	var out []demoStream
	sc := bufio.NewScanner(strings.NewReader(text))
	for n := 1; sc.Scan(); n++ {
		line := strings.TrimSpace(sc.Text())
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		f := strings.Split(line, "|")
		if len(f) != 3 {
			return nil, fmt.Errorf("demo.txt line %d: want 'tag | stream | note', got %d fields", n, len(f))
		}
		out = append(out, demoStream{strings.TrimSpace(f[0]), strings.TrimSpace(f[1]), strings.TrimSpace(f[2])})
	}
	return out, sc.Err()
}

// demoSeedBy is who the seeded streams are recorded as set by.
const demoSeedBy = "demo seed"

// seedDemo fills a never-used catalogue with the demo site. It reports how
// many streams it added (0 when the catalogue was already in use).
func seedDemo(ctx context.Context, db seedCatalogue) (int, error) {
	ss, err := db.Streams(ctx)
	if err != nil {
		return 0, err
	}
	demo, err := parseDemo(demoStreams)
	if err != nil {
		return 0, err
	}
	if len(ss) > 0 || len(demo) == 0 {
		return 0, nil
	}
	// A catalogue someone emptied on purpose stays empty.
	if _, err := db.StreamHistory(ctx, demo[0].Tag); !errors.Is(err, store.ErrNotFound) {
		return 0, err
	}
	for _, d := range demo {
		if err := db.SetStream(ctx, d.Tag, d.Stream, d.Note, demoSeedBy); err != nil {
			return 0, fmt.Errorf("seeding demo stream %s: %w", d.Tag, err)
		}
	}
	return len(demo), nil
}

// isTerminal reports whether r is an interactive terminal.
func isTerminal(r any) bool {
	f, ok := r.(*os.File)
	if !ok {
		return false
	}
	fi, err := f.Stat()
	return err == nil && fi.Mode()&os.ModeCharDevice != 0
}

func (a *app) cmdConsole(ctx context.Context, args []string) error {
	fs := a.newFlags("console", "console [--db PATH] [--tz ZONE] [--shifts SPEC] [--no-demo] [--digests] [--picture-dir DIR]\n\n"+
		"The local console: type the same messages as in the Slack channel (a mix request, streams,\n"+
		"search, digest, help; details, pour and picture for the last answer) and read the answers here. Requests are logged as user \"console\".\n"+
		"Reads standard input, so `echo \"mix ...\" | mixward console` works too.")
	var s siteFlags
	s.register(fs, a.getenv)
	picDir := fs.String("picture-dir", ".", "where `picture` writes the E–pH picture PNG")
	noDemo := fs.Bool("no-demo", false, "do not seed the invented demo site's streams into an empty catalogue")
	digests := fs.Bool("digests", isTerminal(a.stdin), "print shift digests here when they fall due (default: on for a terminal)")
	rest, err := parseFlags(fs, args)
	if err != nil {
		return err
	}
	if len(rest) > 0 {
		return &exitError{exitUsage, fmt.Errorf("console takes no arguments (type requests on its input), got %q", strings.Join(rest, " "))}
	}
	st, err := openSite(ctx, s)
	if err != nil {
		return err
	}
	defer st.db.Close()

	interactive := isTerminal(a.stdin)
	if !*noDemo {
		n, err := seedDemo(ctx, st.db)
		if err != nil {
			return err
		}
		if n > 0 {
			fmt.Fprintf(a.stderr, "mixward: seeded %d streams of the invented demo site (Harrowgate Finishing Works) into %s; say 'streams' to list them\n", n, s.db)
		}
	}
	logger, err := newLogger(&syncWriter{w: a.stderr}, envOr(a.getenv, "MIXWARD_LOG_LEVEL", "warn"), "text")
	if err != nil {
		return err
	}
	b := st.newBot(logger, nil, &bot.Access{Everyone: true})
	b.ConsoleHelp = true
	con := &bot.Console{Bot: b, In: a.stdin, Out: a.stdout, Interactive: interactive, Query: st.db.Get,
		Press: st.db.RecordPress, Plot: plotterFor(st.eng), PictureDir: *picDir}

	if *digests {
		sched, err := store.NewScheduler(st.db, s.shifts, st.loc, con, nil)
		if err != nil {
			return &exitError{exitUsage, err}
		}
		sched.Log = logger
		runCtx, stop := context.WithCancel(ctx)
		defer func() {
			stop()
			sched.Stop()
		}()
		_ = sched.Start(runCtx)
		if interactive {
			fmt.Fprintf(a.stdout, "Next shift digest at %s.\n", sched.Next().In(st.loc).Format("Mon 02 Jan 15:04 MST"))
		}
	}
	start := time.Now()
	err = con.Run(ctx)
	logger.Debug("console closed", "after", time.Since(start))
	if err != nil {
		return err
	}
	return nil
}
