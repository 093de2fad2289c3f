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
	// database (a shift report, a ticket, an anchors file) lets a later
	// check (Verify with an Anchor) prove that no row up to it was
	// rewritten or cut off, even by someone who recomputed every hash.
	HeadHash string `json:"head_hash"`
	// AnchorID and AnchorHash are the last row removed by prune, which the
	// oldest remaining row must follow (0 and "" when nothing was pruned).
	AnchorID   int64  `json:"anchor_id"`
	AnchorHash string `json:"anchor_hash"`
	// KeyedRows counts rows of the keyed chain (HMAC-SHA256), the first of
	// them FirstKeyedID, written with the key KeyID.
	KeyedRows    int64  `json:"keyed_rows"`
	FirstKeyedID int64  `json:"first_keyed_id,omitempty"`
	KeyID        string `json:"key_id,omitempty"`
	// UncheckedRows counts keyed rows whose content could not be checked
	// because no key was given; their links to each other were checked.
	UncheckedRows int64 `json:"unchecked_rows"`
	// DerivedChecked is true when the tables derived from the hashed rows
	// (hazard rows, the search index's text and word counts, the search
	// state) were compared with them and matched.
	DerivedChecked bool `json:"derived_checked"`
	// Anchors are the outcomes of the anchors given to Verify.
	Anchors []AnchorResult `json:"anchors,omitempty"`
	// DigestAnchors counts the log heads carried by digests recorded as
	// sent, each checked like an anchor (not listed in Anchors).
	DigestAnchors int `json:"digest_anchors"`
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
// is broken, rows missing at either end, a plain row after a keyed one, and
// derived tables (hazard rows, search index, search state) that differ from
// the hashed rows. Each anchor (a row id and hash noted outside the
// database) must still be on the chain with that hash. A broken chain is
// reported in the VerifyReport (OK false), not as an error; the error is for
// failures to read the file.
//
// Keyed rows are checked with the DB's ChainKey; without it their content
// is not checked (UncheckedRows) and only their links are.
//
// Without anchors or a key, someone who can write the file and recomputes
// every hash after an edit (or deletes the newest rows and rewinds
// query_ids.retired_upto, and the derived rows with them) is not caught: compare
// HeadHash with a copy kept elsewhere (a digest, a backup, an anchors file).
func (db *DB) Verify(ctx context.Context, anchors ...Anchor) (VerifyReport, error) {
	tx, err := db.readTx(ctx)
	if err != nil {
		return VerifyReport{}, fmt.Errorf("verify: %w", err)
	}
	defer tx.Rollback()
	return verifyTx(ctx, tx, db.ver, db.key, anchors, db.pg)
}

// queryer is what verifyTx needs: a *sql.Tx, or a *sql.DB.
type queryer interface {
	ExecContext(ctx context.Context, query string, args ...any) (sql.Result, error)
	QueryContext(ctx context.Context, query string, args ...any) (*sql.Rows, error)
	QueryRowContext(ctx context.Context, query string, args ...any) *sql.Row
}

// walk is the state of one verification.
type walk struct {
	ctx      context.Context
	tx       queryer
	ver      int
	pg       bool
	key      *ChainKey
	rep      *VerifyReport
	prev     row
	first    bool
	derived  *derivedCheck
	anchors  *anchorCheck
	recorded *anchorCheck // heads carried by recorded digests
	// derivedID and derivedProblem are the first difference between a
	// derived table and the rows; the chain is walked to the end first,
	// since a broken chain is the stronger finding.
	derivedID      int64
	derivedProblem string
}

