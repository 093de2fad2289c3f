package state

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// Env is what a lock's condition is judged against: the mix as combined,
// before any redox change.
type Env struct {
	TempC float64
	// ReachC is the temperature the mix reaches by its own heat when that
	// is known (the caller solves again with it), else TempC.
	ReachC float64
	PH     float64
	Has    func(Group) bool    // any of the group above the presence threshold
	Molar  func(Group) float64 // mol/L of the group (formula units, or atoms of an element group)
}

// Cond is a parsed condition of data/locks.txt.
type Cond interface {
	Holds(e Env) bool
	String() string
}

type (
	andCond []Cond
	orCond  []Cond
	notCond struct{ c Cond }
	cmpCond struct {
		what string // "t", "reach" or "ph"
		less bool   // < when true, >= when false
		v    float64
	}
	hasCond []Group
	// ratioCond is ratio(G[, G...] / G[, G...])<N or >=N: the mol/L of the
	// first groups together over that of the second (infinite when the
	// second are absent), such as hypochlorite chlorine over ammonia
	// nitrogen on either side of breakpoint.
	ratioCond struct {
		num, den []Group
		less     bool
		v        float64
	}
	// concCond is conc(G[, G...])>=N: the groups together at N mol/L or more.
	concCond struct {
		gs []Group
		v  float64
	}
)

func (c concCond) Holds(e Env) bool {
	if e.Molar == nil {
		return false
	}
	tot := 0.0
	for _, g := range c.gs {
		tot += e.Molar(g)
	}
	return tot >= c.v
}

func (c concCond) String() string {
	parts := make([]string, len(c.gs))
	for i, g := range c.gs {
		parts[i] = g.text
	}
	return "conc(" + strings.Join(parts, ", ") + ")>=" + strconv.FormatFloat(c.v, 'g', -1, 64)
}

func (c ratioCond) Holds(e Env) bool {
	if e.Molar == nil {
		return false
	}
	sum := func(gs []Group) float64 {
		t := 0.0
		for _, g := range gs {
			t += e.Molar(g)
		}
		return t
	}
	r := math.Inf(1)
	if d := sum(c.den); d > 0 {
		r = sum(c.num) / d
	}
	if c.less {
		return r < c.v
	}
	return r >= c.v
}

func (c ratioCond) String() string {
	names := func(gs []Group) string {
		parts := make([]string, len(gs))
		for i, g := range gs {
			parts[i] = g.text
		}
		return strings.Join(parts, ", ")
	}
	op := ">="
	if c.less {
		op = "<"
	}
	return "ratio(" + names(c.num) + " / " + names(c.den) + ")" + op + strconv.FormatFloat(c.v, 'g', -1, 64)
}

func (c andCond) Holds(e Env) bool {
	for _, x := range c {
		if !x.Holds(e) {
			return false
		}
	}
	return true
}

func (c orCond) Holds(e Env) bool {
	for _, x := range c {
		if x.Holds(e) {
			return true
		}
	}
	return false
}

func (c notCond) Holds(e Env) bool { return !c.c.Holds(e) }

func (c cmpCond) Holds(e Env) bool {
	v := e.TempC
	switch c.what {
	case "ph":
		v = e.PH
	case "reach":
		v = math.Max(e.ReachC, e.TempC)
	}
	if c.less {
		return v < c.v
	}
	return v >= c.v
}

func (c hasCond) Holds(e Env) bool {
	if e.Has == nil {
		return false
	}
	for _, g := range c {
		if e.Has(g) {
			return true
		}
	}
	return false
}

func (c andCond) String() string { return join(c, " and ") }
func (c orCond) String() string  { return join(c, " or ") }
func (c notCond) String() string { return "not " + c.c.String() }
func (c cmpCond) String() string {
	op := ">="
	if c.less {
		op = "<"
	}
	return c.what + op + strconv.FormatFloat(c.v, 'g', -1, 64)
}
func (c hasCond) String() string {
	parts := make([]string, len(c))
	for i, g := range c {
		parts[i] = g.text
	}
	return "has " + strings.Join(parts, ", ")
}

