package store

import (
	"context"
	"database/sql"
	"encoding/json"
	"fmt"
	"math"
	"strings"
	"time"
	"unicode"
)

// SearchOptions select logged queries. Zero fields do not filter.
type SearchOptions struct {
	// Terms are words that must all appear in the request (as typed or
	// tag-resolved), the species or the hazard codes and messages. Text in
	// double quotes must appear as a phrase. Every other character is
	// literal: FTS operators (AND, OR, NOT, NEAR, *, -, ^, parentheses,
	// column filters) have no special meaning. Matching ignores case and
	// accents, and punctuation splits words: "Fe^2+" finds "Fe 2".
	Terms   string
	Since   time.Time // inclusive
	Until   time.Time // exclusive
	User    string    // user name (any case) or user id
	Verdict string    // one of Verdicts
	Hazard  string    // hazard code (any case)
	// HazardAny matches a query with any of these codes (any case); with
	// Hazard it finds a code together with its older aliases.
	HazardAny []string
	// Site limits the search to one site; "" searches every site.
	Site   string
	Limit  int // page size; 0 means 50, at most 1000
	Offset int // rows to skip, for paging
}

// SearchPage is one page of results, newest first.
type SearchPage struct {
	Queries    []*Query `json:"queries"`
	Offset     int      `json:"offset"`
	Limit      int      `json:"limit"`
	HasMore    bool     `json:"has_more"`
	NextOffset int      `json:"next_offset,omitempty"` // offset of the next page when HasMore
	// Phrases are the word groups searched for, after punctuation was
	// dropped. Terms with no letters or digits at all match nothing.
	Phrases []string `json:"phrases"`
}

// DefaultLimit and MaxLimit bound SearchOptions.Limit.
const (
	DefaultLimit = 50
	MaxLimit     = 1000
)

// Search returns the queries matching o, newest first (by id, which is
// the order they were logged in).
func (db *DB) Search(ctx context.Context, o SearchOptions) (SearchPage, error) {
	page := SearchPage{Offset: o.Offset, Limit: o.Limit, Queries: []*Query{}, Phrases: []string{}}
	if page.Limit <= 0 {
		page.Limit = DefaultLimit
	}
	page.Limit = min(page.Limit, MaxLimit)
	if page.Offset < 0 {
		return page, fmt.Errorf("search: %w: negative offset %d", ErrInvalid, page.Offset)
	}
	if o.Site != "" {
		site, err := NormalizeSite(o.Site)
		if err != nil {
			return page, fmt.Errorf("search: %w", err)
		}
		o.Site = site
	}
	if o.Verdict != "" && !ValidVerdict(o.Verdict) {
		return page, fmt.Errorf("search: %w: verdict %q is not one of %s", ErrInvalid, o.Verdict, strings.Join(Verdicts, ", "))
	}
	phrases := Phrases(o.Terms)
	page.Phrases = phrases
	if n, w := len(phrases), wordCount(phrases); n > MaxSearchTerms || w > MaxSearchWords {
		return page, fmt.Errorf("search: %w: %d different terms of %d words; at most %d terms (a quoted phrase counts as one) of %d words in all "+
			"are searched at once (narrow the search with the date, user, verdict or hazard filters instead)",
			ErrInvalid, n, w, MaxSearchTerms, MaxSearchWords)
	}
	if strings.TrimSpace(o.Terms) != "" && len(phrases) == 0 {
		return page, nil // only punctuation: nothing can match
	}

	if len(phrases) > 0 && !db.ro {
		if err := db.syncIndex(ctx); err != nil {
			return page, fmt.Errorf("search: bring the index up to date: %w", err)
		}
	}
	tx, err := db.readTx(ctx)
	if err != nil {
		return page, fmt.Errorf("search: %w", err)
	}
	defer tx.Rollback()
	where, args := searchFilters(o, db.pg)
	cols := "q." + strings.ReplaceAll(strings.ReplaceAll(rowColumns, "\n\t", " "), ", ", ", q.")
	if len(phrases) > 0 && db.pg {
		match, margs := pgMatch(phrases)
		stmt := `SELECT ` + cols + ` FROM queries q WHERE ` + strings.Join(append(where, match), " AND ") +
			` ORDER BY q.id DESC LIMIT ? OFFSET ?`
		err = readPage(ctx, tx, &page, stmt, append(append(args, margs...), page.Limit+1, page.Offset))
	} else if len(phrases) == 0 && (o.Hazard != "" || len(o.HazardAny) > 0) {
		err = db.searchHazards(ctx, tx, o, &page, cols, where, args)
	} else if kw, kargs := keyFilters(o); len(phrases) == 0 && db.usesKeys() && kw != nil {
		err = searchKeys(ctx, tx, &page, cols, where, args, kw, kargs)
	} else if len(phrases) == 0 {
		stmt := `SELECT ` + cols + ` FROM queries q WHERE ` + strings.Join(where, " AND ") +
			` ORDER BY q.id DESC LIMIT ? OFFSET ?`
		err = readPage(ctx, tx, &page, stmt, append(args, page.Limit+1, page.Offset))
	} else {
		err = db.searchTerms(ctx, tx, o, &page, cols, where, args)
	}
	return page, err
}

