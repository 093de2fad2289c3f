package store

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"strings"
	"time"
	"unicode/utf8"
)

// Stream is the current definition of a site stream tag.
type Stream struct {
	Tag     string    `json:"tag"`    // upper case, e.g. T-101
	Stream  string    `json:"stream"` // stream text in the request language
	Note    string    `json:"note"`
	By      string    `json:"changed_by"`
	Time    time.Time `json:"changed_at"` // UTC
	Version int       `json:"version"`    // number of times the tag was set
}

// StreamChange is one entry in a tag's history.
type StreamChange struct {
	ID     int64     `json:"id"`
	Tag    string    `json:"tag"`
	Action string    `json:"action"` // "set" or "remove"
	Stream string    `json:"stream"` // "" for remove
	Note   string    `json:"note"`
	By     string    `json:"changed_by"`
	Time   time.Time `json:"changed_at"`
}

// Limits on catalogue text.
const (
	maxTagLen    = 32
	maxStreamLen = 500
	maxNoteLen   = 500
)

// NormalizeTag checks that tag is a stream tag (1–32 ASCII letters, digits,
// '-' or '_', starting with a letter or digit) and returns it in upper
// case. Tags are case-insensitive.
func NormalizeTag(tag string) (string, error) {
	if tag == "" {
		return "", fmt.Errorf("%w: empty stream tag", ErrInvalid)
	}
	if len(tag) > maxTagLen {
		return "", fmt.Errorf("%w: stream tag %.40q is longer than %d characters", ErrInvalid, tag, maxTagLen)
	}
	for i, c := range tag {
		ok := c >= 'A' && c <= 'Z' || c >= 'a' && c <= 'z' || c >= '0' && c <= '9' || (i > 0 && (c == '-' || c == '_'))
		if !ok {
			return "", fmt.Errorf("%w: stream tag %q: character %q at position %d is not allowed "+
				"(use letters, digits, '-' and '_', starting with a letter or digit, like T-101)", ErrInvalid, tag, c, i+1)
		}
	}
	return strings.ToUpper(tag), nil
}

func checkText(what, s string, maxLen int, required bool) (string, error) {
	s = strings.TrimSpace(clean(s))
	if required && s == "" {
		return "", fmt.Errorf("%w: empty %s", ErrInvalid, what)
	}
	if strings.ContainsAny(s, "\r\n") {
		return "", fmt.Errorf("%w: %s must be one line", ErrInvalid, what)
	}
	if utf8.RuneCountInString(s) > maxLen {
		return "", fmt.Errorf("%w: %s is longer than %d characters", ErrInvalid, what, maxLen)
	}
	return s, nil
}

// SetStream defines (or redefines) tag as stream, recording who did it and
// when. Earlier definitions are kept in the history. The caller checks that
// stream parses in the request language; the store cannot.
func (db *DB) SetStream(ctx context.Context, tag, stream, note, by string) error {
	t, err := NormalizeTag(tag)
	if err != nil {
		return fmt.Errorf("set stream: %w", err)
	}
	if stream, err = checkText("stream text", stream, maxStreamLen, true); err != nil {
		return fmt.Errorf("set stream %s: %w", t, err)
	}
	if note, err = checkText("note", note, maxNoteLen, false); err != nil {
		return fmt.Errorf("set stream %s: %w", t, err)
	}
	if by, err = checkText("changed-by name", by, 200, true); err != nil {
		return fmt.Errorf("set stream %s: %w", t, err)
	}
	if err := db.writable("set stream " + t); err != nil {
		return err
	}
	tx, err := db.w.BeginTx(ctx, nil)
	if err != nil {
		return fmt.Errorf("set stream %s: %w", t, err)
	}
	defer tx.Rollback()
	if _, err := tx.ExecContext(ctx, `INSERT INTO stream_changes (site, tag, action, stream, note, changed_by, time)
		VALUES (?, ?, 'set', ?, ?, ?, ?)`, db.site, t, stream, note, by, formatTime(db.now())); err != nil {
		return fmt.Errorf("set stream %s: %w", t, err)
	}
	if err := tx.Commit(); err != nil {
		return fmt.Errorf("set stream %s: %w", t, err)
	}
	return nil
}

// RemoveStream removes tag from the catalogue (its history is kept). It
// returns ErrNotFound if the tag is not defined.
func (db *DB) RemoveStream(ctx context.Context, tag, by string) error {
	t, err := NormalizeTag(tag)
	if err != nil {
		return fmt.Errorf("remove stream: %w", err)
	}
	if by, err = checkText("changed-by name", by, 200, true); err != nil {
		return fmt.Errorf("remove stream %s: %w", t, err)
	}
	if err := db.writable("remove stream " + t); err != nil {
		return err
	}
	tx, err := db.w.BeginTx(ctx, nil)
	if err != nil {
		return fmt.Errorf("remove stream %s: %w", t, err)
	}
	defer tx.Rollback()
	if _, err := currentStream(ctx, tx, db.site, t); err != nil {
		return fmt.Errorf("remove stream: %w", err)
	}
	if _, err := tx.ExecContext(ctx, `INSERT INTO stream_changes (site, tag, action, stream, note, changed_by, time)
		VALUES (?, ?, 'remove', '', '', ?, ?)`, db.site, t, by, formatTime(db.now())); err != nil {
		return fmt.Errorf("remove stream %s: %w", t, err)
	}
	if err := tx.Commit(); err != nil {
		return fmt.Errorf("remove stream %s: %w", t, err)
	}
	return nil
}

