package store

import (
	"bytes"
	"context"
	"database/sql"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"strings"
	"time"
	"unicode/utf8"
)

// Hazard is one hazard found in a mix, as logged.
type Hazard struct {
	Code     string `json:"code"`
	Severity string `json:"severity"` // info, warning or danger
	Message  string `json:"message"`
}

// Query is one logged request and its answer. Its JSON form is used by
// `mixward log search/export --format json`; field names never change.
type Query struct {
	ID   int64     `json:"id"`
	Time time.Time `json:"time"` // UTC; set by LogQuery from the clock when zero

	UserID   string `json:"user_id"`
	UserName string `json:"user_name"`
	Channel  string `json:"channel"`  // Slack channel id, "console" or "cli"
	EventID  string `json:"event_id"` // transport delivery id for de-duplication; "" = none

	Request  string `json:"request"`  // raw text as typed
	Resolved string `json:"resolved"` // request after stream-tag substitution ("" when none)
	Verdict  string `json:"verdict"`  // spontaneous, non-spontaneous, no-reaction or error
	Error    string `json:"error"`    // parse error message when Verdict == "error"

	Species        []string `json:"species"` // species texts, e.g. "MnO4-", "Fe^2+", "Cu(s)"
	Oxidizer       string   `json:"oxidizer"`
	Reducer        string   `json:"reducer"`
	ECellV         *float64 `json:"e_cell_v"`
	ECellStandardV *float64 `json:"e_cell_standard_v"`
	Hazards        []Hazard `json:"hazards"`
	Streams        []string `json:"streams"` // stream texts as parsed, tags resolved

	// Result is the full engine result JSON (nil for errors).
	Result json.RawMessage `json:"result"`
	// ResultCompact says Result is valid JSON without insignificant
	// whitespace, as json.Marshal writes it: LogQuery then stores it as it
	// is instead of scanning it again. Otherwise LogQuery checks it and
	// compacts it only when it has whitespace outside strings.
	ResultCompact bool `json:"-"`

	EngineVersion string `json:"engine_version"`
	DataHash      string `json:"data_hash"`

	Hash     string `json:"hash"`      // set by LogQuery
	PrevHash string `json:"prev_hash"` // set by LogQuery
	Chain    string `json:"chain"`     // ChainPlain or ChainKeyed; set by LogQuery
	KeyID    string `json:"key_id"`    // the key's id when keyed; set by LogQuery

	// Site is the site the query was asked at; LogQuery sets the DB's
	// site when it is empty.
	Site string `json:"site"`
}

// The verdicts a query can carry.
const (
	VerdictSpontaneous    = "spontaneous"
	VerdictNonSpontaneous = "non-spontaneous"
	VerdictNoReaction     = "no-reaction"
	VerdictError          = "error"
)

// Verdicts lists the valid verdicts in display order.
var Verdicts = []string{VerdictSpontaneous, VerdictNonSpontaneous, VerdictNoReaction, VerdictError}

// ValidVerdict reports whether v is one of Verdicts.
func ValidVerdict(v string) bool {
	for _, x := range Verdicts {
		if v == x {
			return true
		}
	}
	return false
}

// Severities of hazards, least to most severe.
var severities = []string{"info", "warning", "danger"}

// LogQuery writes q as the next row of the chain in one transaction and
// returns its id; it sets q.ID, q.Time (when zero), q.Hash and q.PrevHash.
// A query whose EventID is already logged is not written again: the
// existing id is returned with an error wrapping ErrDuplicate. Text fields
// are stored as given, except that invalid UTF-8 and NUL bytes become
// U+FFFD. The derived rows (the full-text index and the hazard rows) are
// brought up to date every indexBatch queries inside the same
// transaction; Search and Close index the rest first, and the hazard
// search reads the rows not yet indexed from their hashed hazards.
func (db *DB) LogQuery(ctx context.Context, q *Query) (int64, error) {
	if q == nil {
		return 0, fmt.Errorf("log query: %w: nil query", ErrInvalid)
	}
	if err := db.writable("log query"); err != nil {
		return 0, err
	}
	if q.Time.IsZero() {
		q.Time = db.now()
	}
	q.Time = q.Time.UTC()
	if q.Site == "" {
		q.Site = db.site
	}
	r, err := encodeQuery(q)
	if err != nil {
		return 0, err
	}
	if db.pg {
		id, err := db.pgLogQuery(ctx, r)
		if err != nil {
			return id, err
		}
		q.ID, q.Hash, q.PrevHash, q.Chain, q.KeyID = r.ID, r.Hash, r.PrevHash, r.Chain, r.KeyID
		return r.ID, nil
	}
	err = db.logSQLite(ctx, r, q.Hazards)
	if errors.Is(err, ErrDuplicate) && q.EventID != "" {
		return db.loggedEvent(ctx, q.EventID, err)
	}
	if err != nil {
		return 0, fmt.Errorf("log query: %w", err)
	}
	q.ID, q.Hash, q.PrevHash, q.Chain, q.KeyID = r.ID, r.Hash, r.PrevHash, r.Chain, r.KeyID
	return r.ID, nil
}

