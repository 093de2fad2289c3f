package store

import (
	"fmt"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Printable returns s safe to print on a terminal, in a CSV cell or in a
// chat message: control characters (C0 such as ESC, CR and BEL, DEL, and
// C1), bidirectional overrides and isolates, line and paragraph separators
// and bytes that are not UTF-8 are written as escapes (\x1b, \r, \u202e)
// instead of acting on the screen. Text without them is returned as it is.
// A backslash is left alone, so the escapes are for reading, not decoding.
func Printable(s string) string {
	i := strings.IndexFunc(s, needsEscape)
	if i < 0 && utf8.ValidString(s) {
		return s
	}
	var b strings.Builder
	b.Grow(len(s) + 8)
	for len(s) > 0 {
		r, n := utf8.DecodeRuneInString(s)
		switch {
		case r == utf8.RuneError && n == 1:
			fmt.Fprintf(&b, `\x%02x`, s[0])
		case r == '\t':
			b.WriteString(`\t`)
		case r == '\n':
			b.WriteString(`\n`)
		case r == '\r':
			b.WriteString(`\r`)
		case r < 0x80 && needsEscape(r):
			fmt.Fprintf(&b, `\x%02x`, r)
		case needsEscape(r):
			fmt.Fprintf(&b, `\u%04x`, r)
		default:
			b.WriteString(s[:n])
		}
		s = s[n:]
	}
	return b.String()
}

// needsEscape reports whether r acts on a terminal or reorders text
// instead of showing a glyph.
func needsEscape(r rune) bool {
	switch {
	case unicode.IsControl(r): // C0, DEL, C1
		return true
	case r == 0x061C, r == 0x200E, r == 0x200F, // bidi marks
		0x202A <= r && r <= 0x202E, // embeddings and overrides
		0x2066 <= r && r <= 0x2069, // isolates
		r == 0x2028, r == 0x2029:   // line and paragraph separators
		return true
	}
	return false
}
