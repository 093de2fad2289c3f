package engine

import (
	"fmt"
	"sort"
	"strings"
	"unicode"
)

// Lookup finds a chemical by what an operator typed: first its formula
// exactly (case matters, so Co is cobalt and CO carbon monoxide; a hydrate
// may be written with ., · or *), then one of its names or synonyms, ignoring
// case and extra spaces, and last its formula ignoring case when that is
// unambiguous (naocl). It returns false when nothing matches.
func (t *Tables) Lookup(name string) (*Chemical, bool) {
	q := strings.TrimSpace(name)
	if q == "" {
		return nil, false
	}
	f := hydrateDots(q)
	if t.byFormula != nil {
		if c, ok := t.byFormula[f]; ok {
			return c, true
		}
		if c, ok := t.byName[normName(q)]; ok {
			return c, true
		}
		c, ok := t.byFold[strings.ToLower(f)]
		return c, ok && c != nil
	}
	for _, c := range t.Chemicals {
		if c.Formula == f {
			return c, true
		}
	}
	n := normName(q)
	for _, c := range t.Chemicals {
		for _, cn := range c.Names {
			if cn == n {
				return c, true
			}
		}
	}
	var found *Chemical
	for _, c := range t.Chemicals {
		if len(c.Formula) == len(f) && strings.EqualFold(c.Formula, f) {
			if found != nil {
				return nil, false
			}
			found = c
		}
	}
	return found, found != nil
}

// hydrateDots writes the hydrate separators · and * as the tables do, with a
// full stop.
func hydrateDots(s string) string {
	if !strings.ContainsAny(s, "·*") {
		return s
	}
	return strings.NewReplacer("·", ".", "*", ".").Replace(s)
}

// normName is a chemical name as the tables store it: lower case, single
// spaces, straight apostrophes.
func normName(s string) string {
	if isNormName(s) {
		return s
	}
	s = strings.ToLower(strings.ReplaceAll(s, "’", "'"))
	return strings.Join(strings.Fields(s), " ")
}

// isNormName reports whether s, in ASCII, is already as normName leaves it.
func isNormName(s string) bool {
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case c >= 'A' && c <= 'Z', c >= 0x80, c == '\t', c == '\n', c == '\r', c == '\v', c == '\f':
			return false
		case c == ' ' && (i == 0 || i == len(s)-1 || s[i-1] == ' '):
			return false
		}
	}
	return true
}

// Suggest returns up to n names or formulas close to word, for a "did you
// mean" reply: the closest first, at most one per chemical. Closeness is the
// optimal-string-alignment (Damerau–Levenshtein) distance, ignoring case, to a
// whole name or formula, or one more than the distance to one word of a name
// of several words. Words of up to 3 characters allow 1 edit, up to 6
// characters 2, longer ones 3. Ties go to the candidate that is closer once
// look-alike characters are taken as equal (NaOCI, with a capital i, is
// NaOCl rather than NaOCN), then alphabetically. The result is empty when
// nothing is that close.
func (t *Tables) Suggest(word string, n int) []string {
	w := normName(word)
	if w == "" || n <= 0 {
		return nil
	}
	wr := []rune(w)
	wf := []rune(lookAlike(strings.TrimSpace(word)))
	limit := 3
	switch {
	case len(wr) <= 3:
		limit = 1
	case len(wr) <= 6:
		limit = 2
	}
	type cand struct {
		text  string
		d, dl int // distance; distance with look-alikes folded
	}
	less := func(a, b cand) bool {
		if a.d != b.d {
			return a.d < b.d
		}
		if a.dl != b.dl {
			return a.dl < b.dl
		}
		return a.text < b.text
	}
	var cands []cand
	var o osa
	multi := strings.Contains(w, " ")
	for _, c := range t.Chemicals {
		best := cand{d: limit + 1}
		try := func(text string) {
			lt := normName(text)
			d := o.dist(wr, o.runes(lt), best.d)
			if !multi && strings.Contains(lt, " ") {
				for tok := range strings.FieldsSeq(lt) {
					if td := o.dist(wr, o.runes(tok), best.d-1); td+1 < d {
						d = td + 1
					}
				}
			}
			if d > best.d {
				return
			}
			x := cand{text, d, o.dist(wf, o.runes(lookAlike(text)), limit+1)}
			if less(x, best) {
				best = x
			}
		}
		try(c.Formula)
		for _, name := range c.Names {
			try(name)
		}
		if best.d <= limit {
			cands = append(cands, best)
		}
	}
	sort.Slice(cands, func(i, j int) bool { return less(cands[i], cands[j]) })
	if len(cands) > n {
		cands = cands[:n]
	}
	out := make([]string, len(cands))
	for i, c := range cands {
		out[i] = c.text
	}
	return out
}

// lookAlike folds characters that are easily typed for one another in a
// formula (capital I, digit 1 and bar for small l; digit 0 for O) and then
// lowers the case.
func lookAlike(s string) string {
	return normName(strings.NewReplacer("I", "l", "1", "l", "|", "l", "0", "o").Replace(s))
}

// boundedOSA is the optimal-string-alignment distance between a and b (edits
// are insertion, deletion, substitution and transposition of neighbours). It
// returns max+1 early when the distance is certainly above max.
func boundedOSA(a, b []rune, max int) int {
	var o osa
	return o.dist(a, b, max)
}

