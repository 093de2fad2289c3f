package store

import (
	"context"
	"database/sql"
	"fmt"
	"math"
	"sort"
	"strings"
)

// searchHazards fills page with the queries that carry any of the hazard
// codes of o (Hazard and HazardAny) and match the filters where/args,
// newest first. It walks the hazard-code index of query_hazards newest
// first, one code at a time and a batch of ids at a time, so a page of a
// common code reads a few hundred index entries instead of every row that
// ever had the code; the filters (which include the exact test on the
// hashed hazards) then run on those rows only. The rows not yet indexed
// come first, read from their hashed hazards.
func (db *DB) searchHazards(ctx context.Context, tx *sql.Tx, o SearchOptions, page *SearchPage, cols string, where []string, args []any) error {
	codes := append([]string{}, o.HazardAny...)
	if o.Hazard != "" {
		codes = append(codes, o.Hazard)
	}
	codeSQL := `SELECT query_id FROM query_hazards WHERE code = ? COLLATE NOCASE AND query_id < ? ORDER BY query_id DESC LIMIT ?`
	if db.pg {
		codeSQL = `SELECT query_id FROM query_hazards WHERE lower(code) = lower(?) AND query_id < ? ORDER BY query_id DESC LIMIT ?`
	}
	need := page.Offset + page.Limit + 1
	step := min(max(need, 64), 4096) // doubled each round: most pages need one
	found, cursor, err := db.unindexedHazards(ctx, tx, cols, where, args)
	if err != nil {
		return err
	}
	for len(found) < need {
		ids, floor, done, err := nextHazardIDs(ctx, tx, codeSQL, codes, cursor, step)
		if err != nil {
			return fmt.Errorf("search: %w", err)
		}
		if len(ids) > 0 {
			qs, err := queriesByID(ctx, tx, cols, where, args, ids)
			if err != nil {
				return err
			}
			found = append(found, qs...)
		}
		if done {
			break
		}
		cursor, step = floor, min(2*step, 4096)
	}
	if page.Offset < len(found) {
		page.Queries = append(page.Queries, found[page.Offset:min(len(found), need)]...)
	}
	if len(page.Queries) > page.Limit {
		page.Queries = page.Queries[:page.Limit]
		page.HasMore = true
		page.NextOffset = page.Offset + page.Limit
	}
	return nil
}

// unindexedHazards returns the queries logged after the last indexing
// (at most a batch, which have no hazard rows yet: hazardBatchVersion)
// that match the filters, newest first, and the id below which the
// hazard rows are complete. The filters hold the exact test on the hashed
// hazards, so these rows are found as the hazard rows would find them.
func (db *DB) unindexedHazards(ctx context.Context, tx *sql.Tx, cols string, where []string, args []any) ([]*Query, int64, error) {
	if db.pg || db.ver < hazardBatchVersion {
		return nil, math.MaxInt64, nil
	}
	var done int64
	if err := tx.QueryRowContext(ctx, `SELECT indexed_upto FROM search_state`).Scan(&done); err != nil {
		return nil, 0, err
	}
	page := SearchPage{Limit: math.MaxInt32}
	stmt := `SELECT ` + cols + ` FROM queries q WHERE ` + strings.Join(where, " AND ") + ` AND q.id > ? ORDER BY q.id DESC`
	if err := readPage(ctx, tx, &page, stmt, append(append([]any{}, args...), done)); err != nil {
		return nil, 0, err
	}
	return page.Queries, done + 1, nil
}

// nextHazardIDs reads up to step ids below cursor for each code, newest
// first, and returns the distinct ids that are complete (at or above
// floor: no code can have an unread id there), newest first. done is true
// when every code's ids are read.
func nextHazardIDs(ctx context.Context, tx *sql.Tx, codeSQL string, codes []string, cursor int64, step int) (ids []int64, floor int64, done bool, err error) {
	done = true
	seen := map[int64]bool{}
	for _, c := range codes {
		rows, err := tx.QueryContext(ctx, codeSQL, c, cursor, step)
		if err != nil {
			return nil, 0, false, err
		}
		n := 0
		var last int64
		for rows.Next() {
			if err := rows.Scan(&last); err != nil {
				rows.Close()
				return nil, 0, false, err
			}
			n++
			if !seen[last] {
				seen[last] = true
				ids = append(ids, last)
			}
		}
		rows.Close()
		if err := rows.Err(); err != nil {
			return nil, 0, false, err
		}
		if n == step {
			done = false
			floor = max(floor, last)
		}
	}
	sort.Slice(ids, func(i, j int) bool { return ids[i] > ids[j] })
	k := sort.Search(len(ids), func(i int) bool { return ids[i] < floor })
	return ids[:k], floor, done, nil
}

// queriesByID reads the queries with the given ids (newest first) that
// match the filters.
func queriesByID(ctx context.Context, tx *sql.Tx, cols string, where []string, args []any, ids []int64) ([]*Query, error) {
	marks := strings.TrimSuffix(strings.Repeat("?, ", len(ids)), ", ")
	all := append([]any{}, args...)
	for _, id := range ids {
		all = append(all, id)
	}
	stmt := `SELECT ` + cols + ` FROM queries q WHERE ` + strings.Join(where, " AND ") + ` AND q.id IN (` + marks + `) ORDER BY q.id DESC`
	rows, err := tx.QueryContext(ctx, stmt, all...)
	if err != nil {
		return nil, fmt.Errorf("search: %w", err)
	}
	defer rows.Close()
	var out []*Query
	for rows.Next() {
		var r row
		if err := rows.Scan(r.scanDest()...); err != nil {
			return nil, fmt.Errorf("search: %w", err)
		}
		q, err := decodeQuery(&r)
		if err != nil {
			return nil, fmt.Errorf("search: %w", err)
		}
		out = append(out, q)
	}
	return out, rows.Err()
}