// searchTerms fills page with the queries matching o's phrases (page.Phrases)
// and the filters where/args.
func (db *DB) searchTerms(ctx context.Context, tx *sql.Tx, o SearchOptions, page *SearchPage, cols string, where []string, args []any) error {
	// The index drives (CROSS JOIN keeps it outermost) newest first, so
	// the scan stops once the page is full. The time window also bounds
	// the docids (ids grow with time; min/max keep it exact even if they
	// did not).
	lo, hi, empty, err := idRange(ctx, tx, o.Since, o.Until, db.usesKeys())
	if err != nil || empty {
		return err
	}
	match := MatchExpr(page.Phrases)
	fts := []string{`f.query_fts MATCH ?`}
	ftsArgs := []any{match}
	if lo > 0 {
		fts = append(fts, `f.docid >= ?`)
		ftsArgs = append(ftsArgs, lo)
	}
	if hi > 0 {
		fts = append(fts, `f.docid <= ?`)
		ftsArgs = append(ftsArgs, hi)
	}
	offset := page.Offset
	if db.ro {
		// Nothing may be written: rows logged after the last indexing
		// (at most a batch) are indexed in a temporary table instead.
		tail, done, err := searchTail(ctx, tx, cols, where, args, match)
		if err != nil {
			return fmt.Errorf("search: %w", err)
		}
		fts = append(fts, `f.docid <= ?`)
		ftsArgs = append(ftsArgs, done)
		if offset < len(tail) {
			page.Queries = append(page.Queries, tail[offset:min(len(tail), offset+page.Limit+1)]...)
		}
		offset = max(offset-len(tail), 0)
	}
	args = append(ftsArgs, args...)
	stmt := `SELECT ` + cols + ` FROM query_fts f CROSS JOIN queries q ON q.id = f.docid WHERE ` +
		strings.Join(append(fts, where...), " AND ") + ` ORDER BY f.docid DESC LIMIT ? OFFSET ?`
	args = append(args, page.Limit+1-len(page.Queries), offset)
	return readPage(ctx, tx, page, stmt, args)
}

