-- Version 9: the digest reads no JSON. The decision level of an answer
-- (result.decision.level) becomes a generated column of the row, and the
-- site-and-time index that the digest walks carries it, so the digest
-- takes the level from the index entry it walks instead of parsing the
-- result. (Covering every column the digest reads made the index three
-- times wider and logging slower for no digest gain measured.)
--
-- The column is derived from the hashed result and is not hashed itself
-- (the chain's encoding in store/chain.go is unchanged, old rows verify).
-- Being VIRTUAL it is never stored in the table and cannot drift from the
-- result; the index holds the value computed when the row was written
-- and SQLite recomputes it on any change of result. Old rows get their
-- level when the index is built here, so no separate fill step is needed
-- and nothing has to be reindexed.
ALTER TABLE queries ADD COLUMN level TEXT GENERATED ALWAYS AS (
    CASE WHEN verdict <> 'error' AND json_valid(result)
         THEN coalesce(json_extract(result, '$.decision.level'), '') ELSE '' END) VIRTUAL;
DROP INDEX queries_site_time;
CREATE INDEX queries_site_time ON queries (site, time, kind, verdict, user_id, user_name, streams, level);
