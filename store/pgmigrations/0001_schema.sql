-- PostgreSQL version 1: everything SQLite's versions 1-5 hold (see
-- store/migrations for the reasons behind each table), in PostgreSQL's
-- terms. Times are fixed-width UTC text as in SQLite, compared byte by
-- byte (COLLATE "C"), so text order is time order whatever the database's
-- locale.

-- The query log and its hash chain. Ids are issued by the writer under the
-- chain lock (store/pgchain.go), so no sequence: chain_state.seq is the
-- highest id ever issued (SQLite's sqlite_sequence), which lets Verify see
-- rows cut off the end.
CREATE TABLE queries (
    id                bigint PRIMARY KEY,
    kind              text NOT NULL DEFAULT 'query' CHECK (kind IN ('query', 'prune')),
    time              text COLLATE "C" NOT NULL,
    user_id           text NOT NULL DEFAULT '',
    user_name         text NOT NULL DEFAULT '',
    channel           text NOT NULL DEFAULT '',
    event_id          text NOT NULL DEFAULT '',
    request           text NOT NULL DEFAULT '',
    resolved          text NOT NULL DEFAULT '',
    verdict           text NOT NULL DEFAULT ''
        CHECK (verdict IN ('spontaneous', 'non-spontaneous', 'no-reaction', 'error', '')),
    error             text NOT NULL DEFAULT '',
    species           text NOT NULL DEFAULT '[]',
    oxidizer          text NOT NULL DEFAULT '',
    reducer           text NOT NULL DEFAULT '',
    e_cell_v          double precision,
    e_cell_standard_v double precision,
    hazards           text NOT NULL DEFAULT '[]',
    streams           text NOT NULL DEFAULT '[]',
    result            text,
    engine_version    text NOT NULL DEFAULT '',
    data_hash         text NOT NULL DEFAULT '',
    prev_hash         text NOT NULL,
    hash              text NOT NULL,
    chain             text NOT NULL DEFAULT 'sha256' CHECK (chain IN ('sha256', 'hmac-sha256')),
    key_id            text NOT NULL DEFAULT '',
    -- Derived, not hashed: the searchable words of the row (request as
    -- typed and resolved, species, hazard codes and messages), split,
    -- lower-cased and stripped of accents by the writer exactly as search
    -- terms are (store.Phrases), so every character a user types is
    -- literal. Verify recomputes it from the hashed columns.
    search_doc        text NOT NULL DEFAULT '',
    fts               tsvector GENERATED ALWAYS AS (to_tsvector('simple'::regconfig, search_doc)) STORED
);
CREATE INDEX queries_time ON queries (time, kind, verdict, user_id, user_name);
CREATE UNIQUE INDEX queries_event ON queries (event_id) WHERE event_id <> '';
CREATE INDEX queries_user_name ON queries (lower(user_name));
CREATE INDEX queries_user_id ON queries (user_id);
CREATE INDEX queries_fts ON queries USING gin (fts);

-- The head of the chain, one row: writers lock it (SELECT ... FOR UPDATE)
-- to append, which serialises appends across replicas (store/pgchain.go).
CREATE TABLE chain_state (
    id        integer PRIMARY KEY CHECK (id = 1),
    seq       bigint NOT NULL,
    last_id   bigint NOT NULL DEFAULT 0,
    last_hash text NOT NULL DEFAULT '',
    last_time text COLLATE "C" NOT NULL DEFAULT ''
);
INSERT INTO chain_state (id, seq) VALUES (1, 0);

CREATE TABLE query_hazards (
    query_id bigint NOT NULL REFERENCES queries (id) ON DELETE CASCADE,
    pos      integer NOT NULL,
    code     text NOT NULL,
    severity text NOT NULL,
    message  text NOT NULL,
    PRIMARY KEY (query_id, pos)
);
CREATE INDEX query_hazards_code ON query_hazards (lower(code), query_id);

CREATE TABLE deliveries (
    id       bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    query_id bigint NOT NULL REFERENCES queries (id) ON DELETE CASCADE,
    time     text COLLATE "C" NOT NULL,
    ok       boolean NOT NULL,
    detail   text NOT NULL DEFAULT ''
);
CREATE INDEX deliveries_query ON deliveries (query_id);

-- The search index is a generated column, always up to date, so
-- indexed_upto is not used; time_order_broken is as in SQLite.
CREATE TABLE search_state (
    id                integer PRIMARY KEY CHECK (id = 1),
    indexed_upto      bigint NOT NULL,
    time_order_broken boolean NOT NULL DEFAULT false
);
INSERT INTO search_state (id, indexed_upto, time_order_broken) VALUES (1, 0, false);

CREATE TABLE stream_changes (
    id         bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    tag        text NOT NULL,
    action     text NOT NULL CHECK (action IN ('set', 'remove')),
    stream     text NOT NULL DEFAULT '',
    note       text NOT NULL DEFAULT '',
    changed_by text NOT NULL,
    time       text COLLATE "C" NOT NULL
);
CREATE INDEX stream_changes_tag ON stream_changes (tag, id);
CREATE FUNCTION stream_changes_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
    RAISE EXCEPTION 'stream history is append-only';
END;
$$;
CREATE TRIGGER stream_changes_no_change BEFORE UPDATE OR DELETE ON stream_changes
    FOR EACH ROW EXECUTE FUNCTION stream_changes_append_only();

CREATE TABLE digests (
    slot       text COLLATE "C" PRIMARY KEY,
    since      text COLLATE "C" NOT NULL,
    claimed_at text COLLATE "C" NOT NULL,
    status     text NOT NULL CHECK (status IN ('claimed', 'sent', 'failed')),
    attempts   integer NOT NULL DEFAULT 0,
    detail     text NOT NULL DEFAULT '',
    body       text NOT NULL DEFAULT ''
);

-- The inbox. lease_owner and lease_until say which replica is answering a
-- pending entry and until when: another replica's sweep of owed answers
-- takes it over only after the lease ran out.
CREATE TABLE inbox (
    seq         bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    event_id    text NOT NULL UNIQUE,
    received    text COLLATE "C" NOT NULL,
    thread      text NOT NULL,
    message     text NOT NULL,
    state       text NOT NULL DEFAULT 'pending' CHECK (state IN ('pending', 'posted', 'failed')),
    attempts    integer NOT NULL DEFAULT 0,
    detail      text NOT NULL DEFAULT '',
    done_at     text COLLATE "C" NOT NULL DEFAULT '',
    lease_owner text NOT NULL DEFAULT '',
    lease_until text COLLATE "C" NOT NULL DEFAULT ''
);
CREATE INDEX inbox_pending ON inbox (seq) WHERE state = 'pending';
CREATE INDEX inbox_done ON inbox (done_at) WHERE state <> 'pending';
