package main

// mixward log: verify, search, export, show, prune, backup and restore the
// query log. The helpers at the top (storeFlags, openDB, cliUser,
// parseWhen) are shared by the streams and digest subcommands and may be
// used by any other subcommand that opens the store.

import (
	"context"
	"encoding/csv"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"strconv"
	"strings"
	"text/tabwriter"
	"time"
	_ "time/tzdata" // MIXWARD_TZ works without the system zone database
	"unicode/utf8"

	"mixward/engine/hazard"
	"mixward/store"
)

// storeOpts are the flags every store-backed subcommand takes.
type storeOpts struct {
	db string // --db, env MIXWARD_DB, default ./mixward.db
	tz string // --tz, env MIXWARD_TZ, default UTC
}

// storeFlags registers --db and --tz on fs with their environment defaults.
func storeFlags(a *app, fs *flag.FlagSet) *storeOpts {
	o := &storeOpts{}
	fs.StringVar(&o.db, "db", envOr(a.getenv, "MIXWARD_DB", "mixward.db"), "SQLite `file` of the query log and stream catalogue (env MIXWARD_DB)")
	fs.StringVar(&o.tz, "tz", envOr(a.getenv, "MIXWARD_TZ", "UTC"), "site time `zone` for dates given and times shown, e.g. Europe/London (env MIXWARD_TZ)")
	return o
}

// siteLocation loads an IANA time zone name ("" means UTC).
func siteLocation(name string) (*time.Location, error) {
	if name == "" {
		return time.UTC, nil
	}
	loc, err := time.LoadLocation(name)
	if err != nil {
		return nil, &exitError{exitUsage, fmt.Errorf("time zone %q: %v (use an IANA name such as Europe/London, or UTC)", name, err)}
	}
	return loc, nil
}

// openDB opens the store named by o (creating and migrating it as needed)
// in the site time zone.
func openDB(ctx context.Context, a *app, o *storeOpts) (*store.DB, *time.Location, error) {
	loc, err := siteLocation(o.tz)
	if err != nil {
		return nil, nil, err
	}
	_, statErr := os.Stat(o.db)
	db, err := store.Open(ctx, o.db, store.Options{Location: loc})
	if err != nil {
		return nil, nil, err
	}
	if errors.Is(statErr, os.ErrNotExist) {
		fmt.Fprintf(a.stderr, "mixward: created a new, empty log at %s (set --db or MIXWARD_DB to use another)\n", o.db)
	}
	return db, loc, nil
}

// shiftSpec is the shift-change schedule, env MIXWARD_SHIFTS.
func shiftSpec(a *app) string { return envOr(a.getenv, "MIXWARD_SHIFTS", store.DefaultShifts) }

// cliUser names the person at the terminal for records: MIXWARD_USER, else
// USER, else "cli".
func cliUser(a *app) string {
	if u := strings.TrimSpace(a.getenv("MIXWARD_USER")); u != "" {
		return u
	}
	if u := strings.TrimSpace(a.getenv("USER")); u != "" {
		return u
	}
	return "cli"
}

// parseWhen reads a --since/--until/--before value in the site zone.
func parseWhen(flagName, s string, loc *time.Location) (time.Time, error) {
	t, err := store.ParseWhen(s, time.Now(), loc)
	if err != nil {
		return time.Time{}, &exitError{exitUsage, fmt.Errorf("--%s: %w", flagName, err)}
	}
	return t, nil
}

// dateHelp documents the date forms in usage texts.
const dateHelp = `Dates: 2026-12-01 (midnight), 2026-12-01T06:00 or "2026-12-01 06:00" in the
site time zone (--tz), RFC 3339 such as 2026-12-01T06:00:00Z, or a span back
from now: 90m, 24h, 7d, 2w.`

// subFlags makes a flag set whose -h prints the synopsis, the description
// and every flag.
func subFlags(a *app, name, synopsis, about string) *flag.FlagSet {
	fs := a.newFlags(name, synopsis)
	fs.Usage = func() {
		w := fs.Output()
		fmt.Fprintf(w, "usage: mixward %s\n\n%s\n\nflags:\n", synopsis, strings.TrimSpace(about))
		fs.PrintDefaults()
	}
	return fs
}