// osa holds the scratch space of boundedOSA, so that Suggest can compare
// hundreds of candidates without allocating for each.
type osa struct {
	rows [3][]int
	rb   []rune
}

// runes converts s into the scratch rune buffer; the result is valid until
// the next call.
func (o *osa) runes(s string) []rune {
	o.rb = o.rb[:0]
	for _, r := range s {
		o.rb = append(o.rb, r)
	}
	return o.rb
}

func (o *osa) dist(a, b []rune, max int) int {
	if max < 0 {
		return max + 1
	}
	if d := len(a) - len(b); d > max || -d > max {
		return max + 1
	}
	for i := range o.rows {
		if cap(o.rows[i]) < len(b)+1 {
			o.rows[i] = make([]int, len(b)+1)
		}
		o.rows[i] = o.rows[i][:len(b)+1]
	}
	prev2, prev, cur := o.rows[0], o.rows[1], o.rows[2]
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		rowMin := cur[0]
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			v := min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
			if i > 1 && j > 1 && a[i-1] == b[j-2] && a[i-2] == b[j-1] {
				v = min(v, prev2[j-2]+1)
			}
			cur[j] = v
			rowMin = min(rowMin, v)
		}
		if rowMin > max {
			return max + 1
		}
		prev2, prev, cur = prev, cur, prev2
	}
	if prev[len(b)] > max {
		return max + 1
	}
	return prev[len(b)]
}

// MolarMass is the molar mass of a formula in g/mol from the standard atomic
// weights of elements.txt. It fails for a formula that does not parse or that
// names an element the table lacks.
func (t *Tables) MolarMass(formula string) (float64, error) {
	a, err := ParseFormula(hydrateDots(strings.TrimSpace(formula)))
	if err != nil {
		return 0, err
	}
	els := sortedElements(a)
	for _, el := range els {
		if _, ok := t.Atomic[el]; !ok {
			return 0, fmt.Errorf("formula %q: element %q has no atomic weight in %s%s", formula, el, tableDir, ElementsFile)
		}
	}
	return massOf(a, t.Atomic), nil
}

// Density is the density in g/mL at 20 °C of an aqueous solution of formula
// at percentWW % w/w, interpolated linearly between the rows of
// densities.txt. It returns false for a formula without a density table and
// for a concentration outside the table's range.
//
// A hydrate without a table of its own (ZnSO4.7H2O, FeSO4.7H2O) is read on
// its anhydrous salt's table at the same strength counted as the anhydrous
// salt: 20 % of the heptahydrate is the solution of 20 × M(ZnSO4) /
// M(ZnSO4·7H2O) % ZnSO4.
func (t *Tables) Density(formula string, percentWW float64) (gPerML float64, ok bool) {
	if len(t.Densities[formula]) == 0 {
		if anh, _, hyd := strings.Cut(formula, "."); hyd && len(t.Densities[anh]) > 0 {
			mh, err1 := t.MolarMass(formula)
			ma, err2 := t.MolarMass(anh)
			if err1 == nil && err2 == nil && mh > 0 {
				return t.Density(anh, percentWW*ma/mh)
			}
		}
	}
	pts := t.Densities[formula]
	if len(pts) == 0 || !(percentWW >= pts[0].PercentWW) || !(percentWW <= pts[len(pts)-1].PercentWW) {
		return 0, false
	}
	i := sort.Search(len(pts), func(i int) bool { return pts[i].PercentWW >= percentWW })
	if pts[i].PercentWW == percentWW {
		return pts[i].GPerML, true
	}
	a, b := pts[i-1], pts[i]
	f := (percentWW - a.PercentWW) / (b.PercentWW - a.PercentWW)
	return a.GPerML + f*(b.GPerML-a.GPerML), true
}

// SuggestTags returns up to n of tags close to word, for a "did you mean"
// reply to a tag that is not in the catalogue: the closest first. Tags are
// compared in upper case without their separators (T102 and t_102 are
// T-102) by optimal-string-alignment distance, allowing 1 edit for tags of
// up to 5 such characters and 2 for longer ones, so that T-120 finds T-102.
// When some tag differs only in case or separators, only such tags are
// returned.
func SuggestTags(word string, tags []string, n int) []string {
	w := []rune(tagKey(word))
	if len(w) == 0 || n <= 0 {
		return nil
	}
	limit := 1
	if len(w) > 5 {
		limit = 2
	}
	type cand struct {
		tag string
		d   int
	}
	var cands []cand
	var o osa
	for _, t := range tags {
		if d := o.dist(w, o.runes(tagKey(t)), limit); d <= limit {
			cands = append(cands, cand{t, d})
		}
	}
	sort.Slice(cands, func(i, j int) bool {
		if cands[i].d != cands[j].d {
			return cands[i].d < cands[j].d
		}
		return cands[i].tag < cands[j].tag
	})
	out := []string{}
	for _, c := range cands {
		if len(out) == n || (c.d > 0 && cands[0].d == 0) {
			break
		}
		out = append(out, c.tag)
	}
	return out
}

// tagKey is a tag in upper case without separators.
func tagKey(s string) string {
	return strings.Map(func(r rune) rune {
		switch r {
		case '-', '_', ' ', '.', '/':
			return -1
		}
		return unicode.ToUpper(r)
	}, s)
}
