package store

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"os"

	"github.com/mattn/go-sqlite3"
)

// ErrBrokenChain is returned by Restore when the file to restore fails
// verification.
var ErrBrokenChain = errors.New("hash chain is broken")

// Backup writes a consistent copy of the live database to dest with
// SQLite's online backup API, while queries go on being logged. dest must
// not exist. Check the copy with VerifyFile.
func (db *DB) Backup(ctx context.Context, dest string) error {
	if dest == "" {
		return fmt.Errorf("backup: %w: no destination file", ErrInvalid)
	}
	if _, err := os.Stat(dest); err == nil {
		return fmt.Errorf("backup: %s already exists; choose a new file name (backups never overwrite)", dest)
	} else if !errors.Is(err, os.ErrNotExist) {
		return fmt.Errorf("backup: %w", err)
	}
	out, err := sql.Open("sqlite3", dsn(dest))
	if err != nil {
		return fmt.Errorf("backup to %s: %w", dest, err)
	}
	defer out.Close()
	if err := copyDB(ctx, out, db.r); err != nil {
		os.Remove(dest)
		return fmt.Errorf("backup to %s: %w", dest, err)
	}
	if err := out.Close(); err != nil {
		return fmt.Errorf("backup to %s: %w", dest, err)
	}
	return nil
}

// copyDB copies every page of src's main database into dst's, in one step
// (so the copy is one snapshot).
func copyDB(ctx context.Context, dst, src *sql.DB) error {
	dc, err := dst.Conn(ctx)
	if err != nil {
		return err
	}
	defer dc.Close()
	sc, err := src.Conn(ctx)
	if err != nil {
		return err
	}
	defer sc.Close()
	return dc.Raw(func(d any) error {
		return sc.Raw(func(s any) error {
			dconn, ok1 := d.(*sqlite3.SQLiteConn)
			sconn, ok2 := s.(*sqlite3.SQLiteConn)
			if !ok1 || !ok2 {
				return fmt.Errorf("not a go-sqlite3 connection")
			}
			bk, err := dconn.Backup("main", sconn, "main")
			if err != nil {
				return err
			}
			if _, err := bk.Step(-1); err != nil {
				bk.Finish()
				return err
			}
			return bk.Finish()
		})
	})
}

// openReadOnly opens path for reading only, without creating it or
// changing its schema.
func openReadOnly(ctx context.Context, path string) (*sql.DB, error) {
	if _, err := os.Stat(path); err != nil {
		return nil, fmt.Errorf("open %s: %w", path, err)
	}
	r, err := sql.Open("sqlite3", dsn(path, "mode=ro", "_query_only=1"))
	if err != nil {
		return nil, fmt.Errorf("open %s: %w", path, err)
	}
	if err := r.PingContext(ctx); err != nil {
		r.Close()
		return nil, fmt.Errorf("open %s: %w", path, err)
	}
	var v int
	if err := r.QueryRowContext(ctx, `SELECT coalesce(max(version), 0) FROM schema_version`).Scan(&v); err != nil {
		r.Close()
		return nil, fmt.Errorf("open %s: not a mixward database (%v)", path, err)
	}
	if v > len(migrations) {
		r.Close()
		return nil, fmt.Errorf("open %s: %w: the file has schema version %d, this mixward knows up to %d",
			path, ErrSchemaTooNew, v, len(migrations))
	}
	return r, nil
}

// VerifyFile verifies the hash chain of the database file at path (a
// backup, say) without changing it.
func VerifyFile(ctx context.Context, path string) (VerifyReport, error) {
	r, err := openReadOnly(ctx, path)
	if err != nil {
		return VerifyReport{}, fmt.Errorf("verify: %w", err)
	}
	defer r.Close()
	tx, err := r.BeginTx(ctx, &sql.TxOptions{ReadOnly: true})
	if err != nil {
		return VerifyReport{}, fmt.Errorf("verify %s: %w", path, err)
	}
	defer tx.Rollback()
	return verifyTx(ctx, tx)
}

// Restore replaces the whole content of the open database with the
// database file src (a backup), after checking that src's chain verifies.
// A backup from an older release is migrated. It returns the verification
// of the restored database.
func (db *DB) Restore(ctx context.Context, src string) (VerifyReport, error) {
	rep, err := VerifyFile(ctx, src)
	if err != nil {
		return rep, fmt.Errorf("restore: %w", err)
	}
	if !rep.OK {
		return rep, fmt.Errorf("restore: %s: %w: %s; nothing was restored", src, ErrBrokenChain, rep.Problem)
	}
	in, err := openReadOnly(ctx, src)
	if err != nil {
		return rep, fmt.Errorf("restore: %w", err)
	}
	defer in.Close()
	if err := copyDB(ctx, db.w, in); err != nil {
		return rep, fmt.Errorf("restore from %s: %w", src, err)
	}
	if err := db.migrate(ctx, len(migrations)); err != nil {
		return rep, fmt.Errorf("restore from %s: %w", src, err)
	}
	rep, err = db.Verify(ctx)
	if err != nil {
		return rep, fmt.Errorf("restore from %s: %w", src, err)
	}
	return rep, nil
}

// Count returns the number of logged queries (prune records excluded).
func (db *DB) Count(ctx context.Context) (int64, error) {
	var n int64
	err := db.r.QueryRowContext(ctx, `SELECT count(*) FROM queries WHERE kind = 'query'`).Scan(&n)
	if err != nil {
		return 0, fmt.Errorf("count queries: %w", err)
	}
	return n, nil
}
