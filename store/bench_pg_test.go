package store

import (
	"context"
	"database/sql"
	"fmt"
	"sort"
	"testing"
	"time"

	"github.com/jackc/pgx/v5"
)

// pgBenchDB opens (building if needed) the benchmark log on PostgreSQL: the
// same generated rows as benchDB, in a schema of the test server named by
// the generator version and row count, so it is built once and reused by
// later runs of the same throw-away cluster. The rows go in by COPY in one
// transaction (hashes are not chained: search and digest do not read
// them).
func pgBenchDB(b *testing.B) (*DB, int) {
	b.Helper()
	if !benchRequested() {
		b.Skip("needs -bench")
	}
	requirePostgres(b)
	rows := benchRows(b)
	ctx := context.Background()
	schema := fmt.Sprintf("mixward_bench_g%d_%d", benchGenVersion, rows)
	dsn := withParam(b, testPostgres(), "search_path", schema)
	admin, err := sql.Open("pgx", testPostgres())
	if err != nil {
		b.Fatal(err)
	}
	defer admin.Close()
	var have bool
	if err := admin.QueryRow(`SELECT EXISTS (SELECT 1 FROM information_schema.tables WHERE table_schema = $1 AND table_name = 'bench_built')`, schema).Scan(&have); err != nil {
		b.Fatal(err)
	}
	if !have {
		start := time.Now()
		admin.Exec(`DROP SCHEMA IF EXISTS ` + schema + ` CASCADE`)
		if _, err := admin.Exec(`CREATE SCHEMA ` + schema); err != nil {
			b.Fatal(err)
		}
		if err := buildPgBench(ctx, dsn, rows); err != nil {
			b.Fatal(err)
		}
		b.Logf("built %d-row PostgreSQL benchmark log in schema %s in %v", rows, schema, time.Since(start).Round(time.Second))
	}
	db, err := Open(ctx, dsn, Options{})
	if err != nil {
		b.Fatal(err)
	}
	b.Cleanup(func() { db.Close() })
	return db, rows
}

func buildPgBench(ctx context.Context, dsn string, rows int) error {
	db, err := Open(ctx, dsn, Options{})
	if err != nil {
		return err
	}
	defer db.Close()
	conn, err := db.w.Conn(ctx)
	if err != nil {
		return err
	}
	defer conn.Close()
	return conn.Raw(func(dc any) error {
		pc := dc.(*qmarkConn).Conn.Conn()
		tx, err := pc.Begin(ctx)
		if err != nil {
			return err
		}
		defer tx.Rollback(ctx)
		g := newGenerator()
		var qrows, hrows [][]any
		for i := 0; i < rows; i++ {
			q := g.query(i)
			r, err := encodeQuery(q)
			if err != nil {
				return err
			}
			r.ID, r.Chain, r.Hash = int64(i+1), ChainPlain, fmt.Sprintf("%064x", i+1)
			qrows = append(qrows, []any{r.ID, r.Kind, r.Time, r.UserID, r.UserName, r.Channel, r.EventID, r.Request, r.Resolved,
				r.Verdict, r.Error, r.Species, r.Oxidizer, r.Reducer, r.ECellV, r.ECellStandardV, r.Hazards, r.Streams, r.Result,
				r.EngineVersion, r.DataHash, r.PrevHash, r.Hash, r.Chain, r.KeyID, r.Site, searchDoc(r)})
			for p, h := range q.Hazards {
				hrows = append(hrows, []any{r.ID, p, h.Code, h.Severity, h.Message})
			}
		}
		cols := []string{"id", "kind", "time", "user_id", "user_name", "channel", "event_id", "request", "resolved", "verdict", "error",
			"species", "oxidizer", "reducer", "e_cell_v", "e_cell_standard_v", "hazards", "streams", "result", "engine_version",
			"data_hash", "prev_hash", "hash", "chain", "key_id", "site", "search_doc"}
		if _, err := tx.CopyFrom(ctx, pgx.Identifier{"queries"}, cols, pgx.CopyFromRows(qrows)); err != nil {
			return err
		}
		if _, err := tx.CopyFrom(ctx, pgx.Identifier{"query_hazards"}, []string{"query_id", "pos", "code", "severity", "message"}, pgx.CopyFromRows(hrows)); err != nil {
			return err
		}
		for _, s := range []string{
			fmt.Sprintf(`UPDATE chain_state SET seq = %d, last_id = %d, last_hash = '%064x'`, rows, rows, rows),
			`CREATE TABLE bench_built ()`,
			`ANALYZE`,
		} {
			if _, err := tx.Exec(ctx, s); err != nil {
				return err
			}
		}
		return tx.Commit(ctx)
	})
}

// plainSearch is the baseline of BenchmarkSearch: the text index alone,
// newest first, a page of ids, with no filter, no join and no decoding.
func plainSearch(ctx context.Context, db *DB, terms string) error {
	q := `SELECT docid FROM query_fts WHERE query_fts MATCH ? ORDER BY docid DESC LIMIT 51`
	args := []any{MatchExpr(Phrases(terms))}
	if db.pg {
		var match string
		match, args = pgMatch(Phrases(terms))
		q = `SELECT q.id FROM queries q WHERE ` + match + ` ORDER BY q.id DESC LIMIT 51`
	}
	rows, err := db.r.QueryContext(ctx, q, args...)
	if err != nil {
		return err
	}
	defer rows.Close()
	for rows.Next() {
	}
	return rows.Err()
}

// searchP50 runs every search case n times (search) or every case with
// terms (plain) and returns the median time.
func searchP50(b *testing.B, fn func(SearchOptions) error, cases []SearchOptions) time.Duration {
	var times []time.Duration
	for _, o := range cases {
		start := time.Now()
		if err := fn(o); err != nil {
			b.Fatal(err)
		}
		times = append(times, time.Since(start))
	}
	sort.Slice(times, func(i, j int) bool { return times[i] < times[j] })
	return times[len(times)/2]
}
