package store

// Benchmarks. BenchmarkSearch and BenchmarkDigest share a generated log of
// MIXWARD_BENCH_ROWS rows (default 1,000,000), logged at 100,000 rows per
// day so that any 24-hour window holds 100,000 rows. It is built once into
// $TMPDIR/mixward-bench-…db and reused by later runs (delete the file to
// rebuild). Building 1,000,000 rows takes about a minute on two cores.
//
//	go test -run '^$' -bench . -benchtime 1x ./store/
//	MIXWARD_BENCH_ROWS=100000 go test -run '^$' -bench Search ./store/
//
// With MIXWARD_TEST_POSTGRES set each runs on PostgreSQL too, on the same
// generated rows put in by COPY (bench_pg_test.go).

import (
	"context"
	"flag"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"testing"
	"time"
)

// benchGenVersion changes when the generator does, so stale cached files
// are not reused.
const benchGenVersion = 5

const (
	defaultBenchRows = 1_000_000
	benchRowsPerDay  = 100_000
)

var benchStart = time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)

func benchRequested() bool {
	f := flag.Lookup("test.bench")
	return f != nil && f.Value.String() != ""
}

func benchRows(b *testing.B) int {
	n := defaultBenchRows
	if s := os.Getenv("MIXWARD_BENCH_ROWS"); s != "" {
		v, err := strconv.Atoi(s)
		if err != nil || v < 1000 {
			b.Fatalf("MIXWARD_BENCH_ROWS=%q: want a whole number ≥ 1000", s)
		}
		n = v
	}
	return n
}

func BenchmarkLogQuery(b *testing.B) {
	for _, bc := range []struct {
		name string
		opt  Options
	}{{"sync=normal", Options{}}, {"sync=full", Options{FullSync: true}}} {
		b.Run(bc.name, func(b *testing.B) {
			path := filepath.Join(b.TempDir(), "bench.db")
			db, err := Open(context.Background(), path, bc.opt)
			if err != nil {
				b.Fatal(err)
			}
			defer db.Close()
			ctx := context.Background()
			q := demoQuery()
			b.ReportAllocs()
			b.ResetTimer()
			start := time.Now()
			for i := 0; i < b.N; i++ {
				qq := *q
				qq.Time = time.Time{}
				if _, err := db.LogQuery(ctx, &qq); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(b.N)/time.Since(start).Seconds(), "queries/s")
		})
	}
}

// searchCases are what a safety reviewer might type, common words and rare.
var searchCases = []SearchOptions{
	{Terms: "NaOCl"},
	{Terms: "NaOCl HCl"},
	{Terms: "chlorine gas"},
	{Terms: "CL2-GAS"},
	{Terms: "KMnO4 FeSO4"},
	{Terms: "T-204"},
	{Terms: "Fe^2+"},
	{Terms: "Bleech"},
	{Terms: `"NEAR" (x*) -HCl`},
	{Terms: "H2O2", Since: benchStart.Add(3 * 24 * time.Hour), Until: benchStart.Add(4 * 24 * time.Hour)},
	{Terms: "HCl", Verdict: VerdictError},
	{Terms: "NaOCl", User: "op.07"},
	{Hazard: "CL2-GAS"},
	{User: "op.39"},
	{Verdict: VerdictError, Offset: 200},
	{},
}

