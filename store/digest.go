package store

import (
	"context"
	"database/sql"
	"encoding/json"
	"fmt"
	"sort"
	"strings"
	"time"
)

// Digest summarises the queries logged in [Since, Until): the shift
// handover for supervisors. Its JSON form (`mixward digest --format json`)
// has stable snake_case fields; times are UTC, TimeZone names the site zone
// Text renders them in.
type Digest struct {
	Site        string         `json:"site"`
	Since       time.Time      `json:"since"`
	Until       time.Time      `json:"until"`
	TimeZone    string         `json:"time_zone"`
	Queries     int            `json:"queries"`
	Askers      []AskerCount   `json:"askers"`
	Verdicts    VerdictCounts  `json:"verdicts"`
	Flagged     []FlaggedMix   `json:"flagged_mixes"` // spontaneous mixes with a danger or warning hazard
	ParseErrors []ParseFailure `json:"parse_errors"`
	TopPairs    []PairCount    `json:"top_stream_pairs"`
	// Levels counts the answered queries by the operator's decision, and
	// Mixes lists every mix asked, grouped (one line per mix and decision,
	// with a count), do-not-mix first, whatever the redox verdict.
	Levels LevelCounts `json:"levels"`
	Mixes  []MixLine   `json:"mixes"`
	// HeadID and HeadHash are the newest row of the log logged before
	// Until, as read when the digest was made (0 and "" for an empty log).
	// Noted outside the database, they let `mixward log verify --expect`
	// (or --anchors) prove later that no row up to it was rewritten or
	// cut off.
	HeadID   int64  `json:"head_id"`
	HeadHash string `json:"head_hash"`

	// Location is the site time zone Text uses.
	Location *time.Location `json:"-"`
}

// AskerCount is how many queries one person asked.
type AskerCount struct {
	UserID   string `json:"user_id"`
	UserName string `json:"user_name"`
	Queries  int    `json:"queries"`
}

// VerdictCounts counts queries by verdict.
type VerdictCounts struct {
	Spontaneous    int `json:"spontaneous"`
	NonSpontaneous int `json:"non_spontaneous"`
	NoReaction     int `json:"no_reaction"`
	Error          int `json:"error"`
}

// FlaggedMix is a spontaneous mix with at least one danger or warning
// hazard; Hazards holds only those.
type FlaggedMix struct {
	ID       int64     `json:"id"`
	Time     time.Time `json:"time"`
	UserID   string    `json:"user_id"`
	UserName string    `json:"user_name"`
	Channel  string    `json:"channel"`
	Request  string    `json:"request"`
	Resolved string    `json:"resolved"` // request after stream-tag substitution ("" when none)
	Hazards  []Hazard  `json:"hazards"`
}

// ParseFailure is a request that did not parse.
type ParseFailure struct {
	ID       int64     `json:"id"`
	Time     time.Time `json:"time"`
	UserID   string    `json:"user_id"`
	UserName string    `json:"user_name"`
	Channel  string    `json:"channel"`
	Request  string    `json:"request"`
	Error    string    `json:"error"`
}

// PairCount is how many queries mixed two streams together.
type PairCount struct {
	Streams [2]string `json:"streams"`
	Count   int       `json:"count"`
}

// TopPairsN is how many stream pairs a digest lists.
const TopPairsN = 10

// Digest summarises the queries logged in [since, until).
func (db *DB) Digest(ctx context.Context, since, until time.Time) (*Digest, error) {
	if since.IsZero() || until.IsZero() || !since.Before(until) {
		return nil, fmt.Errorf("digest: %w: period %s to %s is empty; the start must be before the end",
			ErrInvalid, since.Format(time.RFC3339), until.Format(time.RFC3339))
	}
	d := &Digest{Site: db.site, Since: since.UTC(), Until: until.UTC(), TimeZone: db.loc.String(), Location: db.loc,
		Askers: []AskerCount{}, Flagged: []FlaggedMix{}, ParseErrors: []ParseFailure{}, TopPairs: []PairCount{}, Mixes: []MixLine{}}
	tx, err := db.readTx(ctx)
	if err != nil {
		return nil, fmt.Errorf("digest: %w", err)
	}
	defer tx.Rollback()
	window := `q.site = ? AND q.kind = 'query' AND q.time >= ? AND q.time < ?`
	w := []any{db.site, formatTime(since), formatTime(until)}
	for _, step := range []func() error{
		func() error { return digestCounts(ctx, tx, d, window, w) },
		func() error { return digestNames(ctx, tx, d, db.hasNames()) },
		func() error { return digestMixes(ctx, tx, d, window, w, db.pg) },
		func() error { return digestFlagged(ctx, tx, d, window, w) },
		func() error { return digestErrors(ctx, tx, d, window, w) },
		func() error { return digestHead(ctx, tx, d, until) },
	} {
		if err := step(); err != nil {
			return nil, fmt.Errorf("digest: %w", err)
		}
	}
	return d, nil
}