func join[T Cond](cs []T, sep string) string {
	parts := make([]string, len(cs))
	for i, c := range cs {
		parts[i] = "(" + c.String() + ")"
	}
	return strings.Join(parts, sep)
}

// parseCond reads a condition: atoms t<N, t>=N, reach<N, reach>=N, ph<N,
// ph>=N, has G[, G...], conc(G[, G...])>=N, ratio(G[, G...] / G[, G...])<N
// or >=N;
// "not" before an atom or a parenthesised condition; "and" binds before "or".
func parseCond(s string) (Cond, error) {
	p := &condParser{toks: condTokens(s)}
	c, err := p.or()
	if err != nil {
		return nil, err
	}
	if p.i != len(p.toks) {
		return nil, fmt.Errorf("unexpected %q", p.toks[p.i])
	}
	return c, nil
}

// afterHas reports whether the next token is an item of a has-list: the
// token before is "has" or an item that ends with a comma. A parenthesis
// there opens a species ((CH3)2CHOH), not a group of conditions.
func afterHas(out []string) bool {
	if len(out) == 0 {
		return false
	}
	last := out[len(out)-1]
	return last == "has" || strings.HasSuffix(last, ",")
}

// condTokens splits on spaces, keeps parentheses apart, and keeps a has-list
// ("has Fe(2..3), Mn(2)") together as one token each group; a species that
// begins with a parenthesis ((CH3)2CHOH) may stand in a has-list.
func condTokens(s string) []string {
	var out []string
	var cur strings.Builder
	depth := 0 // parentheses inside a group such as Fe(2..3)
	flush := func() {
		if cur.Len() > 0 {
			out = append(out, cur.String())
			cur.Reset()
		}
	}
	for _, r := range s {
		switch {
		case r == ' ' && depth == 0:
			flush()
		case r == '(' && cur.Len() == 0 && !afterHas(out):
			out = append(out, "(")
		case r == '(':
			depth++
			cur.WriteRune(r)
		case r == ')' && depth > 0:
			depth--
			cur.WriteRune(r)
		case r == ')':
			flush()
			out = append(out, ")")
		default:
			cur.WriteRune(r)
		}
	}
	flush()
	return out
}

type condParser struct {
	toks []string
	i    int
}

func (p *condParser) peek() string {
	if p.i < len(p.toks) {
		return p.toks[p.i]
	}
	return ""
}

func (p *condParser) or() (Cond, error) {
	var cs orCond
	for {
		c, err := p.and()
		if err != nil {
			return nil, err
		}
		cs = append(cs, c)
		if p.peek() != "or" {
			break
		}
		p.i++
	}
	if len(cs) == 1 {
		return cs[0], nil
	}
	return cs, nil
}

func (p *condParser) and() (Cond, error) {
	var cs andCond
	for {
		c, err := p.factor()
		if err != nil {
			return nil, err
		}
		cs = append(cs, c)
		if p.peek() != "and" {
			break
		}
		p.i++
	}
	if len(cs) == 1 {
		return cs[0], nil
	}
	return cs, nil
}

func (p *condParser) factor() (Cond, error) {
	switch t := p.peek(); t {
	case "":
		return nil, fmt.Errorf("condition ends too soon")
	case "not":
		p.i++
		c, err := p.factor()
		if err != nil {
			return nil, err
		}
		return notCond{c}, nil
	case "(":
		p.i++
		c, err := p.or()
		if err != nil {
			return nil, err
		}
		if p.peek() != ")" {
			return nil, fmt.Errorf("missing )")
		}
		p.i++
		return c, nil
	case "has":
		p.i++
		return p.has()
	default:
		p.i++
		return parseCmp(t)
	}
}