func verifyTx(ctx context.Context, tx queryer, ver int, key *ChainKey, anchors []Anchor, pg bool) (VerifyReport, error) {
	rep := VerifyReport{}
	given := func(int) string { return "an anchor" }
	w := &walk{ctx: ctx, tx: tx, ver: ver, pg: pg, key: key, rep: &rep, first: true, anchors: newAnchorCheck(anchors, given)}
	if ok, err := w.readPruneAnchor(); err != nil || !ok {
		return rep, err
	}
	recorded, from, err := recordedAnchors(ctx, tx, ver)
	if err != nil {
		return rep, fmt.Errorf("verify: read the digests sent: %w", err)
	}
	w.recorded = newAnchorCheck(recorded, func(i int) string { return from[i] })
	rep.DigestAnchors = len(recorded)
	var seq int64
	seqSQL := `SELECT ` + retiredSQL(ver)
	if pg {
		seqSQL = `SELECT seq FROM chain_state`
	}
	err = tx.QueryRowContext(ctx, seqSQL).Scan(&seq)
	if err != nil && !errors.Is(err, sql.ErrNoRows) {
		return rep, fmt.Errorf("verify: %w", err)
	}
	w.derived, err = newDerivedCheck(ctx, tx, ver, pg)
	defer w.derived.close() // also the cursors opened before an error
	if err != nil {
		return rep, fmt.Errorf("verify: %w", err)
	}
	if err := w.walkRows(); err != nil || rep.Problem != "" {
		return rep, err
	}
	id, p, err := w.finish(seq)
	if err != nil || p != "" {
		rep.BrokenID, rep.Problem = id, p
		return rep, err
	}
	rep.OK = true
	return rep, nil
}

// finish runs the checks that need the whole walk, strongest evidence
// first: rows missing at the end, the keyed head, the anchors given, the
// heads recorded by digests, then the derived tables.
func (w *walk) finish(seq int64) (int64, string, error) {
	rep := w.rep
	if seq > rep.LastID {
		if rep.Rows == 0 {
			return 1, fmt.Sprintf("the log is empty but ids up to %d were issued: rows were deleted outside mixward", seq), nil
		}
		return rep.LastID + 1, fmt.Sprintf("rows after %d are missing: ids up to %d were issued (deleted outside mixward)", rep.LastID, seq), nil
	}
	if p := w.keyedHeadProblem(); p != "" {
		return rep.LastID, p, nil
	}
	if id, p := w.anchors.finish(rep); p != "" {
		return id, p, nil
	}
	listed := rep.Anchors
	id, p := w.recorded.finish(rep)
	rep.Anchors = listed
	if p != "" {
		return id, p, nil
	}
	if w.derivedProblem != "" {
		return w.derivedID, w.derivedProblem, nil
	}
	if w.pg {
		p, err := pgChainStateProblem(w.ctx, w.tx, rep.LastID, rep.HeadHash)
		if err != nil || p != "" {
			return rep.LastID, p, err
		}
	}
	id, p, err := w.derived.finish(rep.LastID)
	if err != nil || p != "" {
		return id, p, err
	}
	rep.DerivedChecked = w.derived.enabled
	return 0, "", nil
}

// readPruneAnchor reads the newest prune record, which holds the anchor the
// oldest kept row follows; its own hash is checked during the walk. It
// returns false when the record is unreadable (reported in rep).
func (w *walk) readPruneAnchor() (bool, error) {
	var res sql.NullString
	var pruneID int64
	err := w.tx.QueryRowContext(w.ctx, `SELECT id, result FROM queries WHERE kind = 'prune' ORDER BY id DESC LIMIT 1`).Scan(&pruneID, &res)
	switch {
	case errors.Is(err, sql.ErrNoRows):
		return true, nil
	case err != nil:
		return false, fmt.Errorf("verify: %w", err)
	}
	var pr pruneRecord
	if err := json.Unmarshal([]byte(res.String), &pr); err != nil {
		w.rep.BrokenID = pruneID
		w.rep.Problem = fmt.Sprintf("row %d: prune record is not readable (%v)", pruneID, err)
		return false, nil
	}
	w.rep.AnchorID, w.rep.AnchorHash = pr.AnchorID, pr.AnchorHash
	return true, nil
}

// walkRows checks every row, oldest first, stopping at the first problem.
func (w *walk) walkRows() error {
	rows, err := openRows(w.ctx, w.tx, w.pg, `SELECT `+rowColumnsFor(w.ver)+` FROM queries ORDER BY id`)
	if err != nil {
		return fmt.Errorf("verify: %w", err)
	}
	defer rows.Close()
	rep := w.rep
	for rows.Next() {
		var r row
		if err := rows.Scan(r.scanDest()...); err != nil {
			return fmt.Errorf("verify: read row after %d: %w", w.prev.ID, err)
		}
		problem := w.checkRow(&r)
		if problem == "" && w.derivedProblem == "" {
			if w.derivedProblem, err = w.derived.row(&r); err != nil {
				return fmt.Errorf("verify: %w", err)
			}
			w.derivedID = r.ID
		}
		if problem != "" {
			rep.BrokenID, rep.Problem = r.ID, problem
			return nil
		}
		if w.first {
			rep.FirstID = r.ID
			w.first = false
		}
		rep.Rows++
		if r.Kind == kindPrune {
			rep.Prunes++
		} else {
			rep.Queries++
		}
		rep.LastID, rep.HeadHash = r.ID, r.Hash
		w.anchors.row(&r)
		w.recorded.row(&r)
		w.prev = r
	}
	if err := rows.Err(); err != nil {
		return fmt.Errorf("verify: %w", err)
	}
	return nil
}

