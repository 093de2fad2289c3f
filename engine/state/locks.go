package state

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"mixward/engine/chem"
	"mixward/engine/thermo"
)

// A Lock takes a class of changes out of the equilibrium search while its
// condition holds (data/locks.txt): what is downhill on paper but does not
// happen in a tank at plant conditions.
type Lock struct {
	ID     string
	Rules  []Rule // at least one must hold (one, or two joined by "or")
	When   Cond   // nil means always
	Reason string
	Source string
	Line   int

	groups []Group // every group the row names, for checking against the species data
}

// Never reports whether the lock is a never rule: what it holds back is
// not possible in water at all, so the answer does not list it as "possible
// on paper, held back".
func (l *Lock) Never() bool { return len(l.Rules) == 1 && l.Rules[0].Never }

// Direction says which way a rule keeps a group.
type Direction int

// Directions of a rule.
const (
	NoGain Direction = iota // the group may not grow
	NoLoss                  // the group may not shrink
	Fixed                   // neither
	// OneWay keeps an element from rising and falling at once out of any
	// oxidation state the mix as combined holds it in: a species acts as
	// oxidizing agent or as reducing agent, not on itself (see oneWayRules).
	OneWay
	// NoNewBonds keeps carbon–carbon bonds from being made: for every
	// carbon count k of two or more, the carbon atoms in organic species of
	// k or more carbon atoms may not grow (see chainRules). Organic
	// compounds may then be oxidized, and broken into smaller ones, but
	// never built up into larger ones.
	NoNewBonds
)

// Rule keeps one group of atoms from growing, shrinking or both.
type Rule struct {
	Dir   Direction
	Group Group
	// AcidTo, when set, lets a no-gain group grow by the strong acid the mix
	// as combined holds above that pH (one atom per proton): hydrogen from
	// metals in acid until the acid is spent, not beyond; counted Per atoms
	// per proton (a quarter of a nitrogen per proton for nitric acid taken
	// to nitric oxide). BaseTo is the same for the strong base held below
	// that pH, counted Per atoms per hydroxide (aluminium in caustic gives up to three hydrogen atoms per
	// hydroxide it takes up).
	AcidTo, BaseTo *float64
	Per            float64
	// With, when set, lets a no-gain group grow only as far as this group
	// grows beside it, atom for atom: "no-gain S(0) + with S(4)" lets sulfur
	// come off thiosulfate together with sulfur dioxide or bisulfite (in
	// acid), never with sulfate.
	With *Group
	// SpentBy, when set, lowers a no-gain group's cap by Per of its units
	// for each atom of this group the streams bring, never below zero: the
	// group is used up by the second before any of it can be left over or
	// made anew ("no-gain {HOCl, OCl-, Cl2, Cl2(g)} + spent by Cl(3) x 0.5":
	// chlorite takes hypochlorous acid and chlorine to chlorine dioxide
	// first, one for every two chlorite).
	SpentBy *Group
	// Never marks a "never {A, B}" rule: each listed species may not grow
	// beyond what the streams bring (a no-gain rule per species, so that one
	// listed metal cannot form at the expense of another). Such species
	// never form in water (sodium or magnesium metal), and a change that
	// would form them is not worth listing as held back (see Lock.Never).
	Never bool
}

// Group selects atoms: of an element within an oxidation-state range, of an
// element in organic species, or formula units of listed species.
type Group struct {
	Element string
	Lo, Hi  float64
	Above   bool // X(>a): atoms above state a, each counted at most once per unit of state (see Weight)
	Organic bool
	// Without, when set, leaves out species holding that element: N(-3
	// without C) is ammonia, ammonium and their complexes, not the nitrogen
	// of cyanide, cyanate, thiocyanate or amines.
	Without string
	Species []string // species texts; when set, Element is unused
	// Per is the count of each listed species (1 unless the list writes a
	// number before it: {N2, 2 CO(NH2)2} counts a urea as two units, the
	// two nitrogen molecules it can give).
	Per []float64
	// MinAtoms, when set (with Organic), counts only species holding at
	// least that many atoms of the element: the carbon of compounds of k or
	// more carbon atoms.
	MinAtoms int
	// Blocks, when set (with MinAtoms), counts in each species the whole
	// blocks of MinAtoms atoms it holds, not its atoms: the most pieces of
	// k carbon atoms a compound could be broken into.
	Blocks bool
	text   string
}

