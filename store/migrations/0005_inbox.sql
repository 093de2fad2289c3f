-- Version 5: the inbox of acknowledged Slack messages.
--
-- A message is written here before Slack gets its acknowledgement, so
-- that an answer owed is never only in memory: a process stopped by
-- SIGTERM past its drain timeout, or killed, leaves its unanswered
-- messages here, and the next process answers them (in seq order, which
-- keeps the order within a thread). event_id is the transport's delivery
-- id; a redelivery of a message already here is not taken again.
--
-- state: 'pending' until the answer is posted (or refused for good),
-- then 'posted' or 'failed'. Operational state like deliveries, not part
-- of the hash chain.
CREATE TABLE inbox (
    seq       INTEGER PRIMARY KEY AUTOINCREMENT,
    event_id  TEXT NOT NULL UNIQUE,
    received  TEXT NOT NULL,
    thread    TEXT NOT NULL,
    message   TEXT NOT NULL,
    state     TEXT NOT NULL DEFAULT 'pending' CHECK (state IN ('pending', 'posted', 'failed')),
    attempts  INTEGER NOT NULL DEFAULT 0,
    detail    TEXT NOT NULL DEFAULT '',
    done_at   TEXT NOT NULL DEFAULT ''
);
CREATE INDEX inbox_pending ON inbox (seq) WHERE state = 'pending';
CREATE INDEX inbox_done ON inbox (done_at) WHERE state <> 'pending';
