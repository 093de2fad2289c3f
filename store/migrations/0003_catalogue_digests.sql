-- Version 3: the site stream catalogue and the record of digests sent.

-- Every change to a stream tag, oldest first. The current definition of a
-- tag is its newest change; a 'remove' hides the tag. Rows are never
-- updated or deleted.
CREATE TABLE stream_changes (
    id         INTEGER PRIMARY KEY AUTOINCREMENT,
    tag        TEXT NOT NULL,
    action     TEXT NOT NULL CHECK (action IN ('set', 'remove')),
    stream     TEXT NOT NULL DEFAULT '',
    note       TEXT NOT NULL DEFAULT '',
    changed_by TEXT NOT NULL,
    time       TEXT NOT NULL
);
CREATE INDEX stream_changes_tag ON stream_changes (tag, id);
CREATE TRIGGER stream_changes_no_update BEFORE UPDATE ON stream_changes BEGIN
    SELECT RAISE(ABORT, 'stream history is append-only');
END;
CREATE TRIGGER stream_changes_no_delete BEFORE DELETE ON stream_changes BEGIN
    SELECT RAISE(ABORT, 'stream history is append-only');
END;

-- One row per scheduled digest slot (the end of the period it covers). The
-- primary key is what keeps a digest from being sent twice: a slot is
-- claimed before it is published.
CREATE TABLE digests (
    slot       TEXT PRIMARY KEY,
    since      TEXT NOT NULL,
    claimed_at TEXT NOT NULL,
    status     TEXT NOT NULL CHECK (status IN ('claimed', 'sent', 'failed')),
    attempts   INTEGER NOT NULL DEFAULT 0,
    detail     TEXT NOT NULL DEFAULT '',
    body       TEXT NOT NULL DEFAULT ''
);