func (g Group) String() string { return g.text }

// Weight is how many atoms (or formula units) of the group one formula unit
// of sp holds.
func (g Group) Weight(sp *thermo.Species) float64 {
	if len(g.Species) > 0 {
		for i, s := range g.Species {
			if s == sp.Text || s == sp.Ion() {
				return g.Per[i]
			}
		}
		return 0
	}
	n := sp.Atoms[g.Element]
	if n == 0 || (g.Without != "" && sp.Atoms[g.Without] > 0) {
		return 0
	}
	if g.Organic {
		if IsOrganic(sp.Atoms, sp.Ion()) && n >= g.MinAtoms {
			if g.Blocks {
				return float64(n / g.MinAtoms)
			}
			return float64(n)
		}
		return 0
	}
	ox, ok := sp.Ox[g.Element]
	if !ok {
		return 0
	}
	const tol = 0.01
	if g.Above {
		// Atoms above state Lo, from an average state: n·min(ox−Lo, 1).
		// Oxygen above −II: 2 in H2O2, 2 in O2, 2 in HSO5- (average −1.6),
		// 2 in S2O8^2- (average −1.75), 3 in O3.
		if ox <= g.Lo+tol {
			return 0
		}
		return math.Round(float64(n)*math.Min(ox-g.Lo, 1)*1e9) / 1e9
	}
	if ox < g.Lo-tol || ox > g.Hi+tol {
		return 0
	}
	return float64(n)
}

// inorganicCarbon are the one-carbon species with hydrogen that are not
// organic by the usual convention.
var inorganicCarbon = map[string]bool{"HCO3-": true, "H2CO3": true, "HCN": true, "HOCN": true, "HSCN": true}

// IsOrganic reports whether a species counts as organic: two or more carbon
// atoms, or carbon together with hydrogen other than in bicarbonate, carbonic
// acid, HCN, HOCN and HSCN. Cyanide complexes of metals (Fe(CN)6^4-,
// Ag(CN)2-, Cu(CN)3^2-) and cyanogen are inorganic, as the usual convention
// has it: their carbon is cyanide's, which they take up and give back.
func IsOrganic(a chem.Atoms, ion string) bool {
	c := a["C"]
	switch {
	case cyanoOnly(a):
		return false
	case c >= 2:
		return true
	case c == 1 && a["H"] > 0:
		return !inorganicCarbon[ion]
	}
	return false
}

// cyanoOnly reports whether a species' non-metal atoms are cyanide groups
// and nothing else: carbon and nitrogen in equal numbers, no hydrogen, no
// other non-metal.
func cyanoOnly(a chem.Atoms) bool {
	if a["C"] == 0 || a["C"] != a["N"] {
		return false
	}
	for el := range a {
		if el != "C" && el != "N" && !chem.IsMetal(el) {
			return false
		}
	}
	return true
}

// parseLocks reads data/locks.txt.
func parseLocks(file string, b []byte) ([]Lock, error) {
	var out []Lock
	seen := map[string]int{}
	for i, line := range strings.Split(string(b), "\n") {
		line = strings.TrimSpace(line)
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		l, err := parseLockRow(line)
		if err != nil {
			return nil, fmt.Errorf("%s:%d: %v", file, i+1, err)
		}
		if prev, dup := seen[l.ID]; dup {
			return nil, fmt.Errorf("%s:%d: lock %q is already defined on line %d; give each lock its own id", file, i+1, l.ID, prev)
		}
		seen[l.ID] = i + 1
		l.Line = i + 1
		out = append(out, l)
	}
	return out, nil
}

