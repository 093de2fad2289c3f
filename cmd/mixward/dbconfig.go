package main

import (
	"fmt"
	"os"
	"strconv"
	"strings"
	"time"

	"mixward/store"
)

// Environment variables for the database connection, beyond MIXWARD_DB
// (a SQLite file path, or a postgres:// / postgresql:// URL).
const (
	envMaxConns     = "MIXWARD_DB_MAX_CONNS"      // PostgreSQL pool: connections open at most (default 10)
	envMaxIdle      = "MIXWARD_DB_MAX_IDLE_CONNS" // PostgreSQL pool: idle connections kept (default 5)
	envConnLifetime = "MIXWARD_DB_CONN_LIFETIME"  // PostgreSQL pool: close connections older than this (default 30m)
	envConnIdleTime = "MIXWARD_DB_CONN_IDLE_TIME" // PostgreSQL pool: close connections idle this long (default 5m)
	envReplica      = "MIXWARD_REPLICA"           // this replica's name (default host-pid)
	envInboxLease   = "MIXWARD_INBOX_LEASE"       // how long a replica holds an owed answer (default 5m on PostgreSQL, 0 on SQLite)
	envSite         = "MIXWARD_SITE"              // the site this process serves (default main)
)

// defaultInboxLease is how long an owed answer stays with the replica that
// took it, on PostgreSQL: an answer takes seconds; a replica that died
// leaves its answers to the others' hourly sweep after this.
const defaultInboxLease = 5 * time.Minute

// storeOptions reads the database settings from the environment for dsn.
func storeOptions(getenv func(string) string, dsn string) (store.Options, error) {
	var o store.Options
	if getenv == nil {
		return o, nil
	}
	var errs []string
	num := func(key string, dst *int) {
		if v := strings.TrimSpace(getenv(key)); v != "" {
			n, err := strconv.Atoi(v)
			if err != nil || n < 1 {
				errs = append(errs, fmt.Sprintf("%s=%q: want a whole number of at least 1", key, v))
			}
			*dst = n
		}
	}
	dur := func(key string, dst *time.Duration) {
		if v := strings.TrimSpace(getenv(key)); v != "" {
			d, err := time.ParseDuration(v)
			if err != nil || d < 0 {
				errs = append(errs, fmt.Sprintf("%s=%q: want a duration such as 30s, 5m or 1h", key, v))
			}
			*dst = d
		}
	}
	num(envMaxConns, &o.Pool.MaxOpen)
	num(envMaxIdle, &o.Pool.MaxIdle)
	dur(envConnLifetime, &o.Pool.MaxLifetime)
	dur(envConnIdleTime, &o.Pool.MaxIdleTime)
	o.Replica = strings.TrimSpace(getenv(envReplica))
	if store.IsPostgres(dsn) {
		o.InboxLease = defaultInboxLease
	}
	dur(envInboxLease, &o.InboxLease)
	if len(errs) > 0 {
		return o, &exitError{exitUsage, fmt.Errorf("%s", strings.Join(errs, "; "))}
	}
	return o, nil
}

// dbExists reports whether the database named by dsn is there to read: a
// PostgreSQL URL is taken to be (opening it says otherwise), a SQLite file
// must exist.
func dbExists(dsn string) bool {
	if store.IsPostgres(dsn) {
		return true
	}
	_, err := os.Stat(dsn)
	return err == nil
}

// dbName is dsn fit to print: no password, no control characters.
func dbName(dsn string) string { return safe(store.DisplayName(dsn)) }
