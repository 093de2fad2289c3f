package store

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"strconv"
	"strings"
)

// Derived tables are rebuilt from the hashed rows, never the other way
// round, and Verify checks them against the rows:
//
//   - query_hazards: one row per hazard of each query, in the order of the
//     hashed hazards JSON, read by the hazard search; from schema
//     hazardBatchVersion on, for the rows up to search_state.indexed_upto
//     only (written with the search index, in batches);
//   - query_fts: the search index, whose documents are ftsDocColumns of
//     each query row up to search_state.indexed_upto;
//   - query_keys (keysVersion on): the time, site, asker and decision
//     level of every row up to search_state.indexed_upto, whose indexes
//     the searches by time, site and asker and the digest read;
//   - search_state: the indexed_upto mark and time_order_broken, which
//     must be 1 once some row's time is earlier than the row before it.

// ftsDocColumns is the search-index document of query row q (docid,
// request, species, hazards), from its hashed columns only: the request as
// typed and resolved, the species (JSON text) and each hazard's code and
// message in order. ftsDoc is the same in Go.
const ftsDocColumns = `q.id, q.request || ' ' || q.resolved, q.species,
	coalesce((SELECT group_concat(json_extract(j.value, '$.code') || ' ' || json_extract(j.value, '$.message'), ' ')
	            FROM json_each(q.hazards) j), '')`

// hazardRowColumns are the query_hazards columns (query_id, pos, code,
// severity, message) of the hazard j of query row q, from json_each over
// its hashed hazards.
const hazardRowColumns = `q.id, j.key, json_extract(j.value, '$.code'), json_extract(j.value, '$.severity'),
	json_extract(j.value, '$.message')`

// ftsDoc returns the indexed text of r: request, species, hazards.
func ftsDoc(r *row, hz []Hazard) [3]string {
	parts := make([]string, len(hz))
	for i, h := range hz {
		parts[i] = h.Code + " " + h.Message
	}
	return [3]string{r.Request + " " + r.Resolved, r.Species, strings.Join(parts, " ")}
}

// derivedCheck walks the derived tables alongside the chain (both in id
// order) and compares them with each row.
type derivedCheck struct {
	ctx         context.Context
	tx          queryer
	enabled     bool // the file has the search tables (schema 2 and later)
	hz          *cursor
	fts         *cursor
	keys        *cursor // query_keys beside each row's generated level; nil before keysVersion
	indexedUpto int64
	hzBatched   bool // hazard rows only up to indexedUpto (hazardBatchVersion)
	storedOrder bool // search_state.time_order_broken
	sawBack     int64
	lastTime    string
	pg          bool // PostgreSQL: fts reads queries.search_doc
}

// cursor is one derived table read in id order; cur holds the row ahead.
type cursor struct {
	rows rowSource
	ok   bool
	id   int64
	cols []string
}

func openCursor(ctx context.Context, tx queryer, pg bool, n int, q string) (*cursor, error) {
	rows, err := openRows(ctx, tx, pg, q)
	if err != nil {
		return nil, err
	}
	c := &cursor{rows: rows, cols: make([]string, n)}
	return c, c.next()
}

func (c *cursor) next() error {
	c.ok = c.rows.Next()
	if !c.ok {
		return c.rows.Err()
	}
	dest := []any{&c.id}
	for i := range c.cols {
		dest = append(dest, &c.cols[i])
	}
	return c.rows.Scan(dest...)
}

