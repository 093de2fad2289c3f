-- PostgreSQL version 4: the digest reads no JSON, as SQLite's version 9.
-- The decision level of an answer (result.decision.level) becomes a
-- stored generated column, computed once when the row is written (and
-- here, for every row already logged). It is derived from the hashed
-- result and not hashed itself; the chain's encoding is unchanged. The
-- site-and-time index carries it and the other columns the digest reads,
-- so the digest window is one index-only scan.
ALTER TABLE queries ADD COLUMN level text GENERATED ALWAYS AS (
    CASE WHEN verdict <> 'error' AND result IS NOT NULL
         THEN coalesce(result::jsonb #>> '{decision,level}', '') ELSE '' END) STORED;
DROP INDEX queries_site_time;
CREATE INDEX queries_site_time ON queries (site, time, kind, verdict, user_id, user_name)
    INCLUDE (id, channel, request, resolved, error, streams, hazards, level);
