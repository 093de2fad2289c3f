package store

import (
	"context"
	"os"
	"testing"
	"time"
)

func TestProfSearch(t *testing.T) {
	if os.Getenv("PROF") == "" {
		t.Skip()
	}
	ctx := context.Background()
	db, err := Open(ctx, "/tmp/mixward-bench-g3-s3-1000000.db", Options{})
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	for round := 0; round < 2; round++ {
		for _, o := range searchCases {
			s := time.Now()
			p, err := db.Search(ctx, o)
			if err != nil {
				t.Fatal(err)
			}
			if round == 1 {
				t.Logf("%-50s %8v %d", o.Terms+"|"+o.User+"|"+o.Verdict+"|"+o.Hazard, time.Since(s).Round(10*time.Microsecond), len(p.Queries))
			}
		}
	}
}
