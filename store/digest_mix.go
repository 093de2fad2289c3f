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

// Decision levels of a logged answer, as the digest groups them. An answer
// logged with the operator's decision carries it in its hashed result
// (decision.level); an older answer without one is judged from its hashed
// hazards: a danger is do-not-mix, a warning with-precautions.
const (
	LevelDoNotMix        = "do-not-mix"
	LevelWithPrecautions = "with-precautions"
	LevelNoConcern       = "no-concern"
)

// LevelCounts counts the answered queries of a digest by decision level.
type LevelCounts struct {
	DoNotMix        int `json:"do_not_mix"`
	WithPrecautions int `json:"with_precautions"`
	NoConcern       int `json:"no_concern"`
}

// MixLine is one mix of a digest: every query of the period that mixed the
// same streams and got the same decision, counted once.
type MixLine struct {
	Level    string   `json:"level"` // do-not-mix, with-precautions or no-concern
	Mix      string   `json:"mix"`   // the streams joined by " + ", or the request when no streams were read
	Count    int      `json:"count"`
	People   int      `json:"people"`    // distinct user ids who asked it
	Codes    []string `json:"codes"`     // danger and warning hazard codes, danger first
	QueryIDs []int64  `json:"query_ids"` // oldest first
}

// levelRank orders levels danger first.
func levelRank(l string) int {
	switch l {
	case LevelDoNotMix:
		return 0
	case LevelWithPrecautions:
		return 1
	}
	return 2
}

// digestMixes groups the answered queries of the window by mix and
// decision, danger first, then most asked.
func digestMixes(ctx context.Context, tx *sql.Tx, d *Digest, window string, w []any, pg bool) error {
	level := `json_extract(q.result, '$.decision.level')`
	if pg {
		level = `q.result::jsonb #>> '{decision,level}'`
	}
	rows, err := tx.QueryContext(ctx, `SELECT q.id, q.user_id, q.request, q.streams, q.hazards, coalesce(`+level+`, '')
		  FROM queries q WHERE `+window+` AND q.verdict <> 'error' ORDER BY q.id`, w...)
	if err != nil {
		return err
	}
	defer rows.Close()
	idx := map[[2]string]int{}
	people := map[int]map[string]bool{}
	for rows.Next() {
		var id int64
		var user, req, streams, hazards, level string
		if err := rows.Scan(&id, &user, &req, &streams, &hazards, &level); err != nil {
			return err
		}
		var ss []string
		var hz []Hazard
		if json.Unmarshal([]byte(streams), &ss) != nil || json.Unmarshal([]byte(hazards), &hz) != nil {
			return fmt.Errorf("query %d: stored streams or hazards are not JSON arrays", id)
		}
		level = judgedLevel(level, hz)
		mix := mixName(ss, req)
		k := [2]string{level, mix}
		i, ok := idx[k]
		if !ok {
			i = len(d.Mixes)
			idx[k] = i
			d.Mixes = append(d.Mixes, MixLine{Level: level, Mix: mix, Codes: []string{}})
			people[i] = map[string]bool{}
		}
		m := &d.Mixes[i]
		m.Count++
		m.QueryIDs = append(m.QueryIDs, id)
		people[i][user] = true
		m.People = len(people[i])
		m.Codes = addCodes(m.Codes, hz)
		switch level {
		case LevelDoNotMix:
			d.Levels.DoNotMix++
		case LevelWithPrecautions:
			d.Levels.WithPrecautions++
		default:
			d.Levels.NoConcern++
		}
	}
	if err := rows.Err(); err != nil {
		return err
	}
	sort.SliceStable(d.Mixes, func(i, j int) bool {
		a, b := d.Mixes[i], d.Mixes[j]
		if levelRank(a.Level) != levelRank(b.Level) {
			return levelRank(a.Level) < levelRank(b.Level)
		}
		if a.Count != b.Count {
			return a.Count > b.Count
		}
		return a.Mix < b.Mix
	})
	return nil
}

// judgedLevel is the stored decision level, or one judged from the hazards
// for an answer logged without a decision.
func judgedLevel(stored string, hz []Hazard) string {
	switch stored {
	case LevelDoNotMix, LevelWithPrecautions, LevelNoConcern:
		return stored
	}
	level := LevelNoConcern
	for _, h := range hz {
		switch h.Severity {
		case "danger":
			return LevelDoNotMix
		case "warning":
			level = LevelWithPrecautions
		}
	}
	return level
}

// mixName names a mix by its distinct streams, sorted, whitespace
// collapsed; by its request when no stream was read.
func mixName(streams []string, request string) string {
	var uniq []string
	for _, s := range streams {
		s = strings.Join(strings.Fields(s), " ")
		if s != "" && !contains(uniq, s) {
			uniq = append(uniq, s)
		}
	}
	if len(uniq) == 0 {
		return strings.Join(strings.Fields(request), " ")
	}
	sort.Strings(uniq)
	return strings.Join(uniq, " + ")
}

// addCodes adds the danger and warning codes of hz to codes, danger first.
func addCodes(codes []string, hz []Hazard) []string {
	for _, sev := range []string{"danger", "warning"} {
		for _, h := range hz {
			if h.Severity == sev && !contains(codes, h.Code) {
				codes = append(codes, h.Code)
			}
		}
	}
	sort.SliceStable(codes, func(i, j int) bool { return codeRank(hz, codes[i]) < codeRank(hz, codes[j]) })
	return codes
}

func codeRank(hz []Hazard, code string) int {
	for _, h := range hz {
		if h.Code == code && h.Severity == "danger" {
			return 0
		}
	}
	return 1
}

// digestNames names the askers by the newest name noted for their id up to
// the end of the period (the names table), else the newest name their
// queries carry; one person is one line whatever names they were seen under.
func digestNames(ctx context.Context, tx *sql.Tx, d *Digest, names bool) error {
	if !names {
		return nil
	}
	for i, a := range d.Askers {
		name, err := nameAt(ctx, tx, a.UserID, d.Until)
		if err != nil {
			return err
		}
		if name != "" {
			d.Askers[i].UserName = name
		}
	}
	sortAskers(d.Askers)
	return nil
}

// mergeAskers folds asker rows of one user id seen under several names into
// one, keeping the name of the newest query.
func mergeAskers(rows []askerRow) []AskerCount {
	byID := map[string]int{}
	var out []AskerCount
	newest := map[string]time.Time{}
	for _, r := range rows {
		i, ok := byID[r.id]
		if !ok {
			i = len(out)
			byID[r.id] = i
			out = append(out, AskerCount{UserID: r.id})
		}
		out[i].Queries += r.n
		if r.name != "" && r.name != r.id && !r.last.Before(newest[r.id]) {
			out[i].UserName, newest[r.id] = r.name, r.last
		}
	}
	return out
}

type askerRow struct {
	id, name string
	n        int
	last     time.Time
	lastText string // the newest time as stored, while counting
}
