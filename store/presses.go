package store

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"time"
)

// The actions a press can ask for.
const (
	PressDetails = "details" // the full answer
	PressPicture = "picture" // the E–pH picture
	PressPour    = "pour"    // the order of addition
)

// Press is one button pressed under an answer (or the same console
// command), recorded against its query.
type Press struct {
	QueryID   int64     `json:"query_id"`
	Time      time.Time `json:"time"`
	Action    string    `json:"action"` // details, picture or pour
	UserID    string    `json:"user_id"`
	UserName  string    `json:"user_name"`
	Channel   string    `json:"channel"`
	Transport string    `json:"transport"` // socket, http or console
	Key       string    `json:"-"`         // the transport's id of the press; "" = none
}

// RecordPress records a press against its query. A press whose Key is
// already recorded is not written again and returns an error wrapping
// ErrDuplicate; a query id that is not in the log returns ErrNotFound.
// Presses are kept outside the hash chain (see the migration): they ask to
// see an answer already on record.
func (db *DB) RecordPress(ctx context.Context, p Press) error {
	if err := db.writable("record press"); err != nil {
		return err
	}
	switch p.Action {
	case PressDetails, PressPicture, PressPour:
	default:
		return fmt.Errorf("record press on query %d: %w: action %q is not details, picture or pour", p.QueryID, ErrInvalid, p.Action)
	}
	if p.Time.IsZero() {
		p.Time = db.now()
	}
	tx, err := db.w.BeginTx(ctx, nil)
	if err != nil {
		return fmt.Errorf("record press on query %d: %w", p.QueryID, err)
	}
	defer tx.Rollback()
	var n int
	if err := tx.QueryRowContext(ctx, `SELECT count(*) FROM queries WHERE id = ? AND kind = 'query'`, p.QueryID).Scan(&n); err != nil {
		return fmt.Errorf("record press on query %d: %w", p.QueryID, err)
	}
	if n == 0 {
		return fmt.Errorf("record press on query %d: %w", p.QueryID, ErrNotFound)
	}
	_, err = tx.ExecContext(ctx, `INSERT INTO presses (query_id, time, action, user_id, user_name, channel, transport, press_key)
		VALUES (?, ?, ?, ?, ?, ?, ?, ?)`, p.QueryID, formatTime(p.Time), p.Action, clean(p.UserID), clean(p.UserName),
		clean(p.Channel), clean(p.Transport), clean(p.Key))
	if isUnique(err) {
		return fmt.Errorf("record press on query %d: %w", p.QueryID, ErrDuplicate)
	}
	if err != nil {
		return fmt.Errorf("record press on query %d: %w", p.QueryID, err)
	}
	if err := tx.Commit(); err != nil {
		return fmt.Errorf("record press on query %d: %w", p.QueryID, err)
	}
	return nil
}

// Presses lists the presses recorded against a query, oldest first.
func (db *DB) Presses(ctx context.Context, queryID int64) ([]Press, error) {
	rows, err := db.r.QueryContext(ctx, `SELECT time, action, user_id, user_name, channel, transport
		FROM presses WHERE query_id = ? ORDER BY id`, queryID)
	if err != nil {
		return nil, fmt.Errorf("presses of query %d: %w", queryID, err)
	}
	defer rows.Close()
	var out []Press
	for rows.Next() {
		p := Press{QueryID: queryID}
		var ts string
		if err := rows.Scan(&ts, &p.Action, &p.UserID, &p.UserName, &p.Channel, &p.Transport); err != nil {
			return nil, fmt.Errorf("presses of query %d: %w", queryID, err)
		}
		if p.Time, err = parseTime(ts); err != nil {
			return nil, err
		}
		out = append(out, p)
	}
	return out, rows.Err()
}

// NoteName records that the Slack id (a user or channel) was shown as name
// at time at. Empty ids or names are ignored.
func (db *DB) NoteName(ctx context.Context, id, name string, at time.Time) error {
	id, name = clean(id), clean(name)
	if id == "" || name == "" || id == name {
		return nil
	}
	if err := db.writable("note name"); err != nil {
		return err
	}
	if at.IsZero() {
		at = db.now()
	}
	t := formatTime(at)
	_, err := db.w.ExecContext(ctx, `INSERT INTO names (slack_id, name, first_seen, last_seen) VALUES (?, ?, ?, ?)
		ON CONFLICT (slack_id, name) DO UPDATE SET
			first_seen = CASE WHEN excluded.first_seen < names.first_seen THEN excluded.first_seen ELSE names.first_seen END,
			last_seen = CASE WHEN excluded.last_seen > names.last_seen THEN excluded.last_seen ELSE names.last_seen END`, id, name, t, t)
	if err != nil {
		return fmt.Errorf("note name of %s: %w", id, err)
	}
	return nil
}

// NameAt is the name id was last seen under at or before at; when it was
// only seen later, the earliest name; "" (and no error) when never seen.
func (db *DB) NameAt(ctx context.Context, id string, at time.Time) (string, error) {
	if !db.hasNames() {
		return "", nil // a file of an older schema, read as it is
	}
	return nameAt(ctx, db.r, id, at)
}

func nameAt(ctx context.Context, q queryer, id string, at time.Time) (string, error) {
	var name string
	err := q.QueryRowContext(ctx, `SELECT name FROM names WHERE slack_id = ?
		ORDER BY first_seen <= ? DESC, CASE WHEN first_seen <= ? THEN last_seen END DESC NULLS LAST, first_seen LIMIT 1`,
		id, formatTime(at), formatTime(at)).Scan(&name)
	if errors.Is(err, sql.ErrNoRows) {
		return "", nil
	}
	if err != nil {
		return "", fmt.Errorf("name of %s: %w", id, err)
	}
	return name, nil
}
