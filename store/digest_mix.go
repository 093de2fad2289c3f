package store

import (
	"context"
	"database/sql"
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

// sortMixes orders mix lines danger first, then most asked, then by name.
func sortMixes(ms []MixLine) {
	sort.SliceStable(ms, func(i, j int) bool {
		a, b := ms[i], ms[j]
		if levelRank(a.Level) != levelRank(b.Level) {
			return levelRank(a.Level) < levelRank(b.Level)
		}
		if a.Count != b.Count {
			return a.Count > b.Count
		}
		return a.Mix < b.Mix
	})
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