// Stream returns the current definition of tag, or ErrNotFound.
func (db *DB) Stream(ctx context.Context, tag string) (Stream, error) {
	t, err := NormalizeTag(tag)
	if err != nil {
		return Stream{}, fmt.Errorf("stream: %w", err)
	}
	tx, err := db.readTx(ctx)
	if err != nil {
		return Stream{}, fmt.Errorf("stream %s: %w", t, err)
	}
	defer tx.Rollback()
	return currentStream(ctx, tx, db.site, t)
}

// currentStreamsSQL selects the newest change of each tag of one site (the
// parameter) and how many times each was set. Tags are the site's own:
// T-101 at one site is not T-101 at another.
const currentStreamsSQL = `
SELECT c.tag, c.action, c.stream, c.note, c.changed_by, c.time,
       (SELECT count(*) FROM stream_changes s WHERE s.site = c.site AND s.tag = c.tag AND s.action = 'set')
  FROM stream_changes c
 WHERE c.site = ? AND c.id = (SELECT max(id) FROM stream_changes m WHERE m.site = c.site AND m.tag = c.tag)`

func currentStream(ctx context.Context, tx *sql.Tx, site, tag string) (Stream, error) {
	s, action, err := scanStream(tx.QueryRowContext(ctx, currentStreamsSQL+` AND c.tag = ?`, site, tag))
	if errors.Is(err, sql.ErrNoRows) || (err == nil && action == "remove") {
		return Stream{}, fmt.Errorf("stream tag %s: %w", tag, ErrNotFound)
	}
	if err != nil {
		return Stream{}, fmt.Errorf("stream %s: %w", tag, err)
	}
	return s, nil
}

type scanner interface{ Scan(...any) error }

func scanStream(sc scanner) (Stream, string, error) {
	var s Stream
	var action, ts string
	if err := sc.Scan(&s.Tag, &action, &s.Stream, &s.Note, &s.By, &ts, &s.Version); err != nil {
		return s, "", err
	}
	t, err := parseTime(ts)
	s.Time = t
	return s, action, err
}

// Streams lists the current catalogue, by tag.
func (db *DB) Streams(ctx context.Context) ([]Stream, error) {
	rows, err := db.r.QueryContext(ctx, currentStreamsSQL+` AND c.action = 'set' ORDER BY c.tag`, db.site)
	if err != nil {
		return nil, fmt.Errorf("list streams: %w", err)
	}
	defer rows.Close()
	out := []Stream{}
	for rows.Next() {
		s, _, err := scanStream(rows)
		if err != nil {
			return nil, fmt.Errorf("list streams: %w", err)
		}
		out = append(out, s)
	}
	return out, rows.Err()
}

// StreamHistory lists every change of tag, oldest first, including removed
// tags. It returns ErrNotFound if the tag was never defined.
func (db *DB) StreamHistory(ctx context.Context, tag string) ([]StreamChange, error) {
	t, err := NormalizeTag(tag)
	if err != nil {
		return nil, fmt.Errorf("stream history: %w", err)
	}
	rows, err := db.r.QueryContext(ctx, `SELECT id, tag, action, stream, note, changed_by, time
		FROM stream_changes WHERE site = ? AND tag = ? ORDER BY id`, db.site, t)
	if err != nil {
		return nil, fmt.Errorf("stream history %s: %w", t, err)
	}
	defer rows.Close()
	var out []StreamChange
	for rows.Next() {
		var c StreamChange
		var ts string
		if err := rows.Scan(&c.ID, &c.Tag, &c.Action, &c.Stream, &c.Note, &c.By, &ts); err != nil {
			return nil, fmt.Errorf("stream history %s: %w", t, err)
		}
		if c.Time, err = parseTime(ts); err != nil {
			return nil, err
		}
		out = append(out, c)
	}
	if err := rows.Err(); err != nil {
		return nil, fmt.Errorf("stream history %s: %w", t, err)
	}
	if len(out) == 0 {
		return nil, fmt.Errorf("stream tag %s: %w", t, ErrNotFound)
	}
	return out, nil
}

// StreamMap returns the current catalogue as tag → stream text, for
// resolving tags in requests (look up with NormalizeTag(tag)).
func (db *DB) StreamMap(ctx context.Context) (map[string]string, error) {
	ss, err := db.Streams(ctx)
	if err != nil {
		return nil, err
	}
	m := make(map[string]string, len(ss))
	for _, s := range ss {
		m[s.Tag] = s.Stream
	}
	return m, nil
}
