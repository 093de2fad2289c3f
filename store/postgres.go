package store

import (
	"context"
	"database/sql"
	"database/sql/driver"
	"errors"
	"fmt"
	"net/url"
	"strings"
	"sync"
	"time"

	"github.com/jackc/pgx/v5"
	"github.com/jackc/pgx/v5/pgconn"
	"github.com/jackc/pgx/v5/stdlib"
)

// IsPostgres reports whether dsn names a PostgreSQL database
// ("postgres://…" or "postgresql://…") rather than a SQLite file path.
func IsPostgres(dsn string) bool {
	d := strings.ToLower(strings.TrimSpace(dsn))
	return strings.HasPrefix(d, "postgres://") || strings.HasPrefix(d, "postgresql://")
}

// Pool tunes the PostgreSQL connection pool (ignored for SQLite, which
// keeps one writer and four readers). Zero fields take the defaults.
type Pool struct {
	MaxOpen     int           // connections open at most; default 10
	MaxIdle     int           // idle connections kept; default 5
	MaxLifetime time.Duration // a connection is closed after this long; default 30 min
	MaxIdleTime time.Duration // an idle connection is closed after this long; default 5 min
}

// redact hides the password of a PostgreSQL URL for messages.
func redact(dsn string) string {
	u, err := url.Parse(dsn)
	if err != nil {
		return "postgres://…"
	}
	if _, ok := u.User.Password(); ok {
		u.User = url.UserPassword(u.User.Username(), "xxxxx")
	}
	return u.String()
}

// openPostgres opens the PostgreSQL database at dsn. Writers and readers
// share one pool (db.w == db.r); readOnly makes every transaction read-only
// on the server and skips migrations.
func openPostgres(ctx context.Context, dsn string, opt Options, readOnly bool, upto int) (*DB, error) {
	name := redact(dsn)
	cfg, err := pgx.ParseConfig(dsn)
	if err != nil {
		return nil, fmt.Errorf("open database %s: %w: %v", name, ErrInvalid, err)
	}
	if readOnly {
		cfg.RuntimeParams["default_transaction_read_only"] = "on"
	}
	db := newDB(name, opt)
	db.pg = true
	db.ro = readOnly
	pool := sql.OpenDB(qmarkConnector{stdlib.GetConnector(*cfg)})
	p := opt.Pool
	pool.SetMaxOpenConns(orDefault(p.MaxOpen, 10))
	pool.SetMaxIdleConns(orDefault(p.MaxIdle, 5))
	pool.SetConnMaxLifetime(orDefaultDur(p.MaxLifetime, 30*time.Minute))
	pool.SetConnMaxIdleTime(orDefaultDur(p.MaxIdleTime, 5*time.Minute))
	if err := pool.PingContext(ctx); err != nil {
		pool.Close()
		return nil, fmt.Errorf("open database %s: %w (check the server is up and the URL's host, user and database)", name, err)
	}
	db.r = pool
	if readOnly {
		v, err := fileVersion(ctx, pool, name, len(pgMigrations))
		if err != nil {
			pool.Close()
			return nil, err
		}
		db.ver = v
		if v < len(pgMigrations) && !opt.OlderSchema {
			pool.Close()
			return nil, fmt.Errorf("open database %s: %w: it has schema version %d, this mixward reads version %d; upgrade it with 'mixward log migrate'",
				name, ErrSchemaTooOld, v, len(pgMigrations))
		}
		db.pgv, db.ver = v, pgVersion(v)
		return db, nil
	}
	db.w = pool
	db.ws = newWriteStmts(true)
	if err := db.migrate(ctx, upto); err != nil {
		pool.Close()
		return nil, err
	}
	db.pgv, db.ver = upto, pgVersion(upto)
	if err := db.checkKey(ctx, db.w); err != nil {
		pool.Close()
		return nil, err
	}
	return db, nil
}

