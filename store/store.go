// Package store keeps mixward's query log, site stream catalogue and digest
// records in one SQLite file (github.com/mattn/go-sqlite3), or in a
// PostgreSQL database (github.com/jackc/pgx/v5) shared by several replicas
// (see postgres.go).
//
// Every answer the bot gives is a safety record: LogQuery writes it in one
// transaction, chained by SHA-256 to the row before it, before the answer is
// sent. Verify walks the chain. The file runs in WAL mode with a busy
// timeout, so an acknowledged row survives a crash of the process
// (Options.FullSync makes it survive power loss too). The schema is created and upgraded by
// ordered migrations embedded in the binary; an older binary refuses a file
// whose schema is newer than it knows.
//
// Two connection pools are kept: one writer (a single connection whose
// transactions begin IMMEDIATE, so writers queue instead of deadlocking) and
// a small read-only pool for search, export and digests. OpenReadOnly opens
// only the read-only pool, for tools that must not change the file.
//
// Files are created with mode 0600 (the database, and so its WAL and
// shared-memory files, which SQLite gives the database file's mode).
package store

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"os"
	"strings"
	"sync"
	"time"

	"github.com/mattn/go-sqlite3"
)

// Options tune Open.
type Options struct {
	// Now is the clock; nil means time.Now. Times are stored in UTC.
	Now func() time.Time
	// Location is the site time zone used when rendering (digests); nil means UTC.
	Location *time.Location
	// FullSync makes every commit wait for the disk (synchronous=FULL), so
	// a logged query survives a power cut as well as a crash of the
	// process, at roughly half the write rate. By default (WAL with
	// synchronous=NORMAL) a logged query survives the process being
	// killed; a power cut or kernel crash may lose the last commits before
	// it, but never corrupts the file or the chain.
	FullSync bool
	// ChainKey, when set, makes every new row of the log keyed
	// (HMAC-SHA256) and lets Verify check keyed rows. A log whose newest
	// row is keyed cannot be opened for writing without its key.
	ChainKey *ChainKey
	// OlderSchema lets OpenReadOnly read a file of an older schema version
	// as it is; only Verify may then be used on it.
	OlderSchema bool
	// Pool tunes the connection pool of a PostgreSQL database.
	Pool Pool
	// Site is the site this process serves: the stream catalogue it
	// resolves tags in, the site its queries are logged under and its
	// digests cover. "" means DefaultSite.
	Site string
	// Replica names this process among several sharing one database (the
	// owner of inbox leases); "" means host name and process id.
	Replica string
	// InboxLease, when positive, makes each pending inbox entry belong to
	// the replica that accepted or swept it for this long: another
	// replica's PendingMessages skips it until the lease runs out. Zero
	// (the default for SQLite) lists every pending entry.
	InboxLease time.Duration
}

// DB is an open mixward database. It is safe for concurrent use.
type DB struct {
	path string
	w    *sql.DB // writer: one connection, BEGIN IMMEDIATE
	r    *sql.DB // readers: mode=ro (temporary tables allowed)
	ws   *writeStmts
	ver  int // schema version applied by Open (as found, for OpenReadOnly), in SQLite's numbering
	pgv  int // PostgreSQL: the schema version in pgmigrations' numbering
	now  func() time.Time
	loc  *time.Location
	key  *ChainKey
	ro   bool // opened by OpenReadOnly: w is nil (SQLite) or refuses writes (PostgreSQL)
	pg   bool // PostgreSQL: w and r are one pool

	replica string
	lease   time.Duration
	site    string

	headMu sync.Mutex
	head   chainHead // SQLite: the newest row this process wrote (head.go)
}

// Sentinel errors. Wrapped errors match with errors.Is.
var (
	// ErrDuplicate is returned by LogQuery when a query with the same
	// EventID is already logged; the existing id is returned with it.
	ErrDuplicate = errors.New("query already logged for this event id")
	// ErrNotFound is returned when a stream tag or query id does not exist.
	ErrNotFound = errors.New("not found")
	// ErrSchemaTooNew is returned by Open when the file was written by a
	// newer mixward than this one.
	ErrSchemaTooNew = errors.New("database schema is newer than this mixward")
	// ErrInvalid is wrapped by errors about bad arguments (a bad tag, an
	// unknown verdict, a non-finite potential).
	ErrInvalid = errors.New("invalid argument")
	// ErrNoDatabase is returned by OpenReadOnly when the file does not exist.
	ErrNoDatabase = errors.New("no database file")
	// ErrSchemaTooOld is returned by OpenReadOnly when the file has an
	// older schema; a writing command (mixward log migrate) upgrades it.
	ErrSchemaTooOld = errors.New("database schema is older than this mixward")
	// ErrReadOnly is returned by writing methods of a DB opened read-only.
	ErrReadOnly = errors.New("database opened read-only")
)

