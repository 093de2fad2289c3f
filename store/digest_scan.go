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

// digestRow is what the digest reads of one query of its window.
type digestRow struct {
	id                                     int64
	time, user, name, channel              string
	request, resolved, verdict, err, level string
	streams, hazards                       string
}

// digestScan reads every query of the window once, in the order of the
// site-and-time index, and fills the counts, askers, stream pairs, mix lines, flagged
// mixes and parse failures from it in Go: one pass over the rows instead
// of a GROUP BY sort for the askers, another for the pairs and three more
// scans. The hazards are the hashed JSON of each row, so editing a derived
// table cannot hide one. Stored JSON lists are decoded once per distinct
// text (operators ask the same mixes again and again). With keys
// (usesKeys) the rows up to the indexed mark are found through the
// site-and-time index of query_keys, which also gives their decision level
// (Verify compares it with the row's), and the rows above the mark by a
// scan of those few rows; the window is tested on the hashed columns too.
func digestScan(ctx context.Context, tx *sql.Tx, d *Digest, window string, w []any, keys bool) error {
	const cols = `q.id, q.time, q.user_id, q.user_name, q.channel, q.request, q.resolved, q.verdict, q.error, q.streams, q.hazards`
	a := newDigestAdder(d)
	if !keys {
		if err := digestRows(ctx, tx, a, `SELECT `+cols+`, q.level FROM queries q WHERE `+window, w); err != nil {
			return err
		}
		return a.finish()
	}
	mark, err := indexedMark(ctx, tx)
	if err != nil {
		return err
	}
	kwin := strings.ReplaceAll(window, "q.", "k.")
	if err := digestRows(ctx, tx, a, `SELECT `+cols+`, k.level FROM query_keys k CROSS JOIN queries q ON q.id = k.id
		WHERE `+kwin+` AND `+window+` AND k.id <= ?`, append(append(append([]any{}, w...), w...), mark)); err != nil {
		return err
	}
	if err := digestRows(ctx, tx, a, `SELECT `+cols+`, `+levelExpr+` FROM queries q WHERE q.id > ? AND `+window,
		append([]any{mark}, w...)); err != nil {
		return err
	}
	return a.finish()
}

// digestRows adds the rows of stmt (digestRow's columns in order).
func digestRows(ctx context.Context, tx *sql.Tx, a *digestAdder, stmt string, args []any) error {
	rows, err := tx.QueryContext(ctx, stmt, args...)
	if err != nil {
		return err
	}
	defer rows.Close()
	var r digestRow
	for rows.Next() {
		if err := rows.Scan(&r.id, &r.time, &r.user, &r.name, &r.channel, &r.request, &r.resolved, &r.verdict,
			&r.err, &r.streams, &r.hazards, &r.level); err != nil {
			return err
		}
		if err := a.add(&r); err != nil {
			return err
		}
	}
	return rows.Err()
}

// digestAdder adds the rows of a digest up.
type digestAdder struct {
	d       *Digest
	askers  map[[2]string]*askerRow
	streams map[string][]string
	pairs   map[string][][2]string
	names   map[string]string // a stored stream list → its mix name
	hazards map[string][]Hazard
	counts  map[[2]string]int
	mixes   map[[2]string]int
	people  []map[string]bool
}

func newDigestAdder(d *Digest) *digestAdder {
	return &digestAdder{d: d, askers: map[[2]string]*askerRow{}, streams: map[string][]string{}, pairs: map[string][][2]string{}, names: map[string]string{},
		hazards: map[string][]Hazard{}, counts: map[[2]string]int{}, mixes: map[[2]string]int{}}
}

func (a *digestAdder) add(r *digestRow) error {
	d := a.d
	d.Queries++
	switch r.verdict {
	case VerdictSpontaneous:
		d.Verdicts.Spontaneous++
	case VerdictNonSpontaneous:
		d.Verdicts.NonSpontaneous++
	case VerdictNoReaction:
		d.Verdicts.NoReaction++
	case VerdictError:
		d.Verdicts.Error++
	}
	k := [2]string{r.user, r.name}
	ar := a.askers[k]
	if ar == nil {
		ar = &askerRow{id: r.user, name: r.name}
		a.askers[k] = ar
	}
	ar.n++
	ar.lastText = max(ar.lastText, r.time)
	ss, ps, err := a.streamList(r.streams)
	if err != nil {
		return err
	}
	for _, p := range ps {
		a.counts[p]++
	}
	if r.verdict == VerdictError {
		t, err := parseTime(r.time)
		if err != nil {
			return err
		}
		d.ParseErrors = append(d.ParseErrors, ParseFailure{ID: r.id, Time: t, UserID: r.user, UserName: r.name,
			Channel: r.channel, Request: r.request, Error: r.err})
		return nil
	}
	hz, ok := a.hazards[r.hazards]
	if !ok {
		if err := json.Unmarshal([]byte(r.hazards), &hz); err != nil {
			return fmt.Errorf("query %d: stored hazards are not a JSON array: %v", r.id, err)
		}
		a.hazards[r.hazards] = hz
	}
	if err := a.flag(r, hz); err != nil {
		return err
	}
	a.mix(r, ss, hz)
	return nil
}