// BenchmarkSearch runs every search case on the benchmark log and, in the
// same run, the plain text search (the text index alone, a page of ids) for
// the cases with terms, and reports both medians and their ratio
// (issue 13: search p50 ≤ 20 ms at 1,000,000 rows).
func BenchmarkSearch(b *testing.B) {
	eachBenchBackend(b, func(b *testing.B, be backend) {
		db := benchLog(b, be)
		ctx := context.Background()
		var withTerms []SearchOptions
		for _, o := range searchCases {
			if o.Terms != "" && len(Phrases(o.Terms)) > 0 {
				withTerms = append(withTerms, o)
			}
		}
		var search, plain []time.Duration
		var hazard time.Duration
		b.ResetTimer()
		for i := 0; i < b.N; i++ {
			search = append(search, searchP50(b, func(o SearchOptions) error { _, err := db.Search(ctx, o); return err }, searchCases))
			plain = append(plain, searchP50(b, func(o SearchOptions) error { return plainSearch(ctx, db, o.Terms) }, withTerms))
			hazard += searchP50(b, func(o SearchOptions) error { _, err := db.Search(ctx, o); return err },
				[]SearchOptions{{Hazard: "CL2-GAS"}, {HazardAny: []string{"O2-GAS", "HEAT"}}, {Hazard: "FIZZ", Offset: 500}})
		}
		b.StopTimer()
		ms := func(d time.Duration) float64 { return float64(d.Microseconds()) / 1000 }
		s, p := median(search), median(plain)
		b.ReportMetric(ms(s), "p50-ms")
		b.ReportMetric(ms(p), "plain-p50-ms")
		b.ReportMetric(float64(p)/float64(s), "ratio")
		b.ReportMetric(ms(hazard/time.Duration(b.N)), "hazard-ms")
	})
}

func median(ds []time.Duration) time.Duration {
	sort.Slice(ds, func(i, j int) bool { return ds[i] < ds[j] })
	return ds[len(ds)/2]
}

// benchLog is the benchmark log of the backend.
func benchLog(b *testing.B, be backend) *DB {
	if be.name == "postgres" {
		db, _ := pgBenchDB(b)
		return db
	}
	db, _ := benchDB(b)
	return db
}

// BenchmarkDigest makes the digest of the last 24 hours of the benchmark
// log (100,000 rows) and reports the rows it covered (issue 13: ≤ 500 ms).
func BenchmarkDigest(b *testing.B) {
	eachBenchBackend(b, func(b *testing.B, be backend) {
		db := benchLog(b, be)
		rows := benchRows(b)
		ctx := context.Background()
		until := benchStart.Add(time.Duration(rows) * benchSpacing)
		since := until.Add(-24 * time.Hour)
		b.ResetTimer()
		var d *Digest
		for i := 0; i < b.N; i++ {
			var err error
			if d, err = db.Digest(ctx, since, until); err != nil {
				b.Fatal(err)
			}
		}
		b.StopTimer()
		b.ReportMetric(float64(d.Queries), "rows")
		b.ReportMetric(float64(b.Elapsed().Milliseconds())/float64(b.N), "ms/digest")
	})
}

// benchSpacing spaces generated rows at benchRowsPerDay.
const benchSpacing = 24 * time.Hour / benchRowsPerDay

// benchDB opens (building if needed) the cached benchmark log.
func benchDB(b *testing.B) (*DB, int) {
	b.Helper()
	if !benchRequested() {
		b.Skip("needs -bench")
	}
	rows := benchRows(b)
	path := filepath.Join(os.TempDir(), fmt.Sprintf("mixward-bench-g%d-s%d-%d.db", benchGenVersion, SchemaVersion(), rows))
	if _, err := os.Stat(path); err != nil {
		start := time.Now()
		if err := buildBenchDB(path, rows); err != nil {
			b.Fatal(err)
		}
		b.Logf("built %d-row benchmark log %s in %v", rows, path, time.Since(start).Round(time.Second))
	}
	db, err := Open(context.Background(), path, Options{})
	if err != nil {
		b.Fatal(err)
	}
	b.Cleanup(func() { db.Close() })
	return db, rows
}