// digestCounts counts verdicts, askers and stream pairs in one pass over
// the site-and-time index, which holds every column it reads (on SQLite;
// PostgreSQL reads the rows beside it), adding up in Go instead of
// sorting for two GROUP BYs. An asker is a user id: rows of one id under
// several names are one person.
func digestCounts(ctx context.Context, tx *sql.Tx, d *Digest, window string, w []any) error {
	rows, err := tx.QueryContext(ctx, `SELECT q.user_id, q.user_name, q.verdict, q.time, q.streams FROM queries q WHERE `+window, w...)
	if err != nil {
		return err
	}
	defer rows.Close()
	type asker struct{ id, name string }
	byAsker := map[asker]*askerRow{}
	pairsOf := map[string][][2]string{} // a stored stream list → its pairs, decoded once
	counts := map[[2]string]int{}
	var id, name, v, last, streams string
	for rows.Next() {
		if err := rows.Scan(&id, &name, &v, &last, &streams); err != nil {
			return err
		}
		d.Queries++
		switch v {
		case VerdictSpontaneous:
			d.Verdicts.Spontaneous++
		case VerdictNonSpontaneous:
			d.Verdicts.NonSpontaneous++
		case VerdictNoReaction:
			d.Verdicts.NoReaction++
		case VerdictError:
			d.Verdicts.Error++
		}
		a := byAsker[asker{id, name}]
		if a == nil {
			a = &askerRow{id: id, name: name}
			byAsker[asker{id, name}] = a
		}
		a.n++
		if last > a.lastText {
			a.lastText = last
		}
		if streams == "[]" {
			continue
		}
		ps, ok := pairsOf[streams]
		if !ok {
			var ss []string
			if err := json.Unmarshal([]byte(streams), &ss); err != nil {
				return fmt.Errorf("stored streams %q: %v", streams, err)
			}
			ps = streamPairs(ss)
			pairsOf[streams] = ps
		}
		for _, p := range ps {
			counts[p]++
		}
	}
	if err := rows.Err(); err != nil {
		return err
	}
	ars := make([]askerRow, 0, len(byAsker))
	for _, a := range byAsker {
		t, err := parseTime(a.lastText)
		if err != nil {
			return err
		}
		a.last = t
		ars = append(ars, *a)
	}
	sort.Slice(ars, func(i, j int) bool {
		if ars[i].id != ars[j].id {
			return ars[i].id < ars[j].id
		}
		return ars[i].name < ars[j].name
	})
	d.Askers = mergeAskers(ars)
	sortAskers(d.Askers)
	topPairs(d, counts)
	return nil
}

// sortAskers orders askers by queries asked, then name, then id.
func sortAskers(as []AskerCount) {
	sort.Slice(as, func(i, j int) bool {
		a, b := as[i], as[j]
		if a.Queries != b.Queries {
			return a.Queries > b.Queries
		}
		if a.UserName != b.UserName {
			return a.UserName < b.UserName
		}
		return a.UserID < b.UserID
	})
}

func digestFlagged(ctx context.Context, tx *sql.Tx, d *Digest, window string, w []any) error {
	// The time index (which holds the verdict) drives; the hazards are the
	// hashed JSON of each row, so editing a derived table cannot hide one.
	rows, err := tx.QueryContext(ctx, `SELECT q.id, q.time, q.user_id, q.user_name, q.channel, q.request, q.resolved, q.hazards
		  FROM queries q
		 WHERE `+window+` AND q.verdict = 'spontaneous' AND (q.hazards LIKE '%"danger"%' OR q.hazards LIKE '%"warning"%')
		 ORDER BY q.time, q.id`, w...)
	if err != nil {
		return err
	}
	defer rows.Close()
	for rows.Next() {
		var f FlaggedMix
		var ts, raw string
		if err := rows.Scan(&f.ID, &ts, &f.UserID, &f.UserName, &f.Channel, &f.Request, &f.Resolved, &raw); err != nil {
			return err
		}
		var hz []Hazard
		if err := json.Unmarshal([]byte(raw), &hz); err != nil {
			return fmt.Errorf("query %d: stored hazards are not a JSON array: %v", f.ID, err)
		}
		for _, h := range hz {
			if h.Severity == "danger" || h.Severity == "warning" {
				f.Hazards = append(f.Hazards, h)
			}
		}
		if len(f.Hazards) == 0 {
			continue
		}
		if f.Time, err = parseTime(ts); err != nil {
			return err
		}
		d.Flagged = append(d.Flagged, f)
	}
	return rows.Err()
}

