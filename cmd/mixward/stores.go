package main

import (
	"context"
	"time"

	"mixward/bot"
	"mixward/store"
)

// The command line's needs of the store, declared here where they are used.
// *store.DB, on SQLite or on PostgreSQL, implements each (stores_test.go
// asserts it); the bot's own needs are declared in package bot (QueryLog,
// Searcher, Catalogue, Digester, Journal).

// streamReader reads a site's stream catalogue: tag resolution, review.
type streamReader interface {
	Stream(ctx context.Context, tag string) (store.Stream, error)
	Streams(ctx context.Context) ([]store.Stream, error)
}

// digestRecords lists the digests a site sent.
type digestRecords interface {
	DigestRecords(ctx context.Context, limit int) ([]store.DigestRecord, error)
}

// inboxPruner drops finished inbox entries.
type inboxPruner interface {
	PruneInbox(ctx context.Context, before time.Time) (int64, error)
}

// healthDB is what /healthz asks of the database.
type healthDB interface {
	Ping(ctx context.Context) error
	Backend() string
}

// seedCatalogue is what the console's demo seeding needs.
type seedCatalogue interface {
	bot.Catalogue
}

// newHealth is the health state of a serving process, checking db.
func newHealth(db healthDB) *bot.Health {
	return &bot.Health{Database: db.Ping, DatabaseKind: db.Backend()}
}
