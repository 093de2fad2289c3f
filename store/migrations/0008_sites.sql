-- Version 8: sites. One database may hold the log, catalogue and digests of
-- several sites (plants); every row says which. Rows from before belong to
-- the site 'main'.
--
-- queries.site is covered by the hash of rows of any other site
-- (store/chain.go): a 'main' row hashes as before, so old rows verify.
ALTER TABLE queries ADD COLUMN site TEXT NOT NULL DEFAULT 'main';
CREATE INDEX queries_site_time ON queries (site, time, kind, verdict, user_id, user_name, streams);

ALTER TABLE stream_changes ADD COLUMN site TEXT NOT NULL DEFAULT 'main';
CREATE INDEX stream_changes_site_tag ON stream_changes (site, tag, id);

-- A digest slot is claimed per site: the key becomes (site, slot).
CREATE TABLE digests_by_site (
    site       TEXT NOT NULL DEFAULT 'main',
    slot       TEXT NOT NULL,
    since      TEXT NOT NULL,
    claimed_at TEXT NOT NULL,
    status     TEXT NOT NULL CHECK (status IN ('claimed', 'sent', 'failed')),
    attempts   INTEGER NOT NULL DEFAULT 0,
    detail     TEXT NOT NULL DEFAULT '',
    body       TEXT NOT NULL DEFAULT '',
    PRIMARY KEY (site, slot)
);
INSERT INTO digests_by_site (site, slot, since, claimed_at, status, attempts, detail, body)
SELECT 'main', slot, since, claimed_at, status, attempts, detail, body FROM digests;
DROP TABLE digests;
ALTER TABLE digests_by_site RENAME TO digests;