// digestHead finds the newest row logged before until (by id among the
// rows before it) and its hash.
func digestHead(ctx context.Context, tx *sql.Tx, d *Digest, until time.Time) error {
	_, hi, empty, err := idRange(ctx, tx, time.Time{}, until)
	if err != nil || empty || hi == 0 {
		return err
	}
	return tx.QueryRowContext(ctx, `SELECT id, hash FROM queries WHERE id = ?`, hi).Scan(&d.HeadID, &d.HeadHash)
}

func digestErrors(ctx context.Context, tx *sql.Tx, d *Digest, window string, w []any) error {
	rows, err := tx.QueryContext(ctx, `SELECT q.id, q.time, q.user_id, q.user_name, q.channel, q.request, q.error
		  FROM queries q WHERE `+window+` AND q.verdict = 'error' ORDER BY q.time, q.id`, w...)
	if err != nil {
		return err
	}
	defer rows.Close()
	for rows.Next() {
		var p ParseFailure
		var ts string
		if err := rows.Scan(&p.ID, &ts, &p.UserID, &p.UserName, &p.Channel, &p.Request, &p.Error); err != nil {
			return err
		}
		if p.Time, err = parseTime(ts); err != nil {
			return err
		}
		d.ParseErrors = append(d.ParseErrors, p)
	}
	return rows.Err()
}

// topPairs keeps the TopPairsN most-asked stream pairs.
func topPairs(d *Digest, counts map[[2]string]int) {
	for p, n := range counts {
		d.TopPairs = append(d.TopPairs, PairCount{Streams: p, Count: n})
	}
	sort.Slice(d.TopPairs, func(i, j int) bool {
		a, b := d.TopPairs[i], d.TopPairs[j]
		if a.Count != b.Count {
			return a.Count > b.Count
		}
		if a.Streams[0] != b.Streams[0] {
			return a.Streams[0] < b.Streams[0]
		}
		return a.Streams[1] < b.Streams[1]
	})
	if len(d.TopPairs) > TopPairsN {
		d.TopPairs = d.TopPairs[:TopPairsN]
	}
}

// streamPairs returns each unordered pair of distinct streams in one
// request once, each pair sorted; whitespace is collapsed.
func streamPairs(streams []string) [][2]string {
	var uniq []string
	for _, s := range streams {
		s = strings.Join(strings.Fields(s), " ")
		if s != "" && !contains(uniq, s) {
			uniq = append(uniq, s)
		}
	}
	sort.Strings(uniq)
	var out [][2]string
	for i := range uniq {
		for j := i + 1; j < len(uniq); j++ {
			out = append(out, [2]string{uniq[i], uniq[j]})
		}
	}
	return out
}

// JSON is the digest's JSON form, indented, with a final newline.
func (d *Digest) JSON() ([]byte, error) {
	b, err := json.MarshalIndent(d, "", "  ")
	if err != nil {
		return nil, err
	}
	return append(b, '\n'), nil
}

// Advisory closes every rendered digest.
const Advisory = "Verdicts are advisory, never a permit: safety data sheets, site procedures, " +
	"management of change and local codes come first."

// maxTextRequest caps requests in the text form (the JSON form has them whole).
const maxTextRequest = 72

func untilHeader(since, until time.Time) string {
	if since.Format("2006-01-02") == until.Format("2006-01-02") {
		return until.Format("15:04 MST")
	}
	return until.Format("Mon 02 Jan 2006 15:04 MST")
}

// who names a person by the name seen, by the id when no name was seen,
// safe to print.
func who(name, id string) string {
	name, id = Printable(name), Printable(id)
	switch {
	case name != "":
		return name
	case id != "":
		return id
	}
	return "(unknown)"
}

func plural(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}
