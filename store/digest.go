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
		func() error { return digestScan(ctx, tx, d, window, w, db.usesKeys()) },
		func() error { return digestNames(ctx, tx, d, db.hasNames()) },
		func() error { return digestHead(ctx, tx, d, until, db.usesKeys()) },
	} {
		if err := step(); err != nil {
			return nil, fmt.Errorf("digest: %w", err)
		}
	}
	return d, nil
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

// digestHead finds the newest row logged before until (by id among the
// rows before it) and its hash.
func digestHead(ctx context.Context, tx *sql.Tx, d *Digest, until time.Time, keys bool) error {
	_, hi, empty, err := idRange(ctx, tx, time.Time{}, until, keys)
	if err != nil || empty || hi == 0 {
		return err
	}
	return tx.QueryRowContext(ctx, `SELECT id, hash FROM queries WHERE id = ?`, hi).Scan(&d.HeadID, &d.HeadHash)
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