// busyTimeout is how long a connection waits for another writer (ms).
const busyTimeout = 5000

// Open opens (creating if needed) the database at path and applies any
// pending migrations. path is a SQLite file name, or a PostgreSQL URL
// (postgres://… or postgresql://…, see IsPostgres) whose database must
// exist; the tables are created in it. ":memory:" is refused because each
// pooled connection would see its own empty database.
func Open(ctx context.Context, path string, opt Options) (*DB, error) {
	if _, err := NormalizeSite(opt.Site); err != nil {
		return nil, fmt.Errorf("open database: %w (MIXWARD_SITE or --site)", err)
	}
	if IsPostgres(path) {
		return openPostgres(ctx, path, opt, false, len(pgMigrations))
	}
	return openAt(ctx, path, opt, len(migrations))
}

// openAt is Open with migrations applied only up to version upto (tests use
// it to build files of older schema versions).
func openAt(ctx context.Context, path string, opt Options, upto int) (*DB, error) {
	if path == "" {
		return nil, fmt.Errorf("open database: %w: empty path (set --db or MIXWARD_DB)", ErrInvalid)
	}
	if path == ":memory:" || strings.HasPrefix(path, "file:") {
		return nil, fmt.Errorf("open database %q: %w: give a plain file path", path, ErrInvalid)
	}
	db := newDB(path, opt)
	db.ws = newWriteStmts(false)
	if err := createPrivate(path); err != nil {
		return nil, fmt.Errorf("open database %s: %w (check the directory exists and is writable)", path, err)
	}
	var err error
	sync := "_synchronous=NORMAL"
	if opt.FullSync {
		sync = "_synchronous=FULL"
	}
	db.w, err = sql.Open("sqlite3", dsn(path, "_journal_mode=WAL", sync, "_txlock=immediate"))
	if err != nil {
		return nil, fmt.Errorf("open database %s: %w", path, err)
	}
	db.w.SetMaxOpenConns(1)
	db.w.SetConnMaxIdleTime(0)
	if err := pingWriter(ctx, db.w); err != nil {
		db.w.Close()
		return nil, fmt.Errorf("open database %s: %w (check the directory exists and is writable)", path, err)
	}
	if err := db.migrate(ctx, upto); err != nil {
		db.w.Close()
		return nil, err
	}
	db.ver = upto
	if err := db.checkKey(ctx, db.w); err != nil {
		db.w.Close()
		return nil, err
	}
	db.ws.forVersion(db.ver)
	db.ws.prepare(ctx, db.w)
	db.r, err = sql.Open("sqlite3", dsn(path, "mode=ro", "_txlock=deferred"))
	if err != nil {
		db.w.Close()
		return nil, fmt.Errorf("open database %s for reading: %w", path, err)
	}
	db.r.SetMaxOpenConns(4)
	return db, nil
}

func newDB(path string, opt Options) *DB {
	db := &DB{path: path, now: opt.Now, loc: opt.Location, key: opt.ChainKey}
	if db.now == nil {
		db.now = time.Now
	}
	if db.loc == nil {
		db.loc = time.UTC
	}
	db.replica, db.lease = opt.Replica, opt.InboxLease
	db.site, _ = NormalizeSite(opt.Site) // checked by Open
	if db.replica == "" {
		host, _ := os.Hostname()
		db.replica = fmt.Sprintf("%s-%d-%d", host, os.Getpid(), time.Now().UnixNano()%1e6)
	}
	return db
}

// createPrivate creates path with mode 0600 if it does not exist, so that
// SQLite (which would use 0644) and its WAL and shared-memory files, which
// take the database file's mode, are private to the owner.
func createPrivate(path string) error {
	f, err := os.OpenFile(path, os.O_RDWR|os.O_CREATE|os.O_EXCL, 0o600)
	if errors.Is(err, os.ErrExist) {
		return nil
	}
	if err != nil {
		return err
	}
	return f.Close()
}

