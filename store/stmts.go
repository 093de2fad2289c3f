package store

import (
	"context"
	"database/sql"
)

// stmt is a write statement prepared once on the writer connection and
// reused in each transaction (preparing costs as much as running). When it
// could not be prepared (a file of an older schema in tests) the SQL text
// is run instead.
type stmt struct {
	sql string
	s   *sql.Stmt
}

func (st *stmt) exec(ctx context.Context, tx *sql.Tx, args ...any) (sql.Result, error) {
	if st.s != nil {
		return tx.StmtContext(ctx, st.s).ExecContext(ctx, args...)
	}
	return tx.ExecContext(ctx, st.sql, args...)
}

func (st *stmt) queryRow(ctx context.Context, tx *sql.Tx, args ...any) *sql.Row {
	if st.s != nil {
		return tx.StmtContext(ctx, st.s).QueryRowContext(ctx, args...)
	}
	return tx.QueryRowContext(ctx, st.sql, args...)
}

// writeStmts are the statements of LogQuery.
type writeStmts struct {
	head, insert, hazard, index, event, indexed, setIndexed, timeBroken stmt
}

func newWriteStmts() *writeStmts {
	return &writeStmts{
		// The highest id ever issued, the newest row's id and its hash.
		head: stmt{sql: `SELECT coalesce((SELECT seq FROM sqlite_sequence WHERE name = 'queries'), 0),
			coalesce((SELECT max(id) FROM queries), 0),
			coalesce((SELECT hash FROM queries ORDER BY id DESC LIMIT 1), ?),
			coalesce((SELECT time FROM queries ORDER BY id DESC LIMIT 1), '')`},
		timeBroken: stmt{sql: `UPDATE search_state SET time_order_broken = 1 WHERE time_order_broken = 0`},
		insert: stmt{sql: `INSERT INTO queries (` + rowColumns + `)
			VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`},
		hazard: stmt{sql: `INSERT INTO query_hazards (query_id, pos, code, severity, message) VALUES (?, ?, ?, ?, ?)`},
		// The same expression migration 0002 uses to index older rows.
		index: stmt{sql: `INSERT INTO query_fts (docid, request, species, hazards)
			SELECT q.id, q.request || ' ' || q.resolved, q.species,
			       coalesce((SELECT group_concat(h.code || ' ' || h.message, ' ')
			                   FROM query_hazards h WHERE h.query_id = q.id), '')
			  FROM queries q WHERE q.kind = 'query' AND q.id > ? AND q.id <= ?`},
		indexed:    stmt{sql: `SELECT indexed_upto FROM search_state`},
		setIndexed: stmt{sql: `UPDATE search_state SET indexed_upto = ?`},
		event:      stmt{sql: `SELECT id FROM queries WHERE event_id = ?`},
	}
}

// prepare prepares what it can on the writer pool.
func (ws *writeStmts) prepare(ctx context.Context, w *sql.DB) {
	for _, st := range ws.all() {
		if s, err := w.PrepareContext(ctx, st.sql); err == nil {
			st.s = s
		}
	}
}

func (ws *writeStmts) close() {
	for _, st := range ws.all() {
		if st.s != nil {
			st.s.Close()
			st.s = nil
		}
	}
}

func (ws *writeStmts) all() []*stmt {
	return []*stmt{&ws.head, &ws.insert, &ws.hazard, &ws.index, &ws.event, &ws.indexed, &ws.setIndexed, &ws.timeBroken}
}
