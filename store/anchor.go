package store

import (
	"bufio"
	"context"
	"encoding/json"
	"fmt"
	"io"
	"strconv"
	"strings"
)

// Anchor is a row id and hash noted outside the database (from a digest,
// `mixward log verify`, a backup report): Verify checks that the row is
// still on the chain with that hash. ID 0 means "the row with this hash,
// wherever it is" (`log verify --expect HASH`).
type Anchor struct {
	ID   int64  `json:"id"`
	Hash string `json:"hash"`
}

// AnchorResult is what Verify found for one anchor. Status is "ok" (the
// row is on the chain with that hash), "pruned" (it was removed by a
// recorded prune and cannot be checked), "rewritten" (the row has another
// hash) or "missing" (no such row: the log was cut, or for an ID 0 anchor,
// no row has the hash).
type AnchorResult struct {
	Anchor
	Status    string `json:"status"`
	FoundID   int64  `json:"found_id,omitempty"`   // the row that has the hash
	FoundHash string `json:"found_hash,omitempty"` // the row's hash now, when rewritten
	from      string // where the anchor was noted, for messages
}

// ParseAnchors reads anchors: one per line, "ID HASH" or a bare HASH;
// blank lines and lines starting with # are skipped.
func ParseAnchors(r io.Reader) ([]Anchor, error) {
	var out []Anchor
	sc := bufio.NewScanner(r)
	for n := 1; sc.Scan(); n++ {
		line := strings.TrimSpace(sc.Text())
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		a, err := ParseAnchor(line)
		if err != nil {
			return nil, fmt.Errorf("line %d: %w", n, err)
		}
		out = append(out, a)
	}
	if err := sc.Err(); err != nil {
		return nil, err
	}
	return out, nil
}

// ParseAnchor reads "ID HASH", "ID:HASH" or a bare HASH (64 hex digits).
func ParseAnchor(s string) (Anchor, error) {
	f := strings.Fields(strings.Replace(strings.TrimSpace(s), ":", " ", 1))
	var a Anchor
	switch len(f) {
	case 1:
		a.Hash = f[0]
	case 2:
		id, err := strconv.ParseInt(strings.TrimPrefix(f[0], "#"), 10, 64)
		if err != nil || id < 1 {
			return a, fmt.Errorf("%w: anchor %q: %q is not a row id", ErrInvalid, s, f[0])
		}
		a.ID, a.Hash = id, f[1]
	default:
		return a, fmt.Errorf("%w: anchor %q: want \"ID HASH\" or a hash", ErrInvalid, s)
	}
	a.Hash = strings.ToLower(a.Hash)
	if len(a.Hash) != 64 || strings.Trim(a.Hash, "0123456789abcdef") != "" {
		return a, fmt.Errorf("%w: anchor %q: the hash must be 64 hex digits", ErrInvalid, s)
	}
	return a, nil
}

// anchorCheck follows the walk and records where each anchor was seen.
type anchorCheck struct {
	res    []AnchorResult
	byID   map[int64][]int
	byHash map[string][]int
}

func newAnchorCheck(anchors []Anchor, from func(i int) string) *anchorCheck {
	c := &anchorCheck{byID: map[int64][]int{}, byHash: map[string][]int{}}
	for i, a := range anchors {
		c.res = append(c.res, AnchorResult{Anchor: a, from: from(i)})
		if a.ID > 0 {
			c.byID[a.ID] = append(c.byID[a.ID], i)
		} else {
			c.byHash[a.Hash] = append(c.byHash[a.Hash], i)
		}
	}
	return c
}

// row notes a row that verified.
func (c *anchorCheck) row(r *row) {
	for _, i := range c.byID[r.ID] {
		c.res[i].Status, c.res[i].FoundHash = "rewritten", r.Hash
		if c.res[i].Hash == r.Hash {
			c.res[i].Status, c.res[i].FoundHash = "ok", ""
		}
		c.res[i].FoundID = r.ID
	}
	for _, i := range c.byHash[r.Hash] {
		c.res[i].Status, c.res[i].FoundID = "ok", r.ID
	}
}

// finish settles the anchors not seen and returns the first failure.
func (c *anchorCheck) finish(rep *VerifyReport) (int64, string) {
	defer func() { rep.Anchors = append(rep.Anchors, c.res...) }()
	var brokenID int64
	var problem string
	for i := range c.res {
		a := &c.res[i]
		if a.Status == "" {
			switch {
			case a.Hash == rep.AnchorHash && rep.AnchorID > 0 && (a.ID == 0 || a.ID == rep.AnchorID):
				a.Status, a.FoundID = "ok", rep.AnchorID
			case a.ID > 0 && a.ID <= rep.AnchorID:
				a.Status = "pruned"
			default:
				a.Status = "missing"
			}
		}
		if problem != "" {
			continue
		}
		switch {
		case a.Status == "rewritten":
			brokenID = a.ID
			problem = fmt.Sprintf("row %d: has hash %s, but %s noted %s: the row and every row after it were re-hashed after it was noted", a.ID, short(a.FoundHash), a.from, short(a.Hash))
		case a.Status == "missing" && a.ID > rep.LastID:
			brokenID = a.ID
			problem = fmt.Sprintf("row %d: is noted in %s but the log ends at row %d: the newest rows were cut off (and the record of deleted ids rewound)", a.ID, a.from, rep.LastID)
		case a.Status == "missing" && a.ID > 0:
			brokenID = a.ID
			problem = fmt.Sprintf("row %d: is noted in %s but is not in the log", a.ID, a.from)
		case a.Status == "missing":
			problem = fmt.Sprintf("no row has the hash %s noted in %s: the row it named was rewritten, re-hashed or cut off", short(a.Hash), a.from)
		}
	}
	return brokenID, problem
}

// recordedAnchors are the log heads carried by the digests recorded as
// sent (schema 3 and later; digests made before heads were carried have
// none): someone who cuts or rewrites the log must also find and edit
// these, or Verify notices.
func recordedAnchors(ctx context.Context, tx queryer, ver int) ([]Anchor, []string, error) {
	if ver < 3 {
		return nil, nil, nil
	}
	rows, err := tx.QueryContext(ctx, `SELECT slot, body FROM digests WHERE status = 'sent' AND body <> '' ORDER BY slot`)
	if err != nil {
		return nil, nil, err
	}
	defer rows.Close()
	var as []Anchor
	var from []string
	for rows.Next() {
		var slot, body string
		if err := rows.Scan(&slot, &body); err != nil {
			return nil, nil, err
		}
		var d struct {
			HeadID   int64  `json:"head_id"`
			HeadHash string `json:"head_hash"`
		}
		if json.Unmarshal([]byte(body), &d) != nil || d.HeadID == 0 {
			continue
		}
		as = append(as, Anchor{ID: d.HeadID, Hash: d.HeadHash})
		from = append(from, "the digest recorded as sent for the shift ending "+slot)
	}
	return as, from, rows.Err()
}

func short(h string) string {
	if len(h) > 16 {
		return h[:16] + "…"
	}
	return h
}
