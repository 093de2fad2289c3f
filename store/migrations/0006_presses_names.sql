-- Version 6: button presses on answers, and the names seen for Slack ids.
--
-- presses: one row per button pressed under an answer in chat (details,
-- E–pH picture, pour order) or the same command at the console, recorded
-- against the query it was pressed on. Kept outside the hash chain like
-- deliveries: a press asks to see more of an answer already on record and
-- changes nothing of it; the answer itself is the hashed row. press_key is
-- the transport's id of the press (Slack's action_ts with the user), so a
-- redelivered press is recorded once.
CREATE TABLE presses (
    id        INTEGER PRIMARY KEY,
    query_id  INTEGER NOT NULL REFERENCES queries (id) ON DELETE CASCADE,
    time      TEXT NOT NULL,
    action    TEXT NOT NULL CHECK (action IN ('details', 'picture', 'pour')),
    user_id   TEXT NOT NULL DEFAULT '',
    user_name TEXT NOT NULL DEFAULT '',
    channel   TEXT NOT NULL DEFAULT '',
    transport TEXT NOT NULL DEFAULT '',
    press_key TEXT NOT NULL DEFAULT ''
);
CREATE INDEX presses_query ON presses (query_id);
CREATE UNIQUE INDEX presses_key ON presses (press_key) WHERE press_key <> '';

-- names: the display name seen for a Slack user or channel id, one row per
-- (id, name), with when it was first and last seen, so a record can show
-- the name that held at its time. The query log keeps the ids (and the
-- user name at the time, hashed); this table only labels them. Outside the
-- hash chain: it is a lookup of Slack's own directory.
CREATE TABLE names (
    slack_id   TEXT NOT NULL,
    name       TEXT NOT NULL,
    first_seen TEXT NOT NULL,
    last_seen  TEXT NOT NULL,
    PRIMARY KEY (slack_id, name)
) WITHOUT ROWID;
CREATE INDEX names_latest ON names (slack_id, last_seen);
