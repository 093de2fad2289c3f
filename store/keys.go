package store

import (
	"context"
	"database/sql"
	"strings"
	"time"
)

// keysVersion is the SQLite schema version from which the time, site and
// asker look-ups of the query rows are in the derived table query_keys,
// written in batches with the search index up to search_state.indexed_upto
// (migrations/0011_query_keys.sql), instead of in indexes on queries.
const keysVersion = 11

// levelExpr is the decision level of query row q: result.decision.level,
// "" for errors and results without one, as text. It is what the generated
// column queries.level of schema 9–11 held (migrations/0012_level_unstored.sql).
const levelExpr = `CAST(CASE WHEN q.verdict <> 'error' AND json_valid(q.result)
	THEN coalesce(json_extract(q.result, '$.decision.level'), '') ELSE '' END AS TEXT)`

// keyColumns are the query_keys columns, read from query row q.
const keyColumns = `q.id, q.site, q.time, q.kind, q.user_id, q.user_name, ` + levelExpr

// usesKeys reports whether the look-ups by time, site and asker go through
// query_keys (SQLite from keysVersion on). Every reader that uses it reads
// the rows up to the indexed mark through the table's indexes and scans
// the rows above the mark (fewer than indexBatch, unless a batch is
// pending) in queries, so its results are those of the hashed rows.
func (db *DB) usesKeys() bool { return !db.pg && db.ver >= keysVersion }

// indexedMark reads search_state.indexed_upto: query_keys, the hazard rows
// and the search index hold every row up to it and none above.
func indexedMark(ctx context.Context, tx *sql.Tx) (int64, error) {
	var done int64
	err := tx.QueryRowContext(ctx, `SELECT indexed_upto FROM search_state`).Scan(&done)
	return done, err
}

// keyBound returns the lowest id of the rows with time at or after t (lo)
// or the highest id of the rows with time before t (!lo), over query_keys
// below the indexed mark and queries above it; invalid when there is none.
// While times never went back (ordered) the bound is read with two index
// look-ups: the first (last) time in range, then its lowest (highest) id;
// otherwise the time index is scanned from t, which stays exact.
func keyBound(ctx context.Context, tx *sql.Tx, lo, ordered bool, t string, mark int64) (sql.NullInt64, error) {
	agg, cmp := "min", ">="
	if !lo {
		agg, cmp = "max", "<"
	}
	keyed := `SELECT ` + agg + `(id) AS id FROM query_keys WHERE time ` + cmp + ` ?`
	if ordered {
		keyed = `SELECT ` + agg + `(id) AS id FROM query_keys WHERE time = (SELECT ` + agg + `(time) FROM query_keys WHERE time ` + cmp + ` ?)`
	}
	stmt := `SELECT ` + agg + `(id) FROM (` + keyed + ` UNION ALL
		SELECT ` + agg + `(id) FROM queries WHERE id > ? AND time ` + cmp + ` ?)`
	var v sql.NullInt64
	err := tx.QueryRowContext(ctx, stmt, t, mark, t).Scan(&v)
	return v, err
}

// keyFilters are the filters of o that query_keys k can answer by index
// (time, site, asker), or nil when o has none. The same filters on the
// hashed row (searchFilters) are applied as well, so an edited key row can
// hide a row (Verify reports it) but never add one.
func keyFilters(o SearchOptions) ([]string, []any) {
	var where []string
	var args []any
	if !o.Since.IsZero() {
		where = append(where, `k.time >= ?`)
		args = append(args, formatTime(o.Since))
	}
	if !o.Until.IsZero() {
		where = append(where, `k.time < ?`)
		args = append(args, formatTime(o.Until))
	}
	if o.User != "" {
		where = append(where, `(k.user_name = ? COLLATE NOCASE OR k.user_id = ?)`)
		args = append(args, o.User, o.User)
	}
	if o.Site != "" {
		where = append(where, `k.site = ?`)
		args = append(args, o.Site)
	}
	if len(where) == 0 {
		return nil, nil
	}
	return append(where, `k.kind = 'query'`), args
}

// searchKeys fills page with the queries matching the filters where/args
// (and their index part kw/kargs), newest first: the rows above the indexed
// mark by a scan of those few rows, then the rows below it through the
// indexes of query_keys.
func searchKeys(ctx context.Context, tx *sql.Tx, page *SearchPage, cols string, where []string, args []any, kw []string, kargs []any) error {
	mark, err := indexedMark(ctx, tx)
	if err != nil {
		return err
	}
	tail := SearchPage{Limit: maxTail}
	stmt := `SELECT ` + cols + ` FROM queries q WHERE ` + strings.Join(where, " AND ") + ` AND q.id > ? ORDER BY q.id DESC`
	if err := readPage(ctx, tx, &tail, stmt, append(append([]any{}, args...), mark)); err != nil {
		return err
	}
	offset := page.Offset
	if offset < len(tail.Queries) {
		page.Queries = append(page.Queries, tail.Queries[offset:min(len(tail.Queries), offset+page.Limit+1)]...)
	}
	offset = max(offset-len(tail.Queries), 0)
	stmt = `SELECT ` + cols + ` FROM query_keys k CROSS JOIN queries q ON q.id = k.id WHERE ` +
		strings.Join(append(append(kw, where...), `k.id <= ?`), " AND ") + ` ORDER BY k.id DESC LIMIT ? OFFSET ?`
	all := append(append(append([]any{}, kargs...), args...), mark, page.Limit+1-len(page.Queries), offset)
	return readPage(ctx, tx, page, stmt, all)
}

// maxTail bounds the rows read above the indexed mark in one go: every
// row there (at most a batch, more only while a write is pending).
const maxTail = 1 << 30

// keyRange is idRange over query_keys and the rows above the indexed mark.
func keyRange(ctx context.Context, tx *sql.Tx, since, until time.Time, ordered bool) (lo, hi int64, empty bool, err error) {
	mark, err := indexedMark(ctx, tx)
	if err != nil {
		return 0, 0, false, err
	}
	for _, b := range []struct {
		t   time.Time
		lo  bool
		dst *int64
	}{{since, true, &lo}, {until, false, &hi}} {
		if b.t.IsZero() {
			continue
		}
		v, err := keyBound(ctx, tx, b.lo, ordered, formatTime(b.t), mark)
		if err != nil {
			return 0, 0, false, err
		}
		if !v.Valid {
			return 0, 0, true, nil
		}
		*b.dst = v.Int64
	}
	return lo, hi, lo > 0 && hi > 0 && lo > hi, nil
}

// firstFrom returns the lowest id of the rows with time at or after t
// (invalid when there is none), scanning the time index from t.
func (db *DB) firstFrom(ctx context.Context, tx *sql.Tx, t string) (sql.NullInt64, error) {
	if !db.usesKeys() {
		var cut sql.NullInt64
		err := tx.QueryRowContext(ctx, `SELECT min(id) FROM queries WHERE time >= ?`, t).Scan(&cut)
		return cut, err
	}
	mark, err := indexedMark(ctx, tx)
	if err != nil {
		return sql.NullInt64{}, err
	}
	return keyBound(ctx, tx, true, false, t, mark)
}