func newDerivedCheck(ctx context.Context, tx queryer, ver int, pg bool) (*derivedCheck, error) {
	d := &derivedCheck{ctx: ctx, tx: tx, enabled: ver >= 2, pg: pg, hzBatched: ver >= hazardBatchVersion && !pg}
	var err error
	d.hz, err = openCursor(ctx, tx, pg, 4, `SELECT query_id, pos, code, severity, message FROM query_hazards ORDER BY query_id, pos`)
	if err != nil || !d.enabled {
		return d, err
	}
	err = tx.QueryRowContext(ctx, `SELECT indexed_upto, time_order_broken FROM search_state`).Scan(&d.indexedUpto, &d.storedOrder)
	if err != nil {
		return d, fmt.Errorf("read search state: %w", err)
	}
	if ver >= keysVersion && !pg {
		d.keys, err = openCursor(ctx, tx, pg, 7, `SELECT k.id, k.site, k.time, k.kind, k.user_id, k.user_name, k.level,
			coalesce(`+levelExpr+`, '') FROM query_keys k LEFT JOIN queries q ON q.id = k.id ORDER BY k.id`)
		if err != nil {
			return d, err
		}
	}
	if pg {
		// The index is generated from search_doc by the server; every row
		// is indexed as it is written.
		d.indexedUpto = math.MaxInt64
		d.fts, err = openCursor(ctx, tx, pg, 1, `SELECT id, search_doc FROM queries WHERE kind = 'query' ORDER BY id`)
		return d, err
	}
	d.fts, err = openCursor(ctx, tx, pg, 3, `SELECT docid, c0request, c1species, c2hazards FROM query_fts_content ORDER BY docid`)
	return d, err
}

func (d *derivedCheck) close() {
	for _, c := range []*cursor{d.hz, d.fts, d.keys} {
		if c != nil {
			c.rows.Close()
		}
	}
}

// row compares the derived rows of r with r.
func (d *derivedCheck) row(r *row) (string, error) {
	if d.lastTime != "" && r.Time < d.lastTime && d.sawBack == 0 {
		d.sawBack = r.ID
	}
	d.lastTime = r.Time
	var hz []Hazard
	if err := json.Unmarshal([]byte(r.Hazards), &hz); err != nil {
		return fmt.Sprintf("row %d: stored hazards are not a JSON array (%v)", r.ID, err), nil
	}
	if p, err := d.hazards(r.ID, hz); p != "" || err != nil {
		return p, err
	}
	if !d.enabled {
		return "", nil
	}
	if p, err := d.key(r); p != "" || err != nil {
		return p, err
	}
	if d.fts.ok && d.fts.id < r.ID {
		return fmt.Sprintf("row %d: the search index holds a document %d that is no query of the log (added outside mixward, or its row was deleted)", r.ID, d.fts.id), nil
	}
	indexed := r.Kind == kindQuery && r.ID <= d.indexedUpto
	if !indexed {
		return "", nil
	}
	if !d.fts.ok || d.fts.id != r.ID {
		return fmt.Sprintf("row %d: is missing from the search index (deleted outside mixward, hiding it from 'log search')", r.ID), nil
	}
	if d.pg {
		if d.fts.cols[0] != searchDoc(r) {
			return fmt.Sprintf("row %d: its search words differ from the hashed row (edited outside mixward)", r.ID), nil
		}
		return "", d.fts.next()
	}
	if want := ftsDoc(r, hz); [3]string(d.fts.cols) != want {
		return fmt.Sprintf("row %d: its search-index text differs from the hashed row (edited outside mixward)", r.ID), nil
	}
	return "", d.fts.next()
}

// key compares the query_keys row of r with r: one row for every row up
// to the indexed mark, none above it.
func (d *derivedCheck) key(r *row) (string, error) {
	c := d.keys
	if c == nil {
		return "", nil
	}
	if c.ok && c.id < r.ID {
		return fmt.Sprintf("row %d: the look-up table holds row %d, which is not in the log (rows deleted outside mixward)", r.ID, c.id), nil
	}
	has := c.ok && c.id == r.ID
	switch {
	case r.ID > d.indexedUpto && has:
		return fmt.Sprintf("row %d: has a look-up row but is not indexed yet (added outside mixward)", r.ID), nil
	case r.ID > d.indexedUpto:
		return "", nil
	case !has:
		return fmt.Sprintf("row %d: is missing from the look-up table (deleted outside mixward, hiding it from searches by date, site or user and from digests)", r.ID), nil
	}
	if want := [6]string{r.Site, r.Time, r.Kind, r.UserID, r.UserName, c.cols[6]}; [6]string(c.cols[:6]) != want {
		return fmt.Sprintf("row %d: its look-up row (time, site, user or level) differs from the hashed row (edited outside mixward)", r.ID), nil
	}
	return "", c.next()
}

