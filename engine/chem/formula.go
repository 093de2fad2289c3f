package chem

import (
	"fmt"
	"slices"
	"sort"
	"strings"
)

// Atoms counts the atoms of each element in a formula.
type Atoms map[string]int

// ParseFormula counts the atoms in a formula written the usual way:
// element symbols with subscripts, parenthesised groups with a multiplier
// (Fe2(SO4)3, Ca(OH)2), and hydrates after a dot or a middle dot
// (CuSO4.5H2O, CuSO4·5H2O). It checks only the syntax; whether each symbol is
// a real element is checked against the atomic-weight table (ReadAtomicWeights).
func ParseFormula(f string) (Atoms, error) {
	p := formulaParser{a: make(Atoms, 4)}
	if err := p.formula(f); err != nil {
		return nil, err
	}
	return p.a, nil
}

// CheckFormula returns the error ParseFormula would return for f, without
// building the atom counts (no allocation for a good formula of up to
// twelve elements).
func CheckFormula(f string) error {
	var p formulaParser
	return p.formula(f)
}

// formula parses f, every part, into p's tally.
func (p *formulaParser) formula(f string) error {
	if f == "" {
		return fmt.Errorf("empty formula")
	}
	if !strings.ContainsAny(f, ".·*") && (f[0] < '0' || f[0] > '9') {
		// One part without a multiplier.
		p.s, p.pos = f, 0
		seen, err := p.group(0, 1)
		if err != nil {
			return fmt.Errorf("formula %q: %w", f, err)
		}
		if !seen {
			return fmt.Errorf("formula %q: part %q has no atoms", f, f)
		}
		return nil
	}
	parts := strings.FieldsFunc(f, func(r rune) bool { return r == '.' || r == '·' || r == '*' })
	if len(parts) == 0 {
		return fmt.Errorf("formula %q has no atoms", f)
	}
	if len(parts) != strings.Count(f, ".")+strings.Count(f, "·")+strings.Count(f, "*")+1 {
		return fmt.Errorf("formula %q: a hydrate separator must stand between two parts, like CuSO4.5H2O", f)
	}
	for k, part := range parts {
		mult := 1
		i := 0
		for i < len(part) && part[i] >= '0' && part[i] <= '9' {
			i++
		}
		if i > 0 {
			if k == 0 {
				return fmt.Errorf("formula %q starts with a number; write a coefficient apart from the formula (2 H2O)", f)
			}
			mult = atoiSafe(part[:i])
			if mult == 0 {
				return fmt.Errorf("formula %q: the multiplier of %q is zero", f, part)
			}
		}
		p.s, p.pos = part, i
		seen, err := p.group(0, mult)
		if err != nil {
			return fmt.Errorf("formula %q: %w", f, err)
		}
		if !seen {
			return fmt.Errorf("formula %q: part %q has no atoms", f, part)
		}
	}
	return nil
}

// maxAtoms bounds the count of one element in a formula, so that nested
// multipliers cannot overflow.
const maxAtoms = 1_000_000

// atoiSafe reads decimal digits; a number above maxAtoms reads as
// maxAtoms+1, which the callers reject.
func atoiSafe(s string) int {
	n := 0
	for _, c := range s {
		n = n*10 + int(c-'0')
		if n > maxAtoms {
			return maxAtoms + 1
		}
	}
	return n
}

// formulaParser reads one part of a formula at a time and tallies its atoms:
// into the map a when it is set, otherwise into a small array (spilling into
// a map past its size), so that checking a formula allocates nothing.
type formulaParser struct {
	s     string
	pos   int
	a     Atoms
	small [12]struct {
		el string
		n  int
	}
	k int // entries used in small
}

// add adds n atoms of el to the tally and returns el's new count.
func (p *formulaParser) add(el string, n int) int {
	if p.a != nil {
		p.a[el] += n
		return p.a[el]
	}
	for i := 0; i < p.k; i++ {
		if p.small[i].el == el {
			p.small[i].n += n
			return p.small[i].n
		}
	}
	if p.k < len(p.small) {
		p.small[p.k].el, p.small[p.k].n = el, n
		p.k++
		return n
	}
	p.a = make(Atoms, p.k+1)
	for _, c := range p.small[:p.k] {
		p.a[c.el] = c.n
	}
	p.a[el] += n
	return p.a[el]
}

// number reads an optional subscript: 1 when there is none, an error when it
// is zero.
func (p *formulaParser) number() (int, error) {
	start := p.pos
	for p.pos < len(p.s) && p.s[p.pos] >= '0' && p.s[p.pos] <= '9' {
		p.pos++
	}
	if p.pos == start {
		return 1, nil
	}
	n := atoiSafe(p.s[start:p.pos])
	if n == 0 {
		return 0, fmt.Errorf("subscript %q at position %d is zero", p.s[start:p.pos], start+1)
	}
	return n, nil
}

