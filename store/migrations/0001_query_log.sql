-- Version 1: the query log and its hash chain.
--
-- Each row of queries is one answered (or refused) request, or a record of
-- log maintenance (kind 'prune'). hash is the SHA-256 of the row's content
-- columns and prev_hash; prev_hash is the hash of the row before it. The
-- content encoding is in store/chain.go. AUTOINCREMENT keeps ids from being
-- reused, so sqlite_sequence shows the highest id ever issued.
CREATE TABLE queries (
    id                INTEGER PRIMARY KEY AUTOINCREMENT,
    kind              TEXT NOT NULL DEFAULT 'query' CHECK (kind IN ('query', 'prune')),
    time              TEXT NOT NULL,
    user_id           TEXT NOT NULL DEFAULT '',
    user_name         TEXT NOT NULL DEFAULT '',
    channel           TEXT NOT NULL DEFAULT '',
    event_id          TEXT NOT NULL DEFAULT '',
    request           TEXT NOT NULL DEFAULT '',
    resolved          TEXT NOT NULL DEFAULT '',
    verdict           TEXT NOT NULL DEFAULT ''
        CHECK (verdict IN ('spontaneous', 'non-spontaneous', 'no-reaction', 'error', '')),
    error             TEXT NOT NULL DEFAULT '',
    species           TEXT NOT NULL DEFAULT '[]',
    oxidizer          TEXT NOT NULL DEFAULT '',
    reducer           TEXT NOT NULL DEFAULT '',
    e_cell_v          REAL,
    e_cell_standard_v REAL,
    hazards           TEXT NOT NULL DEFAULT '[]',
    streams           TEXT NOT NULL DEFAULT '[]',
    result            TEXT,
    engine_version    TEXT NOT NULL DEFAULT '',
    data_hash         TEXT NOT NULL DEFAULT '',
    prev_hash         TEXT NOT NULL,
    hash              TEXT NOT NULL
);
-- Covers the digest's counts and stream pairs over a time window, so they
-- read no table rows.
CREATE INDEX queries_time ON queries (time, kind, verdict, user_id, user_name, streams);
CREATE UNIQUE INDEX queries_event ON queries (event_id) WHERE event_id <> '';
CREATE INDEX queries_user_name ON queries (user_name COLLATE NOCASE);
CREATE INDEX queries_user_id ON queries (user_id);

-- Hazards of each query, one row each, for filtering (derived from
-- queries.hazards, which is the hashed copy).
CREATE TABLE query_hazards (
    query_id INTEGER NOT NULL REFERENCES queries (id) ON DELETE CASCADE,
    pos      INTEGER NOT NULL,
    code     TEXT NOT NULL,
    severity TEXT NOT NULL,
    message  TEXT NOT NULL,
    PRIMARY KEY (query_id, pos)
) WITHOUT ROWID;
CREATE INDEX query_hazards_code ON query_hazards (code COLLATE NOCASE, query_id);

-- Outcome of posting each answer. Kept outside the hash chain: a post can
-- be retried and its outcome is operational state, not the safety record.
CREATE TABLE deliveries (
    id       INTEGER PRIMARY KEY,
    query_id INTEGER NOT NULL REFERENCES queries (id) ON DELETE CASCADE,
    time     TEXT NOT NULL,
    ok       INTEGER NOT NULL,
    detail   TEXT NOT NULL DEFAULT ''
);
CREATE INDEX deliveries_query ON deliveries (query_id);