// streamList decodes a stored stream list and its pairs, once per text.
func (a *digestAdder) streamList(raw string) ([]string, [][2]string, error) {
	if ss, ok := a.streams[raw]; ok {
		return ss, a.pairs[raw], nil
	}
	var ss []string
	if err := json.Unmarshal([]byte(raw), &ss); err != nil {
		return nil, nil, fmt.Errorf("stored streams %q: %v", raw, err)
	}
	a.streams[raw], a.pairs[raw] = ss, streamPairs(ss)
	if len(ss) > 0 {
		a.names[raw] = mixName(ss, "")
	}
	return ss, a.pairs[raw], nil
}

// flag lists a spontaneous mix with a danger or warning hazard.
func (a *digestAdder) flag(r *digestRow, hz []Hazard) error {
	if r.verdict != VerdictSpontaneous {
		return nil
	}
	f := FlaggedMix{ID: r.id, UserID: r.user, UserName: r.name, Channel: r.channel, Request: r.request, Resolved: r.resolved}
	for _, h := range hz {
		if h.Severity == "danger" || h.Severity == "warning" {
			f.Hazards = append(f.Hazards, h)
		}
	}
	if len(f.Hazards) == 0 {
		return nil
	}
	var err error
	if f.Time, err = parseTime(r.time); err != nil {
		return err
	}
	a.d.Flagged = append(a.d.Flagged, f)
	return nil
}

// mix counts an answered query on its mix line.
func (a *digestAdder) mix(r *digestRow, ss []string, hz []Hazard) {
	d := a.d
	level := judgedLevel(r.level, hz)
	name, ok := a.names[r.streams]
	if !ok || name == "" {
		name = mixName(ss, r.request)
	}
	k := [2]string{level, name}
	i, ok := a.mixes[k]
	if !ok {
		i = len(d.Mixes)
		a.mixes[k] = i
		d.Mixes = append(d.Mixes, MixLine{Level: level, Mix: k[1], Codes: []string{}})
		a.people = append(a.people, map[string]bool{})
	}
	m := &d.Mixes[i]
	m.Count++
	m.QueryIDs = append(m.QueryIDs, r.id)
	a.people[i][r.user] = true
	m.People = len(a.people[i])
	for _, h := range hz {
		if (h.Severity == "danger" || h.Severity == "warning") && !contains(m.Codes, h.Code) {
			m.Codes = addCodes(m.Codes, hz)
			break
		}
	}
	switch level {
	case LevelDoNotMix:
		d.Levels.DoNotMix++
	case LevelWithPrecautions:
		d.Levels.WithPrecautions++
	default:
		d.Levels.NoConcern++
	}
}

// finish orders what was added up.
func (a *digestAdder) finish() error {
	d := a.d
	ars := make([]askerRow, 0, len(a.askers))
	for _, ar := range a.askers {
		t, err := parseTime(ar.lastText)
		if err != nil {
			return err
		}
		ar.last = t
		ars = append(ars, *ar)
	}
	sort.Slice(ars, func(i, j int) bool {
		if ars[i].id != ars[j].id {
			return ars[i].id < ars[j].id
		}
		return ars[i].name < ars[j].name
	})
	d.Askers = mergeAskers(ars)
	sortAskers(d.Askers)
	topPairs(d, a.counts)
	for i := range d.Mixes {
		ids := d.Mixes[i].QueryIDs
		sort.Slice(ids, func(i, j int) bool { return ids[i] < ids[j] }) // rows come in index order
	}
	sortMixes(d.Mixes)
	byTime := func(ti, tj time.Time, ii, ij int64) bool {
		if !ti.Equal(tj) {
			return ti.Before(tj)
		}
		return ii < ij
	}
	sort.Slice(d.Flagged, func(i, j int) bool {
		return byTime(d.Flagged[i].Time, d.Flagged[j].Time, d.Flagged[i].ID, d.Flagged[j].ID)
	})
	sort.Slice(d.ParseErrors, func(i, j int) bool {
		return byTime(d.ParseErrors[i].Time, d.ParseErrors[j].Time, d.ParseErrors[i].ID, d.ParseErrors[j].ID)
	})
	return nil
}
