-- Version 4: which chain each row uses.
--
-- chain 'sha256' is the plain chain of versions 1-3: hash is the SHA-256 of
-- the row's content and prev_hash (store/chain.go, mixward-chain-1). Every
-- row written before this version is plain and keeps its hash unchanged.
--
-- chain 'hmac-sha256' is the keyed chain: hash is an HMAC-SHA256, under a
-- secret key kept outside the database (MIXWARD_CHAIN_KEY_FILE), of the same
-- content plus chain and key_id (mixward-chain-2). key_id names the key (an
-- HMAC of a fixed text under it, so it reveals nothing of the key). Without
-- the key nobody can compute the hash of an edited or added row.
ALTER TABLE queries ADD COLUMN chain TEXT NOT NULL DEFAULT 'sha256'
    CHECK (chain IN ('sha256', 'hmac-sha256'));
ALTER TABLE queries ADD COLUMN key_id TEXT NOT NULL DEFAULT '';