func parseLockRow(line string) (Lock, error) {
	f := strings.Split(line, " | ")
	if len(f) != 5 {
		return Lock{}, fmt.Errorf("want 5 fields (id | rule | applies when | reason | source), got %d", len(f))
	}
	for i := range f {
		f[i] = strings.TrimSpace(f[i])
	}
	l := Lock{ID: f[0], Reason: f[3], Source: f[4]}
	if l.ID == "" || strings.ContainsAny(l.ID, " \t") {
		return Lock{}, fmt.Errorf("lock id %q must be one word", l.ID)
	}
	if l.Source == "" {
		return Lock{}, fmt.Errorf("lock %s has no source; name one or write \"common practice, no source\"", l.ID)
	}
	for _, part := range strings.Split(f[1], " or ") {
		r, err := parseRule(strings.TrimSpace(part))
		if err != nil {
			return Lock{}, fmt.Errorf("lock %s: %v", l.ID, err)
		}
		l.Rules = append(l.Rules, r)
		l.groups = append(l.groups, r.Group)
		if r.With != nil {
			l.groups = append(l.groups, *r.With)
		}
	}
	if len(l.Rules) > 2 {
		return Lock{}, fmt.Errorf("lock %s: at most two rules may be joined by \"or\"", l.ID)
	}
	for _, r := range l.Rules {
		if (r.Dir == OneWay || r.Dir == NoNewBonds) && len(l.Rules) > 1 {
			return Lock{}, fmt.Errorf("lock %s: a one-way or no-new-bonds rule stands alone, not joined by \"or\"", l.ID)
		}
		if r.Never && len(l.Rules) > 1 {
			return Lock{}, fmt.Errorf("lock %s: a never rule stands alone, not joined by \"or\"", l.ID)
		}
	}
	if f[2] != "always" {
		c, err := parseCond(f[2])
		if err != nil {
			return Lock{}, fmt.Errorf("lock %s: condition %q: %v", l.ID, f[2], err)
		}
		l.When = c
		l.groups = append(l.groups, condGroups(c)...)
	}
	return l, nil
}

func parseRule(s string) (Rule, error) {
	dir, rest, ok := strings.Cut(s, " ")
	if !ok {
		return Rule{}, fmt.Errorf("rule %q: want no-gain, no-loss, fixed or never followed by a group", s)
	}
	var r Rule
	switch dir {
	case "no-gain":
		r.Dir = NoGain
	case "no-loss":
		r.Dir = NoLoss
	case "fixed":
		r.Dir = Fixed
	case "never":
		g, err := parseGroup(strings.TrimSpace(rest))
		if err != nil {
			return Rule{}, err
		}
		if len(g.Species) == 0 {
			return Rule{}, fmt.Errorf("rule %q: never takes a list of species, like never {Na(s), K(s)}", s)
		}
		return Rule{Dir: NoGain, Group: g, Never: true}, nil
	case "one-way":
		el := strings.TrimSpace(rest)
		if !chem.IsElementSymbol(el) {
			return Rule{}, fmt.Errorf("rule %q: one-way takes an element alone, like one-way N", s)
		}
		return Rule{Dir: OneWay, Group: Group{Element: el, Lo: -8, Hi: 8, text: el}}, nil
	case "no-new-bonds":
		if strings.TrimSpace(rest) != "C" {
			return Rule{}, fmt.Errorf("rule %q: no-new-bonds takes carbon alone: no-new-bonds C", s)
		}
		return Rule{Dir: NoNewBonds, Group: Group{Element: "C", Organic: true, text: "C(organic)"}}, nil
	default:
		return Rule{}, fmt.Errorf("rule %q: %q is not no-gain, no-loss, fixed, never, one-way or no-new-bonds", s, dir)
	}
	rest, allowance, hasAllowance := strings.Cut(strings.TrimSpace(rest), " + ")
	g, err := parseGroup(strings.TrimSpace(rest))
	if err != nil {
		return Rule{}, err
	}
	r.Group = g
	if hasAllowance {
		if err := r.parseAllowance(allowance); err != nil {
			return Rule{}, fmt.Errorf("rule %q: %v", s, err)
		}
	}
	return r, nil
}