// hazards compares the query_hazards rows of query id with its hashed
// hazards, and reports hazard rows of ids that are not in the log.
func (d *derivedCheck) hazards(id int64, hz []Hazard) (string, error) {
	c := d.hz
	if c.ok && c.id < id {
		return fmt.Sprintf("row %d: hazard rows of query %d remain, which is not in the log (rows deleted outside mixward)", id, c.id), nil
	}
	if d.hzBatched && id > d.indexedUpto {
		if c.ok && c.id == id {
			return fmt.Sprintf("row %d: has hazard rows but is not indexed yet (added outside mixward)", id), nil
		}
		return "", nil
	}
	i := 0
	for ; c.ok && c.id == id; i++ {
		if i >= len(hz) {
			return fmt.Sprintf("row %d: the hazard table has more hazards than the hashed row (added outside mixward)", id), nil
		}
		if c.cols[0] != strconv.Itoa(i) {
			return fmt.Sprintf("row %d: hazard %d (%s) is missing from the hazard table (deleted outside mixward)", id, i+1, hz[i].Code), nil
		}
		if h := hz[i]; [3]string(c.cols[1:]) != [3]string{h.Code, h.Severity, h.Message} {
			return fmt.Sprintf("row %d: hazard %d in the hazard table differs from the hashed row (edited outside mixward)", id, i+1), nil
		}
		if err := c.next(); err != nil {
			return "", err
		}
	}
	if i < len(hz) {
		return fmt.Sprintf("row %d: hazard %d (%s) is missing from the hazard table (deleted outside mixward)", id, i+1, hz[i].Code), nil
	}
	return "", nil
}

// finish reports derived rows beyond the end of the log and a search state
// that does not fit the rows, then compares the search index's word counts
// with an index rebuilt from its (checked) text.
func (d *derivedCheck) finish(lastID int64) (int64, string, error) {
	if d.hz.ok {
		return d.hz.id, fmt.Sprintf("hazard rows of query %d remain, but the log ends at row %d (rows deleted outside mixward)", d.hz.id, lastID), nil
	}
	if !d.enabled {
		return 0, "", nil
	}
	if d.keys != nil && d.keys.ok {
		return d.keys.id, fmt.Sprintf("the look-up table holds row %d, but the log ends at row %d (rows deleted outside mixward)", d.keys.id, lastID), nil
	}
	if d.fts.ok {
		return d.fts.id, fmt.Sprintf("the search index holds document %d, but the log ends at row %d (rows deleted outside mixward)", d.fts.id, lastID), nil
	}
	if d.indexedUpto > lastID && !d.pg {
		return lastID + 1, fmt.Sprintf("the search state says rows up to %d are indexed, but the log ends at row %d (rows deleted outside mixward)", d.indexedUpto, lastID), nil
	}
	if d.sawBack > 0 && !d.storedOrder {
		return d.sawBack, fmt.Sprintf("row %d: is earlier than the row before it, but the search state says times never went back (edited outside mixward; searches by date could miss rows)", d.sawBack), nil
	}
	if d.pg {
		return 0, "", nil // the tsvector column is generated by the server from the checked words
	}
	term, err := d.compareWordCounts()
	if err != nil || term == "" {
		return 0, "", err
	}
	return 0, fmt.Sprintf("the search index's entries for the word %q differ from the indexed text (the index was edited outside mixward, hiding or adding matches)", term), nil
}

