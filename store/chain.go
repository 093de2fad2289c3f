package store

import (
	"bytes"
	"crypto/hmac"
	"crypto/sha256"
	"database/sql"
	"encoding/hex"
	"errors"
	"fmt"
	"hash"
	"os"
	"strconv"
)

// Kinds of chained rows.
const (
	kindQuery = "query"
	kindPrune = "prune"
)

// Chain kinds a row may use (column queries.chain, schema version 4).
const (
	// ChainPlain is SHA-256 over the row's content: anyone can recompute it.
	ChainPlain = "sha256"
	// ChainKeyed is HMAC-SHA256 under a key kept outside the database:
	// only a holder of the key can compute it.
	ChainKeyed = "hmac-sha256"
)

// row is one row of the queries table exactly as stored: the hash covers
// these values, so Verify can recompute it from the columns alone.
type row struct {
	ID             int64
	Kind           string
	Time           string
	UserID         string
	UserName       string
	Channel        string
	EventID        string
	Request        string
	Resolved       string
	Verdict        string
	Error          string
	Species        string // JSON array
	Oxidizer       string
	Reducer        string
	ECellV         sql.NullFloat64
	ECellStandardV sql.NullFloat64
	Hazards        string // JSON array of {code, severity, message}
	Streams        string // JSON array
	Result         sql.NullString
	EngineVersion  string
	DataHash       string
	PrevHash       string
	Hash           string
	Chain          string // ChainPlain or ChainKeyed
	KeyID          string // the key's id for ChainKeyed, else ""
	Site           string // the site the row belongs to (schema 9)
}

// rowColumns lists the queries columns in the order of row's fields.
const rowColumns = `id, kind, time, user_id, user_name, channel, event_id, request, resolved, verdict, error,
	species, oxidizer, reducer, e_cell_v, e_cell_standard_v, hazards, streams, result, engine_version, data_hash,
	prev_hash, hash, chain, key_id, site`

// rowColumnsV7 reads a file of schema version 4–7 (before sites): every
// row of such a file belongs to the default site.
const rowColumnsV7 = `id, kind, time, user_id, user_name, channel, event_id, request, resolved, verdict, error,
	species, oxidizer, reducer, e_cell_v, e_cell_standard_v, hazards, streams, result, engine_version, data_hash,
	prev_hash, hash, chain, key_id, 'main'`

// siteVersion is the SQLite schema version that brought sites.
const siteVersion = 8

// hazardBatchVersion is the SQLite schema version from which hazard rows
// are written with the search index, in batches, up to
// search_state.indexed_upto (migrations/0010_hazards_batched.sql).
const hazardBatchVersion = 10

// namesVersion is the SQLite schema version that brought the presses and
// names tables.
const namesVersion = 6

// rowColumnsV3 reads a file of schema version 1–3 (before chain kinds) into
// the same fields: every row of such a file is plain.
const rowColumnsV3 = `id, kind, time, user_id, user_name, channel, event_id, request, resolved, verdict, error,
	species, oxidizer, reducer, e_cell_v, e_cell_standard_v, hazards, streams, result, engine_version, data_hash,
	prev_hash, hash, 'sha256', '', 'main'`

// rowColumnsFor returns the column list for a file of schema version ver.
func rowColumnsFor(ver int) string {
	switch {
	case ver < 4:
		return rowColumnsV3
	case ver < siteVersion:
		return rowColumnsV7
	}
	return rowColumns
}

// scanDest returns pointers to r's fields in rowColumns order.
func (r *row) scanDest() []any {
	return []any{&r.ID, &r.Kind, &r.Time, &r.UserID, &r.UserName, &r.Channel, &r.EventID, &r.Request, &r.Resolved,
		&r.Verdict, &r.Error, &r.Species, &r.Oxidizer, &r.Reducer, &r.ECellV, &r.ECellStandardV, &r.Hazards,
		&r.Streams, &r.Result, &r.EngineVersion, &r.DataHash, &r.PrevHash, &r.Hash, &r.Chain, &r.KeyID, &r.Site}
}

// args returns r's fields in rowColumns order, as statement arguments.
func (r *row) args() []any {
	return []any{r.ID, r.Kind, r.Time, r.UserID, r.UserName, r.Channel, r.EventID, r.Request, r.Resolved, r.Verdict,
		r.Error, r.Species, r.Oxidizer, r.Reducer, r.ECellV, r.ECellStandardV, r.Hazards, r.Streams, r.Result,
		r.EngineVersion, r.DataHash, r.PrevHash, r.Hash, r.Chain, r.KeyID, r.Site}
}

// Content encodings. A change to an encoding is a new version, so rows
// written before it still verify.
const (
	chainVersion      = "mixward-chain-1" // plain rows
	chainVersionKeyed = "mixward-chain-2" // keyed rows: adds chain and key_id
)

// computeHash is the plain chain hash of r: SHA-256 over a canonical
// encoding of every content column and prev_hash (not hash itself). Each
// field is written as "name len:value\n" (len in bytes), NULL as "name -\n",
// numbers in Go's shortest round-trip form, so no two different rows encode
// alike.
func computeHash(r *row) string {
	e := newEncoder(sha256.New())
	e.str("v", chainVersion)
	encodeContent(e, r)
	return e.sum()
}

