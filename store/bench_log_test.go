package store

import (
	"bytes"
	"context"
	"database/sql"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"testing"
	"time"
)

// benchResult is a real engine answer (the chromate reduction golden
// file, compacted as the bot's json.Marshal writes it), so logging is
// measured with a result of the size the bot logs.
func benchResult(b *testing.B) json.RawMessage {
	b.Helper()
	raw, err := os.ReadFile(filepath.Join("..", "testdata", "golden", "chromate-reduction.json"))
	if err != nil {
		b.Fatal(err)
	}
	var buf bytes.Buffer
	if err := json.Compact(&buf, raw); err != nil {
		b.Fatal(err)
	}
	return buf.Bytes()
}

// eachBenchBackend runs fn on SQLite and, when MIXWARD_TEST_POSTGRES is
// set, on PostgreSQL.
func eachBenchBackend(b *testing.B, fn func(b *testing.B, be backend)) {
	b.Run("sqlite", func(b *testing.B) { fn(b, sqliteBackend) })
	b.Run("postgres", func(b *testing.B) {
		requirePostgres(b)
		fn(b, postgresBackend)
	})
}

// plainTable opens a table with the queries columns and no index, no
// chain, no derived rows: on SQLite in a second file opened with the same
// pragmas as the store's writer, on PostgreSQL in the same schema. It
// returns the prepared INSERT of one row and the table's database.
func plainTable(b *testing.B, be backend, dsn string) (*sql.Stmt, *sql.DB) {
	b.Helper()
	var db *sql.DB
	var create string
	if be.name == "sqlite" {
		var err error
		db, err = sql.Open("sqlite3", dsnFor(dsn+"-plain"))
		if err != nil {
			b.Fatal(err)
		}
		db.SetMaxOpenConns(1)
		b.Cleanup(func() { db.Close() })
		create = `CREATE TABLE plain (id INTEGER PRIMARY KEY, kind TEXT, time TEXT, user_id TEXT, user_name TEXT, channel TEXT,
			event_id TEXT, request TEXT, resolved TEXT, verdict TEXT, error TEXT, species TEXT, oxidizer TEXT, reducer TEXT,
			e_cell_v REAL, e_cell_standard_v REAL, hazards TEXT, streams TEXT, result TEXT, engine_version TEXT, data_hash TEXT,
			prev_hash TEXT, hash TEXT, chain TEXT, key_id TEXT, site TEXT)`
	} else {
		db = be.raw(b, dsn)
		create = `CREATE TABLE plain (id bigint PRIMARY KEY, kind text, time text, user_id text, user_name text, channel text,
			event_id text, request text, resolved text, verdict text, error text, species text, oxidizer text, reducer text,
			e_cell_v double precision, e_cell_standard_v double precision, hazards text, streams text, result text,
			engine_version text, data_hash text, prev_hash text, hash text, chain text, key_id text, site text)`
	}
	if _, err := db.Exec(create); err != nil {
		b.Fatal(err)
	}
	st, err := db.Prepare(`INSERT INTO plain (` + rowColumns + `) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`)
	if err != nil {
		b.Fatal(err)
	}
	b.Cleanup(func() { st.Close() })
	return st, db
}

// dsnFor is the store's writer DSN for a SQLite file (Open's pragmas).
func dsnFor(path string) string {
	return dsn(path, "_journal_mode=WAL", "_synchronous=NORMAL", "_txlock=immediate")
}