// buildBenchDB writes rows generated queries into a temporary file through
// the same insert path as LogQuery (10,000 rows per transaction), then
// renames it into place so an interrupted build leaves nothing behind.
func buildBenchDB(path string, rows int) error {
	ctx := context.Background()
	tmp := path + ".building"
	for _, s := range []string{"", "-wal", "-shm"} {
		os.Remove(tmp + s)
	}
	db, err := Open(ctx, tmp, Options{})
	if err != nil {
		return err
	}
	g := newGenerator()
	for done := 0; done < rows; {
		tx, err := db.w.BeginTx(ctx, nil)
		if err != nil {
			return err
		}
		for end := min(done+10_000, rows); done < end; done++ {
			q := g.query(done)
			r, err := encodeQuery(q)
			if err == nil {
				err = db.appendRow(ctx, tx, r, "")
			}
			if err == nil && db.ver < hazardBatchVersion { // since then indexUpTo writes them
				err = db.insertHazards(ctx, tx, r.ID, q.Hazards)
			}
			if err == nil {
				_, err = db.indexUpTo(ctx, tx, r.ID, false)
			}
			if err != nil {
				tx.Rollback()
				return fmt.Errorf("row %d: %w", done, err)
			}
		}
		if err := tx.Commit(); err != nil {
			return err
		}
	}
	if _, err := db.w.ExecContext(ctx, `INSERT INTO query_fts (query_fts) VALUES ('optimize')`); err != nil {
		return err
	}
	if err := db.Close(); err != nil {
		return err
	}
	return os.Rename(tmp, path)
}

// generator makes plausible queries at the invented Harrowgate Finishing
// Works, deterministically.
type generator struct {
	rng   *rand.Rand
	users []string
}

type benchChem struct {
	formula string
	concs   []string
	species []string
}

var benchChems = []benchChem{
	{"NaOCl", []string{"12.5 %", "5 %", "1 %"}, []string{"Na+", "OCl-"}},
	{"HCl", []string{"10 %", "1 M", "32 %"}, []string{"H+", "Cl-"}},
	{"H2SO4", []string{"1 M", "98 %"}, []string{"H+", "HSO4-", "SO4^2-"}},
	{"NaOH", []string{"1 M", "50 %"}, []string{"Na+", "OH-"}},
	{"H2O2", []string{"3 %", "35 %"}, []string{"H2O2"}},
	{"KMnO4", []string{"0.02 M"}, []string{"K+", "MnO4-"}},
	{"FeSO4", []string{"0.1 M"}, []string{"Fe^2+", "SO4^2-"}},
	{"CuSO4", []string{"0.5 M"}, []string{"Cu^2+", "SO4^2-"}},
	{"Zn", []string{""}, []string{"Zn(s)"}},
	{"HNO3", []string{"10 %", "65 %"}, []string{"H+", "NO3-"}},
	{"K2Cr2O7", []string{"0.1 M"}, []string{"K+", "Cr2O7^2-"}},
	{"water", []string{""}, []string{"H2O"}},
}

func newGenerator() *generator {
	g := &generator{rng: rand.New(rand.NewPCG(2026, 12))}
	for i := 0; i < 40; i++ {
		g.users = append(g.users, fmt.Sprintf("op.%02d", i))
	}
	return g
}

func (g *generator) stream() (text, req string, species []string) {
	c := benchChems[g.rng.IntN(len(benchChems))]
	conc := c.concs[g.rng.IntN(len(c.concs))]
	text = c.formula
	if conc != "" {
		text += " " + conc
	}
	if g.rng.IntN(8) == 0 {
		req = fmt.Sprintf("T-%d", 101+g.rng.IntN(312))
	} else {
		req = fmt.Sprintf("%d L %s", 5*(1+g.rng.IntN(80)), text)
	}
	return text, req, c.species
}

func (g *generator) query(i int) *Query {
	u := g.rng.IntN(len(g.users))
	q := &Query{
		Time:   benchStart.Add(time.Duration(i) * benchSpacing),
		UserID: fmt.Sprintf("U%04d", u), UserName: g.users[u], Channel: "C0SHIFT",
		EngineVersion: "0.1.0", DataHash: "sha256:bench",
	}
	if g.rng.IntN(10) == 0 {
		q.Request = fmt.Sprintf("mix %d L Bleech + acid %d", g.rng.IntN(500), i)
		q.Verdict, q.Error = VerdictError, `unknown chemical "Bleech"`
		if g.rng.IntN(2) == 0 {
			q.Request = fmt.Sprintf("mix tank %d with HCl", g.rng.IntN(400))
			q.Error = "no quantity for the first stream"
		}
		return q
	}
	a, ra, sa := g.stream()
	c, rc, sc := g.stream()
	q.Request = "mix " + ra + " + " + rc
	q.Streams = []string{a, c}
	q.Species = append(append([]string{}, sa...), sc...)
	q.Verdict = []string{VerdictSpontaneous, VerdictNonSpontaneous, VerdictNoReaction}[g.rng.IntN(3)]
	e := g.rng.Float64()*2 - 1
	q.ECellV, q.ECellStandardV = &e, &e
	if q.Verdict == VerdictSpontaneous {
		switch g.rng.IntN(4) {
		case 0:
			q.Hazards = []Hazard{{"CL2-GAS", "danger", "chlorine gas is released"}}
		case 1:
			q.Hazards = []Hazard{{"HEAT", "warning", "the mix warms noticeably"}}
		case 2:
			q.Hazards = []Hazard{{"O2-GAS", "warning", "oxygen is released"}, {"FIZZ", "info", "gas bubbles"}}
		}
	}
	q.Result = []byte(fmt.Sprintf(`{"verdict":%q,"e_cell_v":%.3f}`, q.Verdict, e))
	return q
}

