package main

import (
	"context"
	"errors"
	"fmt"
	"strings"
	"time"

	"mixward/store"
)

// chainKey reads the keyed-chain key from the file named by
// MIXWARD_CHAIN_KEY_FILE; nil when it is not set.
func chainKey(getenv func(string) string) (*store.ChainKey, error) {
	if getenv == nil {
		return nil, nil
	}
	path := strings.TrimSpace(getenv("MIXWARD_CHAIN_KEY_FILE"))
	if path == "" {
		return nil, nil
	}
	k, err := store.ReadChainKey(path)
	if err != nil {
		return nil, &exitError{exitUsage, fmt.Errorf("MIXWARD_CHAIN_KEY_FILE: %w", err)}
	}
	return k, nil
}

// openDB opens the store named by o for writing (creating and migrating it
// as needed) in the site time zone, with the chain key if one is set.
func openDB(ctx context.Context, a *app, o *storeOpts) (*store.DB, *time.Location, error) {
	loc, err := siteLocation(o.tz)
	if err != nil {
		return nil, nil, err
	}
	key, err := chainKey(a.getenv)
	if err != nil {
		return nil, nil, err
	}
	opt, err := storeOptions(a.getenv, o.db)
	if err != nil {
		return nil, nil, err
	}
	opt.Location, opt.ChainKey, opt.Site = loc, key, o.site
	existed := dbExists(o.db)
	db, err := store.Open(ctx, o.db, opt)
	if errors.Is(err, store.ErrChainKey) {
		return nil, nil, &exitError{exitUsage, err}
	}
	if errors.Is(err, store.ErrInvalid) {
		return nil, nil, &exitError{exitUsage, err}
	}
	if err != nil {
		return nil, nil, err
	}
	if !existed {
		fmt.Fprintf(a.stderr, "mixward: created a new, empty log at %s (set --db or MIXWARD_DB to use another)\n", dbName(o.db))
	}
	return db, loc, nil
}

// openReadDB opens the store named by o read-only: it is never created,
// migrated or written. A missing file is bad input (exit 2); a file of
// another schema version is a problem found (exit 1), and the message names
// the command that upgrades it. olderSchema lets an older file be read as
// it is (log verify).
func openReadDB(ctx context.Context, a *app, o *storeOpts, olderSchema bool) (*store.DB, *time.Location, error) {
	loc, err := siteLocation(o.tz)
	if err != nil {
		return nil, nil, err
	}
	key, err := chainKey(a.getenv)
	if err != nil {
		return nil, nil, err
	}
	opt, err := storeOptions(a.getenv, o.db)
	if err != nil {
		return nil, nil, err
	}
	opt.Location, opt.ChainKey, opt.OlderSchema, opt.Site = loc, key, olderSchema, o.site
	db, err := store.OpenReadOnly(ctx, o.db, opt)
	switch {
	case errors.Is(err, store.ErrNoDatabase), errors.Is(err, store.ErrInvalid):
		return nil, nil, &exitError{exitUsage, err}
	case err != nil:
		return nil, nil, &exitError{exitFail, err}
	}
	return db, loc, nil
}
