package chem

import (
	"fmt"
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
	if f == "" {
		return nil, fmt.Errorf("empty formula")
	}
	total := Atoms{}
	parts := strings.FieldsFunc(f, func(r rune) bool { return r == '.' || r == '·' || r == '*' })
	if len(parts) == 0 {
		return nil, fmt.Errorf("formula %q has no atoms", f)
	}
	if len(parts) != strings.Count(f, ".")+strings.Count(f, "·")+strings.Count(f, "*")+1 {
		return nil, fmt.Errorf("formula %q: a hydrate separator must stand between two parts, like CuSO4.5H2O", f)
	}
	for k, part := range parts {
		mult := 1
		i := 0
		for i < len(part) && part[i] >= '0' && part[i] <= '9' {
			i++
		}
		if i > 0 {
			if k == 0 {
				return nil, fmt.Errorf("formula %q starts with a number; write a coefficient apart from the formula (2 H2O)", f)
			}
			mult = atoiSafe(part[:i])
			if mult == 0 {
				return nil, fmt.Errorf("formula %q: the multiplier of %q is zero", f, part)
			}
		}
		p := &formulaParser{s: part, pos: i}
		a, err := p.group(0)
		if err != nil {
			return nil, fmt.Errorf("formula %q: %w", f, err)
		}
		if p.pos != len(p.s) {
			return nil, fmt.Errorf("formula %q: unexpected %q at position %d", f, p.s[p.pos:p.pos+1], p.pos+1)
		}
		if len(a) == 0 {
			return nil, fmt.Errorf("formula %q: part %q has no atoms", f, part)
		}
		for el, n := range a {
			total[el] += n * mult
			if total[el] > maxAtoms {
				return nil, fmt.Errorf("formula %q has more than %d atoms of %s", f, maxAtoms, el)
			}
		}
	}
	return total, nil
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

type formulaParser struct {
	s   string
	pos int
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

func (p *formulaParser) group(depth int) (Atoms, error) {
	if depth > 8 {
		return nil, fmt.Errorf("parentheses nested too deep")
	}
	a := Atoms{}
	for p.pos < len(p.s) {
		c := p.s[p.pos]
		switch {
		case c == '(' || c == '[':
			closer := byte(')')
			if c == '[' {
				closer = ']'
			}
			p.pos++
			inner, err := p.group(depth + 1)
			if err != nil {
				return nil, err
			}
			if p.pos >= len(p.s) || p.s[p.pos] != closer {
				return nil, fmt.Errorf("missing %q", string(closer))
			}
			p.pos++
			if len(inner) == 0 {
				return nil, fmt.Errorf("empty parentheses")
			}
			n, err := p.number()
			if err != nil {
				return nil, err
			}
			for el, k := range inner {
				a[el] += k * n
				if a[el] > maxAtoms {
					return nil, fmt.Errorf("more than %d atoms of %s", maxAtoms, el)
				}
			}
		case c == ')' || c == ']':
			if depth == 0 {
				return nil, fmt.Errorf("unmatched %q at position %d", string(c), p.pos+1)
			}
			return a, nil
		case c >= 'A' && c <= 'Z':
			start := p.pos
			p.pos++
			for p.pos < len(p.s) && p.s[p.pos] >= 'a' && p.s[p.pos] <= 'z' {
				p.pos++
			}
			if p.pos-start > 3 {
				return nil, fmt.Errorf("%q is not an element symbol", p.s[start:p.pos])
			}
			el := p.s[start:p.pos]
			n, err := p.number()
			if err != nil {
				return nil, err
			}
			a[el] += n
			if a[el] > maxAtoms {
				return nil, fmt.Errorf("more than %d atoms of %s", maxAtoms, el)
			}
		default:
			return nil, fmt.Errorf("unexpected %q at position %d", string(c), p.pos+1)
		}
	}
	if depth > 0 {
		return nil, fmt.Errorf("missing closing parenthesis")
	}
	return a, nil
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