// group adds mult times the atoms from p.pos up to the closing bracket of
// this depth (or the end at depth 0) to the tally, and reports whether it saw
// any.
// A bracket's multiplier follows its closer, so it is read ahead and passed
// down: the whole formula fills one map.
func (p *formulaParser) group(depth, mult int) (bool, error) {
	if depth > 8 {
		return false, fmt.Errorf("parentheses nested too deep")
	}
	seen := false
	for p.pos < len(p.s) {
		c := p.s[p.pos]
		switch {
		case c == '(' || c == '[':
			if err := p.bracket(depth, mult, c); err != nil {
				return false, err
			}
			seen = true
		case c == ')' || c == ']':
			if depth == 0 {
				return false, fmt.Errorf("unmatched %q at position %d", string(c), p.pos+1)
			}
			return seen, nil
		case c >= 'A' && c <= 'Z':
			start := p.pos
			p.pos++
			for p.pos < len(p.s) && p.s[p.pos] >= 'a' && p.s[p.pos] <= 'z' {
				p.pos++
			}
			if p.pos-start > 3 {
				return false, fmt.Errorf("%q is not an element symbol", p.s[start:p.pos])
			}
			el := p.s[start:p.pos]
			n, err := p.number()
			if err != nil {
				return false, err
			}
			if p.add(el, n*mult) > maxAtoms {
				return false, fmt.Errorf("more than %d atoms of %s", maxAtoms, el)
			}
			seen = true
		default:
			return false, fmt.Errorf("unexpected %q at position %d", string(c), p.pos+1)
		}
	}
	if depth > 0 {
		return false, fmt.Errorf("missing closing parenthesis")
	}
	return seen, nil
}

// bracket reads a bracketed group and its multiplier, p.pos at the opener c.
func (p *formulaParser) bracket(depth, mult int, c byte) error {
	closer := byte(')')
	if c == '[' {
		closer = ']'
	}
	// Find the closer of this bracket, and read the multiplier after it.
	end, level := -1, 0
	for i := p.pos; i < len(p.s) && end < 0; i++ {
		switch p.s[i] {
		case '(', '[':
			level++
		case ')', ']':
			level--
			if level == 0 {
				end = i
			}
		}
	}
	if end < 0 {
		return fmt.Errorf("missing %q", string(closer))
	}
	after := &formulaParser{s: p.s, pos: end + 1}
	n, err := after.number()
	if err != nil {
		return err
	}
	if mult*n > maxAtoms {
		return fmt.Errorf("more than %d atoms in a group", maxAtoms)
	}
	p.pos++
	inner, err := p.group(depth+1, mult*n)
	if err != nil {
		return err
	}
	if p.pos >= len(p.s) || p.s[p.pos] != closer {
		return fmt.Errorf("missing %q", string(closer))
	}
	if !inner {
		return fmt.Errorf("empty parentheses")
	}
	p.pos = after.pos
	return nil
}

// Add adds n times b to a.
func (a Atoms) Add(b Atoms, n int) {
	for el, k := range b {
		a[el] += k * n
		if a[el] == 0 {
			delete(a, el)
		}
	}
}

// String lists the atoms in Hill order (C, H, then alphabetical), e.g. "H2O1".
func (a Atoms) String() string {
	els := make([]string, 0, len(a))
	for el := range a {
		els = append(els, el)
	}
	sort.Slice(els, func(i, j int) bool { return hillLess(els[i], els[j], a) })
	var b strings.Builder
	for _, el := range els {
		fmt.Fprintf(&b, "%s%d", el, a[el])
	}
	return b.String()
}

func hillLess(x, y string, a Atoms) bool {
	rank := func(s string) int {
		if _, ok := a["C"]; ok {
			switch s {
			case "C":
				return 0
			case "H":
				return 1
			}
		}
		return 2
	}
	if rank(x) != rank(y) {
		return rank(x) < rank(y)
	}
	return x < y
}

// MolarMass is the molar mass of formula from the atomic weights w (g/mol),
// summed over the elements in symbol order, as ParseFormula's atoms would be;
// an element missing from w counts zero. It allocates nothing for a formula
// of up to twelve elements.
func MolarMass(formula string, w map[string]float64) (float64, error) {
	var p formulaParser
	if err := p.formula(formula); err != nil {
		return 0, err
	}
	if p.a != nil {
		els := make([]string, 0, len(p.a))
		for el := range p.a {
			els = append(els, el)
		}
		slices.Sort(els)
		m := 0.0
		for _, el := range els {
			m += float64(p.a[el]) * w[el]
		}
		return m, nil
	}
	tally := p.small[:p.k]
	slices.SortFunc(tally, func(x, y struct {
		el string
		n  int
	}) int {
		return strings.Compare(x.el, y.el)
	})
	m := 0.0
	for _, c := range tally {
		m += float64(c.n) * w[c.el]
	}
	return m, nil
}
