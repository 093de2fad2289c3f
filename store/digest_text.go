package store

import (
	"fmt"
	"strings"
	"time"
	"unicode/utf8"
)

// DigestLineWidth is the most characters a line of a rendered digest
// entry takes, so each entry reads as one line on a phone or in a text
// file.
const DigestLineWidth = 120

// Text renders the digest for people: the totals first, then one line per
// mix (danger first), the requests that did not parse, who asked, and the
// log head. Times are in the site zone.
func (d *Digest) Text() string {
	var b strings.Builder
	b.WriteString(d.Heading() + "\n")
	b.WriteString(d.Totals() + "\n")
	b.WriteString(d.headLine() + "\n")
	fmt.Fprintf(&b, "\nMixes, danger first (%d):\n", len(d.Mixes))
	if len(d.Mixes) == 0 {
		b.WriteString("  none\n")
	}
	for _, m := range d.Mixes {
		b.WriteString(m.Line() + "\n")
	}
	fmt.Fprintf(&b, "\nRequests that did not parse (%d):\n", len(d.ParseErrors))
	if len(d.ParseErrors) == 0 {
		b.WriteString("  none\n")
	}
	for _, p := range d.ParseErrors {
		b.WriteString(d.errorLine(p) + "\n")
	}
	b.WriteString("\nWho asked:\n")
	if len(d.Askers) == 0 {
		b.WriteString("  nobody\n")
	}
	for _, a := range d.Askers {
		fmt.Fprintf(&b, "  %3d  %s\n", a.Queries, clip(who(a.UserName, a.UserID), DigestLineWidth-7))
	}
	if d.HeadHash != "" {
		fmt.Fprintf(&b, "\nTo check later that nothing up to the head was rewritten or cut off:\n  mixward log verify --expect %s\n", d.HeadHash)
	}
	b.WriteString("\n" + Advisory + "\n")
	return b.String()
}

// Heading is the digest's first line: the period in the site zone.
func (d *Digest) Heading() string {
	loc := d.loc()
	since, until := d.Since.In(loc), d.Until.In(loc)
	h := fmt.Sprintf("Shift digest %s – %s", since.Format("Mon 02 Jan 2006 15:04 MST"), untilHeader(since, until))
	if d.Site != "" && d.Site != DefaultSite {
		h += ", site " + Printable(d.Site)
	}
	if name := loc.String(); name != until.Format("MST") {
		h += " (" + name + ")"
	}
	return h
}

// Totals is the shift's totals in one line.
func (d *Digest) Totals() string {
	return fmt.Sprintf("%d %s from %d %s · do not mix %d · with precautions %d · no concern %d · did not parse %d",
		d.Queries, plural(d.Queries, "query", "queries"), len(d.Askers), plural(len(d.Askers), "person", "people"),
		d.Levels.DoNotMix, d.Levels.WithPrecautions, d.Levels.NoConcern, d.Verdicts.Error)
}

func (d *Digest) headLine() string {
	if d.HeadHash == "" {
		return "Log head at the end of the period: none (nothing was logged before it)"
	}
	return fmt.Sprintf("Log head at the end of the period: row %d, hash %s", d.HeadID, d.HeadHash)
}

func (d *Digest) loc() *time.Location {
	if d.Location != nil {
		return d.Location
	}
	return time.UTC
}

// levelWord is a level as the digest's lines show it, padded to one width.
func levelWord(l string) string {
	switch l {
	case LevelDoNotMix:
		return "DO NOT MIX      "
	case LevelWithPrecautions:
		return "WITH PRECAUTIONS"
	}
	return "no concern      "
}

// Line is the mix as one digest line of at most DigestLineWidth
// characters: level, count, the mix, the hazard codes, how many people
// and the query ids (first and last).
func (m MixLine) Line() string {
	ids := ""
	switch n := len(m.QueryIDs); {
	case n == 1:
		ids = fmt.Sprintf("#%d", m.QueryIDs[0])
	case n > 1:
		ids = fmt.Sprintf("#%d…#%d", m.QueryIDs[0], m.QueryIDs[n-1])
	}
	tail := ""
	if len(m.Codes) > 0 {
		tail = "  " + strings.Join(m.Codes, ",")
	}
	if m.People > 1 {
		tail += fmt.Sprintf("  %d people", m.People)
	}
	tail += "  " + ids
	head := fmt.Sprintf("%s ×%-3d ", levelWord(m.Level), m.Count)
	room := DigestLineWidth - utf8.RuneCountInString(head) - utf8.RuneCountInString(Printable(tail))
	if room < 20 {
		tail = clip(tail, DigestLineWidth-utf8.RuneCountInString(head)-20)
		room = 20
	}
	return head + clip(m.Mix, room) + Printable(tail)
}

// errorLine is a request that did not parse, on one line.
func (d *Digest) errorLine(p ParseFailure) string {
	head := fmt.Sprintf("  %s #%d %s: ", p.Time.In(d.loc()).Format("15:04"), p.ID, clip(who(p.UserName, p.UserID), 24))
	room := DigestLineWidth - utf8.RuneCountInString(head)
	req := clip(p.Request, room/2)
	return head + req + " — " + clip(p.Error, room-utf8.RuneCountInString(req)-3)
}

// clip is s on one line, safe to print, cut to at most n characters with
// an ellipsis.
func clip(s string, n int) string {
	s = Printable(strings.Join(strings.Fields(s), " "))
	if n < 1 {
		return ""
	}
	if utf8.RuneCountInString(s) > n {
		s = string([]rune(s)[:n-1]) + "…"
	}
	return s
}
