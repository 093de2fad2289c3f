package main

// mixward streams: the site stream catalogue (tags such as T-101 naming a
// stream in the request language).

import (
	"context"
	"errors"
	"fmt"
	"strings"
	"text/tabwriter"

	"mixward/store"
)

// streamValidator checks that a catalogue entry reads as one stream of the
// request language. It is the hook for the engine-side check (the store
// cannot import the engine); by default it loads the embedded tables and
// uses checkStream, as the bot does.
var streamValidator = func(text string) error {
	eng, err := loadEngine()
	if err != nil {
		return err
	}
	return checkStream(eng, text)
}

const streamsUsage = `usage: mixward streams <command> [flags]

The site stream catalogue: plant tags (T-101, RINSE-2) that name a stream in
the request language, so a request may say "mix T-101 + 40 L HCl 1 M".
Every change is kept with who made it and when.

commands:
  set <TAG> "<stream>" [--note TEXT] [--by NAME]   define or change a tag
  list [--format text|json]                       the current catalogue
  show <TAG> [--format text|json]                 one tag and its history
  rm <TAG> [--by NAME]                            remove a tag (history kept)

Tags: 1–32 letters, digits, '-' or '_', starting with a letter or digit;
case does not matter. Every command takes --db (env MIXWARD_DB) and --tz
(env MIXWARD_TZ). Run 'mixward streams <command> -h' for its flags. A --
ends the flags: what follows is read as text even if it starts with -.
list and show only read the file, and fail where no log exists.
`

func (a *app) cmdStreams(ctx context.Context, args []string) error {
	if len(args) == 0 {
		fmt.Fprint(a.stderr, streamsUsage)
		return usageErr("streams: name a command")
	}
	switch args[0] {
	case "set":
		return a.streamsSet(ctx, args[1:])
	case "list", "ls":
		return a.streamsList(ctx, args[1:])
	case "show":
		return a.streamsShow(ctx, args[1:])
	case "rm", "remove":
		return a.streamsRemove(ctx, args[1:])
	case "-h", "-help", "--help", "help":
		fmt.Fprint(a.stdout, streamsUsage)
		return nil
	}
	fmt.Fprint(a.stderr, streamsUsage)
	return usageErr("streams: unknown command %q", args[0])
}

// storeErr maps store errors to exit codes: bad input is a usage error, a
// missing tag a failure.
func storeErr(err error) error {
	switch {
	case err == nil:
		return nil
	case errors.Is(err, store.ErrInvalid):
		return &exitError{exitUsage, err}
	case errors.Is(err, store.ErrNotFound):
		return &exitError{exitFail, err}
	}
	return err
}

func (a *app) streamsSet(ctx context.Context, args []string) error {
	fs := subFlags(a, "streams set", `streams set <TAG> "<stream>" [--note TEXT] [--by NAME]`, `
Define TAG as a stream written as in a mix request, e.g.
  mixward streams set T-101 "200 L NaOCl 12.5 %" --note "bleach day tank"
The stream must parse in the request language as one stream without
conditions (temperature and pH belong in the request). Changing a tag keeps
the earlier definition in its history.`)
	o := storeFlags(a, fs)
	note := fs.String("note", "", "a note kept with the change, e.g. why it changed")
	by := fs.String("by", cliUser(a), "`name` recorded as having made the change (env MIXWARD_USER, else USER)")
	pos, err := parseFlags(fs, args)
	if err != nil {
		return err
	}
	if len(pos) < 2 {
		fs.Usage()
		return usageErr(`streams set: give a tag and a stream, e.g. streams set T-101 "200 L NaOCl 12.5 %%"`)
	}
	tag, err := store.NormalizeTag(pos[0])
	if err != nil {
		return storeErr(err)
	}
	text := strings.TrimSpace(strings.Join(pos[1:], " "))
	if err := streamValidator(text); err != nil {
		return usageErr("streams set %s: %q is not a stream in the request language: %s", tag, text, safe(err.Error()))
	}
	db, _, err := openDB(ctx, a, o)
	if err != nil {
		return err
	}
	defer db.Close()
	prev, perr := db.Stream(ctx, tag)
	if err := db.SetStream(ctx, tag, text, *note, *by); err != nil {
		return storeErr(err)
	}
	if perr == nil {
		fmt.Fprintf(a.stdout, "%s changed: %s  (was %s)\n", safe(tag), safe(text), safe(prev.Stream))
	} else {
		fmt.Fprintf(a.stdout, "%s set: %s\n", safe(tag), safe(text))
	}
	return nil
}

