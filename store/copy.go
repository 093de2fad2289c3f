package store

import (
	"context"
	"database/sql"
	"encoding/json"
	"errors"
	"fmt"
)

// CopyReport says what CopyLog copied, and how the copy verified.
type CopyReport struct {
	Rows          int64        `json:"rows"` // chained rows: queries and prune records
	Deliveries    int64        `json:"deliveries"`
	StreamChanges int64        `json:"stream_changes"`
	Digests       int64        `json:"digests"`
	Presses       int64        `json:"presses"`
	Names         int64        `json:"names"`
	Verify        VerifyReport `json:"verify"` // of the copy
}

// CopyLog copies everything recorded in src into dst, SQLite to
// PostgreSQL or back (or between two of a kind): every row of the chain
// with its id, hash and site as they are, the hazard rows and search words
// derived from them, the delivery outcomes, the stream catalogue's history
// of every site, the digests recorded (whose log heads Verify checks), the
// buttons pressed on answers and the names seen for Slack ids.
// The inbox, which is only a process's work in hand, is not copied.
//
// src must verify (with dst's key, if the chain is keyed) and dst must be
// empty: nothing is merged. The copy is one transaction on dst, so a
// failure leaves dst as it was. The report carries dst's verification.
func CopyLog(ctx context.Context, src, dst *DB) (CopyReport, error) {
	var rep CopyReport
	if err := dst.writable("copy the log"); err != nil {
		return rep, err
	}
	var n int64
	if err := dst.r.QueryRowContext(ctx, `SELECT (SELECT count(*) FROM queries) + (SELECT count(*) FROM stream_changes) + (SELECT count(*) FROM digests)`).Scan(&n); err != nil {
		return rep, fmt.Errorf("copy the log: read the target: %w", err)
	}
	if n > 0 {
		return rep, fmt.Errorf("copy the log: %w: the target %s already holds %d rows; copy only into a new, empty log", ErrInvalid, dst.path, n)
	}
	srep, err := src.Verify(ctx)
	if err != nil {
		return rep, fmt.Errorf("copy the log: verify the source: %w", err)
	}
	if !srep.OK {
		return rep, fmt.Errorf("copy the log: %s: %w: %s; nothing was copied", src.path, ErrBrokenChain, srep.Problem)
	}
	in, err := src.readTx(ctx)
	if err != nil {
		return rep, fmt.Errorf("copy the log: %w", err)
	}
	defer in.Rollback()
	out, err := dst.w.BeginTx(ctx, nil)
	if err != nil {
		return rep, fmt.Errorf("copy the log: %w", err)
	}
	defer out.Rollback()
	if err := dst.lockChain(ctx, out); err != nil {
		return rep, fmt.Errorf("copy the log: %w", err)
	}
	for _, step := range []func() error{
		func() error { return copyRows(ctx, src, dst, in, out, &rep) },
		func() error { return copyTable(ctx, src, in, out, &rep.Deliveries, deliveriesCopy) },
		func() error { return copyTable(ctx, src, in, out, &rep.StreamChanges, streamChangesCopy) },
		func() error { return copyTable(ctx, src, in, out, &rep.Digests, digestsCopy) },
		func() error { return copyNames(ctx, src, dst, in, out, &rep) },
	} {
		if err := step(); err != nil {
			return rep, fmt.Errorf("copy the log from %s to %s: %w", src.path, dst.path, err)
		}
	}
	if err := out.Commit(); err != nil {
		return rep, fmt.Errorf("copy the log: commit: %w", err)
	}
	rep.Verify, err = dst.Verify(ctx)
	return rep, err
}

// copyRows copies the chained rows in id order, with their derived rows,
// and carries over the highest id ever issued and the time-order state.
func copyRows(ctx context.Context, src, dst *DB, in, out *sql.Tx, rep *CopyReport) error {
	rows, err := openRows(ctx, in, src.pg, `SELECT `+rowColumns+` FROM queries ORDER BY id`)
	if err != nil {
		return err
	}
	defer rows.Close()
	var lastID int64
	var lastTime string
	broken := false
	for rows.Next() {
		var r row
		if err := rows.Scan(r.scanDest()...); err != nil {
			return err
		}
		if err := dst.insertRow(ctx, out, &r); err != nil {
			return fmt.Errorf("row %d: %w", r.ID, err)
		}
		var hz []Hazard
		if err := json.Unmarshal([]byte(r.Hazards), &hz); err != nil {
			return fmt.Errorf("row %d: stored hazards are not a JSON array: %v", r.ID, err)
		}
		// PostgreSQL's insertRow wrote them; on SQLite of schema
		// hazardBatchVersion and later indexUpTo writes them below.
		if !dst.pg && dst.ver < hazardBatchVersion {
			if err := dst.insertHazards(ctx, out, r.ID, hz); err != nil {
				return fmt.Errorf("row %d: %w", r.ID, err)
			}
		}
		broken = broken || (lastTime != "" && r.Time < lastTime)
		lastID, lastTime = r.ID, r.Time
		rep.Rows++
	}
	if err := rows.Err(); err != nil {
		return err
	}
	seq, err := issuedUpTo(ctx, src, in)
	if err != nil {
		return err
	}
	seq = max(seq, lastID)
	switch {
	case dst.pg:
		_, err = out.ExecContext(ctx, `UPDATE chain_state SET seq = greatest(seq, ?)`, seq)
	case dst.ver >= idsVersion:
		_, err = out.ExecContext(ctx, `UPDATE query_ids SET retired_upto = max(retired_upto, ?)`, seq)
	default:
		_, err = out.ExecContext(ctx, `INSERT INTO sqlite_sequence (name, seq) SELECT 'queries', 0
			WHERE NOT EXISTS (SELECT 1 FROM sqlite_sequence WHERE name = 'queries')`)
		if err == nil {
			_, err = out.ExecContext(ctx, `UPDATE sqlite_sequence SET seq = ? WHERE name = 'queries'`, seq)
		}
	}
	if err != nil {
		return fmt.Errorf("carry over the highest id issued: %w", err)
	}
	if broken && !dst.pg {
		if _, err := dst.ws.timeBroken.exec(ctx, out); err != nil {
			return err
		}
	}
	_, err = dst.indexUpTo(ctx, out, lastID, true)
	return err
}

