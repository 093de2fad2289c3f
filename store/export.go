package store

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"time"
)

// Entry is one row of the chain as exported: a query, or a prune record
// (Kind "prune", with Prune set and the Query fields ID, Time, UserName =
// who pruned, Request = a summary, Hash and PrevHash).
type Entry struct {
	Kind string `json:"kind"` // "query" or "prune"
	*Query
	Prune *PruneInfo `json:"prune,omitempty"`
}

// Export calls fn for every row of the chain logged in [since, until)
// (zero times do not bound), oldest first, including prune records, so an
// auditor can re-check the hashes.
func (db *DB) Export(ctx context.Context, since, until time.Time, fn func(*Entry) error) error {
	where, args := `TRUE`, []any{}
	if !since.IsZero() {
		where += ` AND time >= ?`
		args = append(args, formatTime(since))
	}
	if !until.IsZero() {
		where += ` AND time < ?`
		args = append(args, formatTime(until))
	}
	tx, err := db.readTx(ctx)
	if err != nil {
		return fmt.Errorf("export: %w", err)
	}
	defer tx.Rollback()
	if db.usesKeys() && len(args) > 0 {
		// Bound the ids through the time index of query_keys (exact:
		// idRange), so a short window reads only its rows.
		lo, hi, empty, err := idRange(ctx, tx, since, until, true)
		if err != nil {
			return fmt.Errorf("export: %w", err)
		}
		where += ` AND id >= ? AND id <= ?`
		args = append(args, lo, hi)
		if hi == 0 {
			args[len(args)-1] = math.MaxInt64
		}
		if empty {
			return nil
		}
	}
	rows, err := tx.QueryContext(ctx, `SELECT `+rowColumns+` FROM queries WHERE `+where+` ORDER BY id`, args...)
	if err != nil {
		return fmt.Errorf("export: %w", err)
	}
	defer rows.Close()
	for rows.Next() {
		var r row
		if err := rows.Scan(r.scanDest()...); err != nil {
			return fmt.Errorf("export: %w", err)
		}
		q, err := decodeQuery(&r)
		if err != nil {
			return fmt.Errorf("export: %w", err)
		}
		e := &Entry{Kind: r.Kind, Query: q}
		if r.Kind == kindPrune {
			var pr pruneRecord
			if err := json.Unmarshal([]byte(r.Result.String), &pr); err != nil {
				return fmt.Errorf("export: prune record %d is not readable: %v", r.ID, err)
			}
			before, _ := time.Parse(time.RFC3339Nano, pr.Before)
			e.Prune = &PruneInfo{ID: r.ID, Time: q.Time, By: r.UserName, Before: before, Deleted: pr.Deleted,
				AnchorID: pr.AnchorID, AnchorHash: pr.AnchorHash}
		}
		if err := fn(e); err != nil {
			return err
		}
	}
	if err := rows.Err(); err != nil {
		return fmt.Errorf("export: %w", err)
	}
	return nil
}
