package store

import (
	"context"
	"fmt"
	"testing"
	"time"
)

// TestSearchHazardsPaging: a hazard-only search walks the code index in
// batches (more rows than one batch carry a code here) and pages through
// exactly the rows a plain filter would give, newest first, each once
// even when a row carries two of the codes asked for, on both backends.
func TestSearchHazardsPaging(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		ctx := context.Background()
		c := newClock(t0)
		db, _ := b.mustOpen(t, c.Now)
		var want []int64 // newest first: rows with CL2-GAS or the older alias, verdict spontaneous
		for i := 0; i < 700; i++ {
			c.Add(time.Second)
			q := &Query{UserID: "U1", Request: fmt.Sprint("mix ", i), Verdict: VerdictSpontaneous}
			switch {
			case i%7 == 0:
				q.Hazards = []Hazard{{"HEAT", "warning", "warms"}}
			case i%5 == 0:
				q.Hazards = []Hazard{{"CL2-GAS", "danger", "chlorine"}, {"CHLORINE", "danger", "chlorine"}}
			case i%3 != 0:
				q.Hazards = []Hazard{{"cl2-gas", "danger", "chlorine"}}
			default:
				q.Hazards = []Hazard{{"CHLORINE", "danger", "chlorine"}}
			}
			if i%11 == 0 {
				q.Verdict = VerdictNoReaction
			}
			id := mustLog(t, db, q)
			if i%7 != 0 && i%11 != 0 {
				want = append([]int64{id}, want...)
			}
		}
		o := SearchOptions{HazardAny: []string{"CL2-GAS", "chlorine"}, Verdict: VerdictSpontaneous, Limit: 100}
		var got []int64
		for {
			page, err := db.Search(ctx, o)
			if err != nil {
				t.Fatal(err)
			}
			for _, q := range page.Queries {
				got = append(got, q.ID)
			}
			if !page.HasMore {
				break
			}
			o.Offset = page.NextOffset
		}
		if len(got) != len(want) {
			t.Fatalf("paged %d rows, want %d", len(got), len(want))
		}
		for i := range want {
			if got[i] != want[i] {
				t.Fatalf("row %d of the pages is %d, want %d", i, got[i], want[i])
			}
		}
	})
}