// logSQLite appends r to a SQLite log: in one statement by appendFast when
// the head this process last wrote is still the head and no batch of
// derived rows is due, else in a transaction that reads the head
// (appendRow) and brings the derived rows up to date every indexBatch
// rows. A repeated event id is refused by the unique index on event_id (no
// look-up before every insert) with an error wrapping ErrDuplicate.
func (db *DB) logSQLite(ctx context.Context, r *row, hz []Hazard) error {
	if ok, err := db.appendFast(ctx, r); ok || err != nil {
		return err
	}
	tx, err := db.w.BeginTx(ctx, nil)
	if err != nil {
		return err
	}
	defer tx.Rollback()
	if err := db.appendRow(ctx, tx, r, ""); err != nil {
		return err
	}
	if db.ver < hazardBatchVersion { // since then indexUpTo writes them
		if err := db.insertHazards(ctx, tx, r.ID, hz); err != nil {
			return err
		}
	}
	mark, err := db.indexUpTo(ctx, tx, r.ID, false)
	if err != nil {
		return err
	}
	if err := tx.Commit(); err != nil {
		return fmt.Errorf("commit: %w", err)
	}
	db.noteHead(r.ID, r.Hash, mark)
	return nil
}

// loggedEvent returns the id of the query already logged for eventID with
// ErrDuplicate (dupErr when it cannot be read).
func (db *DB) loggedEvent(ctx context.Context, eventID string, dupErr error) (int64, error) {
	var id int64
	if err := db.w.QueryRowContext(ctx, db.ws.event.sql, eventID).Scan(&id); err != nil {
		return 0, fmt.Errorf("log query: %w", dupErr)
	}
	return id, fmt.Errorf("log query: event %q is query %d: %w", eventID, id, ErrDuplicate)
}

// clean makes s storable text: valid UTF-8 without NUL bytes.
func clean(s string) string {
	if !utf8.ValidString(s) {
		s = strings.ToValidUTF8(s, "\uFFFD")
	}
	if strings.IndexByte(s, 0) >= 0 {
		s = strings.ReplaceAll(s, "\x00", "\uFFFD")
	}
	return s
}

func cleanAll(ss []string) []string {
	out := make([]string, len(ss))
	for i, s := range ss {
		out[i] = clean(s)
	}
	return out
}

