-- Version 7: inbox leases, for several processes sharing one database.
--
-- lease_owner names the process answering a pending entry and lease_until
-- (UTC text, as every time here) how long the entry stays its own: another
-- process's sweep of owed answers takes it over only after that. Empty
-- means no lease: the entry is anyone's, as before this version.
ALTER TABLE inbox ADD COLUMN lease_owner TEXT NOT NULL DEFAULT '';
ALTER TABLE inbox ADD COLUMN lease_until TEXT NOT NULL DEFAULT '';