// pgVersion maps a PostgreSQL schema version to the SQLite schema version
// whose features it has (the code branches on the SQLite numbering):
// PostgreSQL's version 1 holds SQLite's versions 1–5 and the inbox leases
// (SQLite's 7), its version 2 adds sites (SQLite's 8), its version 3 the
// presses and names (SQLite's 6). The presses and names came in a
// different order on the two backends, so DB.hasNames asks for them by
// each backend's own number.
func pgVersion(v int) int {
	switch {
	case v >= 2:
		return siteVersion
	case v == 1:
		return siteVersion - 1
	}
	return 0
}

// pgNamesVersion is the PostgreSQL schema version that brought the presses
// and names tables.
const pgNamesVersion = 3

// hasNames reports whether the database has the presses and names tables.
func (db *DB) hasNames() bool {
	if db.pg {
		return db.pgv >= pgNamesVersion
	}
	return db.ver >= namesVersion
}

func orDefault(v, d int) int {
	if v > 0 {
		return v
	}
	return d
}

func orDefaultDur(v, d time.Duration) time.Duration {
	if v > 0 {
		return v
	}
	return d
}

// pgUnique reports whether err is a PostgreSQL unique violation (23505).
func pgUnique(err error) bool {
	var pe *pgconn.PgError
	return errors.As(err, &pe) && pe.Code == "23505"
}

// lockChain serialises appends to the chain across every process writing
// to this PostgreSQL database: the row lock on chain_state (see pgchain.go),
// held until the transaction ends. On SQLite the write transaction (BEGIN
// IMMEDIATE) already does this.
func (db *DB) lockChain(ctx context.Context, tx *sql.Tx) error {
	if !db.pg {
		return nil
	}
	if _, err := tx.ExecContext(ctx, `SELECT 1 FROM chain_state FOR UPDATE`); err != nil {
		return fmt.Errorf("lock the chain: %w", err)
	}
	return nil
}

// qmarkConnector makes the pgx driver accept the store's SQL, written with
// ? placeholders (SQLite's), by numbering them $1, $2 … outside quotes and
// comments before PostgreSQL sees them.
type qmarkConnector struct{ driver.Connector }

func (c qmarkConnector) Connect(ctx context.Context) (driver.Conn, error) {
	cn, err := c.Connector.Connect(ctx)
	if err != nil {
		return nil, err
	}
	return &qmarkConn{cn.(*stdlib.Conn)}, nil
}

type qmarkConn struct{ *stdlib.Conn }

func (c *qmarkConn) Prepare(q string) (driver.Stmt, error) { return c.Conn.Prepare(rebind(q)) }

func (c *qmarkConn) PrepareContext(ctx context.Context, q string) (driver.Stmt, error) {
	return c.Conn.PrepareContext(ctx, rebind(q))
}

func (c *qmarkConn) ExecContext(ctx context.Context, q string, args []driver.NamedValue) (driver.Result, error) {
	return c.Conn.ExecContext(ctx, rebind(q), args)
}

func (c *qmarkConn) QueryContext(ctx context.Context, q string, args []driver.NamedValue) (driver.Rows, error) {
	return c.Conn.QueryContext(ctx, rebind(q), args)
}

var rebound sync.Map // query text → rebound text

// rebind numbers the ? placeholders of q as $1, $2 …, leaving quoted
// strings, quoted names and -- comments alone.
func rebind(q string) string {
	if !strings.Contains(q, "?") {
		return q
	}
	if s, ok := rebound.Load(q); ok {
		return s.(string)
	}
	var b strings.Builder
	n := 0
	var quote byte
	for i := 0; i < len(q); i++ {
		c := q[i]
		switch {
		case quote != 0:
			if c == quote {
				quote = 0
			}
		case c == '\'' || c == '"':
			quote = c
		case c == '-' && i+1 < len(q) && q[i+1] == '-':
			j := strings.IndexByte(q[i:], '\n')
			if j < 0 {
				j = len(q) - i
			}
			b.WriteString(q[i : i+j])
			i += j - 1
			continue
		case c == '?':
			n++
			fmt.Fprintf(&b, "$%d", n)
			continue
		}
		b.WriteByte(c)
	}
	s := b.String()
	rebound.Store(q, s)
	return s
}