func usageErr(format string, args ...any) error {
	return &exitError{exitUsage, fmt.Errorf(format, args...)}
}

// local formats t in the site zone with the zone's abbreviation.
func local(t time.Time, loc *time.Location) string {
	return t.In(loc).Format("2006-01-02 15:04 MST")
}

// cut shortens s to n runes on one line.
func cut(s string, n int) string {
	s = strings.Join(strings.Fields(s), " ")
	if utf8.RuneCountInString(s) <= n {
		return s
	}
	return string([]rune(s)[:n-1]) + "…"
}

const logUsage = `usage: mixward log <command> [flags]

The query log: every request the bot or the command line answered, chained
by SHA-256 so that edits show.

commands:
  verify               walk the hash chain; exit status 1 if it is broken
  search "<terms>"     full-text search, newest first (--since, --until, --user,
                       --verdict, --hazard, --limit, --offset, --format)
  export               every row of a period for audits (--format csv|json)
  show <id>            one query in full, with its delivery record
  prune --before DATE --confirm   delete the oldest queries (recorded in the log)
  backup <file>        copy the live log with SQLite's online backup, then verify the copy
  restore <file>       replace the log with a verified backup

Every command takes --db (env MIXWARD_DB, default ./mixward.db) and --tz
(env MIXWARD_TZ, default UTC). Run 'mixward log <command> -h' for its flags.
`

func (a *app) cmdLog(ctx context.Context, args []string) error {
	if len(args) == 0 {
		fmt.Fprint(a.stderr, logUsage)
		return usageErr("log: name a command")
	}
	switch args[0] {
	case "verify":
		return a.logVerify(ctx, args[1:])
	case "search":
		return a.logSearch(ctx, args[1:])
	case "export":
		return a.logExport(ctx, args[1:])
	case "show":
		return a.logShow(ctx, args[1:])
	case "prune":
		return a.logPrune(ctx, args[1:])
	case "backup":
		return a.logBackup(ctx, args[1:])
	case "restore":
		return a.logRestore(ctx, args[1:])
	case "-h", "-help", "--help", "help":
		fmt.Fprint(a.stdout, logUsage)
		return nil
	}
	fmt.Fprint(a.stderr, logUsage)
	return usageErr("log: unknown command %q", args[0])
}

// parseNoArgs parses the flags of a subcommand that takes no arguments and
// checks its --format flag against formats.
func parseNoArgs(fs *flag.FlagSet, args []string, cmd string, formats ...string) error {
	pos, err := parseFlags(fs, args)
	if err != nil {
		return err
	}
	if err := noArgs(pos, cmd); err != nil {
		return err
	}
	return checkFormat(fs.Lookup("format").Value.String(), formats...)
}

func noArgs(pos []string, cmd string) error {
	if len(pos) > 0 {
		return usageErr("%s takes no arguments, got %q", cmd, strings.Join(pos, " "))
	}
	return nil
}

// --- verify -----------------------------------------------------------------

func (a *app) logVerify(ctx context.Context, args []string) error {
	fs := subFlags(a, "log verify", "log verify [--db FILE] [--format text|json]", `
Walk the hash chain of the query log from the oldest row to the newest,
recomputing each row's hash, and report the first row that was edited,
removed or inserted outside mixward. Exit status 0: intact; 1: broken.
Note the head hash in the shift report: a later verify that shows the same
hash proves nothing up to it was rewritten.`)
	o := storeFlags(a, fs)
	format := fs.String("format", "text", "output `format`: text or json")
	if err := parseNoArgs(fs, args, "log verify", "text", "json"); err != nil {
		return err
	}
	db, _, err := openDB(ctx, a, o)
	if err != nil {
		return err
	}
	defer db.Close()
	rep, err := db.Verify(ctx)
	if err != nil {
		return err
	}
	return a.printVerify(rep, *format, o.db)
}