// BenchmarkLogging logs queries with the chain (LogQuery: id, hash, hazard
// rows, search index, each in its own transaction, as the bot does) and,
// in the same loop, inserts the same row into a plain table, each row its
// own transaction with the same pragmas. It reports both rates and their
// ratio (issue 13 asks for at least 0.6).
func BenchmarkLogging(b *testing.B) {
	eachBenchBackend(b, func(b *testing.B, be backend) {
		ctx := context.Background()
		db, dsn := be.mustOpen(b, nil)
		plain, _ := plainTable(b, be, dsn)
		q := demoQuery()
		q.Result, q.ResultCompact = benchResult(b), true // as the bot logs json.Marshal's output
		var chain, base time.Duration
		b.ResetTimer()
		for i := 0; i < b.N; i++ {
			qq := *q
			qq.Time = time.Time{}
			qq.EventID = fmt.Sprintf("Ev%d", i) // the bot logs every query with its delivery id
			start := time.Now()
			if _, err := db.LogQuery(ctx, &qq); err != nil {
				b.Fatal(err)
			}
			chain += time.Since(start)
			r, err := encodeQuery(&qq)
			if err != nil {
				b.Fatal(err)
			}
			r.ID, r.Hash, r.PrevHash, r.Chain = int64(i+1), qq.Hash, qq.PrevHash, qq.Chain
			start = time.Now()
			if _, err := plain.Exec(r.ID, r.Kind, r.Time, r.UserID, r.UserName, r.Channel, r.EventID, r.Request, r.Resolved,
				r.Verdict, r.Error, r.Species, r.Oxidizer, r.Reducer, r.ECellV, r.ECellStandardV, r.Hazards, r.Streams, r.Result,
				r.EngineVersion, r.DataHash, r.PrevHash, r.Hash, r.Chain, r.KeyID, r.Site); err != nil {
				b.Fatal(err)
			}
			base += time.Since(start)
		}
		b.StopTimer()
		n := float64(b.N)
		b.ReportMetric(n/chain.Seconds(), "logged/s")
		b.ReportMetric(n/base.Seconds(), "plain/s")
		b.ReportMetric(base.Seconds()/chain.Seconds(), "ratio")
	})
}

// BenchmarkLoggingPages counts the pages each commit writes to the WAL,
// logging with the chain and inserting the same row into the plain table
// of BenchmarkLogging, with automatic checkpoints off on both while it
// counts. Unlike the rates it does not depend on the machine's load: it is
// the work per commit that the ratio of BenchmarkLogging mostly follows.
func BenchmarkLoggingPages(b *testing.B) {
	ctx := context.Background()
	db, dsn := sqliteBackend.mustOpen(b, nil)
	plain, plainDB := plainTable(b, sqliteBackend, dsn)
	q := demoQuery()
	q.Result, q.ResultCompact = benchResult(b), true
	frames := func(w *sql.DB, stmt string) int64 {
		var busy, wal, done int64
		if err := w.QueryRow(stmt).Scan(&busy, &wal, &done); err != nil {
			b.Fatal(err)
		}
		return wal
	}
	for _, w := range []*sql.DB{db.w, plainDB} {
		if _, err := w.Exec(`PRAGMA wal_autocheckpoint = 0`); err != nil {
			b.Fatal(err)
		}
		frames(w, `PRAGMA wal_checkpoint(TRUNCATE)`)
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		qq := *q
		qq.EventID = "Ev" + strconv.Itoa(i)
		if _, err := db.LogQuery(ctx, &qq); err != nil {
			b.Fatal(err)
		}
		r, err := encodeQuery(&qq)
		if err != nil {
			b.Fatal(err)
		}
		r.ID, r.Hash, r.PrevHash, r.Chain = qq.ID, qq.Hash, qq.PrevHash, qq.Chain
		if _, err := plain.Exec(r.ID, r.Kind, r.Time, r.UserID, r.UserName, r.Channel, r.EventID, r.Request, r.Resolved,
			r.Verdict, r.Error, r.Species, r.Oxidizer, r.Reducer, r.ECellV, r.ECellStandardV, r.Hazards, r.Streams, r.Result,
			r.EngineVersion, r.DataHash, r.PrevHash, r.Hash, r.Chain, r.KeyID, r.Site); err != nil {
			b.Fatal(err)
		}
	}
	b.StopTimer()
	n := float64(b.N)
	b.ReportMetric(float64(frames(db.w, `PRAGMA wal_checkpoint(PASSIVE)`))/n, "pages/logged")
	b.ReportMetric(float64(frames(plainDB, `PRAGMA wal_checkpoint(PASSIVE)`))/n, "pages/plain")
}
