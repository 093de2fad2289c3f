-- Version 11: the time, site and asker look-ups move to a derived table
-- written in batches with the search index.
--
-- Each B-tree a commit touches costs at least one page of the WAL, and the
-- four indexes on queries for time, site and time, and the two asker
-- columns were a third of what logging one query wrote. query_keys holds
-- the same look-up columns of every row up to search_state.indexed_upto,
-- derived from the hashed row (level is the generated column of version 9)
-- and written by LogQuery with the search documents and the hazard rows,
-- every indexBatch queries. Readers use its indexes below the mark and scan
-- the few rows above it (store/keys.go), so their results do not change.
-- Verify compares every row of it with its query row.
CREATE TABLE query_keys (
    id        INTEGER PRIMARY KEY REFERENCES queries (id) ON DELETE CASCADE,
    site      TEXT NOT NULL,
    time      TEXT NOT NULL,
    kind      TEXT NOT NULL,
    user_id   TEXT NOT NULL,
    user_name TEXT NOT NULL,
    level     TEXT NOT NULL
);
INSERT INTO query_keys (id, site, time, kind, user_id, user_name, level)
SELECT id, site, time, kind, user_id, user_name, level FROM queries
 WHERE id <= (SELECT indexed_upto FROM search_state) ORDER BY id;
-- Covers the digest's window and level, like queries_site_time did.
CREATE INDEX query_keys_site_time ON query_keys (site, time, kind, level);
CREATE INDEX query_keys_time ON query_keys (time);
CREATE INDEX query_keys_user_name ON query_keys (user_name COLLATE NOCASE);
CREATE INDEX query_keys_user_id ON query_keys (user_id);
DROP INDEX queries_time;
DROP INDEX queries_site_time;
DROP INDEX queries_user_name;
DROP INDEX queries_user_id;
