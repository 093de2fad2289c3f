package main

import (
	"context"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"strings"
	"unicode/utf8"

	"mixward/data"
	"mixward/engine"
	"mixward/engine/advice"
)

// cmdDefault is plain `mixward`: the Slack bot when Slack tokens are set,
// else the local console, so that a fresh machine starts something useful.
func (a *app) cmdDefault(ctx context.Context) error {
	socket := a.getenv("SLACK_APP_TOKEN") != ""
	http := a.getenv("SLACK_SIGNING_SECRET") != "" && a.getenv("MIXWARD_HTTP_ADDR") != ""
	if a.getenv("SLACK_BOT_TOKEN") != "" && (socket || http) {

		return a.cmdServe(ctx, nil)
	}
	return a.cmdConsole(ctx, nil)
}

// loadEngine loads the embedded tables. A failure here is a broken build.
func loadEngine() (*engine.Engine, error) {
	e, err := engine.New(data.FS)
	if err != nil {
		return nil, fmt.Errorf("loading the embedded data tables: %w", err)
	}
	return e, nil
}

// newFlags makes a flag set that reports errors through its return value.
func (a *app) newFlags(name, usage string) *flag.FlagSet {
	fs := flag.NewFlagSet(name, flag.ContinueOnError)
	fs.SetOutput(a.stderr)
	fs.Usage = func() {
		fmt.Fprintf(a.stderr, "usage: mixward %s\n", usage)
		fs.PrintDefaults()
		fmt.Fprintln(a.stderr, endOfFlags)
	}
	return fs
}

// endOfFlags closes every usage text.
const endOfFlags = "A -- ends the flags: every argument after it is read as text, even one starting with -."

// parseFlags parses args, allowing flags after positional arguments. A --
// ends the flags: every argument after it is positional.
func parseFlags(fs *flag.FlagSet, args []string) ([]string, error) {
	var pos []string
	for {
		if err := fs.Parse(args); err != nil {
			if errors.Is(err, flag.ErrHelp) {
				return nil, &exitError{exitOK, errors.New("")}
			}
			return nil, &exitError{exitUsage, errors.New("")}
		}
		rest := fs.Args()
		if len(rest) == 0 {
			return pos, nil
		}
		// The flag package consumes a "--" and stops after it.
		if used := len(args) - len(rest); used > 0 && args[used-1] == "--" {
			return append(pos, rest...), nil
		}
		pos = append(pos, rest[0])
		args = rest[1:]
	}
}

func checkFormat(f string, allowed ...string) error {
	for _, x := range allowed {
		if f == x {
			return nil
		}
	}
	return &exitError{exitUsage, fmt.Errorf("--format %q: use %s", f, strings.Join(allowed, " or "))}
}

func (a *app) cmdAsk(ctx context.Context, args []string) error {
	fs := a.newFlags("ask", `ask [--details] [--format text|json] [--no-log] [--db PATH] [--tz ZONE] "<request>"`)
	format := fs.String("format", "text", "output format: text or json")
	details := fs.Bool("details", false, "print the full answer (species, half-reactions, amounts, every hazard, the pour) instead of the short one")
	noLog := fs.Bool("no-log", false, "do not record the query in the log")
	so := storeFlags(a, fs)
	pos, err := parseFlags(fs, args)
	if err != nil {
		return err
	}
	if err := checkFormat(*format, "text", "json"); err != nil {
		return err
	}
	text := strings.TrimSpace(strings.Join(pos, " "))
	if text == "" {
		fs.Usage()
		return &exitError{exitUsage, errors.New(`give the request in quotes, e.g. mixward ask "mix 200 L NaOCl 12.5 % + 50 L HCl 10 %"`)}
	}
	eng, err := loadEngine()
	if err != nil {
		return err
	}
	adv, err := loadAdvisor(eng)
	if err != nil {
		return err
	}
	res, id, err, logErr := a.askOnce(ctx, eng, adv, so, text, *noLog)
	if logErr != nil {
		return fmt.Errorf("%w: %v", errNotLogged, logErr)
	}
	if id > 0 {
		fmt.Fprintf(a.stderr, "mixward: logged as query #%d in %s\n", id, so.db)
	}
	if err != nil {
		var pe *engine.ParseError
		if !errors.As(err, &pe) {
			return err
		}
		if *format == "json" {
			writeJSON(a.stdout, map[string]any{"error": pe})
		} else {
			fmt.Fprintf(a.stderr, "mixward: cannot read the request: %s\n", safe(pe.Error()))
			fmt.Fprintf(a.stderr, "  %s\n  %s^\n", safe(text), strings.Repeat(" ", caretColumn(text, pe.Position)))
			fmt.Fprintf(a.stderr, "example: mixward ask %q\n", "mix 200 L NaOCl 12.5 % + 50 L HCl 10 %")
		}
		return &exitError{exitUsage, errors.New("")}
	}
	if *format == "json" {
		return writeJSON(a.stdout, res)
	}
	render := advice.RenderShort
	if *details {
		render = advice.RenderDetails
	}
	_, err = io.WriteString(a.stdout, safeLines(render(res)))
	return err
}

// loadAdvisor wraps the engine with the hazard judgement, the pour and the
// decision.
func loadAdvisor(eng *engine.Engine) (*advice.Advisor, error) {
	adv, err := advice.New(eng, data.FS)
	if err != nil {
		return nil, fmt.Errorf("loading the embedded gas table: %w", err)
	}
	return adv, nil
}

