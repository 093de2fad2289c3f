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
	db   string // --db, env MIXWARD_DB, default ./mixward.db
	tz   string // --tz, env MIXWARD_TZ, default UTC
	site string // --site, env MIXWARD_SITE, default main
}

// storeFlags registers --db and --tz on fs with their environment defaults.
func storeFlags(a *app, fs *flag.FlagSet) *storeOpts {
	o := &storeOpts{}
	fs.StringVar(&o.db, "db", envOr(a.getenv, "MIXWARD_DB", "mixward.db"), "query log and stream catalogue: a SQLite `file`, or a postgres:// URL (env MIXWARD_DB)")
	fs.StringVar(&o.tz, "tz", envOr(a.getenv, "MIXWARD_TZ", "UTC"), "site time `zone` for dates given and times shown, e.g. Europe/London (env MIXWARD_TZ)")
	fs.StringVar(&o.site, "site", envOr(a.getenv, envSite, store.DefaultSite), "the `site` whose stream tags, queries and digests are meant (env MIXWARD_SITE)")
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
		fmt.Fprintf(w, "\n%s\n", endOfFlags)
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
  verify               walk the hash chain and check the tables derived from it;
                       exit status 1 if it is broken (--expect HASH, --anchors FILE)
  search "<terms>"     full-text search, newest first (--since, --until, --user,
                       --verdict, --hazard, --limit, --offset, --format)
  export               every row of a period for audits (--format csv|json)
  show <id>            one query in full, with its delivery record
  prune --before DATE --confirm   delete the oldest queries (recorded in the log)
  backup <file>        copy the live log with SQLite's online backup, then verify the copy
  restore <file>       replace the log with a verified backup
  migrate              upgrade the file to this mixward's schema (back it up first)
  reindex              rebuild the hazard rows and the search index from the hashed rows
  copy --from DB --to DB   copy a whole log into a new, empty one, SQLite to
                       PostgreSQL or back, keeping ids and hashes; the copy is verified

verify, search, export, show and backup only read the file: they never
create, upgrade or change it, and fail on a path where no log exists.

Every command takes --db (env MIXWARD_DB, default ./mixward.db) and --tz
(env MIXWARD_TZ, default UTC). Run 'mixward log <command> -h' for its flags.
A -- ends the flags: what follows is read as text even if it starts with -
(mixward log search -- -5 L).
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
	case "migrate":
		return a.logMigrate(ctx, args[1:])
	case "reindex":
		return a.logReindex(ctx, args[1:])
	case "copy":
		return a.logCopy(ctx, args[1:])
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
	fs := subFlags(a, "log verify", "log verify [--db FILE] [--expect HASH] [--anchors FILE] [--format text|json]", `
Walk the hash chain of the query log from the oldest row to the newest,
recomputing each row's hash, and report the first row that was edited,
removed or inserted outside mixward, and any table derived from the rows
(hazard rows, the search index) that differs from them. The file is only
read: never created, migrated or changed. Exit status 0: intact; 1: broken
(or an expected hash is not on the chain); 2: bad input, such as a --db
file that does not exist.

The head hash printed at the end (and carried in every digest) is the
proof to keep: --expect HASH, or --anchors with a file of "ID HASH" lines
noted earlier, fails when any row up to it was rewritten and re-hashed or
the newest rows were cut off.

Rows written with MIXWARD_CHAIN_KEY_FILE set are keyed (HMAC-SHA256):
without the key their content cannot be checked, and this says so.`)
	o := storeFlags(a, fs)
	format := fs.String("format", "text", "output `format`: text or json")
	expect := fs.String("expect", "", "a head `hash` noted earlier (from a digest or an earlier verify) that must still be on the chain")
	anchorsFile := fs.String("anchors", "", "a `file` of anchors, one \"ID HASH\" per line (# comments), that must still be on the chain")
	if err := parseNoArgs(fs, args, "log verify", "text", "json"); err != nil {
		return err
	}
	anchors, err := readAnchors(*expect, *anchorsFile)
	if err != nil {
		return err
	}
	db, _, err := openReadDB(ctx, a, o, true)
	if err != nil {
		return err
	}
	defer db.Close()
	rep, err := db.Verify(ctx, anchors...)
	if err != nil {
		return err
	}
	return a.printVerify(rep, *format, o.db)
}