// encodeQuery validates q (cleaning its text in place) and returns its row
// without id and hashes.
func encodeQuery(q *Query) (*row, error) {
	if !ValidVerdict(q.Verdict) {
		return nil, fmt.Errorf("log query: %w: verdict %q is not one of %s", ErrInvalid, q.Verdict, strings.Join(Verdicts, ", "))
	}
	site, err := NormalizeSite(q.Site)
	if err != nil {
		return nil, fmt.Errorf("log query: %w", err)
	}
	q.Site = site
	if q.Verdict == VerdictError && strings.TrimSpace(q.Error) == "" {
		return nil, fmt.Errorf("log query: %w: verdict error needs the parse error message in Error", ErrInvalid)
	}
	for _, f := range []struct {
		name string
		v    *float64
	}{{"e_cell_v", q.ECellV}, {"e_cell_standard_v", q.ECellStandardV}} {
		if f.v != nil && (math.IsNaN(*f.v) || math.IsInf(*f.v, 0)) {
			return nil, fmt.Errorf("log query: %w: %s is %v; give a finite number or nil", ErrInvalid, f.name, *f.v)
		}
	}
	for i := range q.Hazards {
		h := &q.Hazards[i]
		h.Code, h.Severity, h.Message = clean(h.Code), clean(h.Severity), clean(h.Message)
		if strings.TrimSpace(h.Code) == "" {
			return nil, fmt.Errorf("log query: %w: hazard %d has no code", ErrInvalid, i+1)
		}
		if !contains(severities, h.Severity) {
			return nil, fmt.Errorf("log query: %w: hazard %s has severity %q, want one of %s",
				ErrInvalid, h.Code, h.Severity, strings.Join(severities, ", "))
		}
	}
	q.UserID, q.UserName, q.Channel, q.EventID = clean(q.UserID), clean(q.UserName), clean(q.Channel), clean(q.EventID)
	q.Request, q.Resolved, q.Error = clean(q.Request), clean(q.Resolved), clean(q.Error)
	q.Oxidizer, q.Reducer = clean(q.Oxidizer), clean(q.Reducer)
	q.EngineVersion, q.DataHash = clean(q.EngineVersion), clean(q.DataHash)
	q.Species, q.Streams = cleanAll(q.Species), cleanAll(q.Streams)
	if q.Hazards == nil {
		q.Hazards = []Hazard{}
	}
	r := &row{
		Kind: kindQuery, Time: formatTime(q.Time),
		UserID: q.UserID, UserName: q.UserName, Channel: q.Channel, EventID: q.EventID,
		Request: q.Request, Resolved: q.Resolved, Verdict: q.Verdict, Error: q.Error,
		Species: mustJSON(q.Species), Oxidizer: q.Oxidizer, Reducer: q.Reducer,
		ECellV: nullFloat(q.ECellV), ECellStandardV: nullFloat(q.ECellStandardV),
		Hazards: mustJSON(q.Hazards), Streams: mustJSON(q.Streams),
		EngineVersion: q.EngineVersion, DataHash: q.DataHash, Site: q.Site,
	}
	if q.Result != nil {
		res, err := compactResult(q.Result, q.ResultCompact)
		if err != nil {
			return nil, err
		}
		q.Result = res
		r.Result = sql.NullString{String: string(res), Valid: true}
	}
	return r, nil
}

// compactResult returns the result JSON without insignificant whitespace.
// Trusted bytes (Query.ResultCompact) are returned as they are; others are
// checked with json.Valid and compacted only when they hold whitespace
// outside strings (re-compacting compact JSON cost a third of LogQuery).
func compactResult(b json.RawMessage, trusted bool) (json.RawMessage, error) {
	if trusted {
		return b, nil
	}
	if !json.Valid(b) {
		return nil, fmt.Errorf("log query: %w: result is not valid JSON", ErrInvalid)
	}
	if !spaceOutsideStrings(b) {
		return b, nil
	}
	var buf bytes.Buffer
	if err := json.Compact(&buf, b); err != nil {
		return nil, fmt.Errorf("log query: %w: result is not valid JSON: %v", ErrInvalid, err)
	}
	return buf.Bytes(), nil
}