// searchFilters turns the filters of o other than the terms into SQL over
// queries q. The hazard filter reads the hashed hazards of each row (a quick
// test on the JSON text, then the exact one). On PostgreSQL lower() and
// ILIKE stand for SQLite's NOCASE and LIKE: both fold ASCII letters only,
// under the "C" collation the columns compare in.
func searchFilters(o SearchOptions, pg bool) ([]string, []any) {
	where := []string{`q.kind = 'query'`}
	var args []any
	if !o.Since.IsZero() {
		where = append(where, `q.time >= ?`)
		args = append(args, formatTime(o.Since))
	}
	if !o.Until.IsZero() {
		where = append(where, `q.time < ?`)
		args = append(args, formatTime(o.Until))
	}
	if o.User != "" {
		if pg {
			where = append(where, `(lower(q.user_name) = lower(?) OR q.user_id = ?)`)
		} else {
			where = append(where, `(q.user_name = ? COLLATE NOCASE OR q.user_id = ?)`)
		}
		args = append(args, o.User, o.User)
	}
	if o.Verdict != "" {
		where = append(where, `q.verdict = ?`)
		args = append(args, o.Verdict)
	}
	if o.Site != "" {
		where = append(where, `q.site = ?`)
		args = append(args, o.Site)
	}
	if o.Hazard != "" {
		code, _ := json.Marshal(o.Hazard)
		like := strings.NewReplacer(`\`, `\\`, `%`, `\%`, `_`, `\_`).Replace(`"code":` + string(code))
		if pg {
			where = append(where, `q.hazards ILIKE ? ESCAPE '\' AND EXISTS (SELECT 1 FROM jsonb_array_elements(q.hazards::jsonb) j
			WHERE lower(j->>'code') = lower(?))`)
		} else {
			where = append(where, `q.hazards LIKE ? ESCAPE '\' AND EXISTS (SELECT 1 FROM json_each(q.hazards) j
			WHERE json_extract(j.value, '$.code') = ? COLLATE NOCASE)`)
		}
		args = append(args, "%"+like+"%", o.Hazard)
	}
	if len(o.HazardAny) > 0 {
		if pg {
			marks := strings.TrimSuffix(strings.Repeat("lower(?), ", len(o.HazardAny)), ", ")
			where = append(where, `EXISTS (SELECT 1 FROM jsonb_array_elements(q.hazards::jsonb) j WHERE lower(j->>'code') IN (`+marks+`))`)
		} else {
			marks := strings.TrimSuffix(strings.Repeat("?, ", len(o.HazardAny)), ", ")
			where = append(where, `EXISTS (SELECT 1 FROM json_each(q.hazards) j WHERE json_extract(j.value, '$.code') COLLATE NOCASE IN (`+marks+`))`)
		}
		for _, c := range o.HazardAny {
			args = append(args, c)
		}
	}
	return where, args
}

// readPage runs stmt and appends its rows to page, up to page.Limit, noting
// whether there are more.
func readPage(ctx context.Context, tx *sql.Tx, page *SearchPage, stmt string, args []any) error {
	rows, err := tx.QueryContext(ctx, stmt, args...)
	if err != nil {
		return fmt.Errorf("search: %w", err)
	}
	defer rows.Close()
	for len(page.Queries) <= page.Limit && rows.Next() {
		var r row
		if err := rows.Scan(r.scanDest()...); err != nil {
			return fmt.Errorf("search: %w", err)
		}
		q, err := decodeQuery(&r)
		if err != nil {
			return fmt.Errorf("search: %w", err)
		}
		page.Queries = append(page.Queries, q)
	}
	if err := rows.Err(); err != nil {
		return fmt.Errorf("search: %w", err)
	}
	if len(page.Queries) > page.Limit {
		page.Queries = page.Queries[:page.Limit]
		page.HasMore = true
		page.NextOffset = page.Offset + page.Limit
	}
	return nil
}

// searchTail indexes the query rows after search_state.indexed_upto in a
// temporary table of this connection (a read-only connection may write
// only there) and returns those matching match and the filters, newest
// first, with the indexed mark.
func searchTail(ctx context.Context, tx *sql.Tx, cols string, where []string, args []any, match string) ([]*Query, int64, error) {
	var done int64
	if err := tx.QueryRowContext(ctx, `SELECT indexed_upto FROM search_state`).Scan(&done); err != nil {
		return nil, 0, err
	}
	var pending bool
	if err := tx.QueryRowContext(ctx, `SELECT EXISTS (SELECT 1 FROM queries WHERE id > ?)`, done).Scan(&pending); err != nil || !pending {
		return nil, done, err
	}
	for _, s := range []string{
		`DROP TABLE IF EXISTS temp.search_tail`,
		`CREATE VIRTUAL TABLE temp.search_tail USING fts4(request, species, hazards, tokenize=unicode61)`,
	} {
		if _, err := tx.ExecContext(ctx, s); err != nil {
			return nil, 0, err
		}
	}
	defer tx.ExecContext(ctx, `DROP TABLE IF EXISTS temp.search_tail`)
	if _, err := tx.ExecContext(ctx, `INSERT INTO temp.search_tail (docid, request, species, hazards)
		SELECT `+ftsDocColumns+` FROM queries q WHERE q.kind = 'query' AND q.id > ?`, done); err != nil {
		return nil, 0, err
	}
	page := SearchPage{Limit: math.MaxInt32}
	stmt := `SELECT ` + cols + ` FROM temp.search_tail t CROSS JOIN queries q ON q.id = t.docid WHERE t.search_tail MATCH ? AND ` +
		strings.Join(where, " AND ") + ` ORDER BY t.docid DESC`
	if err := readPage(ctx, tx, &page, stmt, append([]any{match}, args...)); err != nil {
		return nil, 0, err
	}
	return page.Queries, done, nil
}

// MaxSearchTerms and MaxSearchWords bound one search: each term is one
// more look-up in the index, and SQLite refuses a match expression of 4,096
// terms (its expression tree is at most 12 deep).
const (
	MaxSearchTerms = 64
	MaxSearchWords = 256
)

func wordCount(phrases []string) int {
	n := 0
	for _, p := range phrases {
		n += len(strings.Fields(p))
	}
	return n
}

// idRange returns the id bounds of rows in [since, until); 0 means open.
// empty is true when no row can be in the window. While row times never
// went backwards (search_state.time_order_broken = 0) the bounds come from
// the time index; otherwise from scans, which stay exact. With keys
// (usesKeys) the time index is query_keys' below the indexed mark.
func idRange(ctx context.Context, tx *sql.Tx, since, until time.Time, keys bool) (lo, hi int64, empty bool, err error) {
	var broken bool
	if err := tx.QueryRowContext(ctx, `SELECT time_order_broken FROM search_state`).Scan(&broken); err != nil {
		return 0, 0, false, err
	}
	if keys {
		return keyRange(ctx, tx, since, until, !broken)
	}
	loSQL := `SELECT min(id) FROM queries WHERE time = (SELECT min(time) FROM queries WHERE time >= ?)`
	hiSQL := `SELECT max(id) FROM queries WHERE time = (SELECT max(time) FROM queries WHERE time < ?)`
	if broken {
		loSQL = `SELECT min(id) FROM queries WHERE time >= ?`
		hiSQL = `SELECT max(id) FROM queries WHERE time < ?`
	}
	if !since.IsZero() {
		var v sql.NullInt64
		if err := tx.QueryRowContext(ctx, loSQL, formatTime(since)).Scan(&v); err != nil {
			return 0, 0, false, err
		}
		if !v.Valid {
			return 0, 0, true, nil
		}
		lo = v.Int64
	}
	if !until.IsZero() {
		var v sql.NullInt64
		if err := tx.QueryRowContext(ctx, hiSQL, formatTime(until)).Scan(&v); err != nil {
			return 0, 0, false, err
		}
		if !v.Valid {
			return 0, 0, true, nil
		}
		hi = v.Int64
	}
	return lo, hi, lo > 0 && hi > 0 && lo > hi, nil
}

// Phrases splits search terms into phrases of words, each once, in the
// order first given. Whitespace separates phrases except inside double
// quotes (an unclosed quote runs to the end).
// Within a phrase every character that is not a letter, digit or mark
// (or a combining mark that follows no letter) separates words and is dropped, so the words hold nothing the FTS query
// language could read as an operator. Words are lower-cased.
func Phrases(terms string) []string {
	var out []string
	var cur []string
	var word strings.Builder
	flushWord := func() {
		if word.Len() > 0 {
			cur = append(cur, strings.ToLower(word.String()))
			word.Reset()
		}
	}
	flushPhrase := func() {
		flushWord()
		if p := strings.Join(cur, " "); p != "" && !contains(out, p) {
			out = append(out, p)
		}
		cur = nil
	}
	inQuote := false
	for _, c := range terms {
		switch {
		case c == '"':
			flushPhrase()
			inQuote = !inQuote
		case unicode.IsSpace(c) && !inQuote:
			flushPhrase()
		case unicode.IsLetter(c) || unicode.IsNumber(c):
			word.WriteRune(c)
		case unicode.Is(unicode.Mn, c) && word.Len() > 0: // an accent on the letter before
			word.WriteRune(c)
		default:
			flushWord()
		}
	}
	flushPhrase()
	return out
}

// MatchExpr is the FTS4 MATCH expression for phrases: each phrase in double
// quotes, all required. Phrases come from Phrases, so they hold only
// letters, digits, marks and single spaces.
func MatchExpr(phrases []string) string {
	q := make([]string, len(phrases))
	for i, p := range phrases {
		q[i] = `"` + p + `"`
	}
	return strings.Join(q, " ")
}
