package store

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"os"
	"path/filepath"

	"golang.org/x/sys/unix"
)

// OpenReadOnly opens the existing database file at path for reading only.
// It never creates the file, never migrates it and never writes to it: the
// tools that only read (verify, search, show, export, digest) use it, so
// that a mistyped path is an error instead of a new empty log, and an
// older file is not rewritten. It works in a directory the process may
// not write to.
//
// A file of an older schema version is refused with ErrSchemaTooOld
// (naming the command that upgrades it), unless opt.OlderSchema is set, in
// which case only Verify may be used on it. A newer one is refused with
// ErrSchemaTooNew. Writing methods return ErrReadOnly.
func OpenReadOnly(ctx context.Context, path string, opt Options) (*DB, error) {
	if path == "" {
		return nil, fmt.Errorf("open database: %w: empty path (set --db or MIXWARD_DB)", ErrInvalid)
	}
	if _, err := NormalizeSite(opt.Site); err != nil {
		return nil, fmt.Errorf("open database: %w (MIXWARD_SITE or --site)", err)
	}
	if IsPostgres(path) {
		return openPostgres(ctx, path, opt, true, 0)
	}
	st, err := os.Stat(path)
	if errors.Is(err, os.ErrNotExist) {
		return nil, fmt.Errorf("open database %s: %w: nothing exists at that path (check --db or MIXWARD_DB; this command never creates a log)", path, ErrNoDatabase)
	}
	if err != nil {
		return nil, fmt.Errorf("open database %s: %w", path, err)
	}
	if st.IsDir() {
		return nil, fmt.Errorf("open database %s: %w: it is a directory; give the database file", path, ErrInvalid)
	}
	db := newDB(path, opt)
	db.ro = true
	db.r, err = sql.Open("sqlite3", readOnlyDSN(path, dirWritable))
	if err != nil {
		return nil, fmt.Errorf("open database %s: %w", path, err)
	}
	db.r.SetMaxOpenConns(4)
	v, err := fileVersion(ctx, db.r, path, len(migrations))
	if err != nil {
		db.r.Close()
		return nil, err
	}
	db.ver = v
	if v < len(migrations) && !opt.OlderSchema {
		db.r.Close()
		return nil, fmt.Errorf("open database %s: %w: the file has schema version %d, this mixward reads version %d; "+
			"upgrade it with 'mixward log migrate --db %s' (it changes the file: back it up first), or read it with the mixward release that wrote it",
			path, ErrSchemaTooOld, v, len(migrations), path)
	}
	return db, nil
}

// readOnlyDSN opens path with mode=ro, which needs the WAL and
// shared-memory files beside it (SQLite creates them if missing). In a
// directory the process cannot write to, with no WAL file present, no
// writer can be active (a writer needs the WAL file), so the file is opened
// immutable, which creates nothing.
func readOnlyDSN(path string, writable func(dir string) bool) string {
	if _, err := os.Stat(path + "-wal"); err != nil && !writable(filepath.Dir(path)) {
		return dsn(path, "mode=ro", "immutable=1", "_txlock=deferred")
	}
	return dsn(path, "mode=ro", "_txlock=deferred")
}

func dirWritable(dir string) bool { return unix.Access(dir, unix.W_OK) == nil }

// fileVersion reads the schema version of an open file and refuses files
// that are not mixward databases or are newer than this binary.
func fileVersion(ctx context.Context, r *sql.DB, path string, known int) (int, error) {
	var v int
	err := r.QueryRowContext(ctx, `SELECT coalesce(max(version), 0) FROM schema_version`).Scan(&v)
	if err != nil {
		return 0, fmt.Errorf("open %s: not a mixward database (%v)", path, err)
	}
	if v > known {
		return 0, fmt.Errorf("open %s: %w: the file has schema version %d, this mixward knows up to %d",
			path, ErrSchemaTooNew, v, known)
	}
	return v, nil
}

// writable returns ErrReadOnly for a DB opened read-only.
func (db *DB) writable(op string) error {
	if db.ro {
		return fmt.Errorf("%s: %w (%s)", op, ErrReadOnly, db.path)
	}
	return nil
}

// ReadOnly reports whether db was opened by OpenReadOnly.
func (db *DB) ReadOnly() bool { return db.ro }
