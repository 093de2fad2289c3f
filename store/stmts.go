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

// insertV3 inserts a row into a file of schema version 1–3 (tests build
// them), which has no chain columns.
const insertV3 = `INSERT INTO queries (id, kind, time, user_id, user_name, channel, event_id, request, resolved, verdict,
	error, species, oxidizer, reducer, e_cell_v, e_cell_standard_v, hazards, streams, result, engine_version, data_hash,
	prev_hash, hash) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`

// insertV7 inserts a row into a file of schema version 4–7 (tests build
// them), which has no site column.
const insertV7 = `INSERT INTO queries (id, kind, time, user_id, user_name, channel, event_id, request, resolved, verdict,
	error, species, oxidizer, reducer, e_cell_v, e_cell_standard_v, hazards, streams, result, engine_version, data_hash,
	prev_hash, hash, chain, key_id) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`

// writeStmts are the statements of LogQuery.
type writeStmts struct {
	head, insert, hazard, hazards, keys, index, event, indexed, setIndexed, timeBroken stmt
	seq                                                                                stmt // PostgreSQL: chain_state.seq
	fast                                                                               stmt // appendFast; prepared on the writer pool
}

func newWriteStmts(pg bool) *writeStmts {
	if pg {
		return &writeStmts{} // PostgreSQL writes through pgchain.go
	}
	return &writeStmts{
		// The highest id ever issued, the newest row's id and its hash.
		head:       stmt{sql: headSQL(SchemaVersion())},
		timeBroken: stmt{sql: `UPDATE search_state SET time_order_broken = 1 WHERE time_order_broken = 0`},
		insert: stmt{sql: `INSERT INTO queries (` + rowColumns + `)
			VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`},
		hazard: stmt{sql: `INSERT INTO query_hazards (query_id, pos, code, severity, message) VALUES (?, ?, ?, ?, ?)`},
		hazards: stmt{sql: `INSERT INTO query_hazards (query_id, pos, code, severity, message) SELECT ` + hazardRowColumns + `
			FROM queries q, json_each(q.hazards) j WHERE q.id > ? AND q.id <= ? ORDER BY q.id, j.key`},
		keys: stmt{sql: `INSERT INTO query_keys (id, site, time, kind, user_id, user_name, level)
			SELECT ` + keyColumns + ` FROM queries q WHERE q.id > ? AND q.id <= ? ORDER BY q.id`},
		index: stmt{sql: `INSERT INTO query_fts (docid, request, species, hazards)
			SELECT ` + ftsDocColumns + ` FROM queries q WHERE q.kind = 'query' AND q.id > ? AND q.id <= ?`},
		indexed:    stmt{sql: `SELECT indexed_upto FROM search_state`},
		setIndexed: stmt{sql: `UPDATE search_state SET indexed_upto = ?`},
		// event_id <> '' lets the partial index queries_event serve it
		// (without it SQLite cannot prove the index holds the row: a scan).
		event: stmt{sql: `SELECT id FROM queries WHERE event_id = ? AND event_id <> ''`},
		fast:  stmt{sql: fastInsert(SchemaVersion())},
	}
}

// headSQL reads the highest id no new row may take apart from the rows
// present (retiredSQL), the newest row's id, its hash and its time.
func headSQL(ver int) string {
	return `SELECT ` + retiredSQL(ver) + `,
		coalesce((SELECT max(id) FROM queries), 0),
		coalesce((SELECT hash FROM queries ORDER BY id DESC LIMIT 1), ?),
		coalesce((SELECT time FROM queries ORDER BY id DESC LIMIT 1), '')`
}

// forVersion fits the statements that read the retired ids to a file of
// schema version ver (tests build files of older versions).
func (ws *writeStmts) forVersion(ver int) {
	if ver < idsVersion && ws.head.sql != "" {
		ws.head.sql, ws.fast.sql = headSQL(ver), fastInsert(ver)
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
	return []*stmt{&ws.head, &ws.insert, &ws.hazard, &ws.hazards, &ws.keys, &ws.index, &ws.event, &ws.indexed, &ws.setIndexed, &ws.timeBroken, &ws.fast}
}