// compareWordCounts rebuilds the search index from its (checked) text in a
// temporary table and checks, for every word of the text, that a search of
// the live index finds as many documents as the rebuilt one. It returns a
// word that differs ("" if none). Entries added to the live index for words
// that are in no text, or moved between documents keeping the counts, are
// not found. (SQLite's fts4aux reads this index's counts wrongly while it
// has several segments, so each word is searched instead.)
func (d *derivedCheck) compareWordCounts() (string, error) {
	ctx, tx := d.ctx, d.tx
	defer func() {
		for _, t := range []string{"verify_aux", "verify_fts"} {
			tx.ExecContext(ctx, `DROP TABLE IF EXISTS temp.`+t)
		}
	}()
	for _, s := range []string{
		`DROP TABLE IF EXISTS temp.verify_aux`, `DROP TABLE IF EXISTS temp.verify_fts`,
		`CREATE VIRTUAL TABLE temp.verify_fts USING fts4(request, species, hazards, tokenize=unicode61)`,
		`INSERT INTO temp.verify_fts (docid, request, species, hazards) SELECT docid, c0request, c1species, c2hazards FROM main.query_fts_content`,
		`INSERT INTO temp.verify_fts (verify_fts) VALUES ('optimize')`,
		`CREATE VIRTUAL TABLE temp.verify_aux USING fts4aux(temp, verify_fts)`,
	} {
		if _, err := tx.ExecContext(ctx, s); err != nil {
			return "", fmt.Errorf("check the search index: %w", err)
		}
	}
	type count struct {
		term string
		docs int64
	}
	var want []count
	rows, err := tx.QueryContext(ctx, `SELECT term, documents FROM temp.verify_aux WHERE col = '*'`)
	if err != nil {
		return "", fmt.Errorf("check the search index: %w", err)
	}
	for rows.Next() {
		var c count
		if err := rows.Scan(&c.term, &c.docs); err != nil {
			rows.Close()
			return "", fmt.Errorf("check the search index: %w", err)
		}
		want = append(want, c)
	}
	rows.Close()
	if err := rows.Err(); err != nil {
		return "", fmt.Errorf("check the search index: %w", err)
	}
	for _, c := range want {
		var got int64
		if err := tx.QueryRowContext(ctx, `SELECT count(*) FROM main.query_fts WHERE query_fts MATCH ?`, `"`+c.term+`"`).Scan(&got); err != nil {
			return "", fmt.Errorf("check the search index for %q: %w", c.term, err)
		}
		if got != c.docs {
			return c.term, nil
		}
	}
	return "", nil
}

// RebuildDerived rebuilds every derived table from the hashed rows, in one
// transaction: the hazard rows, the look-up keys, the search index and the search state. Use
// it after Verify reported a derived table that differs from the rows (keep
// a copy of the file as evidence first); it changes no chained row.
func (db *DB) RebuildDerived(ctx context.Context) error {
	if err := db.writable("rebuild derived tables"); err != nil {
		return err
	}
	if db.pg {
		return db.pgRebuildDerived(ctx)
	}
	tx, err := db.w.BeginTx(ctx, nil)
	if err != nil {
		return fmt.Errorf("rebuild derived tables: %w", err)
	}
	defer tx.Rollback()
	if db.ver >= keysVersion {
		for _, s := range []string{`DELETE FROM query_keys`, `INSERT INTO query_keys (id, site, time, kind, user_id, user_name, level)
			SELECT ` + keyColumns + ` FROM queries q ORDER BY q.id`} {
			if _, err := tx.ExecContext(ctx, s); err != nil {
				return fmt.Errorf("rebuild derived tables: %w", err)
			}
		}
	}
	for _, s := range []string{
		`DELETE FROM query_hazards`,
		`INSERT INTO query_hazards (query_id, pos, code, severity, message)
		 SELECT ` + hazardRowColumns + ` FROM queries q, json_each(q.hazards) j ORDER BY q.id, j.key`,
		`DELETE FROM query_fts`,
		`INSERT INTO query_fts (docid, request, species, hazards) SELECT ` + ftsDocColumns + ` FROM queries q WHERE q.kind = 'query' ORDER BY q.id`,
		`INSERT INTO query_fts (query_fts) VALUES ('optimize')`,
		`UPDATE search_state SET indexed_upto = coalesce((SELECT max(id) FROM queries), 0),
		    time_order_broken = EXISTS (SELECT 1 FROM queries a JOIN queries b ON b.id = a.id + 1 WHERE b.time < a.time)`,
	} {
		if _, err := tx.ExecContext(ctx, s); err != nil {
			return fmt.Errorf("rebuild derived tables: %w", err)
		}
	}
	if err := tx.Commit(); err != nil {
		return fmt.Errorf("rebuild derived tables: %w", err)
	}
	return nil
}