func (a *app) printVerify(rep store.VerifyReport, format, what string) error {
	if format == "json" {
		if err := writeJSON(a.stdout, rep); err != nil {
			return err
		}
	} else if rep.OK {
		fmt.Fprintf(a.stdout, "%s: chain intact: %d rows (%d queries, %d prune records)", what, rep.Rows, rep.Queries, rep.Prunes)
		if rep.Rows > 0 {
			fmt.Fprintf(a.stdout, ", ids %d–%d\nhead hash %s\n", rep.FirstID, rep.LastID, rep.HeadHash)
		} else {
			fmt.Fprintln(a.stdout)
		}
		if rep.AnchorID > 0 {
			fmt.Fprintf(a.stdout, "rows up to %d were pruned; the oldest kept row follows their anchor %s\n", rep.AnchorID, rep.AnchorHash)
		}
	} else {
		fmt.Fprintf(a.stdout, "%s: CHAIN BROKEN at row %d\n  %s\n  %d rows before it verified\n", what, rep.BrokenID, rep.Problem, rep.Rows)
		fmt.Fprintln(a.stdout, "  Keep this file as evidence; compare with the latest backup (mixward log verify --db BACKUP).")
	}
	if !rep.OK {
		return &exitError{exitFail, fmt.Errorf("hash chain of %s is broken at row %d", what, rep.BrokenID)}
	}
	return nil
}

// --- search -----------------------------------------------------------------

func (a *app) logSearch(ctx context.Context, args []string) error {
	fs := subFlags(a, "log search", `log search "<terms>" [flags]`, `
Search the query log, newest first. Terms are words that must all appear in
the request (as typed or with stream tags resolved), its species, or its
hazard codes and messages; text in double quotes must appear as a phrase.
Case and accents are ignored and punctuation splits words, so "Fe^2+" finds
Fe 2+. Every character is literal: AND, OR, NOT, NEAR, *, -, parentheses
and quotes are never operators. The terms may be left out to list by the
filters alone.

`+dateHelp)
	o := storeFlags(a, fs)
	since := fs.String("since", "", "only queries at or after this `date`")
	until := fs.String("until", "", "only queries before this `date`")
	user := fs.String("user", "", "only queries by this user `name` (any case) or user id")
	verdict := fs.String("verdict", "", "only this `verdict`: spontaneous, non-spontaneous, no-reaction or error")
	hazardCode := fs.String("hazard", "", "only queries with this hazard `code`, e.g. chlorine-release; older codes (hypochlorite-acid) find the same records")
	limit := fs.Int("limit", store.DefaultLimit, fmt.Sprintf("page size, at most %d", store.MaxLimit))
	offset := fs.Int("offset", 0, "skip this many matches (the next page starts at the offset printed)")
	format := fs.String("format", "text", "output `format`: text, json or csv")
	pos, err := parseFlags(fs, args)
	if err != nil {
		return err
	}
	if err := checkFormat(*format, "text", "json", "csv"); err != nil {
		return err
	}
	if *verdict != "" && !store.ValidVerdict(*verdict) {
		return usageErr("--verdict %q: use %s", *verdict, strings.Join(store.Verdicts, ", "))
	}
	if *limit < 1 || *limit > store.MaxLimit {
		return usageErr("--limit %d: use 1 to %d", *limit, store.MaxLimit)
	}
	if *offset < 0 {
		return usageErr("--offset %d: use 0 or more", *offset)
	}
	loc, err := siteLocation(o.tz)
	if err != nil {
		return err
	}
	so := store.SearchOptions{Terms: strings.Join(pos, " "), User: *user, Verdict: *verdict, Limit: *limit, Offset: *offset}
	if *hazardCode != "" {
		// Renamed codes keep their old names as aliases: either finds both.
		so.HazardAny = hazard.Equivalent(*hazardCode)
	}
	if *since != "" {
		if so.Since, err = parseWhen("since", *since, loc); err != nil {
			return err
		}
	}
	if *until != "" {
		if so.Until, err = parseWhen("until", *until, loc); err != nil {
			return err
		}
	}
	if !so.Since.IsZero() && !so.Until.IsZero() && !so.Since.Before(so.Until) {
		return usageErr("--since %s is not before --until %s", local(so.Since, loc), local(so.Until, loc))
	}
	db, loc, err := openDB(ctx, a, o)
	if err != nil {
		return err
	}
	defer db.Close()
	page, err := db.Search(ctx, so)
	if err != nil {
		return err
	}
	switch *format {
	case "json":
		return writeJSON(a.stdout, page)
	case "csv":
		cw := newQueryCSV(a.stdout, false)
		for _, q := range page.Queries {
			cw.write("query", q)
		}
		return cw.flush()
	}
	if strings.TrimSpace(so.Terms) != "" && len(page.Phrases) == 0 {
		fmt.Fprintf(a.stdout, "The terms %q hold no letters or digits, so nothing can match.\n", so.Terms)
		return nil
	}
	if len(page.Queries) == 0 {
		if so.Offset > 0 {
			fmt.Fprintf(a.stdout, "No more matches after the first %d.\n", so.Offset)
		} else {
			fmt.Fprintln(a.stdout, "No queries match.")
		}
		return nil
	}
	tw := tabwriter.NewWriter(a.stdout, 0, 4, 2, ' ', 0)
	fmt.Fprintf(tw, "ID\tTIME (%s)\tWHO\tWHERE\tVERDICT\tREQUEST\tHAZARDS\n", loc)
	for _, q := range page.Queries {
		var hz []string
		for _, h := range q.Hazards {
			hz = append(hz, h.Code)
		}
		req := q.Request
		if q.Verdict == store.VerdictError {
			req += "  [" + q.Error + "]"
		}
		fmt.Fprintf(tw, "%d\t%s\t%s\t%s\t%s\t%s\t%s\n", q.ID, local(q.Time, loc), cut(orDash(q.UserName, q.UserID), 24),
			cut(q.Channel, 16), q.Verdict, cut(req, 70), strings.Join(hz, ","))
	}
	tw.Flush()
	first := so.Offset + 1
	fmt.Fprintf(a.stdout, "\nMatches %d–%d, newest first.", first, so.Offset+len(page.Queries))
	if page.HasMore {
		fmt.Fprintf(a.stdout, " More: add --offset %d.", page.NextOffset)
	}
	fmt.Fprintln(a.stdout, " Full record: mixward log show <ID>.")
	return nil
}

