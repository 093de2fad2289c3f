package store

import (
	"context"
	"database/sql"
	"embed"
	"errors"
	"fmt"
	"io/fs"
	"path"
	"sort"
	"strconv"
	"strings"
)

//go:embed migrations/*.sql
var migrationFS embed.FS

//go:embed pgmigrations/*.sql
var pgMigrationFS embed.FS

// migration is one schema step; version n is migrations[n-1].
type migration struct {
	version int
	name    string
	sql     string
}

// migrations are the embedded schema steps in order. Their file names are
// NNNN_name.sql with NNNN = 1, 2, 3 … without gaps.
var migrations = loadMigrations(migrationFS, "migrations")

// pgMigrations are PostgreSQL's schema steps, in the same scheme, in
// pgmigrations/.
var pgMigrations = loadMigrations(pgMigrationFS, "pgmigrations")

func loadMigrations(fsys embed.FS, dir string) []migration {
	names, err := fs.Glob(fsys, dir+"/*.sql")
	if err != nil {
		panic("store: " + err.Error())
	}
	sort.Strings(names)
	var ms []migration
	for i, n := range names {
		base := path.Base(n)
		num, _, ok := strings.Cut(base, "_")
		v, err := strconv.Atoi(num)
		if !ok || err != nil || v != i+1 {
			panic(fmt.Sprintf("store: migration %s: want version %d as NNNN_name.sql", base, i+1))
		}
		b, err := fsys.ReadFile(n)
		if err != nil {
			panic("store: " + err.Error())
		}
		ms = append(ms, migration{version: v, name: strings.TrimSuffix(base, ".sql"), sql: string(b)})
	}
	return ms
}

// SchemaVersion is the newest schema version this binary knows.
func SchemaVersion() int { return len(migrations) }

// migrate brings the file up to version upto, one transaction per step.
// Each step re-reads the version under the write lock, so two processes
// opening the same new file do not apply a step twice.
func (db *DB) migrate(ctx context.Context, upto int) error {
	if db.pg {
		// Two replicas starting at once: one migrates, the other waits.
		conn, err := db.w.Conn(ctx)
		if err != nil {
			return fmt.Errorf("open database %s: %w", db.path, err)
		}
		defer conn.Close()
		const key = `hashtextextended('mixward migrate ' || current_schema(), 0)`
		if _, err := conn.ExecContext(ctx, `SELECT pg_advisory_lock(`+key+`)`); err != nil {
			return fmt.Errorf("open database %s: lock for migrations: %w", db.path, err)
		}
		defer conn.ExecContext(context.Background(), `SELECT pg_advisory_unlock(`+key+`)`)
	}
	if _, err := db.w.ExecContext(ctx, `CREATE TABLE IF NOT EXISTS schema_version (
		version    INTEGER PRIMARY KEY,
		name       TEXT NOT NULL,
		applied_at TEXT NOT NULL)`); err != nil {
		return fmt.Errorf("open database %s: create version table: %w", db.path, err)
	}
	for {
		done, err := db.migrateStep(ctx, upto)
		if err != nil || done {
			return err
		}
	}
}

// rebuildVersions are the SQLite steps that rebuild a table others refer
// to: foreign_key_check runs before their commit.
var rebuildVersions = map[int]bool{idsVersion: true}

// migrateStep applies the next step in its own transaction. On SQLite the
// step runs with foreign keys off (they cannot be switched inside a
// transaction): a step that rebuilds a table drops the old one, and with
// foreign keys on that would first delete the rows referring to it
// (ON DELETE CASCADE). This is SQLite's own procedure for schema changes
// (sqlite.org/lang_altertable.html, "Making Other Kinds Of Table Schema
// Changes"), foreign_key_check included.
func (db *DB) migrateStep(ctx context.Context, upto int) (done bool, err error) {
	begin := db.w.BeginTx
	if !db.pg {
		conn, err := db.w.Conn(ctx)
		if err != nil {
			return false, fmt.Errorf("open database %s: %w", db.path, err)
		}
		defer conn.Close()
		if _, err := conn.ExecContext(ctx, `PRAGMA foreign_keys = OFF`); err != nil {
			return false, fmt.Errorf("open database %s: %w", db.path, err)
		}
		defer conn.ExecContext(context.Background(), `PRAGMA foreign_keys = ON`)
		begin = conn.BeginTx
	}
	tx, err := begin(ctx, nil)
	if err != nil {
		return false, fmt.Errorf("open database %s: %w", db.path, err)
	}
	defer tx.Rollback()
	var cur int
	if err := tx.QueryRowContext(ctx, `SELECT coalesce(max(version), 0) FROM schema_version`).Scan(&cur); err != nil {
		return false, fmt.Errorf("open database %s: read schema version: %w", db.path, err)
	}
	ms := db.migrations()
	if cur > len(ms) {
		return false, fmt.Errorf("open database %s: %w: the file has schema version %d, this mixward knows up to %d; "+
			"use the mixward release that wrote it (or a newer one), or restore a backup made by this release",
			db.path, ErrSchemaTooNew, cur, len(ms))
	}
	if cur >= upto {
		return true, nil
	}
	m := ms[cur]
	if _, err := tx.ExecContext(ctx, m.sql); err != nil {
		return false, fmt.Errorf("open database %s: apply migration %s: %w", db.path, m.name, err)
	}
	if !db.pg && rebuildVersions[m.version] {
		if err := foreignKeyCheck(ctx, tx); err != nil {
			return false, fmt.Errorf("open database %s: apply migration %s: %w", db.path, m.name, err)
		}
	}
	if _, err := tx.ExecContext(ctx, `INSERT INTO schema_version (version, name, applied_at) VALUES (?, ?, ?)`,
		m.version, m.name, formatTime(db.now())); err != nil {
		return false, fmt.Errorf("open database %s: record migration %s: %w", db.path, m.name, err)
	}
	if err := tx.Commit(); err != nil {
		return false, fmt.Errorf("open database %s: commit migration %s: %w", db.path, m.name, err)
	}
	return false, nil
}

// foreignKeyCheck reports the first row whose reference has no parent.
func foreignKeyCheck(ctx context.Context, tx *sql.Tx) error {
	var table, parent string
	var rowid sql.NullInt64
	var fk int
	err := tx.QueryRowContext(ctx, `PRAGMA foreign_key_check`).Scan(&table, &rowid, &parent, &fk)
	switch {
	case errors.Is(err, sql.ErrNoRows):
		return nil
	case err != nil:
		return fmt.Errorf("check references: %w", err)
	}
	return fmt.Errorf("row %d of %s refers to a missing row of %s: restore a backup and report this", rowid.Int64, table, parent)
}

// migrations returns the schema steps of db's backend.
func (db *DB) migrations() []migration {
	if db.pg {
		return pgMigrations
	}
	return migrations
}

// Version reports the schema version of the open file.
func (db *DB) Version(ctx context.Context) (int, error) {
	var v int
	err := db.r.QueryRowContext(ctx, `SELECT coalesce(max(version), 0) FROM schema_version`).Scan(&v)
	return v, err
}
