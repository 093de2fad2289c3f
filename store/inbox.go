package store

import (
	"context"
	"database/sql"
	"fmt"
	"sort"
	"time"
)

// The states of an inbox entry.
const (
	InboxPending = "pending" // acknowledged, answer not (yet) posted
	InboxPosted  = "posted"  // answer posted
	InboxFailed  = "failed"  // answer refused for good (e.g. channel gone)
)

// InboxEntry is one acknowledged message that is owed an answer.
type InboxEntry struct {
	Seq      int64     // order of acceptance
	EventID  string    // the transport's delivery id; unique
	Received time.Time // when it was accepted
	Thread   string    // ordering key: answers with the same key are posted in order
	Message  []byte    // the message as the bot encoded it
	State    string    // InboxPending, InboxPosted or InboxFailed
	Attempts int       // outcomes recorded so far
	Detail   string    // what the last outcome said
	// LeasedElsewhere is true (from InboxEntryFor) when the entry is
	// pending and another replica holds its lease: that replica is
	// answering it (Options.InboxLease).
	LeasedElsewhere bool
}

// Outcome is what came of posting the answer to an inbox entry.
type Outcome struct {
	EventID string
	QueryID int64  // the logged query the answer carried; 0 when none
	State   string // InboxPosted, InboxFailed, or InboxPending to try again at the next start
	Detail  string
}

// AcceptMessages writes entries to the inbox in one transaction and reports
// for each whether it was new; an entry whose EventID is already there is
// left as it is (a redelivery) and reported false. Entries need an EventID.
func (db *DB) AcceptMessages(ctx context.Context, entries []InboxEntry) ([]bool, error) {
	fresh := make([]bool, len(entries))
	tx, err := db.w.BeginTx(ctx, nil)
	if err != nil {
		return nil, fmt.Errorf("accept messages: %w", err)
	}
	defer tx.Rollback()
	for i, e := range entries {
		if e.EventID == "" {
			return nil, fmt.Errorf("accept messages: %w: entry %d has no event id", ErrInvalid, i+1)
		}
		if e.Received.IsZero() {
			e.Received = db.now()
		}
		ins, args := `INSERT INTO inbox (event_id, received, thread, message) VALUES (?, ?, ?, ?)
			ON CONFLICT (event_id) DO NOTHING`, []any{clean(e.EventID), formatTime(e.Received), clean(e.Thread), string(e.Message)}
		if db.lease > 0 {
			ins = `INSERT INTO inbox (event_id, received, thread, message, lease_owner, lease_until) VALUES (?, ?, ?, ?, ?, ?)
			ON CONFLICT (event_id) DO NOTHING`
			args = append(args, db.replica, formatTime(db.now().Add(db.lease)))
		}
		res, err := tx.ExecContext(ctx, ins, args...)
		if err != nil {
			return nil, fmt.Errorf("accept messages: event %q: %w", e.EventID, err)
		}
		n, err := res.RowsAffected()
		if err != nil {
			return nil, fmt.Errorf("accept messages: %w", err)
		}
		fresh[i] = n == 1
	}
	if err := tx.Commit(); err != nil {
		return nil, fmt.Errorf("accept messages: commit: %w", err)
	}
	return fresh, nil
}

// PendingMessages lists up to limit pending entries with seq above
// afterSeq, oldest first.
//
// With an inbox lease (Options.InboxLease) it lists only the entries this
// replica holds or whose lease ran out, and takes them, leased anew: of
// several replicas sweeping at once, each entry goes to one (on
// PostgreSQL the rows are locked FOR UPDATE SKIP LOCKED; SQLite has one
// writer at a time).
func (db *DB) PendingMessages(ctx context.Context, afterSeq int64, limit int) ([]InboxEntry, error) {
	if db.lease > 0 {
		return db.claimPending(ctx, afterSeq, limit)
	}
	rows, err := db.r.QueryContext(ctx, `SELECT seq, event_id, received, thread, message, state, attempts, detail
		FROM inbox WHERE state = 'pending' AND seq > ? ORDER BY seq LIMIT ?`, afterSeq, limit)
	if err != nil {
		return nil, fmt.Errorf("pending messages: %w", err)
	}
	defer rows.Close()
	return scanInbox(rows)
}

func (db *DB) claimPending(ctx context.Context, afterSeq int64, limit int) ([]InboxEntry, error) {
	lock := ""
	if db.pg {
		lock = " FOR UPDATE SKIP LOCKED"
	}
	now := db.now()
	rows, err := db.w.QueryContext(ctx, `UPDATE inbox SET lease_owner = ?, lease_until = ?
		WHERE seq IN (SELECT seq FROM inbox WHERE state = 'pending' AND seq > ? AND (lease_owner = ? OR lease_until < ?)
		              ORDER BY seq LIMIT ?`+lock+`)
		RETURNING seq, event_id, received, thread, message, state, attempts, detail`,
		db.replica, formatTime(now.Add(db.lease)), afterSeq, db.replica, formatTime(now), limit)
	if err != nil {
		return nil, fmt.Errorf("pending messages: %w", err)
	}
	defer rows.Close()
	out, err := scanInbox(rows)
	sort.Slice(out, func(i, j int) bool { return out[i].Seq < out[j].Seq })
	return out, err
}

