package store

import (
	"context"
	"database/sql"
	"fmt"
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
		res, err := tx.ExecContext(ctx, `INSERT INTO inbox (event_id, received, thread, message) VALUES (?, ?, ?, ?)
			ON CONFLICT (event_id) DO NOTHING`, clean(e.EventID), formatTime(e.Received), clean(e.Thread), string(e.Message))
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
func (db *DB) PendingMessages(ctx context.Context, afterSeq int64, limit int) ([]InboxEntry, error) {
	rows, err := db.r.QueryContext(ctx, `SELECT seq, event_id, received, thread, message, state, attempts, detail
		FROM inbox WHERE state = 'pending' AND seq > ? ORDER BY seq LIMIT ?`, afterSeq, limit)
	if err != nil {
		return nil, fmt.Errorf("pending messages: %w", err)
	}
	defer rows.Close()
	var out []InboxEntry
	for rows.Next() {
		var e InboxEntry
		var at, msg string
		if err := rows.Scan(&e.Seq, &e.EventID, &at, &e.Thread, &msg, &e.State, &e.Attempts, &e.Detail); err != nil {
			return nil, fmt.Errorf("pending messages: %w", err)
		}
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
	var at, msg string
	err := db.r.QueryRowContext(ctx, `SELECT seq, event_id, received, thread, message, state, attempts, detail
		FROM inbox WHERE event_id = ?`, eventID).Scan(&e.Seq, &e.EventID, &at, &e.Thread, &msg, &e.State, &e.Attempts, &e.Detail)
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
				SELECT ?, ?, ?, ? WHERE EXISTS (SELECT 1 FROM queries WHERE id = ? AND kind = 'query')`,
				o.QueryID, now, o.State == InboxPosted, clean(o.Detail), o.QueryID); err != nil {
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