// checkKey refuses to write to a keyed log without its key: a plain row
// after a keyed one would read as a forgery.
func (db *DB) checkKey(ctx context.Context, q queryer) error {
	if db.ver < 4 {
		return nil
	}
	var chain, keyID string
	err := q.QueryRowContext(ctx, `SELECT chain, key_id FROM queries ORDER BY id DESC LIMIT 1`).Scan(&chain, &keyID)
	switch {
	case errors.Is(err, sql.ErrNoRows) || (err == nil && chain != ChainKeyed):
		return nil
	case err != nil:
		return fmt.Errorf("open database %s: read the chain kind: %w", db.path, err)
	case db.key == nil:
		return fmt.Errorf("open database %s: %w: the log is keyed (HMAC-SHA256, key id %s); set MIXWARD_CHAIN_KEY_FILE to the file holding that key",
			db.path, ErrChainKey, keyID)
	case db.key.id != keyID:
		return fmt.Errorf("open database %s: %w: the log is keyed with key id %s but the key given has id %s; give the key it was written with",
			db.path, ErrChainKey, keyID, db.key.id)
	}
	return nil
}

// pingWriter opens the writer's connection. Switching a file that another
// process is creating to WAL mode can return SQLITE_BUSY at once, without
// the busy handler (SQLite, "Write-Ahead Logging": changing the journal
// mode needs an exclusive lock), so a busy first open is retried for up to
// busyTimeout before it is reported.
func pingWriter(ctx context.Context, w *sql.DB) error {
	deadline := time.Now().Add(busyTimeout * time.Millisecond)
	for {
		err := w.PingContext(ctx)
		var se sqlite3.Error
		if err == nil || !errors.As(err, &se) || se.Code != sqlite3.ErrBusy && se.Code != sqlite3.ErrLocked || time.Now().After(deadline) {
			return err
		}
		select {
		case <-ctx.Done():
			return err
		case <-time.After(50 * time.Millisecond):
		}
	}
}

// dsn builds a go-sqlite3 URI for path with the common pragmas plus extra.
func dsn(path string, extra ...string) string {
	// A SQLite URI decodes %XX and stops the path at ? and #.
	r := strings.NewReplacer("%", "%25", "?", "%3f", "#", "%23")
	q := []string{fmt.Sprintf("_busy_timeout=%d", busyTimeout), "_foreign_keys=on", "_cache_size=-16000"}
	q = append(q, extra...)
	return "file:" + r.Replace(path) + "?" + strings.Join(q, "&")
}

// Close closes the database.
func (db *DB) Close() error {
	var errs []error
	if db.pg {
		return db.r.Close()
	}
	if db.w != nil && db.r != nil && db.ver >= 2 {
		// Leave the search index complete.
		if err := db.syncIndex(context.Background()); err != nil {
			errs = append(errs, fmt.Errorf("close: index the newest queries: %w", err))
		}
	}
	if db.r != nil {
		errs = append(errs, db.r.Close())
	}
	if db.ws != nil {
		db.ws.close()
	}
	if db.w != nil {
		// Fold the WAL back into the main file so a plain copy of a closed
		// database is complete.
		_, _ = db.w.Exec("PRAGMA wal_checkpoint(TRUNCATE)")
		errs = append(errs, db.w.Close())
	}
	return errors.Join(errs...)
}

// Path is the database file name (for PostgreSQL, its URL without the
// password).
func (db *DB) Path() string { return db.path }

// Location is the site time zone the database renders times in.
func (db *DB) Location() *time.Location { return db.loc }

// Now is the database clock in UTC.
func (db *DB) Now() time.Time { return db.now().UTC() }

// timeLayout stores times as fixed-width UTC text, so text order is time order.
const timeLayout = "2006-01-02T15:04:05.000000000Z"

func formatTime(t time.Time) string { return t.UTC().Format(timeLayout) }

func parseTime(s string) (time.Time, error) {
	t, err := time.Parse(timeLayout, s)
	if err != nil {
		return time.Time{}, fmt.Errorf("stored time %q: %w", s, err)
	}
	return t, nil
}

// isUnique reports whether err is a UNIQUE or PRIMARY KEY constraint failure.
func isUnique(err error) bool {
	if pgUnique(err) {
		return true
	}
	var se sqlite3.Error
	return errors.As(err, &se) && (se.ExtendedCode == sqlite3.ErrConstraintUnique || se.ExtendedCode == sqlite3.ErrConstraintPrimaryKey)
}