func scanInbox(rows *sql.Rows) ([]InboxEntry, error) {
	var out []InboxEntry
	for rows.Next() {
		var e InboxEntry
		var at, msg string
		if err := rows.Scan(&e.Seq, &e.EventID, &at, &e.Thread, &msg, &e.State, &e.Attempts, &e.Detail); err != nil {
			return nil, fmt.Errorf("pending messages: %w", err)
		}
		var err error
		if e.Received, err = parseTime(at); err != nil {
			return nil, fmt.Errorf("pending messages: inbox %d: %w", e.Seq, err)
		}
		e.Message = []byte(msg)
		out = append(out, e)
	}
	return out, rows.Err()
}

// InboxEntryFor returns the inbox entry of eventID, or ErrNotFound.
func (db *DB) InboxEntryFor(ctx context.Context, eventID string) (InboxEntry, error) {
	var e InboxEntry
	var at, msg, owner, until string
	cols := `seq, event_id, received, thread, message, state, attempts, detail, '', ''`
	if db.lease > 0 {
		cols = `seq, event_id, received, thread, message, state, attempts, detail, lease_owner, lease_until`
	}
	err := db.r.QueryRowContext(ctx, `SELECT `+cols+`
		FROM inbox WHERE event_id = ?`, eventID).Scan(&e.Seq, &e.EventID, &at, &e.Thread, &msg, &e.State, &e.Attempts, &e.Detail, &owner, &until)
	e.LeasedElsewhere = e.State == InboxPending && owner != "" && owner != db.replica && until > formatTime(db.now())
	if err == sql.ErrNoRows {
		return e, fmt.Errorf("inbox entry %q: %w", eventID, ErrNotFound)
	}
	if err != nil {
		return e, fmt.Errorf("inbox entry %q: %w", eventID, err)
	}
	e.Message = []byte(msg)
	e.Received, err = parseTime(at)
	return e, err
}

// FinishMessages records outcomes in one transaction: the entry's state
// (a posted entry stays posted; a failed one may be tried again and
// posted), and for an answer that carried a logged query, a row in
// deliveries (as RecordDelivery writes). An outcome for an event not in the inbox still
// records its delivery.
func (db *DB) FinishMessages(ctx context.Context, outs []Outcome) error {
	tx, err := db.w.BeginTx(ctx, nil)
	if err != nil {
		return fmt.Errorf("finish messages: %w", err)
	}
	defer tx.Rollback()
	now := formatTime(db.now())
	for _, o := range outs {
		switch o.State {
		case InboxPosted, InboxFailed, InboxPending:
		default:
			return fmt.Errorf("finish messages: %w: state %q for event %q", ErrInvalid, o.State, o.EventID)
		}
		done := ""
		if o.State != InboxPending {
			done = now
		}
		if o.EventID != "" {
			if _, err := tx.ExecContext(ctx, `UPDATE inbox SET state = ?, attempts = attempts + 1, detail = ?, done_at = ?
				WHERE event_id = ? AND state <> 'posted'`, o.State, clean(o.Detail), done, o.EventID); err != nil {
				return fmt.Errorf("finish messages: event %q: %w", o.EventID, err)
			}
		}
		if o.QueryID > 0 {
			if _, err := tx.ExecContext(ctx, `INSERT INTO deliveries (query_id, time, ok, detail)
				SELECT id, CAST(? AS TEXT), CAST(? AS BOOLEAN), CAST(? AS TEXT) FROM queries WHERE id = ? AND kind = 'query'`,
				now, o.State == InboxPosted, clean(o.Detail), o.QueryID); err != nil {
				return fmt.Errorf("finish messages: delivery of query %d: %w", o.QueryID, err)
			}
		}
	}
	if err := tx.Commit(); err != nil {
		return fmt.Errorf("finish messages: commit: %w", err)
	}
	return nil
}

// PruneInbox deletes finished entries done before before (redeliveries
// come within the hour; the entries are not needed after) and returns how
// many went. Pending entries are never pruned.
func (db *DB) PruneInbox(ctx context.Context, before time.Time) (int64, error) {
	res, err := db.w.ExecContext(ctx, `DELETE FROM inbox WHERE state <> 'pending' AND done_at < ?`, formatTime(before))
	if err != nil {
		return 0, fmt.Errorf("prune inbox: %w", err)
	}
	return res.RowsAffected()
}

// InboxLease is how long a pending entry stays with the replica that took
// it (Options.InboxLease); 0 when there are no leases.
func (db *DB) InboxLease() time.Duration { return db.lease }
