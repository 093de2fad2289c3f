package store

import (
	"context"
	"database/sql"
	"errors"
	"fmt"

	"github.com/jackc/pgx/v5"
	"github.com/jackc/pgx/v5/pgconn"
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
	_, err := tx.ExecContext(ctx, pgInsertSQL, pgInsertArgs(r)...)
	return err
}

func pgInsertArgs(r *row) []any {
	return []any{r.ID, r.Kind, r.Time, r.UserID, r.UserName, r.Channel, r.EventID, r.Request,
		r.Resolved, r.Verdict, r.Error, r.Species, r.Oxidizer, r.Reducer, r.ECellV, r.ECellStandardV, r.Hazards, r.Streams,
		r.Result, r.EngineVersion, r.DataHash, r.PrevHash, r.Hash, r.Chain, r.KeyID, r.Site, searchDoc(r), r.ID, r.Hazards}
}

// pgLogQuery is LogQuery's transaction on PostgreSQL: lock and read the
// head, seal, write; a query whose event id is already logged (by another
// replica a moment ago, too) returns that id with ErrDuplicate.
//
// It takes two round trips to the server: BEGIN and the locking read of
// the head go in one pipelined batch, the insert and COMMIT in another
// (the hash needs the head, so two is the least). The four statements
// one after another cost twice as much time, most of it waiting.
func (db *DB) pgLogQuery(ctx context.Context, r *row) (int64, error) {
	conn, err := db.w.Conn(ctx)
	if err != nil {
		return 0, fmt.Errorf("log query: %w", err)
	}
	defer conn.Close()
	var dup int64
	err = conn.Raw(func(dc any) error {
		pc := dc.(*qmarkConn).Conn.Conn()
		var err error
		dup, err = db.pgAppend(ctx, pc, r)
		if err != nil && !pc.IsClosed() {
			pc.Exec(context.Background(), "ROLLBACK") // leave no transaction open on a pooled connection
		}
		return err
	})
	if pgUnique(err) && r.EventID != "" {
		var id int64
		if err := db.r.QueryRowContext(ctx, `SELECT id FROM queries WHERE event_id = ?`, r.EventID).Scan(&id); err != nil {
			return 0, fmt.Errorf("log query: event %q already logged: %w", r.EventID, ErrDuplicate)
		}
		return id, fmt.Errorf("log query: event %q is query %d: %w", r.EventID, id, ErrDuplicate)
	}
	if dup > 0 {
		return dup, fmt.Errorf("log query: event %q is query %d: %w", r.EventID, dup, ErrDuplicate)
	}
	if err != nil {
		return 0, fmt.Errorf("log query: %w", err)
	}
	return r.ID, nil
}

// pgAppend runs pgLogQuery's two batches on one connection; dup is the id
// already logged for r's event id (and nothing is written).
func (db *DB) pgAppend(ctx context.Context, pc *pgx.Conn, r *row) (dup int64, err error) {
	var b pgx.Batch
	b.Queue("BEGIN")
	b.Queue(rebind(pgHeadSQL), r.EventID)
	br := pc.SendBatch(ctx, &b)
	var seq, lastID int64
	var prev, lastTime string
	var d sql.NullInt64
	if _, err := br.Exec(); err != nil {
		br.Close()
		return 0, err
	}
	if err := br.QueryRow().Scan(&seq, &lastID, &prev, &lastTime, &d); err != nil {
		br.Close()
		return 0, err
	}
	if err := br.Close(); err != nil {
		return 0, err
	}
	if d.Valid && d.Int64 > 0 {
		_, err := pc.Exec(ctx, "ROLLBACK")
		return d.Int64, err
	}
	if lastID == 0 {
		prev = ""
	}
	r.ID, r.PrevHash = max(seq, lastID)+1, prev
	seal(r, db.key)
	var w pgx.Batch
	w.Queue(rebind(pgInsertSQL), pgInsertArgs(r)...)
	w.Queue("COMMIT")
	br = pc.SendBatch(ctx, &w)
	_, err = br.Exec()
	if err == nil {
		var tag pgconn.CommandTag
		tag, err = br.Exec()
		if err == nil && tag.String() != "COMMIT" {
			err = fmt.Errorf("commit: the server answered %q", tag.String())
		}
	}
	if cerr := br.Close(); err == nil {
		err = cerr
	}
	return 0, err
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
