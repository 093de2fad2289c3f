-- PostgreSQL version 2: sites, as SQLite's version 9. Rows from before
-- belong to the site 'main'; a digest slot is claimed per site.
ALTER TABLE queries ADD COLUMN site text NOT NULL DEFAULT 'main';
CREATE INDEX queries_site_time ON queries (site, time, kind, verdict, user_id, user_name);
CREATE INDEX queries_site_id ON queries (site, id);

ALTER TABLE stream_changes ADD COLUMN site text NOT NULL DEFAULT 'main';
CREATE INDEX stream_changes_site_tag ON stream_changes (site, tag, id);

ALTER TABLE digests ADD COLUMN site text NOT NULL DEFAULT 'main';
ALTER TABLE digests DROP CONSTRAINT digests_pkey;
ALTER TABLE digests ADD PRIMARY KEY (site, slot);