func orDash(a, b string) string {
	switch {
	case a != "":
		return a
	case b != "":
		return b
	}
	return "-"
}

// queryCSV writes queries as CSV with a header row. Values are written as
// logged; a spreadsheet may read a cell starting with = + - @ as a formula.
type queryCSV struct {
	w      *csv.Writer
	export bool
	n      int
}

var csvHeader = []string{"id", "kind", "time", "user_id", "user_name", "channel", "event_id", "request", "resolved",
	"verdict", "error", "species", "oxidizer", "reducer", "e_cell_v", "e_cell_standard_v", "hazards", "streams",
	"engine_version", "data_hash", "prev_hash", "hash"}

func newQueryCSV(w io.Writer, export bool) *queryCSV {
	c := &queryCSV{w: csv.NewWriter(w), export: export}
	c.w.Write(csvHeader)
	return c
}

// csvText guards a text cell of a CSV export against spreadsheet formula
// injection: a cell that starts with =, +, -, @, tab or carriage return gets
// a leading apostrophe, so a spreadsheet shows it as text instead of running
// it (OWASP, "CSV Injection"; common practice). The JSON export is verbatim.
func csvText(s string) string {
	if s != "" && strings.ContainsRune("=+-@\t\r", rune(s[0])) {
		return "'" + s
	}
	return s
}

