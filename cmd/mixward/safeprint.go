package main

import (
	"strings"

	"mixward/store"
)

// safe returns stored or echoed text (a request, a user name, a note, an
// error that quotes input) ready to print on a terminal or in a CSV cell:
// control and escape characters (ESC, CR, BEL, C0 and C1 controls) and
// bidirectional overrides are shown escaped, as \x1b or \u202e, so that
// text typed in chat cannot clear a reviewer's screen, recolour it or
// reorder what is shown. Every printing path of the command line uses it
// (the digest text is escaped where the store renders it, with the same
// function).
func safe(s string) string { return store.Printable(s) }

// safeCut is cut (one line, at most n runes) made safe to print.
func safeCut(s string, n int) string { return safe(cut(s, n)) }

// safeLines is safe for multi-line text (a rendered answer, which echoes
// the request and the tags it resolved): each line is escaped, the line
// breaks kept.
func safeLines(s string) string {
	lines := strings.Split(s, "\n")
	for i, l := range lines {
		lines[i] = safe(l)
	}
	return strings.Join(lines, "\n")
}