// issuedUpTo is the highest id src ever issued.
func issuedUpTo(ctx context.Context, src *DB, in *sql.Tx) (int64, error) {
	q := `SELECT max(` + retiredSQL(src.ver) + `, coalesce((SELECT max(id) FROM queries), 0))`
	if src.pg {
		q = `SELECT seq FROM chain_state`
	}
	var seq int64
	err := in.QueryRowContext(ctx, q).Scan(&seq)
	if errors.Is(err, sql.ErrNoRows) {
		return 0, nil
	}
	return seq, err
}

// tableCopy is one table copied row by row with the same columns.
type tableCopy struct {
	name, cols, order string
	dest              func() []any
}

var (
	deliveriesCopy = tableCopy{"deliveries", "query_id, time, ok, detail", "id", func() []any {
		var id int64
		var t, d string
		var ok bool
		return []any{&id, &t, &ok, &d}
	}}
	streamChangesCopy = tableCopy{"stream_changes", "site, tag, action, stream, note, changed_by, time", "id", func() []any {
		v := make([]string, 7)
		return []any{&v[0], &v[1], &v[2], &v[3], &v[4], &v[5], &v[6]}
	}}
	digestsCopy = tableCopy{"digests", "site, slot, since, claimed_at, status, attempts, detail, body", "site, slot", func() []any {
		v := make([]string, 7)
		var n int64
		return []any{&v[0], &v[1], &v[2], &v[3], &v[4], &n, &v[5], &v[6]}
	}}
	pressesCopy = tableCopy{"presses", "query_id, time, action, user_id, user_name, channel, transport, press_key", "id", func() []any {
		var id int64
		v := make([]string, 7)
		return []any{&id, &v[0], &v[1], &v[2], &v[3], &v[4], &v[5], &v[6]}
	}}
	namesCopy = tableCopy{"names", "slack_id, name, first_seen, last_seen", "slack_id, name", func() []any {
		v := make([]string, 4)
		return []any{&v[0], &v[1], &v[2], &v[3]}
	}}
)

// copyNames copies the presses and the names seen, when src has them.
func copyNames(ctx context.Context, src, dst *DB, in, out *sql.Tx, rep *CopyReport) error {
	if !src.hasNames() {
		return nil
	}
	if !dst.hasNames() {
		return fmt.Errorf("the target's schema has no presses or names; upgrade it first")
	}
	if err := copyTable(ctx, src, in, out, &rep.Presses, pressesCopy); err != nil {
		return err
	}
	return copyTable(ctx, src, in, out, &rep.Names, namesCopy)
}

func copyTable(ctx context.Context, src *DB, in, out *sql.Tx, count *int64, tc tableCopy) error {
	rows, err := openRows(ctx, in, src.pg, `SELECT `+tc.cols+` FROM `+tc.name+` ORDER BY `+tc.order)
	if err != nil {
		return fmt.Errorf("%s: %w", tc.name, err)
	}
	defer rows.Close()
	dest := tc.dest()
	marks := "?"
	for i := 1; i < len(dest); i++ {
		marks += ", ?"
	}
	ins := `INSERT INTO ` + tc.name + ` (` + tc.cols + `) VALUES (` + marks + `)`
	vals := make([]any, len(dest))
	for rows.Next() {
		if err := rows.Scan(dest...); err != nil {
			return fmt.Errorf("%s: %w", tc.name, err)
		}
		for i, d := range dest {
			switch p := d.(type) {
			case *string:
				vals[i] = *p
			case *int64:
				vals[i] = *p
			case *bool:
				vals[i] = *p
			}
		}
		if _, err := out.ExecContext(ctx, ins, vals...); err != nil {
			return fmt.Errorf("%s: %w", tc.name, err)
		}
		*count++
	}
	return rows.Err()
}