func (c *queryCSV) write(kind string, q *store.Query) {
	f := func(p *float64) string {
		if p == nil {
			return ""
		}
		return strconv.FormatFloat(*p, 'f', -1, 64)
	}
	var hz []string
	for _, h := range q.Hazards {
		hz = append(hz, fmt.Sprintf("%s %s: %s", h.Severity, h.Code, h.Message))
	}
	s := csvText
	c.w.Write([]string{strconv.FormatInt(q.ID, 10), kind, q.Time.UTC().Format(time.RFC3339Nano), s(q.UserID), s(q.UserName),
		s(q.Channel), s(q.EventID), s(q.Request), s(q.Resolved), q.Verdict, s(q.Error), s(strings.Join(q.Species, "; ")), s(q.Oxidizer),
		s(q.Reducer), f(q.ECellV), f(q.ECellStandardV), s(strings.Join(hz, "; ")), s(strings.Join(q.Streams, "; ")),
		q.EngineVersion, q.DataHash, q.PrevHash, q.Hash})
	c.n++
}

func (c *queryCSV) flush() error {
	c.w.Flush()
	return c.w.Error()
}

// --- export -----------------------------------------------------------------

func (a *app) logExport(ctx context.Context, args []string) error {
	fs := subFlags(a, "log export", "log export [--since DATE] [--until DATE] [--format csv|json] [--out FILE]", `
Write every row of the query log in a period, oldest first, for an audit:
queries (parse failures included) and prune records, each with its hash and
the hash of the row before it. CSV has a header row; JSON is one array of
objects with the same snake_case fields as 'log search --format json' plus
"kind" ("query" or "prune"). Without --since and --until the whole log is
written. In CSV, a text cell starting with =, +, -, @ or a tab gets a leading
apostrophe so that spreadsheets do not run it as a formula; JSON is verbatim.

`+dateHelp)
	o := storeFlags(a, fs)
	since := fs.String("since", "", "first `date` to include")
	until := fs.String("until", "", "`date` to stop before")
	format := fs.String("format", "csv", "output `format`: csv or json")
	out := fs.String("out", "", "write to this new `file` instead of standard output (never overwrites)")
	if err := parseNoArgs(fs, args, "log export", "csv", "json"); err != nil {
		return err
	}
	loc, err := siteLocation(o.tz)
	if err != nil {
		return err
	}
	var from, to time.Time
	if *since != "" {
		if from, err = parseWhen("since", *since, loc); err != nil {
			return err
		}
	}
	if *until != "" {
		if to, err = parseWhen("until", *until, loc); err != nil {
			return err
		}
	}
	db, _, err := openDB(ctx, a, o)
	if err != nil {
		return err
	}
	defer db.Close()
	w := a.stdout
	var f *os.File
	if *out != "" {
		f, err = os.OpenFile(*out, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o600)
		if err != nil {
			return &exitError{exitFail, fmt.Errorf("export: %v (choose a new file name)", err)}
		}
		defer f.Close()
		w = f
	}
	n := 0
	if *format == "csv" {
		cw := newQueryCSV(w, true)
		err = db.Export(ctx, from, to, func(e *store.Entry) error {
			cw.write(e.Kind, e.Query)
			n++
			return nil
		})
		if ferr := cw.flush(); err == nil {
			err = ferr
		}
	} else {
		enc := json.NewEncoder(w)
		enc.SetEscapeHTML(false)
		io.WriteString(w, "[")
		err = db.Export(ctx, from, to, func(e *store.Entry) error {
			if n > 0 {
				io.WriteString(w, ",")
			}
			n++
			io.WriteString(w, "\n")
			return enc.Encode(e)
		})
		io.WriteString(w, "]\n")
	}
	if err != nil {
		return err
	}
	if f != nil {
		if err := f.Close(); err != nil {
			return err
		}
		fmt.Fprintf(a.stderr, "exported %d rows to %s\n", n, *out)
	}
	return nil
}

// --- show -------------------------------------------------------------------