// spaceOutsideStrings reports whether the valid JSON b has a space, tab or
// line break outside its strings.
func spaceOutsideStrings(b []byte) bool {
	in, esc := false, false
	for _, c := range b {
		switch {
		case esc:
			esc = false
		case in && c == '\\':
			esc = true
		case c == '"':
			in = !in
		case !in && (c == ' ' || c == '\t' || c == '\n' || c == '\r'):
			return true
		}
	}
	return false
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

// mustJSON encodes slices of strings or hazards; these cannot fail.
func mustJSON(v any) string {
	b, err := json.Marshal(v)
	if err != nil {
		panic("store: " + err.Error())
	}
	if string(b) == "null" {
		return "[]"
	}
	return string(b)
}

func nullFloat(f *float64) sql.NullFloat64 {
	if f == nil {
		return sql.NullFloat64{}
	}
	return sql.NullFloat64{Float64: *f, Valid: true}
}

// appendRow gives r the next id, links it to the newest row (or to
// emptyPrev when the table is empty) and inserts it. It must run in a
// write transaction. Ids are contiguous: the next id is one more than the
// highest ever issued, and a rolled-back transaction takes its id back.
func (db *DB) appendRow(ctx context.Context, tx *sql.Tx, r *row, emptyPrev string) error {
	if db.pg {
		seq, lastID, prev, _, err := pgHead(ctx, tx, emptyPrev, "")
		if err != nil {
			return err
		}
		r.ID, r.PrevHash = max(seq, lastID)+1, prev
		seal(r, db.key)
		return db.insertRow(ctx, tx, r)
	}
	var seq, lastID int64
	var prev, lastTime string
	if err := db.ws.head.queryRow(ctx, tx, emptyPrev).Scan(&seq, &lastID, &prev, &lastTime); err != nil {
		return err
	}
	if r.Time < lastTime && db.ver >= 2 {
		if _, err := db.ws.timeBroken.exec(ctx, tx); err != nil {
			return err
		}
	}
	r.ID = max(seq, lastID) + 1
	r.PrevHash = prev
	if db.ver < siteVersion {
		r.Site = DefaultSite
	}
	if db.ver < 4 { // a file of an older schema (tests build them): plain rows only
		seal(r, nil)
	} else {
		seal(r, db.key)
	}
	err := db.insertRow(ctx, tx, r)
	if isUnique(err) {
		return fmt.Errorf("%w: event id %q already logged", ErrDuplicate, r.EventID)
	}
	return err
}

// insertRow inserts r, already sealed, as it is (LogQuery after sealing
// it; CopyLog to keep a row's id and hash). On PostgreSQL it writes the
// row's hazard rows too.
func (db *DB) insertRow(ctx context.Context, tx *sql.Tx, r *row) error {
	args := r.args()[:23] // up to hash: the columns of every schema version
	var err error
	switch {
	case db.pg: // with its hazard rows and the new head
		err = pgInsert(ctx, tx, r)
	case db.ver < 4:
		_, err = tx.ExecContext(ctx, insertV3, args...)
	case db.ver < siteVersion:
		_, err = tx.ExecContext(ctx, insertV7, append(args, r.Chain, r.KeyID)...)
	default:
		_, err = db.ws.insert.exec(ctx, tx, append(args, r.Chain, r.KeyID, r.Site)...)
	}
	return err
}

func (db *DB) insertHazards(ctx context.Context, tx *sql.Tx, id int64, hz []Hazard) error {
	for i, h := range hz {
		if _, err := db.ws.hazard.exec(ctx, tx, id, i, h.Code, h.Severity, h.Message); err != nil {
			return err
		}
	}
	return nil
}

// indexBatch is how many logged rows may wait for the search index and
// their hazard rows before LogQuery writes them (in its own transaction,
// one FTS segment for all, the hazard rows in one statement).
const indexBatch = 256

// indexUpTo indexes every query row with id in (indexed_upto, upto], writes
// the hazard rows of every row there (schema hazardBatchVersion and later)
// and its query_keys row (keysVersion and later),
// and moves the mark; force indexes even a short backlog. It returns the
// mark as it stands after.
func (db *DB) indexUpTo(ctx context.Context, tx *sql.Tx, upto int64, force bool) (int64, error) {
	if db.pg {
		return upto, nil // the search column is generated with the row
	}
	var done int64
	if err := db.ws.indexed.queryRow(ctx, tx).Scan(&done); err != nil {
		return 0, err
	}
	if upto <= done || (!force && upto-done < indexBatch) {
		return done, nil
	}
	if db.ver >= hazardBatchVersion {
		if _, err := db.ws.hazards.exec(ctx, tx, done, upto); err != nil {
			return 0, err
		}
	}
	if db.ver >= keysVersion {
		if _, err := db.ws.keys.exec(ctx, tx, done, upto); err != nil {
			return 0, err
		}
	}
	if _, err := db.ws.index.exec(ctx, tx, done, upto); err != nil {
		return 0, err
	}
	if _, err := db.ws.setIndexed.exec(ctx, tx, upto); err != nil {
		return 0, err
	}
	return upto, nil
}

// syncIndex indexes every row not yet in the search index.
func (db *DB) syncIndex(ctx context.Context) error {
	if db.pg {
		return nil
	}
	var done, last int64
	err := db.r.QueryRowContext(ctx, `SELECT (SELECT indexed_upto FROM search_state), coalesce((SELECT max(id) FROM queries), 0)`).Scan(&done, &last)
	if err != nil || done >= last {
		return err
	}
	tx, err := db.w.BeginTx(ctx, nil)
	if err != nil {
		return err
	}
	defer tx.Rollback()
	if err := tx.QueryRowContext(ctx, `SELECT coalesce(max(id), 0) FROM queries`).Scan(&last); err != nil {
		return err
	}
	if _, err := db.indexUpTo(ctx, tx, last, true); err != nil {
		return err
	}
	return tx.Commit()
}

// decodeQuery turns a stored query row back into a Query.
func decodeQuery(r *row) (*Query, error) {
	t, err := parseTime(r.Time)
	if err != nil {
		return nil, fmt.Errorf("query %d: %w", r.ID, err)
	}
	q := &Query{
		ID: r.ID, Time: t, UserID: r.UserID, UserName: r.UserName, Channel: r.Channel, EventID: r.EventID,
		Request: r.Request, Resolved: r.Resolved, Verdict: r.Verdict, Error: r.Error,
		Oxidizer: r.Oxidizer, Reducer: r.Reducer, EngineVersion: r.EngineVersion, DataHash: r.DataHash,
		Hash: r.Hash, PrevHash: r.PrevHash, Chain: r.Chain, KeyID: r.KeyID, Site: r.Site,
	}
	if r.ECellV.Valid {
		q.ECellV = &r.ECellV.Float64
	}
	if r.ECellStandardV.Valid {
		q.ECellStandardV = &r.ECellStandardV.Float64
	}
	if r.Result.Valid {
		q.Result = json.RawMessage(r.Result.String)
	}
	for _, f := range []struct {
		name string
		src  string
		dst  any
	}{{"species", r.Species, &q.Species}, {"hazards", r.Hazards, &q.Hazards}, {"streams", r.Streams, &q.Streams}} {
		if err := json.Unmarshal([]byte(f.src), f.dst); err != nil {
			return nil, fmt.Errorf("query %d: stored %s is not a JSON array: %v", r.ID, f.name, err)
		}
	}
	return q, nil
}

// Get returns the logged query with the given id, or ErrNotFound.
func (db *DB) Get(ctx context.Context, id int64) (*Query, error) {
	var r row
	err := db.r.QueryRowContext(ctx, `SELECT `+rowColumns+` FROM queries WHERE id = ? AND kind = 'query'`, id).Scan(r.scanDest()...)
	if errors.Is(err, sql.ErrNoRows) {
		return nil, fmt.Errorf("query %d: %w", id, ErrNotFound)
	}
	if err != nil {
		return nil, fmt.Errorf("query %d: %w", id, err)
	}
	return decodeQuery(&r)
}

// Delivery is the outcome of one attempt to post an answer.
type Delivery struct {
	QueryID int64     `json:"query_id"`
	Time    time.Time `json:"time"`
	OK      bool      `json:"ok"`
	Detail  string    `json:"detail"`
}

// RecordDelivery records whether the answer to query queryID was posted.
// Deliveries are kept outside the hash chain (a post can be retried; the
// outcome is operational state, not the safety record) in their own table,
// one row per attempt.
func (db *DB) RecordDelivery(ctx context.Context, queryID int64, ok bool, detail string) error {
	tx, err := db.w.BeginTx(ctx, nil)
	if err != nil {
		return fmt.Errorf("record delivery of query %d: %w", queryID, err)
	}
	defer tx.Rollback()
	var n int
	if err := tx.QueryRowContext(ctx, `SELECT count(*) FROM queries WHERE id = ? AND kind = 'query'`, queryID).Scan(&n); err != nil {
		return fmt.Errorf("record delivery of query %d: %w", queryID, err)
	}
	if n == 0 {
		return fmt.Errorf("record delivery of query %d: %w", queryID, ErrNotFound)
	}
	if _, err := tx.ExecContext(ctx, `INSERT INTO deliveries (query_id, time, ok, detail) VALUES (?, ?, ?, ?)`,
		queryID, formatTime(db.now()), ok, clean(detail)); err != nil {
		return fmt.Errorf("record delivery of query %d: %w", queryID, err)
	}
	if err := tx.Commit(); err != nil {
		return fmt.Errorf("record delivery of query %d: %w", queryID, err)
	}
	return nil
}

// Deliveries lists the delivery attempts of query queryID, oldest first.
func (db *DB) Deliveries(ctx context.Context, queryID int64) ([]Delivery, error) {
	rows, err := db.r.QueryContext(ctx, `SELECT time, ok, detail FROM deliveries WHERE query_id = ? ORDER BY id`, queryID)
	if err != nil {
		return nil, fmt.Errorf("deliveries of query %d: %w", queryID, err)
	}
	defer rows.Close()
	var out []Delivery
	for rows.Next() {
		d := Delivery{QueryID: queryID}
		var ts string
		if err := rows.Scan(&ts, &d.OK, &d.Detail); err != nil {
			return nil, err
		}
		if d.Time, err = parseTime(ts); err != nil {
			return nil, err
		}
		out = append(out, d)
	}
	return out, rows.Err()
}
