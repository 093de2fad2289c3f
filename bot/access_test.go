package bot

import (
	"context"
	"errors"
	"testing"
	"time"
)

type groupsFake struct {
	members map[string][]string
	err     error
	calls   int
}

func (g *groupsFake) GroupMembers(ctx context.Context, group string) ([]string, error) {
	g.calls++
	if g.err != nil {
		return nil, g.err
	}
	return g.members[group], nil
}

func TestAccess(t *testing.T) {
	now := time.Unix(1700000000, 0)
	g := &groupsFake{members: map[string][]string{"SSUP": {"U2"}}}
	a := &Access{Supervisors: []string{"U1", "SSUP"}, Reviewers: []string{"U3"}, Groups: g, TTL: time.Minute, Now: func() time.Time { return now }}
	ctx := context.Background()
	for _, tc := range []struct {
		user       string
		sup, revie bool
	}{
		{"U1", true, false}, {"U2", true, false}, {"U3", false, true}, {"U4", false, false}, {"", false, false},
	} {
		if got := a.IsSupervisor(ctx, tc.user); got != tc.sup {
			t.Errorf("IsSupervisor(%q) = %v", tc.user, got)
		}
		if got := a.IsReviewer(ctx, tc.user); got != tc.revie {
			t.Errorf("IsReviewer(%q) = %v", tc.user, got)
		}
	}
	calls := g.calls
	a.IsSupervisor(ctx, "U2")
	if g.calls != calls {
		t.Errorf("group looked up again within the TTL")
	}
	// After the TTL the group is looked up again; if that fails, the last
	// answer stands.
	now = now.Add(2 * time.Minute)
	g.err = errors.New("slack down")
	if !a.IsSupervisor(ctx, "U2") || g.calls != calls+1 {
		t.Errorf("stale cache not used when the lookup failed (calls %d)", g.calls)
	}
	// With nothing cached, a failed lookup refuses.
	b := &Access{Supervisors: []string{"SSUP"}, Groups: g}
	if b.IsSupervisor(ctx, "U2") {
		t.Error("failed group lookup granted access")
	}
	if !(&Access{Everyone: true}).IsReviewer(ctx, "console") {
		t.Error("Everyone does not grant access")
	}
	var nilAccess *Access
	if nilAccess.IsSupervisor(ctx, "U1") {
		t.Error("nil Access granted access")
	}
}