func (a *app) logShow(ctx context.Context, args []string) error {
	fs := subFlags(a, "log show", "log show <id> [--format text|json]", `
Print one logged query in full: who, where, when, the request as typed and
as resolved, verdict, species, potentials, hazards, streams, engine version,
data hash, its hashes, and whether the answer was posted.`)
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
		return usageErr("log show: give one query id")
	}
	id, err := strconv.ParseInt(strings.TrimPrefix(pos[0], "#"), 10, 64)
	if err != nil || id < 1 {
		return usageErr("log show: %q is not a query id (a whole number from 'log search')", pos[0])
	}
	db, loc, err := openDB(ctx, a, o)
	if err != nil {
		return err
	}
	defer db.Close()
	q, err := db.Get(ctx, id)
	if errors.Is(err, store.ErrNotFound) {
		return &exitError{exitFail, fmt.Errorf("no query %d in %s", id, o.db)}
	}
	if err != nil {
		return err
	}
	ds, err := db.Deliveries(ctx, id)
	if err != nil {
		return err
	}
	if *format == "json" {
		if ds == nil {
			ds = []store.Delivery{}
		}
		return writeJSON(a.stdout, struct {
			Query      *store.Query     `json:"query"`
			Deliveries []store.Delivery `json:"deliveries"`
		}{q, ds})
	}
	tw := tabwriter.NewWriter(a.stdout, 0, 4, 2, ' ', 0)
	row := func(k, v string) {
		if v != "" {
			fmt.Fprintf(tw, "%s\t%s\n", k, v)
		}
	}
	fmt.Fprintf(a.stdout, "Query %d\n", q.ID)
	row("time", local(q.Time, loc)+"  ("+q.Time.Format(time.RFC3339Nano)+")")
	row("who", orDash(q.UserName, q.UserID)+" "+paren(q.UserID, q.UserName))
	row("where", q.Channel)
	row("event id", q.EventID)
	row("request", q.Request)
	row("resolved", q.Resolved)
	row("verdict", q.Verdict)
	row("error", q.Error)
	row("species", strings.Join(q.Species, ", "))
	row("oxidizer", q.Oxidizer)
	row("reducer", q.Reducer)
	if q.ECellV != nil {
		v := fmt.Sprintf("%+.3f V", *q.ECellV)
		if q.ECellStandardV != nil {
			v += fmt.Sprintf(" (standard %+.3f V)", *q.ECellStandardV)
		}
		row("E cell", v)
	}
	for i, h := range q.Hazards {
		k := ""
		if i == 0 {
			k = "hazards"
		}
		fmt.Fprintf(tw, "%s\t%s %s: %s\n", k, h.Severity, h.Code, h.Message)
	}
	row("streams", strings.Join(q.Streams, "  |  "))
	row("engine", strings.TrimSpace(q.EngineVersion+"  data "+q.DataHash))
	row("hash", q.Hash)
	row("prev hash", orDash(q.PrevHash, "(first row)"))
	if len(ds) == 0 {
		row("posted", "no delivery recorded")
	}
	for i, d := range ds {
		k := ""
		if i == 0 {
			k = "posted"
		}
		ok := "failed"
		if d.OK {
			ok = "ok"
		}
		fmt.Fprintf(tw, "%s\t%s %s %s\n", k, local(d.Time, loc), ok, d.Detail)
	}
	return tw.Flush()
}

func paren(id, name string) string {
	if id == "" || id == name || name == "" {
		return ""
	}
	return "(" + id + ")"
}

// --- prune ------------------------------------------------------------------