// readAnchors gathers the anchors of --expect and --anchors.
func readAnchors(expect, file string) ([]store.Anchor, error) {
	var out []store.Anchor
	if expect != "" {
		an, err := store.ParseAnchor(expect)
		if err != nil {
			return nil, usageErr("--expect: %v", err)
		}
		out = append(out, an)
	}
	if file != "" {
		f, err := os.Open(file)
		if err != nil {
			return nil, usageErr("--anchors: %v", err)
		}
		defer f.Close()
		an, err := store.ParseAnchors(f)
		if err != nil {
			return nil, usageErr("--anchors %s: %v", safe(file), err)
		}
		if len(an) == 0 {
			return nil, usageErr("--anchors %s: no anchors in the file (want one \"ID HASH\" per line)", safe(file))
		}
		out = append(out, an...)
	}
	return out, nil
}

func (a *app) printVerify(rep store.VerifyReport, format, what string) error {
	what = safe(what)
	if format == "json" {
		if err := writeJSON(a.stdout, rep); err != nil {
			return err
		}
	} else {
		a.printVerifyText(rep, what)
	}
	if !rep.OK {
		return &exitError{exitFail, fmt.Errorf("hash chain of %s is broken at row %d", what, rep.BrokenID)}
	}
	return nil
}

func (a *app) printVerifyText(rep store.VerifyReport, what string) {
	w := a.stdout
	if !rep.OK {
		fmt.Fprintf(w, "%s: CHAIN BROKEN at row %d\n  %s\n  %d rows before it verified\n", what, rep.BrokenID, safe(rep.Problem), rep.Rows)
		fmt.Fprintln(w, "  Keep this file as evidence; compare with the latest backup (mixward log verify --db BACKUP).")
		return
	}
	fmt.Fprintf(w, "%s: chain intact: %d rows (%d queries, %d prune records)", what, rep.Rows, rep.Queries, rep.Prunes)
	if rep.Rows > 0 {
		fmt.Fprintf(w, ", ids %d–%d\nhead hash %s (row %d)\n", rep.FirstID, rep.LastID, rep.HeadHash, rep.LastID)
	} else {
		fmt.Fprintln(w)
	}
	if rep.AnchorID > 0 {
		fmt.Fprintf(w, "rows up to %d were pruned; the oldest kept row follows their anchor %s\n", rep.AnchorID, rep.AnchorHash)
	}
	switch {
	case rep.KeyedRows == 0:
		fmt.Fprintln(w, "chain: plain SHA-256 (no key): someone with the file could re-hash it; compare the head hash with one noted elsewhere")
	case rep.UncheckedRows > 0:
		fmt.Fprintf(w, "NOT CHECKED: %d keyed rows (from row %d, key id %s) are HMAC-SHA256 rows whose content cannot be checked without the key; "+
			"only their links were. Set MIXWARD_CHAIN_KEY_FILE to the key file to check them.\n", rep.UncheckedRows, rep.FirstKeyedID, rep.KeyID)
	default:
		fmt.Fprintf(w, "chain: keyed (HMAC-SHA256, key id %s) from row %d; all %d keyed rows checked with the key\n", rep.KeyID, rep.FirstKeyedID, rep.KeyedRows)
	}
	if rep.DerivedChecked {
		fmt.Fprintln(w, "derived tables (hazard rows, search index, search state) match the rows")
	}
	if rep.DigestAnchors > 0 {
		fmt.Fprintf(w, "the log heads carried by %d digests sent are on the chain\n", rep.DigestAnchors)
	}
	for _, an := range rep.Anchors {
		switch an.Status {
		case "ok":
			fmt.Fprintf(w, "anchor %s: on the chain at row %d\n", an.Hash, an.FoundID)
		case "pruned":
			fmt.Fprintf(w, "anchor row %d: pruned (recorded), cannot be checked\n", an.ID)
		}
	}
}

// --- search -----------------------------------------------------------------

