package store

import (
	"context"
	"os"
	"testing"
	"time"
)

func TestProfDigest(t *testing.T) {
	if os.Getenv("PROF") == "" {
		t.Skip()
	}
	ctx := context.Background()
	db, err := Open(ctx, "/tmp/mixward-bench-g2-s3-100000.db", Options{})
	if err != nil {
		t.Fatal(err)
	}
	until := benchStart.Add(24 * time.Hour)
	since := benchStart
	tx, _ := db.r.BeginTx(ctx, nil)
	defer tx.Rollback()
	d := &Digest{}
	window := `q.kind = 'query' AND q.time >= ? AND q.time < ?`
	lo, hi := formatTime(since), formatTime(until)
	for i, f := range []func() error{
		func() error { return digestCounts(ctx, tx, d, window, lo, hi) },
		func() error { return digestFlagged(ctx, tx, d, window, since, until) },
		func() error { return digestErrors(ctx, tx, d, window, lo, hi) },
		func() error { return digestPairs(ctx, tx, d, window, lo, hi) },
	} {
		s := time.Now()
		if err := f(); err != nil {
			t.Fatal(err)
		}
		t.Logf("step %d: %v", i, time.Since(s))
	}
}