// parseAllowance reads "acid to ph N [x K]", "base to ph N [x K]" or
// "with GROUP".
func (r *Rule) parseAllowance(s string) error {
	bad := fmt.Errorf(`want "+ acid to ph N [x K]", "+ base to ph N [x K]", "+ with GROUP" or "+ spent by GROUP [x K]" after a no-gain group`)
	if r.Dir != NoGain {
		return bad
	}
	if rest, ok := strings.CutPrefix(s, "spent by "); ok {
		grp, per, hasPer := strings.Cut(rest, " x ")
		g, err := parseGroup(strings.TrimSpace(grp))
		if err != nil {
			return err
		}
		r.Per = 1
		if hasPer {
			if r.Per, err = strconv.ParseFloat(strings.TrimSpace(per), 64); err != nil || r.Per <= 0 || r.Per > 10 {
				return bad
			}
		}
		r.SpentBy = &g
		return nil
	}
	if rest, ok := strings.CutPrefix(s, "with "); ok {
		g, err := parseGroup(strings.TrimSpace(rest))
		if err != nil {
			return err
		}
		if g.Above || g.Organic || len(g.Species) > 0 || len(r.Group.Species) > 0 || r.Group.Above || r.Group.Organic || g.Element != r.Group.Element {
			return fmt.Errorf(`"+ with" pairs two oxidation-state groups of one element, like no-gain S(0) + with S(4)`)
		}
		r.With = &g
		return nil
	}
	kind, rest, ok := strings.Cut(s, " to ph ")
	if !ok || (kind != "acid" && kind != "base") {
		return bad
	}
	ph, per, hasPer := strings.Cut(rest, " x ")
	v, err := strconv.ParseFloat(ph, 64)
	if err != nil || v < 0 || v > 14 {
		return bad
	}
	r.Per = 1
	if hasPer {
		if r.Per, err = strconv.ParseFloat(per, 64); err != nil || r.Per <= 0 || r.Per > 10 {
			return bad
		}
	}
	if kind == "acid" {
		r.AcidTo = &v
	} else {
		r.BaseTo = &v
	}
	return nil
}

