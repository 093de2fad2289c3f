-- PostgreSQL version 4: the digest parses no JSON, as SQLite's version 9.
-- The decision level of an answer (result.decision.level) becomes a
-- stored generated column, computed once when the row is written (and
-- here, for every row already logged). It is derived from the hashed
-- result and not hashed itself; the chain's encoding is unchanged, and
-- PostgreSQL refuses a direct update of a generated column, so it cannot
-- drift from the row. The digest keeps walking queries_site_time; an index
-- covering the digest's columns (INCLUDE the texts) cost 18 % of the
-- logging rate for no gain measured here, so there is none.
--
-- jsonb refuses the escape \u0000 that json.Marshal writes for a NUL in a
-- string (valid JSON, stored as text): the level is read from the result
-- with that sequence read as \ufffd, which keeps the text valid JSON
-- wherever the six characters stand, so such a row is logged and gets its
-- level as on SQLite.
ALTER TABLE queries ADD COLUMN level text GENERATED ALWAYS AS (
    CASE WHEN verdict <> 'error' AND result IS NOT NULL
         THEN coalesce(replace(result, '\u0000', '\ufffd')::jsonb #>> '{decision,level}', '') ELSE '' END) STORED;
