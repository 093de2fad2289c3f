package store

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
)

// The chain on PostgreSQL. chain_state holds the newest row's id, hash and
// time and the highest id ever issued, in one row. A writer reads it with
// SELECT … FOR UPDATE: that row lock serialises every append to the chain
// across replicas (the equivalent of a transaction-level advisory lock,
// held until commit), and because PostgreSQL re-reads a row locked FOR
// UPDATE after waiting for it, the writer sees the head its predecessor
// committed, in the same round trip. The row, its hazard rows, the new head
// and the time-order state are then written by one statement.

const pgHeadSQL = `SELECT c.seq, c.last_id, c.last_hash, c.last_time,
	(SELECT q.id FROM queries q WHERE q.event_id = ? AND q.event_id <> '')
	FROM chain_state c FOR UPDATE`

// pgInsertSQL writes a sealed row (with its search words), its hazard rows
// from the hashed hazards JSON, the new head, and notes a time that went
// back, in one statement.
const pgInsertSQL = `WITH ins AS (
	INSERT INTO queries (` + rowColumns + `, search_doc)
	VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)
	RETURNING id, hash, time),
hz AS (
	INSERT INTO query_hazards (query_id, pos, code, severity, message)
	SELECT CAST(? AS bigint), j.n - 1, j.v->>'code', j.v->>'severity', j.v->>'message'
	  FROM jsonb_array_elements(CAST(? AS jsonb)) WITH ORDINALITY AS j(v, n)),
back AS (
	UPDATE search_state SET time_order_broken = true
	 WHERE NOT time_order_broken AND (SELECT time FROM ins) < (SELECT last_time FROM chain_state))
UPDATE chain_state SET seq = greatest(seq, (SELECT id FROM ins)), last_id = (SELECT id FROM ins),
	last_hash = (SELECT hash FROM ins), last_time = (SELECT time FROM ins)`

// pgHead locks the chain and reads its head; prev is emptyPrev when the log
// is empty. dup is the id already logged for eventID (0 when none).
func pgHead(ctx context.Context, tx *sql.Tx, emptyPrev, eventID string) (seq, lastID int64, prev string, dup int64, err error) {
	var lastTime string
	var d sql.NullInt64
	err = tx.QueryRowContext(ctx, pgHeadSQL, eventID).Scan(&seq, &lastID, &prev, &lastTime, &d)
	if lastID == 0 {
		prev = emptyPrev
	}
	return seq, lastID, prev, d.Int64, err
}

// pgInsert writes the sealed row r as pgInsertSQL does.
func pgInsert(ctx context.Context, tx *sql.Tx, r *row) error {
	_, err := tx.ExecContext(ctx, pgInsertSQL, r.ID, r.Kind, r.Time, r.UserID, r.UserName, r.Channel, r.EventID, r.Request,
		r.Resolved, r.Verdict, r.Error, r.Species, r.Oxidizer, r.Reducer, r.ECellV, r.ECellStandardV, r.Hazards, r.Streams,
		r.Result, r.EngineVersion, r.DataHash, r.PrevHash, r.Hash, r.Chain, r.KeyID, r.Site, searchDoc(r), r.ID, r.Hazards)
	return err
}

// pgLogQuery is LogQuery's transaction on PostgreSQL: lock and read the
// head, seal, write; a query whose event id is already logged (by another
// replica a moment ago, too) returns that id with ErrDuplicate.
func (db *DB) pgLogQuery(ctx context.Context, r *row) (int64, error) {
	tx, err := db.w.BeginTx(ctx, nil)
	if err != nil {
		return 0, fmt.Errorf("log query: %w", err)
	}
	defer tx.Rollback()
	seq, lastID, prev, dup, err := pgHead(ctx, tx, "", r.EventID)
	if err != nil {
		return 0, fmt.Errorf("log query: %w", err)
	}
	if dup > 0 {
		return dup, fmt.Errorf("log query: event %q is query %d: %w", r.EventID, dup, ErrDuplicate)
	}
	r.ID, r.PrevHash = max(seq, lastID)+1, prev
	seal(r, db.key)
	err = pgInsert(ctx, tx, r)
	if pgUnique(err) && r.EventID != "" {
		tx.Rollback()
		var id int64
		if err := db.r.QueryRowContext(ctx, `SELECT id FROM queries WHERE event_id = ?`, r.EventID).Scan(&id); err != nil {
			return 0, fmt.Errorf("log query: event %q already logged: %w", r.EventID, ErrDuplicate)
		}
		return id, fmt.Errorf("log query: event %q is query %d: %w", r.EventID, id, ErrDuplicate)
	}
	if err != nil {
		return 0, fmt.Errorf("log query: %w", err)
	}
	if err := tx.Commit(); err != nil {
		return 0, fmt.Errorf("log query: commit: %w", err)
	}
	return r.ID, nil
}

// pgChainStateProblem compares chain_state with the newest row and the
// highest id Verify found; "" when they agree.
func pgChainStateProblem(ctx context.Context, tx queryer, lastID int64, lastHash string) (string, error) {
	var id int64
	var hash string
	err := tx.QueryRowContext(ctx, `SELECT last_id, last_hash FROM chain_state`).Scan(&id, &hash)
	if errors.Is(err, sql.ErrNoRows) {
		return "the chain state row is missing (deleted outside mixward)", nil
	}
	if err != nil {
		return "", err
	}
	if id != lastID || hash != lastHash {
		return fmt.Sprintf("the chain state names row %d as the newest, but the log ends at row %d (edited outside mixward; the next row would not follow the log)", id, lastID), nil
	}
	return "", nil
}