func (a *app) logSearch(ctx context.Context, args []string) error {
	fs := subFlags(a, "log search", `log search "<terms>" [flags]`, `
Search the query log, newest first. Terms are words that must all appear in
the request (as typed or with stream tags resolved), its species, or its
hazard codes and messages; text in double quotes must appear as a phrase.
Case and accents are ignored and punctuation splits words, so "Fe^2+" finds
Fe 2+. Every character is literal: AND, OR, NOT, NEAR, *, -, parentheses
and quotes are never operators. At most 64 different terms (a quoted phrase
counts as one) of 256 words in all; more is refused (exit 2). The terms may
be left out to list by the filters alone. A first term starting with - needs
-- before it: mixward log search -- -40 L. Every site is searched unless
--site is given (MIXWARD_SITE does not narrow a search). The file is only read.

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
	fs.Visit(func(f *flag.Flag) {
		if f.Name == "site" {
			so.Site = o.site // only when asked for: reviewers search across sites
		}
	})
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
	db, loc, err := openReadDB(ctx, a, o, false)
	if err != nil {
		return err
	}
	defer db.Close()
	page, err := db.Search(ctx, so)
	if err != nil {
		return storeErr(err)
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
	return a.searchText(ctx, db, so, page, loc)
}

// searchText prints a page of search results as a table, newest first, with
// the channel's name at the time and the site of rows outside main.
func (a *app) searchText(ctx context.Context, db *store.DB, so store.SearchOptions, page store.SearchPage, loc *time.Location) error {
	if strings.TrimSpace(so.Terms) != "" && len(page.Phrases) == 0 {
		fmt.Fprintf(a.stdout, "The terms %q hold no letters or digits, so nothing can match.\n", safe(so.Terms))
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
		name, err := db.NameAt(ctx, q.Channel, q.Time)
		if err != nil {
			return err
		}
		var hz []string
		for _, h := range q.Hazards {
			hz = append(hz, h.Code)
		}
		req := q.Request
		if q.Verdict == store.VerdictError {
			req += "  [" + q.Error + "]"
		}
		where := orDash(name, q.Channel)
		if q.Site != store.DefaultSite {
			where = q.Site + "/" + where
		}
		fmt.Fprintf(tw, "%d\t%s\t%s\t%s\t%s\t%s\t%s\n", q.ID, local(q.Time, loc), safeCut(orDash(q.UserName, q.UserID), 24),
			safeCut(where, 32), q.Verdict, safeCut(req, 70), safe(strings.Join(hz, ",")))
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
	"engine_version", "data_hash", "prev_hash", "hash", "chain", "key_id"}

func newQueryCSV(w io.Writer, export bool) *queryCSV {
	c := &queryCSV{w: csv.NewWriter(w), export: export}
	c.w.Write(csvHeader)
	return c
}

// csvText makes a text cell of a CSV export safe: control and escape
// characters are shown escaped (safe), and a cell that starts with =, +, -,
// @, tab or carriage return gets a leading apostrophe, so a spreadsheet
// shows it as text instead of running it as a formula (OWASP, "CSV
// Injection"; common practice). The JSON export is verbatim (JSON escapes
// control characters itself).
func csvText(s string) string {
	if s != "" && strings.ContainsRune("=+-@\t\r", rune(s[0])) {
		return "'" + safe(s)
	}
	return safe(s)
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
		s(q.EngineVersion), s(q.DataHash), q.PrevHash, q.Hash, q.Chain, q.KeyID})
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
	db, _, err := openReadDB(ctx, a, o, false)
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
	db, loc, err := openReadDB(ctx, a, o, false)
	if err != nil {
		return err
	}
	defer db.Close()
	q, err := db.Get(ctx, id)
	if errors.Is(err, store.ErrNotFound) {
		return &exitError{exitFail, fmt.Errorf("no query %d in %s", id, dbName(o.db))}
	}
	if err != nil {
		return err
	}
	ds, err := db.Deliveries(ctx, id)
	if err != nil {
		return err
	}
	ps, err := db.Presses(ctx, id)
	if err != nil {
		return err
	}
	where, err := db.NameAt(ctx, q.Channel, q.Time)
	if err != nil {
		return err
	}
	if *format == "json" {
		if ds == nil {
			ds = []store.Delivery{}
		}
		if ps == nil {
			ps = []store.Press{}
		}
		return writeJSON(a.stdout, struct {
			Query       *store.Query     `json:"query"`
			ChannelName string           `json:"channel_name"`
			Deliveries  []store.Delivery `json:"deliveries"`
			Presses     []store.Press    `json:"presses"`
		}{q, where, ds, ps})
	}
	if err := printQuery(a.stdout, q, ds, loc, where); err != nil {
		return err
	}
	return printPresses(a.stdout, ps, loc)
}

// printPresses lists the buttons pressed on a query's answer (and the
// console's details, pour and picture).
func printPresses(w io.Writer, ps []store.Press, loc *time.Location) error {
	tw := tabwriter.NewWriter(w, 0, 4, 2, ' ', 0)
	if len(ps) == 0 {
		fmt.Fprintf(tw, "pressed\tnothing (no Details, E–pH picture or Pour order asked for)\n")
	}
	for i, p := range ps {
		k := ""
		if i == 0 {
			k = "pressed"
		}
		fmt.Fprintf(tw, "%s\t%s %s by %s over %s\n", k, local(p.Time, loc), p.Action, safe(orDash(p.UserName, p.UserID)+" "+paren(p.UserID, p.UserName)), safe(p.Transport))
	}
	return tw.Flush()
}

// printQuery writes one query in full for people, every stored text made
// safe to print.
func printQuery(w io.Writer, q *store.Query, ds []store.Delivery, loc *time.Location, where string) error {
	tw := tabwriter.NewWriter(w, 0, 4, 2, ' ', 0)
	row := func(k, v string) {
		if v != "" {
			fmt.Fprintf(tw, "%s\t%s\n", k, safe(v))
		}
	}
	fmt.Fprintf(w, "Query %d\n", q.ID)
	row("time", local(q.Time, loc)+"  ("+q.Time.Format(time.RFC3339Nano)+")")
	row("who", orDash(q.UserName, q.UserID)+" "+paren(q.UserID, q.UserName))
	row("where", orDash(where, q.Channel)+" "+paren(q.Channel, where))
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
		fmt.Fprintf(tw, "%s\t%s\n", k, safe(h.Severity+" "+h.Code+": "+h.Message))
	}
	row("streams", strings.Join(q.Streams, "  |  "))
	row("engine", strings.TrimSpace(q.EngineVersion+"  data "+q.DataHash))
	row("hash", q.Hash)
	row("prev hash", orDash(q.PrevHash, "(first row)"))
	if q.Chain == store.ChainKeyed {
		row("chain", "keyed, HMAC-SHA256 (key id "+q.KeyID+")")
	}
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
		fmt.Fprintf(tw, "%s\t%s %s %s\n", k, local(d.Time, loc), ok, safe(d.Detail))
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
	db, _, err := openReadDB(ctx, a, o, true)
	if err != nil {
		return err
	}
	defer db.Close()
	if err := db.Backup(ctx, pos[0]); err != nil {
		return err
	}
	key, err := chainKey(a.getenv)
	if err != nil {
		return err
	}
	rep, err := store.VerifyFileWith(ctx, pos[0], key)
	if err != nil {
		return err
	}
	fmt.Fprintf(a.stdout, "Backed up %s to %s (mode 0600).\n", dbName(o.db), safe(pos[0]))
	return a.printVerify(rep, "text", pos[0])
}

func (a *app) logCopy(ctx context.Context, args []string) error {
	fs := subFlags(a, "log copy", "log copy --from DB --to DB", `
Copy a whole log into a new, empty one: a SQLite file into PostgreSQL
(moving a site onto the shared database) or back, or between two of a kind.
Every row of the chain keeps its id, hash and site; the hazard rows and the
search index are rebuilt from them; delivery outcomes, the stream catalogue
of every site and the digests recorded come along. The source must verify
(with MIXWARD_CHAIN_KEY_FILE for a keyed chain) and is only read; the
target is created (a SQLite file) or migrated (a PostgreSQL database, which
must exist) and must hold nothing yet. The copy is one transaction and is
verified after. Stop the bot writing to the source first, or rows logged
meanwhile stay behind. Each of --from and --to is a file path or a
postgres:// URL.`)
	from := fs.String("from", "", "the log to copy: a SQLite `file` or a postgres:// URL")
	to := fs.String("to", "", "the new, empty log: a SQLite `file` or a postgres:// URL")
	format := fs.String("format", "text", "output `format`: text or json")
	if err := parseNoArgs(fs, args, "log copy", "text", "json"); err != nil {
		return err
	}
	if *from == "" || *to == "" {
		fs.Usage()
		return usageErr("log copy: give both --from and --to")
	}
	src, _, err := openReadDB(ctx, a, &storeOpts{db: *from}, false)
	if err != nil {
		return err
	}
	defer src.Close()
	if !store.IsPostgres(*to) && dbExists(*to) {
		return usageErr("log copy: %s already exists; copy into a new file (nothing was copied)", safe(*to))
	}
	dst, _, err := openDB(ctx, a, &storeOpts{db: *to})
	if err != nil {
		return err
	}
	defer dst.Close()
	rep, err := store.CopyLog(ctx, src, dst)
	switch {
	case errors.Is(err, store.ErrInvalid):
		return &exitError{exitUsage, err}
	case err != nil:
		return &exitError{exitFail, err}
	}
	if *format == "json" {
		if err := writeJSON(a.stdout, rep); err != nil {
			return err
		}
		if !rep.Verify.OK {
			return &exitError{exitFail, errors.New("the copy does not verify")}
		}
		return nil
	}
	fmt.Fprintf(a.stdout, "Copied %d rows of the chain, %d delivery records, %d catalogue changes, %d digest records, %d button presses and %d names from %s to %s.\n",
		rep.Rows, rep.Deliveries, rep.StreamChanges, rep.Digests, rep.Presses, rep.Names, dbName(*from), dbName(*to))
	return a.printVerify(rep.Verify, "text", store.DisplayName(*to))
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
	fmt.Fprintf(a.stdout, "Restored %s from %s.\n", dbName(o.db), safe(pos[0]))
	return a.printVerify(rep, "text", o.db)
}

// --- migrate ----------------------------------------------------------------

func (a *app) logMigrate(ctx context.Context, args []string) error {
	fs := subFlags(a, "log migrate", "log migrate [--db FILE]", `
Upgrade the log file to the schema of this mixward, in place. The tools
that only read (verify, search, show, export, digest) refuse an older file
instead of changing it; 'log verify' reads an older file as it is. The
hashes of the rows are not changed. Make a backup first
('mixward log backup'); the bot and the console upgrade the file
themselves when they start.`)
	o := storeFlags(a, fs)
	pos, err := parseFlags(fs, args)
	if err != nil {
		return err
	}
	if err := noArgs(pos, "log migrate"); err != nil {
		return err
	}
	old, _, err := openReadDB(ctx, a, o, true)
	if err != nil {
		return err
	}
	from, err := old.Version(ctx)
	old.Close()
	if err != nil {
		return err
	}
	db, _, err := openDB(ctx, a, o)
	if err != nil {
		return err
	}
	defer db.Close()
	to, err := db.Version(ctx)
	if err != nil {
		return err
	}
	if from == to {
		fmt.Fprintf(a.stdout, "%s is already at schema version %d; nothing to do.\n", dbName(o.db), to)
		return nil
	}
	fmt.Fprintf(a.stdout, "Upgraded %s from schema version %d to %d.\n", dbName(o.db), from, to)
	return nil
}

// --- reindex ----------------------------------------------------------------

func (a *app) logReindex(ctx context.Context, args []string) error {
	fs := subFlags(a, "log reindex", "log reindex [--db FILE]", `
Rebuild the tables derived from the hashed rows (the per-hazard rows, the
search index and its state) from those rows, then verify. Use it when
'log verify' reports that a derived table differs from the rows, after
keeping a copy of the file as evidence ('mixward log backup'). No hashed
row is changed, so a broken chain stays broken.`)
	o := storeFlags(a, fs)
	pos, err := parseFlags(fs, args)
	if err != nil {
		return err
	}
	if err := noArgs(pos, "log reindex"); err != nil {
		return err
	}
	db, _, err := openDB(ctx, a, o)
	if err != nil {
		return err
	}
	defer db.Close()
	if err := db.RebuildDerived(ctx); err != nil {
		return err
	}
	fmt.Fprintf(a.stdout, "Rebuilt the hazard rows and the search index of %s from the hashed rows.\n", dbName(o.db))
	rep, err := db.Verify(ctx)
	if err != nil {
		return err
	}
	return a.printVerify(rep, "text", o.db)
}
