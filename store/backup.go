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
	if db.pg {
		return fmt.Errorf("backup: %w: the log is in PostgreSQL; back it up with pg_dump, or copy it into a SQLite file with 'mixward log copy --from %s --to FILE'", ErrInvalid, db.path)
	}
	if _, err := os.Stat(dest); err == nil {
		return fmt.Errorf("backup: %s already exists; choose a new file name (backups never overwrite)", dest)
	} else if !errors.Is(err, os.ErrNotExist) {
		return fmt.Errorf("backup: %w", err)
	}
	// Create the file first, private to the owner and only if it is new.
	f, err := os.OpenFile(dest, os.O_RDWR|os.O_CREATE|os.O_EXCL, 0o600)
	if err != nil {
		return fmt.Errorf("backup: %w (backups never overwrite; choose a new file name)", err)
	}
	f.Close()
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

// VerifyFile verifies the hash chain of the database file at path (a
// backup, say) without changing it, with no key and no anchors. A file of
// an older schema is read as it is.
func VerifyFile(ctx context.Context, path string) (VerifyReport, error) {
	return VerifyFileWith(ctx, path, nil)
}

// VerifyFileWith is VerifyFile checking keyed rows with key (nil: none)
// and the anchors given.
func VerifyFileWith(ctx context.Context, path string, key *ChainKey, anchors ...Anchor) (VerifyReport, error) {
	db, err := OpenReadOnly(ctx, path, Options{ChainKey: key, OlderSchema: true})
	if err != nil {
		return VerifyReport{}, fmt.Errorf("verify: %w", err)
	}
	defer db.Close()
	return db.Verify(ctx, anchors...)
}

// Restore replaces the whole content of the open database with the
// database file src (a backup), after checking that src's chain verifies.
// A backup from an older release is migrated. It returns the verification
// of the restored database.
func (db *DB) Restore(ctx context.Context, src string) (VerifyReport, error) {
	if err := db.writable("restore"); err != nil {
		return VerifyReport{}, err
	}
	if db.pg {
		return VerifyReport{}, fmt.Errorf("restore: %w: the log is in PostgreSQL; restore it with pg_restore, or copy a SQLite backup in with 'mixward log copy --from FILE --to URL'", ErrInvalid)
	}
	rep, err := VerifyFileWith(ctx, src, db.key)
	if err != nil {
		return rep, fmt.Errorf("restore: %w", err)
	}
	if !rep.OK {
		return rep, fmt.Errorf("restore: %s: %w: %s; nothing was restored", src, ErrBrokenChain, rep.Problem)
	}
	in, err := OpenReadOnly(ctx, src, Options{OlderSchema: true})
	if err != nil {
		return rep, fmt.Errorf("restore: %w", err)
	}
	defer in.Close()
	if err := copyDB(ctx, db.w, in.r); err != nil {
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