func (a *app) streamsList(ctx context.Context, args []string) error {
	fs := subFlags(a, "streams list", "streams list [--format text|json]", `
List the current stream catalogue by tag, with who changed each tag last
and when.`)
	o := storeFlags(a, fs)
	format := fs.String("format", "text", "output `format`: text or json")
	if err := parseNoArgs(fs, args, "streams list", "text", "json"); err != nil {
		return err
	}
	db, loc, err := openReadDB(ctx, a, o, false)
	if err != nil {
		return err
	}
	defer db.Close()
	ss, err := db.Streams(ctx)
	if err != nil {
		return err
	}
	if *format == "json" {
		return writeJSON(a.stdout, ss)
	}
	if len(ss) == 0 {
		fmt.Fprintln(a.stdout, `No stream tags yet. Add one: mixward streams set T-101 "200 L NaOCl 12.5 %"`)
		return nil
	}
	tw := tabwriter.NewWriter(a.stdout, 0, 4, 2, ' ', 0)
	fmt.Fprintf(tw, "TAG\tSTREAM\tNOTE\tCHANGED BY\tCHANGED (%s)\n", loc)
	for _, s := range ss {
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\n", safe(s.Tag), safe(s.Stream), safeCut(s.Note, 40), safe(s.By), local(s.Time, loc))
	}
	return tw.Flush()
}

func (a *app) streamsShow(ctx context.Context, args []string) error {
	fs := subFlags(a, "streams show", "streams show <TAG> [--format text|json]", `
Show what TAG stands for now and every change to it, oldest first: who,
when, what it was set to, the note, and removals.`)
	o := storeFlags(a, fs)
	format := fs.String("format", "text", "output `format`: text or json")
	pos, err := parseFlags(fs, args)
	if err != nil {
		return err
	}
	if err := checkFormat(*format, "text", "json"); err != nil {
		return err
	}
	if len(pos) != 1 {
		fs.Usage()
		return usageErr("streams show: give one tag")
	}
	tag, err := store.NormalizeTag(pos[0])
	if err != nil {
		return storeErr(err)
	}
	db, loc, err := openReadDB(ctx, a, o, false)
	if err != nil {
		return err
	}
	defer db.Close()
	hist, err := db.StreamHistory(ctx, tag)
	if err != nil {
		return storeErr(fmt.Errorf("%w (list the tags with 'mixward streams list')", err))
	}
	cur, err := db.Stream(ctx, tag)
	removed := errors.Is(err, store.ErrNotFound)
	if err != nil && !removed {
		return err
	}
	if *format == "json" {
		out := struct {
			Tag     string               `json:"tag"`
			Current *store.Stream        `json:"current"` // null when removed
			History []store.StreamChange `json:"history"`
		}{Tag: tag, History: hist}
		if !removed {
			out.Current = &cur
		}
		return writeJSON(a.stdout, out)
	}
	if removed {
		fmt.Fprintf(a.stdout, "%s is not in the catalogue now (removed).\n", safe(tag))
	} else {
		fmt.Fprintf(a.stdout, "%s = %s\n", safe(tag), safe(cur.Stream))
		if cur.Note != "" {
			fmt.Fprintf(a.stdout, "note: %s\n", safe(cur.Note))
		}
	}
	fmt.Fprintf(a.stdout, "\nHistory (%s)\n", loc)
	tw := tabwriter.NewWriter(a.stdout, 0, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "  WHEN\tWHO\tCHANGE\tNOTE")
	for _, c := range hist {
		change := "set to " + c.Stream
		if c.Action == "remove" {
			change = "removed"
		}
		fmt.Fprintf(tw, "  %s\t%s\t%s\t%s\n", local(c.Time, loc), safe(c.By), safe(change), safe(c.Note))
	}
	return tw.Flush()
}

func (a *app) streamsRemove(ctx context.Context, args []string) error {
	fs := subFlags(a, "streams rm", "streams rm <TAG> [--by NAME]", `
Remove TAG from the catalogue; requests naming it are then refused. Its
history is kept, and it may be set again later.`)
	o := storeFlags(a, fs)
	by := fs.String("by", cliUser(a), "`name` recorded as having removed it (env MIXWARD_USER, else USER)")
	pos, err := parseFlags(fs, args)
	if err != nil {
		return err
	}
	if len(pos) != 1 {
		fs.Usage()
		return usageErr("streams rm: give one tag")
	}
	tag, err := store.NormalizeTag(pos[0])
	if err != nil {
		return storeErr(err)
	}
	db, _, err := openDB(ctx, a, o)
	if err != nil {
		return err
	}
	defer db.Close()
	if err := db.RemoveStream(ctx, tag, *by); err != nil {
		return storeErr(err)
	}
	fmt.Fprintf(a.stdout, "%s removed (its history is kept: mixward streams show %s).\n", tag, tag)
	return nil
}
