package store

import (
	"crypto/sha256"
	"database/sql"
	"encoding/hex"
	"hash"
	"strconv"
)

// Kinds of chained rows.
const (
	kindQuery = "query"
	kindPrune = "prune"
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
}

// rowColumns lists the queries columns in the order of row's fields.
const rowColumns = `id, kind, time, user_id, user_name, channel, event_id, request, resolved, verdict, error,
	species, oxidizer, reducer, e_cell_v, e_cell_standard_v, hazards, streams, result, engine_version, data_hash,
	prev_hash, hash`

// scanDest returns pointers to r's fields in rowColumns order.
func (r *row) scanDest() []any {
	return []any{&r.ID, &r.Kind, &r.Time, &r.UserID, &r.UserName, &r.Channel, &r.EventID, &r.Request, &r.Resolved,
		&r.Verdict, &r.Error, &r.Species, &r.Oxidizer, &r.Reducer, &r.ECellV, &r.ECellStandardV, &r.Hazards,
		&r.Streams, &r.Result, &r.EngineVersion, &r.DataHash, &r.PrevHash, &r.Hash}
}

// chainVersion names the content encoding below. A change to the encoding
// is a new version, so rows written before it still verify.
const chainVersion = "mixward-chain-1"

// computeHash is the chain hash of r: SHA-256 over a canonical encoding of
// every content column and prev_hash (not hash itself). Each field is
// written as "name len:value\n" (len in bytes), NULL as "name -\n", numbers
// in Go's shortest round-trip form, so no two different rows encode alike.
func computeHash(r *row) string {
	h := sha256.New()
	e := encoder{h: h}
	e.str("v", chainVersion)
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
	e.str("prev_hash", r.PrevHash)
	return hex.EncodeToString(h.Sum(nil))
}

type encoder struct{ h hash.Hash }

func (e encoder) str(name, v string) {
	e.h.Write([]byte(name))
	e.h.Write([]byte{' '})
	e.h.Write(strconv.AppendInt(nil, int64(len(v)), 10))
	e.h.Write([]byte{':'})
	e.h.Write([]byte(v))
	e.h.Write([]byte{'\n'})
}

func (e encoder) null(name string) {
	e.h.Write([]byte(name))
	e.h.Write([]byte(" -\n"))
}

func (e encoder) float(name string, f sql.NullFloat64) {
	if !f.Valid {
		e.null(name)
		return
	}
	e.str(name, strconv.FormatFloat(f.Float64, 'g', -1, 64))
}