// caretColumn is how many columns precede the character at 1-based rune
// position pos of text once text is printed with safe (escapes are wider).
func caretColumn(text string, pos int) int {
	if pos <= 1 {
		return 0
	}
	r := []rune(text)
	return utf8.RuneCountInString(safe(string(r[:min(pos-1, len(r))])))
}

func writeJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetEscapeHTML(false)
	enc.SetIndent("", "  ")
	return enc.Encode(v)
}

func envOr(getenv func(string) string, key, def string) string {
	if v := getenv(key); v != "" {
		return v
	}
	return def
}

// tableRow is one half-reaction in `mixward table --format json`.
type tableRow struct {
	ID        string          `json:"id"`
	Reactants []engine.EqTerm `json:"reactants"`
	Products  []engine.EqTerm `json:"products"`
	Electrons int             `json:"electrons"`
	EStandard float64         `json:"e_standard_v"`
	Medium    engine.Medium   `json:"medium"`
	Source    string          `json:"source"`
	Text      string          `json:"text"`
}

func eqTerms(ts []engine.Term) []engine.EqTerm {
	out := make([]engine.EqTerm, len(ts))
	for i, t := range ts {
		out[i] = engine.EqTerm{Formula: t.Formula, Charge: t.Charge, Phase: t.Phase, Coef: t.Coef, Text: t.Species.Text()}
	}
	return out
}

func (a *app) cmdTable(ctx context.Context, args []string) error {
	fs := a.newFlags("table", "table [--format text|json] [--check]")
	format := fs.String("format", "text", "output format: text or json")
	check := fs.Bool("check", false, "validate every data table, the species data included, and report each bad row")
	if _, err := parseFlags(fs, args); err != nil {
		return err
	}
	if err := checkFormat(*format, "text", "json"); err != nil {
		return err
	}
	if *check {
		if err := engine.CheckTables(data.FS); err != nil {
			return fmt.Errorf("the data tables have problems:\n%w", err)
		}
		fmt.Fprintln(a.stdout, "data tables: every check passed")
		return nil
	}
	eng, err := loadEngine()
	if err != nil {
		return err
	}
	rows := make([]tableRow, 0, len(eng.Tables.Half))
	for _, h := range eng.Tables.Half {
		rows = append(rows, tableRow{
			ID: h.ID, Reactants: eqTerms(h.Reactants), Products: eqTerms(h.Products),
			Electrons: h.Electrons, EStandard: h.E0, Medium: h.Medium, Source: h.Source,
			Text: engine.HalfText(h, false),
		})
	}
	if *format == "json" {
		return writeJSON(a.stdout, rows)
	}
	fmt.Fprintf(a.stdout, "%-22s %-6s %9s  %s\n", "ID", "MEDIUM", "E°/V", "REDUCTION")
	for _, r := range rows {
		fmt.Fprintf(a.stdout, "%-22s %-6s %+9.3f  %s\n", r.ID, r.Medium, r.EStandard, r.Text)
	}
	fmt.Fprintf(a.stdout, "\n%d half-reactions at 25 °C; sources per row in data/halfreactions.txt and in --format json.\n", len(rows))
	return nil
}

func (a *app) cmdVersion(ctx context.Context) error {
	eng, err := loadEngine()
	if err != nil {
		return err
	}
	fmt.Fprintf(a.stdout, "mixward engine %s, data tables %s\n", engine.Version, eng.Tables.Hash[:12])
	return nil
}

func (a *app) usage(w io.Writer) {
	fmt.Fprint(w, `mixward — may these streams be mixed? Advisory redox and hazard answers for process operators.

usage:
  mixward                         start the local console (no Slack tokens needed)
  mixward ask "<request>"         answer one mix request, short: the decision first (--details, --format text|json, --no-log, --db)
  mixward review                  judge every pair of the site's tagged streams, worst first (--format text|json|csv, --db)
  mixward table                   list the half-reaction table (--format text|json; --check validates every table)
  mixward plot "<request>" -o mix.png   draw the E–pH picture of the predicted couples (--db for tags)
  mixward streams set|list|show|rm      the site stream catalogue (tags such as T-101)
  mixward log verify|search|show|export|prune|backup|restore|migrate|reindex   the query log
  mixward digest                  shift digest (--since, --until, --format text|json)
  mixward console                 the local console, reading stdin
  mixward serve                   the Slack bot (Socket Mode, or --http ADDR for the Events API)
  mixward version

request language:
  [mix] <stream> + <stream> [+ ...] [at <temperature>|<pressure>|pH <n>]   (+, &, and, with)
  stream:    [<amount>] <chemical> [<number> <unit>][, <component> ...]   or [<amount>] a site tag (T-101)
  amount:    L, mL, m3, gal (US), US gal, imp gal (liquids); kg, g, t, lb (solids)
  units:     M, mol/L, mmol/L, %, % w/w, % w/v, g/L, mg/L, ppm;  pH <number>;  12,5 % = 12.5 %
  example:   mixward ask "mix 200 L NaOCl 12.5 % + 50 L HCl 10 % at 20 C"

A -- ends the flags of any subcommand: what follows is read as text even if it starts with -
(mixward log search -- -5 L).

Answers are advisory, never a permit: confirm with the safety data sheets, site procedures,
management-of-change, local codes and licensed practice.
`)
}
