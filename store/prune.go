package store

import (
	"context"
	"database/sql"
	"encoding/json"
	"errors"
	"fmt"
	"strings"
	"time"
)

// Prune deletes the oldest queries, those logged before before, and
// returns how many it deleted. It deletes the longest run of oldest rows
// that all precede before (by id, so the chain stays a chain even if the
// clock once stepped back), and appends a chained prune record naming who
// ran it, the cut-off, the count and the anchor: the id and hash of the
// last deleted row, which the oldest remaining row links to. Verify checks
// the remaining rows against that anchor. A prune that deletes nothing is
// recorded too. Deleted rows are overwritten on disk (secure_delete) and
// the full-text index is merged so their words are gone as well.
func (db *DB) Prune(ctx context.Context, before time.Time, by string) (int64, error) {
	by = clean(strings.TrimSpace(by))
	if by == "" {
		return 0, fmt.Errorf("prune: %w: say who is pruning", ErrInvalid)
	}
	if before.IsZero() {
		return 0, fmt.Errorf("prune: %w: no cut-off date", ErrInvalid)
	}
	if err := db.writable("prune"); err != nil {
		return 0, err
	}
	if db.pg {
		conn, err := db.w.Conn(ctx)
		if err != nil {
			return 0, fmt.Errorf("prune: %w", err)
		}
		defer conn.Close()
		return db.prune(ctx, conn, before.UTC(), by, db.now().UTC())
	}
	conn, err := db.w.Conn(ctx)
	if err != nil {
		return 0, fmt.Errorf("prune: %w", err)
	}
	defer conn.Close()
	if _, err := conn.ExecContext(ctx, `PRAGMA secure_delete = ON`); err != nil {
		return 0, fmt.Errorf("prune: %w", err)
	}
	defer conn.ExecContext(context.Background(), `PRAGMA secure_delete = OFF`)

	n, err := db.prune(ctx, conn, before.UTC(), by, db.now().UTC())
	if err != nil {
		return 0, err
	}
	// Merge the index and fold the WAL back so deleted text leaves the disk.
	if _, err := conn.ExecContext(ctx, `INSERT INTO query_fts (query_fts) VALUES ('optimize')`); err != nil {
		return n, fmt.Errorf("prune: deleted %d rows, then merging the search index failed: %w", n, err)
	}
	if _, err := conn.ExecContext(ctx, `PRAGMA wal_checkpoint(TRUNCATE)`); err != nil {
		return n, fmt.Errorf("prune: deleted %d rows, then the checkpoint failed: %w", n, err)
	}
	return n, nil
}

func (db *DB) prune(ctx context.Context, conn *sql.Conn, before time.Time, by string, now time.Time) (int64, error) {
	tx, err := conn.BeginTx(ctx, nil)
	if err != nil {
		return 0, fmt.Errorf("prune: %w", err)
	}
	defer tx.Rollback()
	if err := db.lockChain(ctx, tx); err != nil {
		return 0, fmt.Errorf("prune: %w", err)
	}

	// The previous anchor carries forward when nothing is deleted.
	var anchor pruneRecord
	var res sql.NullString
	err = tx.QueryRowContext(ctx, `SELECT result FROM queries WHERE kind = 'prune' ORDER BY id DESC LIMIT 1`).Scan(&res)
	if err != nil && !errors.Is(err, sql.ErrNoRows) {
		return 0, fmt.Errorf("prune: %w", err)
	}
	if res.Valid {
		if err := json.Unmarshal([]byte(res.String), &anchor); err != nil {
			return 0, fmt.Errorf("prune: the newest prune record is not readable (%v); run 'mixward log verify'", err)
		}
	}

	cut, err := db.firstFrom(ctx, tx, formatTime(before))
	if err != nil {
		return 0, fmt.Errorf("prune: %w", err)
	}
	cond, args := `id < ?`, []any{cut.Int64}
	if !cut.Valid { // every row precedes the cut-off
		cond, args = `TRUE`, nil
	}
	var lastID int64
	var lastHash string
	err = tx.QueryRowContext(ctx, `SELECT id, hash FROM queries WHERE `+cond+` ORDER BY id DESC LIMIT 1`, args...).Scan(&lastID, &lastHash)
	var deleted int64
	switch {
	case errors.Is(err, sql.ErrNoRows):
	case err != nil:
		return 0, fmt.Errorf("prune: %w", err)
	default:
		r, err := tx.ExecContext(ctx, `DELETE FROM queries WHERE `+cond, args...)
		if err != nil {
			return 0, fmt.Errorf("prune: %w", err)
		}
		if deleted, err = r.RowsAffected(); err != nil {
			return 0, fmt.Errorf("prune: %w", err)
		}
		anchor.AnchorID, anchor.AnchorHash = lastID, lastHash
	}
	rec := pruneRecord{Before: before.Format(time.RFC3339Nano), Deleted: deleted, AnchorID: anchor.AnchorID, AnchorHash: anchor.AnchorHash}
	b, _ := json.Marshal(rec)
	r := &row{
		Kind: kindPrune, Time: formatTime(now), UserName: by,
		Request: fmt.Sprintf("prune before %s: %d rows deleted", rec.Before, deleted),
		Species: "[]", Hazards: "[]", Streams: "[]", Site: DefaultSite,
		Result: sql.NullString{String: string(b), Valid: true},
	}
	if err := db.appendRow(ctx, tx, r, anchor.AnchorHash); err != nil {
		return 0, fmt.Errorf("prune: record the prune: %w", err)
	}
	if err := tx.Commit(); err != nil {
		return 0, fmt.Errorf("prune: commit: %w", err)
	}
	return deleted, nil
}

// Prunes lists the prune records still in the log, oldest first.
func (db *DB) Prunes(ctx context.Context) ([]PruneInfo, error) {
	rows, err := db.r.QueryContext(ctx, `SELECT id, time, user_name, result FROM queries WHERE kind = 'prune' ORDER BY id`)
	if err != nil {
		return nil, fmt.Errorf("list prunes: %w", err)
	}
	defer rows.Close()
	var out []PruneInfo
	for rows.Next() {
		var p PruneInfo
		var ts string
		var res sql.NullString
		if err := rows.Scan(&p.ID, &ts, &p.By, &res); err != nil {
			return nil, fmt.Errorf("list prunes: %w", err)
		}
		if p.Time, err = parseTime(ts); err != nil {
			return nil, err
		}
		var pr pruneRecord
		if err := json.Unmarshal([]byte(res.String), &pr); err != nil {
			return nil, fmt.Errorf("list prunes: row %d is not readable: %v", p.ID, err)
		}
		p.Deleted, p.AnchorID, p.AnchorHash = pr.Deleted, pr.AnchorID, pr.AnchorHash
		if p.Before, err = time.Parse(time.RFC3339Nano, pr.Before); err != nil {
			return nil, fmt.Errorf("list prunes: row %d: %v", p.ID, err)
		}
		out = append(out, p)
	}
	return out, rows.Err()
}

// PruneInfo is one recorded prune.
type PruneInfo struct {
	ID         int64     `json:"id"`
	Time       time.Time `json:"time"`
	By         string    `json:"by"`
	Before     time.Time `json:"before"`
	Deleted    int64     `json:"deleted"`
	AnchorID   int64     `json:"anchor_id"`
	AnchorHash string    `json:"anchor_hash"`
}
