package bot

import (
	"context"
	"log/slog"
	"strings"
	"sync"
	"time"

	"github.com/slack-go/slack"
)

// NameAPI is the part of the Slack Web API that names people and
// channels (users:read, channels:read and groups:read). *slack.Client
// implements it.
type NameAPI interface {
	GetUserInfoContext(ctx context.Context, user string, options ...slack.GetUserInfoOption) (*slack.User, error)
	GetConversationInfoContext(ctx context.Context, input *slack.GetConversationInfoInput) (*slack.Channel, error)
}

// NameNoter records the name seen for an id at a time. *store.DB
// implements it (the log keeps ids; this labels them).
type NameNoter interface {
	NoteName(ctx context.Context, id, name string, at time.Time) error
}

// Names resolves Slack user and channel ids to the names people see,
// caching each answer for TTL (Slack rate-limits these methods) and noting
// every name it learns in Note. A failed lookup leaves the id as it is
// and serves an older cached name when there is one.
type Names struct {
	API  NameAPI
	Note NameNoter // may be nil
	TTL  time.Duration
	Now  func() time.Time
	Log  *slog.Logger

	mu       sync.Mutex
	cache    map[string]nameEntry
	inflight map[string]bool // ids being looked up in the background
}

type nameEntry struct {
	name string
	at   time.Time
}

// failTTL is how long a failed lookup waits before asking again.
const failTTL = 5 * time.Minute

// DefaultNameTTL is how long a looked-up name is used before asking again.
const DefaultNameTTL = time.Hour

func (n *Names) now() time.Time {
	if n.Now != nil {
		return n.Now()
	}
	return time.Now()
}

// User is the display name of a user id ("" when it cannot be found).
func (n *Names) User(ctx context.Context, id string) string {
	return n.lookup(ctx, id, func(ctx context.Context) (string, error) {
		u, err := n.API.GetUserInfoContext(ctx, id)
		if err != nil {
			return "", err
		}
		for _, s := range []string{u.Profile.DisplayName, u.Profile.RealName, u.RealName, u.Name} {
			if s = strings.TrimSpace(s); s != "" {
				return s, nil
			}
		}
		return "", nil
	})
}

// Channel is "#name" for a channel id, "direct message" for a DM ("" when
// it cannot be found).
func (n *Names) Channel(ctx context.Context, id string) string {
	return n.lookup(ctx, id, func(ctx context.Context) (string, error) {
		c, err := n.API.GetConversationInfoContext(ctx, &slack.GetConversationInfoInput{ChannelID: id})
		switch {
		case err != nil:
			return "", err
		case c.IsIM:
			return "direct message", nil
		case c.Name != "":
			return "#" + c.Name, nil
		}
		return "", nil
	})
}

// Known is the name cached for id, "" when none; it never asks Slack.
func (n *Names) Known(id string) string {
	if n == nil {
		return ""
	}
	n.mu.Lock()
	defer n.mu.Unlock()
	return n.cache[id].name
}

// Refresh looks a user's (user true) or channel's name up in the
// background when the cached one is missing or stale, at most one lookup
// per id at a time; it never blocks. Names label records and are not
// needed to answer, so a slow or rate-limited users.info never holds up an
// answer; the name is noted (Note) with the time it was seen.
func (n *Names) Refresh(id string, user bool) {
	if n == nil || n.API == nil || id == "" || id == ConsoleUser {
		return
	}
	n.mu.Lock()
	e, ok := n.cache[id]
	fresh := ok && n.now().Sub(e.at) < n.ttl()
	busy := n.inflight[id]
	if !fresh && !busy {
		if n.inflight == nil {
			n.inflight = map[string]bool{}
		}
		n.inflight[id] = true
	}
	n.mu.Unlock()
	if fresh || busy {
		return
	}
	go func() {
		defer func() {
			n.mu.Lock()
			delete(n.inflight, id)
			n.mu.Unlock()
		}()
		if user {
			n.User(context.Background(), id)
		} else {
			n.Channel(context.Background(), id)
		}
	}()
}

func (n *Names) ttl() time.Duration {
	if n.TTL <= 0 {
		return DefaultNameTTL
	}
	return n.TTL
}

func (n *Names) lookup(ctx context.Context, id string, ask func(context.Context) (string, error)) string {
	if n == nil || n.API == nil || id == "" || id == ConsoleUser {
		return ""
	}
	ttl := n.ttl()
	now := n.now()
	n.mu.Lock()
	e, ok := n.cache[id]
	n.mu.Unlock()
	if ok && now.Sub(e.at) < ttl {
		return e.name
	}
	ctx, cancel := context.WithTimeout(ctx, 5*time.Second)
	defer cancel()
	name, err := ask(ctx)
	if err != nil {
		if n.Log != nil {
			n.Log.Warn("name lookup failed", "id", id, "err", err, "stale_cache", ok)
		}
		// Ask again after failTTL, not at every message (a missing scope
		// or a rate limit would fail every time).
		n.mu.Lock()
		if n.cache == nil {
			n.cache = map[string]nameEntry{}
		}
		n.cache[id] = nameEntry{name: e.name, at: now.Add(-ttl + min(ttl, failTTL))}
		n.mu.Unlock()
		return e.name
	}
	n.mu.Lock()
	if n.cache == nil || len(n.cache) > 10000 {
		n.cache = map[string]nameEntry{}
	}
	n.cache[id] = nameEntry{name: name, at: now}
	n.mu.Unlock()
	if n.Note != nil && name != "" {
		if err := n.Note.NoteName(ctx, id, name, now); err != nil && n.Log != nil {
			n.Log.Warn("name not noted", "id", id, "err", err)
		}
	}
	return name
}