// keyedHash is the keyed chain hash of r: HMAC-SHA256 under k of the same
// encoding, headed by the keyed version, the chain kind and the key id.
func keyedHash(r *row, k *ChainKey) string {
	e := newEncoder(hmac.New(sha256.New, k.secret))
	e.str("v", chainVersionKeyed)
	e.str("chain", ChainKeyed)
	e.str("key_id", k.id)
	encodeContent(e, r)
	return e.sum()
}

func encodeContent(e *encoder, r *row) {
	e.str("id", strconv.FormatInt(r.ID, 10))
	e.str("kind", r.Kind)
	e.str("time", r.Time)
	e.str("user_id", r.UserID)
	e.str("user_name", r.UserName)
	e.str("channel", r.Channel)
	e.str("event_id", r.EventID)
	e.str("request", r.Request)
	e.str("resolved", r.Resolved)
	e.str("verdict", r.Verdict)
	e.str("error", r.Error)
	e.str("species", r.Species)
	e.str("oxidizer", r.Oxidizer)
	e.str("reducer", r.Reducer)
	e.float("e_cell_v", r.ECellV)
	e.float("e_cell_standard_v", r.ECellStandardV)
	e.str("hazards", r.Hazards)
	e.str("streams", r.Streams)
	if r.Result.Valid {
		e.str("result", r.Result.String)
	} else {
		e.null("result")
	}
	e.str("engine_version", r.EngineVersion)
	e.str("data_hash", r.DataHash)
	if r.Site != DefaultSite && r.Site != "" {
		// Rows of the default site (every row written before sites) hash
		// as they always did; a row moved to or from it no longer matches.
		e.str("site", r.Site)
	}
	e.str("prev_hash", r.PrevHash)
}

// seal sets r's chain kind and hash: keyed under k, plain when k is nil.
func seal(r *row, k *ChainKey) {
	if k == nil {
		r.Chain, r.KeyID = ChainPlain, ""
		r.Hash = computeHash(r)
		return
	}
	r.Chain, r.KeyID = ChainKeyed, k.id
	r.Hash = keyedHash(r, k)
}

// encoder writes the canonical encoding into h through a fixed buffer, so
// that a large value (the result JSON) is neither converted to a byte
// slice of its own nor written in many small pieces. Call sum at the end.
type encoder struct {
	h   hash.Hash
	buf []byte
}

func newEncoder(h hash.Hash) *encoder {
	return &encoder{h: h, buf: make([]byte, 0, 4096)}
}

func (e *encoder) write(s string) {
	for len(s) > 0 {
		if len(e.buf) == cap(e.buf) {
			e.h.Write(e.buf)
			e.buf = e.buf[:0]
		}
		n := copy(e.buf[len(e.buf):cap(e.buf)], s)
		e.buf = e.buf[:len(e.buf)+n]
		s = s[n:]
	}
}

// sum writes what is buffered and returns the hash in hex.
func (e *encoder) sum() string {
	e.h.Write(e.buf)
	e.buf = e.buf[:0]
	return hex.EncodeToString(e.h.Sum(nil))
}

func (e *encoder) str(name, v string) {
	e.write(name)
	e.write(" ")
	var n [20]byte
	e.write(string(strconv.AppendInt(n[:0], int64(len(v)), 10)))
	e.write(":")
	e.write(v)
	e.write("\n")
}

func (e *encoder) null(name string) {
	e.write(name)
	e.write(" -\n")
}

func (e *encoder) float(name string, f sql.NullFloat64) {
	if !f.Valid {
		e.null(name)
		return
	}
	e.str(name, strconv.FormatFloat(f.Float64, 'g', -1, 64))
}

// ChainKey is the secret of the keyed chain. Keep it outside the database
// (and outside its backups): someone with the database file but not the
// key cannot compute the hash of an edited, inserted or appended row.
type ChainKey struct {
	secret []byte
	id     string
}

// MinChainKeyLen is the shortest key accepted, in bytes.
const MinChainKeyLen = 32

// ErrChainKey is wrapped by errors about a missing, short or wrong key.
var ErrChainKey = errors.New("chain key")

// NewChainKey makes a key from secret (at least MinChainKeyLen bytes).
func NewChainKey(secret []byte) (*ChainKey, error) {
	if len(secret) < MinChainKeyLen {
		return nil, fmt.Errorf("%w: %d bytes is too short; use at least %d random bytes (e.g. the output of 'openssl rand -hex 32')",
			ErrChainKey, len(secret), MinChainKeyLen)
	}
	k := &ChainKey{secret: bytes.Clone(secret)}
	m := hmac.New(sha256.New, k.secret)
	m.Write([]byte("mixward chain key id"))
	k.id = hex.EncodeToString(m.Sum(nil))[:16]
	return k, nil
}

// ReadChainKey reads a key file: its whole content, less trailing line
// breaks and spaces, is the key.
func ReadChainKey(path string) (*ChainKey, error) {
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("%w file: %v", ErrChainKey, err)
	}
	k, err := NewChainKey(bytes.TrimRight(b, " \t\r\n"))
	if err != nil {
		return nil, fmt.Errorf("key file %s: %w", path, err)
	}
	return k, nil
}

// ID names the key without revealing it: 16 hex digits of an HMAC of a
// fixed text under the key.
func (k *ChainKey) ID() string { return k.id }