// parseGroup reads X(a), X(a..b), X(organic) or {A, B}; a state or range may
// end in "without Y" (N(-3..-1 without C)).
func parseGroup(s string) (Group, error) {
	g := Group{text: s}
	if strings.HasPrefix(s, "{") {
		if !strings.HasSuffix(s, "}") {
			return g, fmt.Errorf("group %q: a species list ends with }", s)
		}
		for _, sp := range strings.Split(s[1:len(s)-1], ",") {
			sp = strings.TrimSpace(sp)
			per := 1.0
			if n, rest, ok := strings.Cut(sp, " "); ok {
				v, err := strconv.ParseFloat(n, 64)
				if err != nil || !(v > 0 && v <= 10) {
					return g, fmt.Errorf("group %q: %q: a count before a species is a number from 0 to 10, like 2 CO(NH2)2", s, sp)
				}
				per, sp = v, strings.TrimSpace(rest)
			}
			if _, err := chem.ParseSpecies(sp); err != nil {
				return g, fmt.Errorf("group %q: %v", s, err)
			}
			g.Species = append(g.Species, sp)
			g.Per = append(g.Per, per)
		}
		return g, nil
	}
	el, arg, ok := strings.Cut(s, "(")
	if !ok || !strings.HasSuffix(arg, ")") || !chem.IsElementSymbol(el) {
		return g, fmt.Errorf("group %q: want an element and an oxidation state, like S(6) or N(0..1)", s)
	}
	g.Element = el
	arg = strings.TrimSuffix(arg, ")")
	if a, without, ok := strings.Cut(arg, " without "); ok {
		without = strings.TrimSpace(without)
		if !chem.IsElementSymbol(without) || without == el {
			return g, fmt.Errorf("group %q: \"without\" takes another element, like N(-3 without C)", s)
		}
		g.Without, arg = without, strings.TrimSpace(a)
	}
	if arg == "organic" {
		g.Organic = true
		return g, nil
	}
	if rest, ok := strings.CutPrefix(arg, "organic>="); ok {
		n, err := strconv.Atoi(rest)
		if err != nil || n < 2 || n > 100 {
			return g, fmt.Errorf("group %q: want a whole number of atoms from 2, like C(organic>=2)", s)
		}
		g.Organic, g.MinAtoms = true, n
		return g, nil
	}
	if rest, ok := strings.CutPrefix(arg, ">"); ok {
		v, err := parseState(rest)
		if err != nil {
			return g, fmt.Errorf("group %q: %v", s, err)
		}
		g.Lo, g.Hi, g.Above = v, 8, true
		return g, nil
	}
	lo, hi, isRange := strings.Cut(arg, "..")
	var err error
	if g.Lo, err = parseState(lo); err != nil {
		return g, fmt.Errorf("group %q: %v", s, err)
	}
	g.Hi = g.Lo
	if isRange {
		if g.Hi, err = parseState(hi); err != nil {
			return g, fmt.Errorf("group %q: %v", s, err)
		}
		if g.Hi < g.Lo {
			return g, fmt.Errorf("group %q: the range runs from low to high", s)
		}
	}
	return g, nil
}

func parseState(s string) (float64, error) {
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsNaN(v) || math.Abs(v) > 8 {
		return 0, fmt.Errorf("%q is not an oxidation state between -8 and 8", s)
	}
	return v, nil
}

// condGroups lists the groups a condition names.
func condGroups(c Cond) []Group {
	switch c := c.(type) {
	case andCond:
		return condGroupsOf(c)
	case orCond:
		return condGroupsOf(c)
	case notCond:
		return condGroups(c.c)
	case hasCond:
		return c
	case concCond:
		return c.gs
	case ratioCond:
		return append(append([]Group{}, c.num...), c.den...)
	}
	return nil
}

func condGroupsOf(cs []Cond) []Group {
	var out []Group
	for _, c := range cs {
		out = append(out, condGroups(c)...)
	}
	return out
}

// checkGroups reports a lock group whose element or species the species
// data do not know: a misspelt row would otherwise hold nothing back.
func checkGroups(l *Lock, db *thermo.DB, elements map[string]bool) error {
	for _, g := range l.groups {
		for _, s := range g.Species {
			if _, ok := db.Get(s); !ok {
				return fmt.Errorf("locks.txt:%d: lock %s names %s, which has no row in species.txt; fix the spelling or add the species", l.Line, l.ID, s)
			}
		}
		if len(g.Species) == 0 && !elements[g.Element] {
			return fmt.Errorf("locks.txt:%d: lock %s names element %s, which no species in species.txt holds", l.Line, l.ID, g.Element)
		}
		if g.Without != "" && !elements[g.Without] {
			return fmt.Errorf("locks.txt:%d: lock %s: \"without %s\" names an element no species in species.txt holds", l.Line, l.ID, g.Without)
		}
	}
	return nil
}

// elementsOf lists the elements the species data hold.
func elementsOf(db *thermo.DB) map[string]bool {
	out := map[string]bool{}
	for _, sp := range db.All() {
		for el := range sp.Atoms {
			out[el] = true
		}
	}
	return out
}
