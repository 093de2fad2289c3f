package bot

import (
	"context"
	"log/slog"
	"slices"
	"strings"
	"sync"
	"time"

	"github.com/slack-go/slack"
)

// GroupLister lists the members of a Slack user group (usergroups.users.list).
// *slack.Client satisfies it through GroupsFromSlack.
type GroupLister interface {
	GroupMembers(ctx context.Context, group string) ([]string, error)
}

// Access says who may change the stream catalogue (supervisors) and who may
// search the query log (reviewers). Entries are Slack user ids (U…, W…) or
// user-group ids (S…); group membership is looked up through Groups and
// cached for TTL. A failed lookup refuses (fail closed) unless an older
// answer is cached, which is then used.
type Access struct {
	Supervisors []string
	Reviewers   []string
	Groups      GroupLister      // may be nil when no group ids are listed
	TTL         time.Duration    // cache time for group members; 0 means 10 minutes
	Now         func() time.Time // clock for the cache; nil means time.Now
	Everyone    bool             // every user has every right (the local console)
	Log         *slog.Logger

	mu    sync.Mutex
	cache map[string]groupEntry
}

type groupEntry struct {
	members []string
	at      time.Time
}

// ParseIDList splits a comma- or space-separated list of Slack ids, dropping
// empties and surrounding "<@…>" or "<!subteam^…>" decoration.
func ParseIDList(s string) []string {
	var out []string
	for _, f := range strings.FieldsFunc(s, func(r rune) bool { return r == ',' || r == ' ' || r == ';' || r == '\t' || r == '\n' }) {
		f = strings.TrimPrefix(f, "<@")
		f = strings.TrimPrefix(f, "<!subteam^")
		f = strings.TrimSuffix(f, ">")
		if i := strings.IndexByte(f, '|'); i >= 0 {
			f = f[:i]
		}
		if f != "" {
			out = append(out, f)
		}
	}
	return out
}

// IsSupervisor reports whether user may change the stream catalogue.
func (a *Access) IsSupervisor(ctx context.Context, user string) bool {
	if a == nil {
		return false
	}
	return a.allowed(ctx, a.Supervisors, user)
}

// IsReviewer reports whether user may search the query log.
func (a *Access) IsReviewer(ctx context.Context, user string) bool {
	if a == nil {
		return false
	}
	return a.allowed(ctx, a.Reviewers, user)
}

func (a *Access) allowed(ctx context.Context, list []string, user string) bool {
	if a.Everyone {
		return true
	}
	if user == "" {
		return false
	}
	if slices.Contains(list, user) {
		return true
	}
	for _, id := range list {
		if !strings.HasPrefix(id, "S") {
			continue
		}
		if slices.Contains(a.members(ctx, id), user) {
			return true
		}
	}
	return false
}

func (a *Access) members(ctx context.Context, group string) []string {
	now := time.Now
	if a.Now != nil {
		now = a.Now
	}
	ttl := a.TTL
	if ttl <= 0 {
		ttl = 10 * time.Minute
	}
	a.mu.Lock()
	e, ok := a.cache[group]
	a.mu.Unlock()
	if ok && now().Sub(e.at) < ttl {
		return e.members
	}
	if a.Groups == nil {
		return nil
	}
	m, err := a.Groups.GroupMembers(ctx, group)
	if err != nil {
		if a.Log != nil {
			a.Log.Warn("user-group lookup failed", "group", group, "err", err, "stale_cache", ok)
		}
		if ok {
			return e.members
		}
		return nil
	}
	a.mu.Lock()
	if a.cache == nil {
		a.cache = map[string]groupEntry{}
	}
	a.cache[group] = groupEntry{members: m, at: now()}
	a.mu.Unlock()
	return m
}

// SlackGroups lists user-group members with usergroups.users.list.
type SlackGroups struct {
	API interface {
		GetUserGroupMembersContext(ctx context.Context, group string, options ...slack.GetUserGroupMembersOption) ([]string, error)
	}
}

// GroupMembers implements GroupLister.
func (g SlackGroups) GroupMembers(ctx context.Context, group string) ([]string, error) {
	return g.API.GetUserGroupMembersContext(ctx, group)
}
