-- Version 13: queries without AUTOINCREMENT; deleted ids are retired by a
-- trigger instead.
--
-- AUTOINCREMENT made every logged query write sqlite_sequence too: one
-- B-tree page more per commit, a seventh of what logging one query wrote.
-- Ids stay never reused without it. query_ids.retired_upto is at least the
-- id of every query row ever deleted (here it starts at the highest id
-- issued so far, which sqlite_sequence held), raised by a trigger on every
-- DELETE, so it is written only when rows are deleted (a prune, or an edit
-- outside mixward), never when one is logged. Every new row takes
-- max(highest id, retired_upto) + 1 (store/query.go appendRow and the
-- check of store/head.go fastInsert), and Verify reports rows missing at
-- the end when retired_upto is above the last row, as it did with
-- sqlite_sequence.
--
-- SQLite cannot drop AUTOINCREMENT from a table in place: queries is
-- rebuilt (with foreign keys off for this step, store/migrate.go, so the
-- tables referring to it keep their rows; foreign_key_check runs before
-- the commit). The columns, ids, hashes and derived rows are unchanged.
CREATE TABLE query_ids (
    id           INTEGER PRIMARY KEY CHECK (id = 1),
    retired_upto INTEGER NOT NULL
);
INSERT INTO query_ids (id, retired_upto)
VALUES (1, coalesce((SELECT seq FROM sqlite_sequence WHERE name = 'queries'), 0));

CREATE TABLE queries_rebuilt (
    id                INTEGER PRIMARY KEY,
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
    hash              TEXT NOT NULL,
    chain             TEXT NOT NULL DEFAULT 'sha256' CHECK (chain IN ('sha256', 'hmac-sha256')),
    key_id            TEXT NOT NULL DEFAULT '',
    site              TEXT NOT NULL DEFAULT 'main'
);
INSERT INTO queries_rebuilt (id, kind, time, user_id, user_name, channel, event_id, request, resolved, verdict, error,
    species, oxidizer, reducer, e_cell_v, e_cell_standard_v, hazards, streams, result, engine_version, data_hash,
    prev_hash, hash, chain, key_id, site)
SELECT id, kind, time, user_id, user_name, channel, event_id, request, resolved, verdict, error,
    species, oxidizer, reducer, e_cell_v, e_cell_standard_v, hazards, streams, result, engine_version, data_hash,
    prev_hash, hash, chain, key_id, site
  FROM queries ORDER BY id;
DROP TABLE queries;
ALTER TABLE queries_rebuilt RENAME TO queries;

CREATE UNIQUE INDEX queries_event ON queries (event_id) WHERE event_id <> '';
CREATE TRIGGER queries_fts_delete AFTER DELETE ON queries BEGIN
    DELETE FROM query_fts WHERE docid = old.id;
END;
CREATE TRIGGER queries_retire AFTER DELETE ON queries BEGIN
    UPDATE query_ids SET retired_upto = old.id WHERE retired_upto < old.id;
END;