// readTx begins a read transaction that sees one snapshot throughout: on
// PostgreSQL, REPEATABLE READ (READ COMMITTED, the default, would let a
// verification or digest see rows committed half-way through it); on
// SQLite every transaction does.
func (db *DB) readTx(ctx context.Context) (*sql.Tx, error) {
	if db.pg {
		return db.r.BeginTx(ctx, &sql.TxOptions{Isolation: sql.LevelRepeatableRead, ReadOnly: true})
	}
	return db.r.BeginTx(ctx, nil)
}

// pgRebuildDerived is RebuildDerived for PostgreSQL: the hazard rows from
// the hashed hazards, and every row's search words.
func (db *DB) pgRebuildDerived(ctx context.Context) error {
	tx, err := db.w.BeginTx(ctx, nil)
	if err != nil {
		return fmt.Errorf("rebuild derived tables: %w", err)
	}
	defer tx.Rollback()
	if err := db.lockChain(ctx, tx); err != nil {
		return fmt.Errorf("rebuild derived tables: %w", err)
	}
	for _, s := range []string{
		`DELETE FROM query_hazards`,
		`INSERT INTO query_hazards (query_id, pos, code, severity, message)
		 SELECT q.id, j.n - 1, j.v->>'code', j.v->>'severity', j.v->>'message'
		   FROM queries q, jsonb_array_elements(q.hazards::jsonb) WITH ORDINALITY AS j(v, n) ORDER BY q.id, j.n`,
		`UPDATE search_state SET time_order_broken = EXISTS (SELECT 1 FROM queries a JOIN queries b ON b.id = a.id + 1 WHERE b.time < a.time)`,
	} {
		if _, err := tx.ExecContext(ctx, s); err != nil {
			return fmt.Errorf("rebuild derived tables: %w", err)
		}
	}
	rows, err := tx.QueryContext(ctx, `SELECT `+rowColumns+` FROM queries WHERE kind = 'query' ORDER BY id`)
	if err != nil {
		return fmt.Errorf("rebuild derived tables: %w", err)
	}
	docs := map[int64]string{}
	for rows.Next() {
		var r row
		if err := rows.Scan(r.scanDest()...); err != nil {
			rows.Close()
			return fmt.Errorf("rebuild derived tables: %w", err)
		}
		docs[r.ID] = searchDoc(&r)
	}
	rows.Close()
	if err := rows.Err(); err != nil {
		return fmt.Errorf("rebuild derived tables: %w", err)
	}
	for id, d := range docs {
		if _, err := tx.ExecContext(ctx, `UPDATE queries SET search_doc = ? WHERE id = ? AND search_doc <> ?`, d, id, d); err != nil {
			return fmt.Errorf("rebuild derived tables: %w", err)
		}
	}
	if err := tx.Commit(); err != nil {
		return fmt.Errorf("rebuild derived tables: %w", err)
	}
	return nil
}

// DisplayName is dsn fit for messages: a PostgreSQL URL without its
// password, a SQLite path as it is.
func DisplayName(dsn string) string {
	if IsPostgres(dsn) {
		return redact(dsn)
	}
	return dsn
}

// Ping checks that the database answers (for health checks).
func (db *DB) Ping(ctx context.Context) error {
	var one int
	if err := db.r.QueryRowContext(ctx, `SELECT 1`).Scan(&one); err != nil {
		return fmt.Errorf("database %s: %w", db.path, err)
	}
	return nil
}

// Backend names the kind of database: "sqlite" or "postgres".
func (db *DB) Backend() string {
	if db.pg {
		return "postgres"
	}
	return "sqlite"
}