func (a *app) logPrune(ctx context.Context, args []string) error {
	fs := subFlags(a, "log prune", "log prune --before DATE --confirm [--by NAME]", `
Delete the oldest queries, those logged before DATE, for sites that must
not keep them. The log is kept whole by default: run this only where a
retention rule requires it. The deletion is recorded in the log itself
(who, when, the cut-off, how many rows) as a chained prune record that
'log verify' checks the remaining rows against. Deleted text is overwritten
on disk. Make a backup first ('mixward log backup').

`+dateHelp)
	o := storeFlags(a, fs)
	before := fs.String("before", "", "delete queries logged before this `date` (required)")
	confirm := fs.Bool("confirm", false, "really delete (required)")
	by := fs.String("by", cliUser(a), "`name` recorded as having pruned (env MIXWARD_USER, else USER)")
	pos, err := parseFlags(fs, args)
	if err != nil {
		return err
	}
	if err := noArgs(pos, "log prune"); err != nil {
		return err
	}
	if *before == "" {
		fs.Usage()
		return usageErr("log prune: --before DATE is required")
	}
	loc, err := siteLocation(o.tz)
	if err != nil {
		return err
	}
	cutoff, err := parseWhen("before", *before, loc)
	if err != nil {
		return err
	}
	if cutoff.After(time.Now()) {
		return usageErr("--before %s is in the future: that would delete everything; give a past date", local(cutoff, loc))
	}
	db, loc, err := openDB(ctx, a, o)
	if err != nil {
		return err
	}
	defer db.Close()
	if !*confirm {
		page, err := db.Search(ctx, store.SearchOptions{Until: cutoff, Limit: 1})
		if err != nil {
			return err
		}
		what := "no queries"
		if len(page.Queries) > 0 {
			what = "queries"
		}
		return usageErr("log prune: add --confirm to delete the %s logged before %s from %s (nothing was deleted)", what, local(cutoff, loc), o.db)
	}
	n, err := db.Prune(ctx, cutoff, *by)
	if err != nil {
		return err
	}
	fmt.Fprintf(a.stdout, "Deleted %d rows logged before %s; the prune is recorded in the log as done by %s.\n", n, local(cutoff, loc), *by)
	rep, err := db.Verify(ctx)
	if err != nil {
		return err
	}
	return a.printVerify(rep, "text", o.db)
}

// --- backup and restore -----------------------------------------------------

func (a *app) logBackup(ctx context.Context, args []string) error {
	fs := subFlags(a, "log backup", "log backup <file> [--db FILE]", `
Copy the live log (queries, stream catalogue, digest records) to a new file
with SQLite's online backup API: the bot may keep logging meanwhile, and the
copy is one consistent snapshot. The copy's hash chain is then verified.
The file must not exist yet. Restore with 'mixward log restore <file>'.`)
	o := storeFlags(a, fs)
	pos, err := parseFlags(fs, args)
	if err != nil {
		return err
	}
	if len(pos) != 1 {
		fs.Usage()
		return usageErr("log backup: give one destination file")
	}
	db, _, err := openDB(ctx, a, o)
	if err != nil {
		return err
	}
	defer db.Close()
	if err := db.Backup(ctx, pos[0]); err != nil {
		return err
	}
	rep, err := store.VerifyFile(ctx, pos[0])
	if err != nil {
		return err
	}
	fmt.Fprintf(a.stdout, "Backed up %s to %s.\n", o.db, pos[0])
	return a.printVerify(rep, "text", pos[0])
}

func (a *app) logRestore(ctx context.Context, args []string) error {
	fs := subFlags(a, "log restore", "log restore <file> [--db FILE] [--replace]", `
Replace the log in --db with the backup <file>. The backup's hash chain is
verified first and nothing is changed if it is broken; a backup made by an
older mixward is brought up to this schema. The restored log is verified
again. Stop the bot first. A log that already holds queries is replaced only
with --replace (back it up first).`)
	o := storeFlags(a, fs)
	replace := fs.Bool("replace", false, "replace a log that already holds queries")
	pos, err := parseFlags(fs, args)
	if err != nil {
		return err
	}
	if len(pos) != 1 {
		fs.Usage()
		return usageErr("log restore: give one backup file")
	}
	if _, err := os.Stat(pos[0]); err != nil {
		return &exitError{exitFail, fmt.Errorf("log restore: %v", err)}
	}
	db, _, err := openDB(ctx, a, o)
	if err != nil {
		return err
	}
	defer db.Close()
	n, err := db.Count(ctx)
	if err != nil {
		return err
	}
	if n > 0 && !*replace {
		return usageErr("log restore: %s already holds %d queries; back it up, then add --replace", o.db, n)
	}
	rep, err := db.Restore(ctx, pos[0])
	if errors.Is(err, store.ErrBrokenChain) {
		a.printVerify(rep, "text", pos[0])
		return &exitError{exitFail, err}
	}
	if err != nil {
		return err
	}
	fmt.Fprintf(a.stdout, "Restored %s from %s.\n", o.db, pos[0])
	return a.printVerify(rep, "text", o.db)
}
