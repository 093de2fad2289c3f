-- Version 2: full-text search for safety reviewers (built-in FTS4, so no
-- build tags are needed). One document per query row, docid = queries.id:
-- the request as typed plus its tag-resolved form, the species, and each
-- hazard's code and message. Rows logged before this version are indexed
-- here.
--
-- The index is derived data and trails the log by a few rows: LogQuery
-- indexes in batches (one FTS segment per batch instead of per query), and
-- Search and Close first index whatever is left. search_state says up to
-- which query id every row is indexed.
--
-- time_order_broken is 1 once some row's time is earlier than the row
-- before it (a clock stepped back, or a caller-given time). While it is 0,
-- a time window maps to an id range by two index look-ups; after, by scans.
CREATE TABLE search_state (
    id                INTEGER PRIMARY KEY CHECK (id = 1),
    indexed_upto      INTEGER NOT NULL,
    time_order_broken INTEGER NOT NULL DEFAULT 0
);
INSERT INTO search_state (id, indexed_upto, time_order_broken) VALUES (1,
    coalesce((SELECT max(id) FROM queries), 0),
    EXISTS (SELECT 1 FROM queries a JOIN queries b ON b.id = a.id + 1 WHERE b.time < a.time));

-- order=DESC keeps doclists newest first, so a newest-first search reads
-- only as far as the page it needs.
CREATE VIRTUAL TABLE query_fts USING fts4(request, species, hazards, tokenize=unicode61, order=DESC);

INSERT INTO query_fts (docid, request, species, hazards)
SELECT q.id,
       q.request || ' ' || q.resolved,
       q.species,
       coalesce((SELECT group_concat(h.code || ' ' || h.message, ' ')
                   FROM query_hazards h WHERE h.query_id = q.id), '')
  FROM queries q
 WHERE q.kind = 'query'
 ORDER BY q.id;

CREATE TRIGGER queries_fts_delete AFTER DELETE ON queries BEGIN
    DELETE FROM query_fts WHERE docid = old.id;
END;
