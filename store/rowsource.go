package store

import (
	"context"
	"database/sql"
	"fmt"
	"sync/atomic"
)

// rowSource is a result read row by row: *sql.Rows, or on PostgreSQL a
// server-side cursor read in batches (fetchRows). Verify walks the chain
// and the derived tables side by side in one transaction; a PostgreSQL
// connection can stream only one result at a time, so each batch there is
// read whole before the next statement runs.
type rowSource interface {
	Next() bool
	Scan(dest ...any) error
	Err() error
	Close() error
}

// openRows runs q in tx: streamed on SQLite, through a cursor on
// PostgreSQL.
func openRows(ctx context.Context, tx queryer, pg bool, q string, args ...any) (rowSource, error) {
	if !pg {
		return tx.QueryContext(ctx, q, args...)
	}
	name := fmt.Sprintf("mixward_cursor_%d", cursorSeq.Add(1))
	if _, err := tx.ExecContext(ctx, `DECLARE `+name+` NO SCROLL CURSOR FOR `+q, args...); err != nil {
		return nil, err
	}
	return &fetchRows{ctx: ctx, tx: tx, name: name}, nil
}

var cursorSeq atomic.Int64

// fetchBatch is how many rows one FETCH reads.
const fetchBatch = 2000

type fetchRows struct {
	ctx  context.Context
	tx   queryer
	name string
	buf  [][]any
	cur  []any
	done bool
	err  error
}

func (f *fetchRows) Next() bool {
	if len(f.buf) == 0 && !f.done && f.err == nil {
		f.fill()
	}
	if len(f.buf) == 0 {
		return false
	}
	f.cur, f.buf = f.buf[0], f.buf[1:]
	return true
}

func (f *fetchRows) fill() {
	rows, err := f.tx.QueryContext(f.ctx, fmt.Sprintf(`FETCH %d FROM %s`, fetchBatch, f.name))
	if err != nil {
		f.err = err
		return
	}
	defer rows.Close()
	cols, err := rows.Columns()
	if err != nil {
		f.err = err
		return
	}
	n := 0
	for rows.Next() {
		vals := make([]any, len(cols))
		ptrs := make([]any, len(cols))
		for i := range vals {
			ptrs[i] = &vals[i]
		}
		if err := rows.Scan(ptrs...); err != nil {
			f.err = err
			return
		}
		f.buf = append(f.buf, vals)
		n++
	}
	f.err = rows.Err()
	f.done = n < fetchBatch
}

func (f *fetchRows) Scan(dest ...any) error {
	if len(dest) != len(f.cur) {
		return fmt.Errorf("scan: %d destinations for %d columns", len(dest), len(f.cur))
	}
	for i, d := range dest {
		if err := assign(d, f.cur[i]); err != nil {
			return fmt.Errorf("scan column %d: %w", i+1, err)
		}
	}
	return nil
}

// assign stores a driver value in dest with database/sql's conversions
// (through its Null types, which implement them).
func assign(dest, v any) error {
	switch d := dest.(type) {
	case sql.Scanner:
		return d.Scan(v)
	case *string:
		var n sql.NullString
		err := n.Scan(v)
		*d = n.String
		return err
	case *int64:
		var n sql.NullInt64
		err := n.Scan(v)
		*d = n.Int64
		return err
	case *int:
		var n sql.NullInt64
		err := n.Scan(v)
		*d = int(n.Int64)
		return err
	case *bool:
		var n sql.NullBool
		err := n.Scan(v)
		*d = n.Bool
		return err
	case *float64:
		var n sql.NullFloat64
		err := n.Scan(v)
		*d = n.Float64
		return err
	}
	return fmt.Errorf("unsupported destination %T", dest)
}

func (f *fetchRows) Err() error { return f.err }

func (f *fetchRows) Close() error {
	_, err := f.tx.ExecContext(context.Background(), `CLOSE `+f.name)
	return err
}