func (p *condParser) has() (Cond, error) {
	var gs hasCond
	for {
		t := p.peek()
		if t == "" {
			return nil, fmt.Errorf("has without a group")
		}
		p.i++
		more := strings.HasSuffix(t, ",")
		g, err := parseHasItem(strings.TrimSuffix(t, ","))
		if err != nil {
			return nil, err
		}
		gs = append(gs, g)
		if !more {
			return gs, nil
		}
	}
}

// parseHasItem reads a group X(a..b) or one species text (NH2SO3-).
func parseHasItem(s string) (Group, error) {
	if g, err := parseGroup(s); err == nil {
		return g, nil
	}
	return parseGroup("{" + s + "}")
}

// parseGroupList reads "G[, G...]" as groups.
func parseGroupList(list string) ([]Group, error) {
	var gs []Group
	for _, item := range strings.Split(list, ",") {
		g, err := parseHasItem(strings.TrimSpace(item))
		if err != nil {
			return nil, err
		}
		gs = append(gs, g)
	}
	return gs, nil
}

// parseRatio reads ratio(G[, G...] / G[, G...])<N or >=N.
func parseRatio(t, rest string) (Cond, error) {
	c := ratioCond{}
	i := strings.LastIndex(rest, ")")
	if i < 0 {
		return nil, fmt.Errorf("%q: write ratio(GROUPS / GROUPS)<N or >=N", t)
	}
	inner, tail := rest[:i], rest[i+1:]
	num, den, ok := strings.Cut(inner, " / ")
	if !ok {
		return nil, fmt.Errorf("%q: write ratio(GROUPS / GROUPS)<N or >=N, with spaces around /", t)
	}
	var err error
	if c.num, err = parseGroupList(num); err != nil {
		return nil, err
	}
	if c.den, err = parseGroupList(den); err != nil {
		return nil, err
	}
	switch {
	case strings.HasPrefix(tail, ">="):
		tail = tail[2:]
	case strings.HasPrefix(tail, "<"):
		c.less, tail = true, tail[1:]
	default:
		return nil, fmt.Errorf("%q: write ratio(GROUPS / GROUPS)<N or >=N", t)
	}
	v, err := strconv.ParseFloat(tail, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) || v < 0 {
		return nil, fmt.Errorf("%q: %q is not a number of zero or more", t, tail)
	}
	c.v = v
	return c, nil
}

func parseCmp(t string) (Cond, error) {
	if rest, ok := strings.CutPrefix(t, "ratio("); ok {
		return parseRatio(t, rest)
	}
	if rest, ok := strings.CutPrefix(t, "conc("); ok {
		list, v, ok := strings.Cut(rest, ")>=")
		if !ok {
			return nil, fmt.Errorf("%q: write conc(SPECIES[, SPECIES])>=N", t)
		}
		c := concCond{}
		for _, item := range strings.Split(list, ",") {
			g, err := parseHasItem(strings.TrimSpace(item))
			if err != nil {
				return nil, err
			}
			c.gs = append(c.gs, g)
		}
		x, err := strconv.ParseFloat(v, 64)
		if err != nil || math.IsNaN(x) || math.IsInf(x, 0) {
			return nil, fmt.Errorf("%q: %q is not a number", t, v)
		}
		c.v = x
		return c, nil
	}
	for _, what := range []string{"ph", "reach", "t"} {
		rest, ok := strings.CutPrefix(t, what)
		if !ok {
			continue
		}
		c := cmpCond{what: what}
		switch {
		case strings.HasPrefix(rest, ">="):
			rest = rest[2:]
		case strings.HasPrefix(rest, "<"):
			c.less = true
			rest = rest[1:]
		default:
			return nil, fmt.Errorf("%q: write %s<N or %s>=N", t, what, what)
		}
		v, err := strconv.ParseFloat(rest, 64)
		if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("%q: %q is not a number", t, rest)
		}
		c.v = v
		return c, nil
	}
	return nil, fmt.Errorf("%q is not a condition (t<N, t>=N, reach<N, reach>=N, ph<N, ph>=N, has GROUP, conc(GROUP)>=N, ratio(GROUP / GROUP)<N or >=N, not, and, or)", t)
}
