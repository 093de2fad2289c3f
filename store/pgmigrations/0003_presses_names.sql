-- PostgreSQL version 3: button presses on answers and the names seen for
-- Slack ids, as SQLite's version 6 (see store/migrations for the reasons:
-- both tables are kept outside the hash chain). A press belongs to the
-- site of its query; a Slack id names one user or channel of the
-- workspace whatever the site, so names has no site.
CREATE TABLE presses (
    id        bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    query_id  bigint NOT NULL REFERENCES queries (id) ON DELETE CASCADE,
    time      text COLLATE "C" NOT NULL,
    action    text NOT NULL CHECK (action IN ('details', 'picture', 'pour')),
    user_id   text NOT NULL DEFAULT '',
    user_name text NOT NULL DEFAULT '',
    channel   text NOT NULL DEFAULT '',
    transport text NOT NULL DEFAULT '',
    press_key text NOT NULL DEFAULT ''
);
CREATE INDEX presses_query ON presses (query_id);
CREATE UNIQUE INDEX presses_key ON presses (press_key) WHERE press_key <> '';

CREATE TABLE names (
    slack_id   text NOT NULL,
    name       text NOT NULL,
    first_seen text COLLATE "C" NOT NULL,
    last_seen  text COLLATE "C" NOT NULL,
    PRIMARY KEY (slack_id, name)
);
CREATE INDEX names_latest ON names (slack_id, last_seen);
