package store

import (
	"encoding/json"
	"strings"
	"unicode"
	"unicode/utf8"

	"golang.org/x/text/runes"
	"golang.org/x/text/transform"
	"golang.org/x/text/unicode/norm"
)

// PostgreSQL's search reads the column search_doc: the words of ftsDoc,
// found by the same rules as search terms (Phrases), folded (foldWord) and
// joined by single spaces. PostgreSQL's 'simple' text search configuration
// then only splits at those spaces and keeps each word as it is, so both the
// indexed words and the searched ones come from one Go function, and every
// character a user types stays literal.

// searchDoc is the search_doc of r ("" for a prune record, which is never
// searched).
func searchDoc(r *row) string {
	if r.Kind != kindQuery {
		return ""
	}
	var hz []Hazard
	_ = json.Unmarshal([]byte(r.Hazards), &hz) // written by encodeQuery; Verify reports an unreadable one
	d := ftsDoc(r, hz)
	var words []string
	for _, part := range d {
		for _, p := range Phrases(`"` + strings.ReplaceAll(part, `"`, " ") + `"`) {
			for _, w := range strings.Fields(p) {
				words = append(words, foldWord(w))
			}
		}
	}
	return strings.Join(words, " ")
}

// foldWord lower-cases w and removes its accents (combining marks after
// canonical decomposition), as SQLite's unicode61 tokenizer does.
func foldWord(w string) string {
	ascii := true
	for i := 0; i < len(w); i++ {
		if w[i] >= utf8.RuneSelf {
			ascii = false
			break
		}
	}
	if ascii {
		return strings.ToLower(w)
	}
	t := transform.Chain(norm.NFD, runes.Remove(runes.In(unicode.Mn)), norm.NFC)
	s, _, err := transform.String(t, w)
	if err != nil || s == "" {
		return strings.ToLower(w)
	}
	return strings.ToLower(s)
}

// foldPhrase folds every word of a phrase from Phrases.
func foldPhrase(p string) string {
	ws := strings.Fields(p)
	for i, w := range ws {
		ws[i] = foldWord(w)
	}
	return strings.Join(ws, " ")
}

// pgMatch is the PostgreSQL condition for phrases (every phrase required)
// and its arguments: one phraseto_tsquery per phrase, the text passed as a
// parameter.
func pgMatch(phrases []string) (string, []any) {
	parts := make([]string, len(phrases))
	args := make([]any, len(phrases))
	for i, p := range phrases {
		parts[i] = `phraseto_tsquery('simple', ?)`
		args[i] = foldPhrase(p)
	}
	return `q.fts @@ (` + strings.Join(parts, " && ") + `)`, args
}