// checkRow returns what is wrong with r given the row before it ("" if
// nothing).
func (w *walk) checkRow(r *row) string {
	if _, err := parseTime(r.Time); err != nil {
		return fmt.Sprintf("row %d: stored time %q is not valid", r.ID, r.Time)
	}
	if p := w.checkHash(r); p != "" {
		return p
	}
	if r.Kind == kindPrune {
		var pr pruneRecord
		if !r.Result.Valid || json.Unmarshal([]byte(r.Result.String), &pr) != nil {
			return fmt.Sprintf("row %d: prune record is not readable", r.ID)
		}
	}
	if w.first {
		return checkFirst(r, w.rep.AnchorID, w.rep.AnchorHash)
	}
	prev := &w.prev
	if r.ID != prev.ID+1 {
		return fmt.Sprintf("row %d: rows %d–%d are missing (ids are issued without gaps)", r.ID, prev.ID+1, r.ID-1)
	}
	if r.PrevHash != prev.Hash {
		return fmt.Sprintf("row %d: does not follow row %d (a row between was removed or inserted, or row %d was re-hashed)", r.ID, prev.ID, prev.ID)
	}
	return ""
}

// checkHash checks r's hash by its chain kind, and that no plain row
// follows a keyed one (the writer refuses to write one: such a row was
// rewritten by someone without the key).
func (w *walk) checkHash(r *row) string {
	rep := w.rep
	switch r.Chain {
	case ChainPlain:
		if rep.KeyedRows > 0 {
			return fmt.Sprintf("row %d: is a plain (unkeyed) row after keyed row %d: mixward never writes one; "+
				"this row was rewritten or added by someone without the key", r.ID, rep.FirstKeyedID)
		}
		if computeHash(r) != r.Hash {
			return fmt.Sprintf("row %d: content does not match its hash (edited after it was written)", r.ID)
		}
		return ""
	case ChainKeyed:
	default:
		return fmt.Sprintf("row %d: unknown chain kind %q", r.ID, r.Chain)
	}
	if rep.KeyedRows == 0 {
		rep.FirstKeyedID, rep.KeyID = r.ID, r.KeyID
	}
	rep.KeyedRows++
	if r.KeyID != rep.KeyID {
		return fmt.Sprintf("row %d: is keyed with key id %s but the rows before it with %s: mixward writes one log with one key", r.ID, r.KeyID, rep.KeyID)
	}
	if w.key == nil {
		rep.UncheckedRows++
		return ""
	}
	if r.KeyID != w.key.id {
		return fmt.Sprintf("row %d: is keyed with key id %s, but the key given has id %s: give the key the log was written with", r.ID, r.KeyID, w.key.id)
	}
	if keyedHash(r, w.key) != r.Hash {
		return fmt.Sprintf("row %d: content does not match its keyed hash (edited after it was written, or re-hashed without the key)", r.ID)
	}
	return ""
}

// checkFirst checks the oldest row against the prune anchor.
func checkFirst(r *row, anchorID int64, anchorHash string) string {
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

// keyedHeadProblem: with a key given, the newest row must be keyed. A log
// written with the key ends in a keyed row; one that does not had its
// keyed rows rewritten as plain ones (or the key was never used to write).
func (w *walk) keyedHeadProblem() string {
	if w.key == nil || w.rep.Rows == 0 || w.prev.Chain == ChainKeyed {
		return ""
	}
	return fmt.Sprintf("row %d: the newest row is not keyed although a key is given: either no row was ever written "+
		"with this key (if it was only just configured, check again after the next query) or the keyed rows were "+
		"rewritten as plain ones by someone without the key", w.rep.LastID)
}
