package store

import (
	"context"
	"database/sql"
	"encoding/json"
	"errors"
	"fmt"
)

// VerifyReport is the outcome of walking the hash chain. Its JSON form is
// printed by `mixward log verify --format json`.
type VerifyReport struct {
	OK      bool  `json:"ok"`
	Rows    int64 `json:"rows"`    // rows checked (queries and prune records)
	Queries int64 `json:"queries"` // of which queries
	Prunes  int64 `json:"prunes"`  // of which prune records
	FirstID int64 `json:"first_id"`
	LastID  int64 `json:"last_id"`
	// HeadHash is the hash of the newest row. Writing it down outside the
	// database (a shift report, a ticket) lets a later check prove that no
	// row up to it was rewritten, even by someone who recomputed every hash.
	HeadHash string `json:"head_hash"`
	// AnchorID and AnchorHash are the last row removed by prune, which the
	// oldest remaining row must follow (0 and "" when nothing was pruned).
	AnchorID   int64  `json:"anchor_id"`
	AnchorHash string `json:"anchor_hash"`
	// BrokenID is the first row that fails, with the reason in Problem.
	BrokenID int64  `json:"broken_id,omitempty"`
	Problem  string `json:"problem,omitempty"`
}

// pruneRecord is the result column of a prune row.
type pruneRecord struct {
	Before     string `json:"before"`
	Deleted    int64  `json:"deleted"`
	AnchorID   int64  `json:"anchor_id"`
	AnchorHash string `json:"anchor_hash"`
}

// Verify walks the whole chain, oldest row first, and reports the first row
// whose content does not match its hash or whose link to the row before it
// is broken, and rows missing at either end. A broken chain is reported in
// the VerifyReport (OK false), not as an error; the error is for failures
// to read the file.
//
// The chain has no secret: someone who can write the file and recomputes
// every hash after an edit (or deletes the newest rows and rewinds
// sqlite_sequence) is caught only by comparing HeadHash with a copy kept
// elsewhere: a backup, an export, or the head hash noted in a report.
func (db *DB) Verify(ctx context.Context) (VerifyReport, error) {
	tx, err := db.r.BeginTx(ctx, nil)
	if err != nil {
		return VerifyReport{}, fmt.Errorf("verify: %w", err)
	}
	defer tx.Rollback()
	return verifyTx(ctx, tx)
}

// queryer is what verifyTx needs: a *sql.Tx, or a *sql.DB on a file opened
// read-only (restore checks a backup before copying it).
type queryer interface {
	QueryContext(ctx context.Context, query string, args ...any) (*sql.Rows, error)
	QueryRowContext(ctx context.Context, query string, args ...any) *sql.Row
}

func verifyTx(ctx context.Context, tx queryer) (VerifyReport, error) {
	var rep VerifyReport
	// The newest prune record holds the anchor; its own hash is checked
	// during the walk below.
	var res sql.NullString
	var pruneID int64
	err := tx.QueryRowContext(ctx, `SELECT id, result FROM queries WHERE kind = 'prune' ORDER BY id DESC LIMIT 1`).Scan(&pruneID, &res)
	switch {
	case errors.Is(err, sql.ErrNoRows):
	case err != nil:
		return rep, fmt.Errorf("verify: %w", err)
	default:
		var pr pruneRecord
		if err := json.Unmarshal([]byte(res.String), &pr); err != nil {
			rep.BrokenID = pruneID
			rep.Problem = fmt.Sprintf("row %d: prune record is not readable (%v)", pruneID, err)
			return rep, nil
		}
		rep.AnchorID, rep.AnchorHash = pr.AnchorID, pr.AnchorHash
	}
	var seq int64
	err = tx.QueryRowContext(ctx, `SELECT seq FROM sqlite_sequence WHERE name = 'queries'`).Scan(&seq)
	if err != nil && !errors.Is(err, sql.ErrNoRows) {
		return rep, fmt.Errorf("verify: %w", err)
	}

	rows, err := tx.QueryContext(ctx, `SELECT `+rowColumns+` FROM queries ORDER BY id`)
	if err != nil {
		return rep, fmt.Errorf("verify: %w", err)
	}
	defer rows.Close()
	var prev row
	first := true
	for rows.Next() {
		var r row
		if err := rows.Scan(r.scanDest()...); err != nil {
			return rep, fmt.Errorf("verify: read row after %d: %w", prev.ID, err)
		}
		if problem := checkRow(&r, &prev, first, rep.AnchorID, rep.AnchorHash); problem != "" {
			rep.BrokenID, rep.Problem = r.ID, problem
			return rep, nil
		}
		if first {
			rep.FirstID = r.ID
			first = false
		}
		rep.Rows++
		if r.Kind == kindPrune {
			rep.Prunes++
		} else {
			rep.Queries++
		}
		rep.LastID, rep.HeadHash = r.ID, r.Hash
		prev = r
	}
	if err := rows.Err(); err != nil {
		return rep, fmt.Errorf("verify: %w", err)
	}
	if seq > rep.LastID {
		rep.BrokenID = rep.LastID + 1
		if rep.Rows == 0 {
			rep.Problem = fmt.Sprintf("the log is empty but ids up to %d were issued: rows were deleted outside mixward", seq)
		} else {
			rep.Problem = fmt.Sprintf("rows after %d are missing: ids up to %d were issued (deleted outside mixward)", rep.LastID, seq)
		}
		return rep, nil
	}
	rep.OK = true
	return rep, nil
}

// checkRow returns what is wrong with r given the row before it ("" if
// nothing).
func checkRow(r, prev *row, first bool, anchorID int64, anchorHash string) string {
	if _, err := parseTime(r.Time); err != nil {
		return fmt.Sprintf("row %d: stored time %q is not valid", r.ID, r.Time)
	}
	if got := computeHash(r); got != r.Hash {
		return fmt.Sprintf("row %d: content does not match its hash (edited after it was written)", r.ID)
	}
	if r.Kind == kindPrune {
		var pr pruneRecord
		if !r.Result.Valid || json.Unmarshal([]byte(r.Result.String), &pr) != nil {
			return fmt.Sprintf("row %d: prune record is not readable", r.ID)
		}
	}
	if first {
		if r.PrevHash != anchorHash {
			if anchorID == 0 {
				return fmt.Sprintf("row %d: the log starts here but no prune of the rows before it is recorded (rows deleted outside mixward)", r.ID)
			}
			return fmt.Sprintf("row %d: does not follow row %d, the last row removed by the newest prune (rows deleted outside mixward)", r.ID, anchorID)
		}
		if anchorID > 0 && r.ID != anchorID+1 {
			return fmt.Sprintf("row %d: the log starts here but the newest prune removed rows up to %d: rows %d–%d are missing", r.ID, anchorID, anchorID+1, r.ID-1)
		}
		if anchorID == 0 && r.ID != 1 {
			return fmt.Sprintf("row %d: the log starts here but no prune of rows 1–%d is recorded (rows deleted outside mixward)", r.ID, r.ID-1)
		}
		return ""
	}
	if r.ID != prev.ID+1 {
		return fmt.Sprintf("row %d: rows %d–%d are missing (ids are issued without gaps)", r.ID, prev.ID+1, r.ID-1)
	}
	if r.PrevHash != prev.Hash {
		return fmt.Sprintf("row %d: does not follow row %d (a row between was removed or inserted, or row %d was re-hashed)", r.ID, prev.ID, prev.ID)
	}
	return ""
}