// BenchmarkVerify walks the whole benchmark log: every hash, the hazard
// rows, the search index's text, and its word counts against a rebuild.
func BenchmarkVerify(b *testing.B) {
	db, rows := benchDB(b)
	ctx := context.Background()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		rep, err := db.Verify(ctx)
		if err != nil || !rep.OK || rep.Rows < int64(rows) {
			b.Fatalf("Verify = %+v, %v", rep, err)
		}
	}
	b.StopTimer()
	b.ReportMetric(float64(rows)/(b.Elapsed().Seconds()/float64(b.N)), "rows/s")
}

// BenchmarkLogQueryPostgres logs queries on PostgreSQL (MIXWARD_TEST_POSTGRES)
// one after another and from 8 goroutines (replicas' workers), beside a
// plain INSERT of the same row's columns into a table without the chain,
// as the baseline.
func BenchmarkLogQueryPostgres(b *testing.B) {
	requirePostgres(b)
	ctx := context.Background()
	b.Run("chain", func(b *testing.B) {
		db, _ := postgresBackend.mustOpenWith(b, Options{})
		q := demoQuery()
		start := time.Now()
		for i := 0; i < b.N; i++ {
			qq := *q
			qq.Time = time.Time{}
			if _, err := db.LogQuery(ctx, &qq); err != nil {
				b.Fatal(err)
			}
		}
		b.ReportMetric(float64(b.N)/time.Since(start).Seconds(), "queries/s")
	})
	b.Run("chain-8-writers", func(b *testing.B) {
		db, _ := postgresBackend.mustOpenWith(b, Options{})
		q := demoQuery()
		start := time.Now()
		b.SetParallelism(8)
		b.RunParallel(func(pb *testing.PB) {
			for pb.Next() {
				qq := *q
				qq.Time = time.Time{}
				if _, err := db.LogQuery(ctx, &qq); err != nil {
					b.Error(err)
					return
				}
			}
		})
		b.ReportMetric(float64(b.N)/time.Since(start).Seconds(), "queries/s")
	})
	b.Run("plain-insert", func(b *testing.B) {
		db, dsn := postgresBackend.mustOpenWith(b, Options{})
		raw := postgresBackend.raw(b, dsn)
		if _, err := raw.Exec(`CREATE TABLE plain (LIKE queries INCLUDING DEFAULTS)`); err != nil {
			b.Fatal(err)
		}
		_ = db
		q := demoQuery()
		r, err := encodeQuery(q)
		if err != nil {
			b.Fatal(err)
		}
		start := time.Now()
		for i := 0; i < b.N; i++ {
			if _, err := raw.Exec(`INSERT INTO plain (id, kind, time, user_id, user_name, channel, request, verdict, species, hazards, streams, result, prev_hash, hash)
				VALUES (?, 'query', ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, '', '')`, i+1, r.Time, r.UserID, r.UserName, r.Channel, r.Request, r.Verdict,
				r.Species, r.Hazards, r.Streams, r.Result); err != nil {
				b.Fatal(err)
			}
		}
		b.ReportMetric(float64(b.N)/time.Since(start).Seconds(), "rows/s")
	})
}
