package store

import (
	"context"
	"errors"
	"fmt"
	"strconv"
	"strings"

	"github.com/mattn/go-sqlite3"
)

// chainHead is the newest row of a SQLite log as this process last wrote
// it, and the indexed mark as it last saw it. It only lets appendFast skip
// reading the head: the statement that appends checks it again inside its
// own write transaction, so a stale head (another process or connection
// appended, pruned or edited the log) costs one transaction more, never a
// wrong link.
type chainHead struct {
	ok   bool
	id   int64  // the newest row's id: also the highest id issued
	hash string // its hash
	mark int64  // search_state.indexed_upto after that row was written
}

// noteHead records the row id with hash as the newest row and mark as the
// indexed mark, unless a newer row was recorded already.
func (db *DB) noteHead(id int64, hash string, mark int64) {
	db.headMu.Lock()
	defer db.headMu.Unlock()
	if db.head.ok && db.head.id >= id {
		return
	}
	db.head = chainHead{ok: true, id: id, hash: hash, mark: max(mark, db.head.mark)}
}

// idsVersion is the schema version from which queries has no
// AUTOINCREMENT: query_ids.retired_upto, raised by a trigger on every
// delete, keeps deleted ids from being issued again
// (migrations/0013_ids_retired.sql).
const idsVersion = 13

// retiredSQL is the highest id no new row may take apart from the rows
// present: query_ids.retired_upto, or before idsVersion the highest id
// sqlite_sequence issued.
func retiredSQL(ver int) string {
	if ver < idsVersion {
		return `coalesce((SELECT seq FROM sqlite_sequence WHERE name = 'queries'), 0)`
	}
	return `coalesce((SELECT retired_upto FROM query_ids), 0)`
}

// fastInsert appends a sealed row (parameters 1–26 in rowColumns order:
// id first, time third, hash 23rd), parameters 27 and 28 being the head it
// was sealed on (id, hash). Its hash is written only if the row with that
// id exists with that hash and is not later than the new row (else
// time_order_broken must be set: appendRow does it), no row has a higher
// id and no higher id was retired (retiredSQL): the id and link appendRow
// would give it, read in the INSERT's own write transaction. Otherwise the
// hash is NULL and the NOT NULL constraint refuses the row. (A VALUES row,
// not INSERT … SELECT … WHERE: a SELECT that reads queries while inserting
// into it makes SQLite copy the row through a temporary table first.)
func fastInsert(ver int) string {
	p := make([]string, 26)
	for i := range p {
		p[i] = "?" + strconv.Itoa(i+1)
	}
	p[22] = `CASE WHEN (SELECT hash = ?28 AND time <= ?3 FROM queries WHERE id = ?27)
	  AND NOT EXISTS (SELECT 1 FROM queries WHERE id > ?27)
	  AND ` + retiredSQL(ver) + ` <= ?27 THEN ?23 END`
	return `INSERT INTO queries (` + rowColumns + `) VALUES (` + strings.Join(p, ", ") + `)`
}

// appendFast appends r in one statement outside an explicit transaction
// (SQLite wraps it in its own), sealed on the head this process last
// wrote, when no batch of derived rows is due with it. It reports false,
// having written nothing, when the head is unknown or moved, r is earlier
// than the head, or a batch is due: the caller then appends r in a
// transaction that reads the head. Saved per row: BEGIN and COMMIT as
// statements of their own and the read of the head.
func (db *DB) appendFast(ctx context.Context, r *row) (bool, error) {
	if db.ver < keysVersion || db.ws.fast.s == nil {
		return false, nil
	}
	db.headMu.Lock()
	h := db.head
	db.headMu.Unlock()
	if !h.ok || h.id+1-h.mark >= indexBatch {
		return false, nil
	}
	r.ID, r.PrevHash = h.id+1, h.hash
	seal(r, db.key)
	args := append(r.args(), h.id, h.hash)
	_, err := db.ws.fast.s.ExecContext(ctx, args...)
	var se sqlite3.Error
	switch {
	case errors.As(err, &se) && se.ExtendedCode == sqlite3.ErrConstraintNotNull:
		return false, nil // the head moved: nothing was written
	case isUnique(err):
		return false, fmt.Errorf("%w: event id %q already logged", ErrDuplicate, r.EventID)
	case err != nil:
		return false, err
	}
	db.noteHead(r.ID, r.Hash, h.mark)
	return true, nil
}
