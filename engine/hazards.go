package engine

import (
	"fmt"
	"io/fs"
	"math"
	"sort"
	"strconv"
	"strings"
)

// HazardFile is the name of the hazard rule table at the root of the data FS.
const HazardFile = "hazards.txt"

// UncertainECellV is the band around zero within which a cell potential does
// not settle a verdict: the sources of the potential table differ by up to
// about 0.1 V, and concentrations are rarely known better than that. Hazard
// rules treat a reaction with E cell above −UncertainECellV as possible, and
// the caveats call a verdict with |E cell| below it uncertain.
const UncertainECellV = 0.1

// HazardRule is one rule of the hazard table (data/hazards.txt). The format
// is described in the comment header of that file.
type HazardRule struct {
	ID       string   // rule name, unique in the table
	Code     string   // hazard code shown to operators (toxic-gas, acid-cyanide, ...)
	Severity Severity // info, warning or danger
	When     string   // the condition as written in the table
	Message  string   // message template; placeholders are expanded by EvaluateHazards
	Source   string   // where the rule and its limits come from
	Releases []string // gas formulas the rule releases when it fires (acid + sulfide releases H2S)
	Limits   []Limit  // exposure or flammability limits quoted by the rule
	Line     int      // line of the table where the rule starts

	cond hzCond
}

// Limit is an exposure or flammability limit quoted by a hazard rule, e.g.
// IDLH 10 ppm, LFL 4 %.
type Limit struct {
	Name  string // IDLH, LFL, UFL, O2, PEL, ...
	Value float64
	Unit  string // ppm, %, mg/m3, ...
}

// String is the limit as written in messages: "10 ppm", "4 %".
func (l Limit) String() string {
	return strconv.FormatFloat(l.Value, 'f', -1, 64) + " " + l.Unit
}

// Limit returns the rule's limit of the given name (IDLH, LFL, ...).
func (r *HazardRule) Limit(name string) (Limit, bool) {
	for _, l := range r.Limits {
		if l.Name == name {
			return l, true
		}
	}
	return Limit{}, false
}

// Gases lists the gas formulas the rule's condition tests with a `gas` term,
// in the order they are written.
func (r *HazardRule) Gases() []string {
	var out []string
	seen := map[string]bool{}
	for _, cl := range r.cond {
		for _, t := range cl {
			if t.kind != termGas {
				continue
			}
			for _, p := range t.pats {
				if !seen[p.sp.Formula] {
					seen[p.sp.Formula] = true
					out = append(out, p.sp.Formula)
				}
			}
		}
	}
	return out
}

// SpeciesAmount is a species with its amount in the mix. Molar is the
// concentration after mixing (aqueous species), 0 where it does not apply.
type SpeciesAmount struct {
	Species Species
	Mol     float64
	Molar   float64
}

// ReactionCase is one reaction the hazard rules judge: the headline, an
// alternative or a follow-on step. Label says which ("headline",
// "alternative", "step 2").
type ReactionCase struct {
	Label    string
	Reaction *Reaction
	ECell    float64
}

// HazardInput is everything the hazard rules look at.
type HazardInput struct {
	Present          []SpeciesAmount // species in the mix before any reaction, after acid–base speciation at the mix pH
	Chemicals        []string        // formulas of the chemicals named in the request (K2Cr2O7, NaOCl, HCl)
	Reactions        []ReactionCase  // headline, every spontaneous alternative, every follow-on step
	Gases            []GasRelease    // gases released by the whole sequence
	PH               float64
	VolumeL          float64
	TemperatureC     float64
	TemperatureRiseC *float64 // nil when the heat estimate is missing
	StrongAcidMol    float64  // strong-acid H+ before neutralisation
	StrongBaseMol    float64  // strong-base OH- before neutralisation
}

// LoadHazardRules reads and checks hazards.txt from the root of fsys.
func LoadHazardRules(fsys fs.FS) ([]*HazardRule, error) {
	b, err := fs.ReadFile(fsys, HazardFile)
	if err != nil {
		return nil, fmt.Errorf("read hazard rules: %w", err)
	}
	return parseHazardRules(HazardFile, b)
}

func parseHazardRules(name string, b []byte) ([]*HazardRule, error) {
	var rules []*HazardRule
	ids := map[string]int{}
	var cur *HazardRule
	seen := map[string]bool{}
	finish := func() error {
		if cur == nil {
			return nil
		}
		if err := checkHazardRule(cur); err != nil {
			return fmt.Errorf("%s:%d: rule %s: %w", name, cur.Line, cur.ID, err)
		}
		rules = append(rules, cur)
		cur = nil
		return nil
	}
	sc := newLineReader(b)
	line := 0
	for sc.Scan() {
		line++
		raw := sc.Text()
		text := strings.TrimSpace(raw)
		if text == "" || strings.HasPrefix(text, "#") {
			continue
		}
		indented := raw[0] == ' ' || raw[0] == '\t'
		key, val := text, ""
		if i := strings.IndexAny(text, " \t"); i >= 0 {
			key, val = text[:i], strings.TrimSpace(text[i+1:])
		}
		if !indented {
			if key != "rule" {
				return nil, fmt.Errorf("%s:%d: %q: a rule starts with `rule NAME` at the start of the line; its fields are indented below it", name, line, text)
			}
			if err := finish(); err != nil {
				return nil, err
			}
			if val == "" || strings.ContainsAny(val, " \t") {
				return nil, fmt.Errorf("%s:%d: `rule` needs one name without spaces, like `rule cl2-gas`", name, line)
			}
			if prev, dup := ids[val]; dup {
				return nil, fmt.Errorf("%s:%d: rule %s is already defined at line %d; give each rule its own name", name, line, val, prev)
			}
			ids[val] = line
			cur = &HazardRule{ID: val, Line: line}
			seen = map[string]bool{}
			continue
		}
		if cur == nil {
			return nil, fmt.Errorf("%s:%d: field %q comes before any `rule NAME` line", name, line, key)
		}
		if val == "" {
			return nil, fmt.Errorf("%s:%d: field %q of rule %s is empty", name, line, key, cur.ID)
		}
		repeatable := key == "message" || key == "source" || key == "limit" || key == "releases"
		if seen[key] && !repeatable {
			return nil, fmt.Errorf("%s:%d: field %q appears twice in rule %s; keep one", name, line, key, cur.ID)
		}
		seen[key] = true
		if err := cur.setField(key, val); err != nil {
			return nil, fmt.Errorf("%s:%d: rule %s: %w", name, line, cur.ID, err)
		}
	}
	if err := sc.Err(); err != nil {
		return nil, fmt.Errorf("%s: %w", name, err)
	}
	if err := finish(); err != nil {
		return nil, err
	}
	if len(rules) == 0 {
		return nil, fmt.Errorf("%s: no rules found; each rule starts with `rule NAME`", name)
	}
	return rules, nil
}

// setField sets one field of a hazard rule from its text.
func (r *HazardRule) setField(key, val string) error {
	switch key {
	case "code":
		r.Code = val
	case "severity":
		r.Severity = Severity(val)
	case "when":
		c, err := parseHzCond(val)
		if err != nil {
			return fmt.Errorf("when: %w", err)
		}
		r.When, r.cond = val, c
	case "message":
		r.Message = joinField(r.Message, val)
	case "source":
		r.Source = joinField(r.Source, val)
	case "releases":
		for _, g := range strings.Split(val, ",") {
			f, err := gasFormula(strings.TrimSpace(g))
			if err != nil {
				return fmt.Errorf("releases: %w", err)
			}
			r.Releases = append(r.Releases, f)
		}
	case "limit":
		l, err := parseLimit(val)
		if err != nil {
			return err
		}
		if _, dup := r.Limit(l.Name); dup {
			return fmt.Errorf("limit %s is given twice", l.Name)
		}
		r.Limits = append(r.Limits, l)
	default:
		return fmt.Errorf("unknown field %q; fields are code, severity, when, releases, limit, message, source", key)
	}
	return nil
}

func joinField(have, more string) string {
	if have == "" {
		return more
	}
	return have + " " + more
}

func checkHazardRule(r *HazardRule) error {
	switch {
	case r.Code == "":
		return fmt.Errorf("missing `code` (for example `code toxic-gas`)")
	case !isCode(r.Code):
		return fmt.Errorf("code %q: use lower-case letters, digits and hyphens, like toxic-gas", r.Code)
	}
	switch r.Severity {
	case Info, Warning, Danger:
	case "":
		return fmt.Errorf("missing `severity` (info, warning or danger)")
	default:
		return fmt.Errorf("severity %q: use info, warning or danger", r.Severity)
	}
	if r.cond == nil {
		return fmt.Errorf("missing `when` (for example `when gas Cl2`)")
	}
	if r.Message == "" {
		return fmt.Errorf("missing `message`: say in plain words what will happen and what to do")
	}
	if r.Source == "" {
		return fmt.Errorf("missing `source`: name the document, or write \"common practice, no source\"")
	}
	return checkPlaceholders(r)
}

func isCode(s string) bool {
	for i, c := range s {
		switch {
		case c >= 'a' && c <= 'z', c >= '0' && c <= '9':
		case c == '-' && i > 0 && i < len(s)-1:
		default:
			return false
		}
	}
	return s != ""
}

func parseLimit(val string) (Limit, error) {
	f := strings.Fields(val)
	if len(f) != 3 {
		return Limit{}, fmt.Errorf("limit %q: write NAME VALUE UNIT, like `limit IDLH 10 ppm`", val)
	}
	v, err := strconv.ParseFloat(f[1], 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) || v < 0 {
		return Limit{}, fmt.Errorf("limit %q: %q is not a non-negative number", val, f[1])
	}
	if strings.ContainsAny(f[0], "{}:") {
		return Limit{}, fmt.Errorf("limit %q: the name may not contain braces or colons", val)
	}
	return Limit{Name: f[0], Value: v, Unit: f[2]}, nil
}

// checkPlaceholders makes sure every {placeholder} in the message is known
// and every {limit:NAME} names a limit of the rule.
func checkPlaceholders(r *HazardRule) error {
	s := r.Message
	for {
		i := strings.IndexByte(s, '{')
		j := strings.IndexByte(s, '}')
		if i < 0 && j < 0 {
			return nil
		}
		if i < 0 || j < i {
			return fmt.Errorf("message has an unmatched brace; placeholders are written {gas}, {ph}, {rise}, {final}, {temp} or {limit:NAME}")
		}
		ph := s[i+1 : j]
		switch {
		case ph == "gas", ph == "ph", ph == "rise", ph == "final", ph == "temp":
		case strings.HasPrefix(ph, "limit:"):
			if _, ok := r.Limit(strings.TrimPrefix(ph, "limit:")); !ok {
				return fmt.Errorf("message uses {%s} but the rule has no `limit %s VALUE UNIT` line", ph, strings.TrimPrefix(ph, "limit:"))
			}
		default:
			return fmt.Errorf("message placeholder {%s} is unknown; use {gas}, {ph}, {rise}, {final}, {temp} or {limit:NAME}", ph)
		}
		s = s[j+1:]
	}
}

// A hazard condition is an OR of clauses; a clause is an AND of terms.
type hzCond [][]hzTerm

type termKind int

const (
	termGas termKind = iota + 1
	termFormed
	termPresent
	termChemical
	termStrongAcid
	termStrongBase
	termNumber
)

type hzTerm struct {
	not   bool
	kind  termKind
	pats  []speciesPat // gas, formed, present
	names []string     // chemical
	vname string       // ph, rise, final, temp
	op    string       // <, <=, >, >=
	val   float64
}

// speciesPat matches a species: formula and charge always, the phase only
// when the pattern was written with a phase suffix.
type speciesPat struct {
	sp       Species
	anyPhase bool
}

func (p speciesPat) match(s Species) bool {
	if s.Phase == "" {
		s.Phase = Aqueous
	}
	return p.sp.Formula == s.Formula && p.sp.Charge == s.Charge && (p.anyPhase || p.sp.Phase == s.Phase)
}

func parseSpeciesPat(text string) (speciesPat, error) {
	sp, err := ParseSpecies(text)
	if err != nil {
		return speciesPat{}, err
	}
	if sp.IsElectron() {
		return speciesPat{}, fmt.Errorf("the electron is not a species of the mix")
	}
	return speciesPat{sp: sp, anyPhase: !strings.HasSuffix(text, ")")}, nil
}

// gasFormula reads a gas written as Cl2 or Cl2(g) and returns its formula.
func gasFormula(text string) (string, error) {
	t := strings.TrimSuffix(text, "(g)")
	if strings.HasSuffix(t, "(aq)") || strings.HasSuffix(t, "(s)") || strings.HasSuffix(t, "(l)") {
		return "", fmt.Errorf("gas %q: write a neutral formula such as Cl2 or H2S, optionally with (g)", text)
	}
	sp, err := ParseSpecies(t)
	if err != nil {
		return "", fmt.Errorf("gas %q: %w", text, err)
	}
	if sp.Charge != 0 || sp.IsElectron() {
		return "", fmt.Errorf("gas %q: a gas is neutral; write a formula such as Cl2 or H2S", text)
	}
	return sp.Formula, nil
}

const condHelp = "terms are `gas F,..`, `formed S,..`, `present S,..`, `chemical F,..`, `strong-acid`, `strong-base` and `ph<N`, `rise>=N`, `final>=N`, `temp>=N` (operators < <= > >=), joined by `and` and `or`, each optionally preceded by `not`"

func parseHzCond(s string) (hzCond, error) {
	toks := strings.Fields(s)
	if len(toks) == 0 {
		return nil, fmt.Errorf("empty condition; %s", condHelp)
	}
	var cond hzCond
	var clause []hzTerm
	i := 0
	for {
		if i >= len(toks) {
			return nil, fmt.Errorf("condition %q ends where a term is expected; %s", s, condHelp)
		}
		t := hzTerm{}
		if toks[i] == "not" {
			t.not = true
			i++
			if i >= len(toks) {
				return nil, fmt.Errorf("condition %q ends after `not`; %s", s, condHelp)
			}
		}
		word := toks[i]
		i++
		switch word {
		case "gas", "formed", "present", "chemical":
			if i >= len(toks) || toks[i] == "and" || toks[i] == "or" || toks[i] == "not" {
				return nil, fmt.Errorf("condition %q: `%s` needs a comma-separated list with no spaces, like `%s Cl2,Br2`", s, word, word)
			}
			list := toks[i]
			i++
			for _, item := range strings.Split(list, ",") {
				if item == "" {
					return nil, fmt.Errorf("condition %q: empty item in list %q", s, list)
				}
				switch word {
				case "gas":
					f, err := gasFormula(item)
					if err != nil {
						return nil, fmt.Errorf("condition %q: %w", s, err)
					}
					t.kind = termGas
					t.pats = append(t.pats, speciesPat{sp: Species{Formula: f, Phase: Gas}})
				case "formed", "present":
					p, err := parseSpeciesPat(item)
					if err != nil {
						return nil, fmt.Errorf("condition %q: %w", s, err)
					}
					t.kind = termPresent
					if word == "formed" {
						t.kind = termFormed
					}
					t.pats = append(t.pats, p)
				case "chemical":
					if _, err := ParseFormula(item); err != nil {
						return nil, fmt.Errorf("condition %q: chemical %q: %w", s, item, err)
					}
					t.kind = termChemical
					t.names = append(t.names, item)
				}
			}
		case "strong-acid":
			t.kind = termStrongAcid
		case "strong-base":
			t.kind = termStrongBase
		default:
			if err := parseNumberTerm(word, &t); err != nil {
				return nil, fmt.Errorf("condition %q: %w; %s", s, err, condHelp)
			}
		}
		clause = append(clause, t)
		if i >= len(toks) {
			cond = append(cond, clause)
			return cond, nil
		}
		switch toks[i] {
		case "and":
		case "or":
			cond = append(cond, clause)
			clause = nil
		default:
			return nil, fmt.Errorf("condition %q: expected `and` or `or` before %q; %s", s, toks[i], condHelp)
		}
		i++
	}
}

func parseNumberTerm(word string, t *hzTerm) error {
	for _, v := range []string{"ph", "rise", "final", "temp"} {
		if !strings.HasPrefix(word, v) {
			continue
		}
		rest := word[len(v):]
		for _, op := range []string{"<=", ">=", "<", ">"} {
			if !strings.HasPrefix(rest, op) {
				continue
			}
			x, err := strconv.ParseFloat(rest[len(op):], 64)
			if err != nil || math.IsNaN(x) || math.IsInf(x, 0) {
				return fmt.Errorf("%q: %q is not a number", word, rest[len(op):])
			}
			t.kind, t.vname, t.op, t.val = termNumber, v, op, x
			return nil
		}
		return fmt.Errorf("%q: compare with <, <=, > or >= and a number, written without spaces, like %s<9.2", word, v)
	}
	return fmt.Errorf("unknown term %q", word)
}

// hzState is the mix as the hazard rules see it.
type hzState struct {
	in       *HazardInput
	released map[string]*GasRelease // gas formula → amount (nil when the amount is not known)
	formed   []Species
}

func newHzState(in *HazardInput) *hzState {
	st := &hzState{in: in, released: map[string]*GasRelease{}}
	for i := range in.Gases {
		g := &in.Gases[i]
		f, err := gasFormula(strings.TrimSpace(g.Text))
		if err != nil {
			continue
		}
		if prev := st.released[f]; prev != nil {
			// The same gas listed twice: add the amounts up.
			sum := *prev
			sum.Mol += g.Mol
			sum.VolumeL += g.VolumeL
			sum.VolumeM3 += g.VolumeM3
			st.released[f] = &sum
			continue
		}
		st.released[f] = g
	}
	for _, rc := range in.Reactions {
		if rc.Reaction == nil || rc.ECell <= -UncertainECellV || math.IsNaN(rc.ECell) {
			continue
		}
		for _, p := range rc.Reaction.Products {
			sp := Species{Formula: p.Formula, Charge: p.Charge, Phase: p.Phase}
			if sp.Phase == "" {
				sp.Phase = Aqueous
			}
			st.formed = append(st.formed, sp)
			if sp.Phase == Gas && sp.Charge == 0 {
				if _, ok := st.released[sp.Formula]; !ok {
					st.released[sp.Formula] = nil
				}
			}
		}
	}
	return st
}

func (c hzCond) eval(st *hzState) bool {
	for _, cl := range c {
		ok := true
		for _, t := range cl {
			if t.eval(st) == t.not {
				ok = false
				break
			}
		}
		if ok {
			return true
		}
	}
	return false
}

func (t hzTerm) eval(st *hzState) bool {
	in := st.in
	switch t.kind {
	case termGas:
		for _, p := range t.pats {
			if _, ok := st.released[p.sp.Formula]; ok {
				return true
			}
		}
	case termFormed:
		for _, p := range t.pats {
			for _, s := range st.formed {
				if p.match(s) {
					return true
				}
			}
		}
	case termPresent:
		for _, p := range t.pats {
			for _, s := range in.Present {
				if p.match(s.Species) && s.Mol >= 0 && s.Molar >= 0 {
					return true
				}
			}
		}
	case termChemical:
		for _, n := range t.names {
			for _, c := range in.Chemicals {
				if strings.TrimSpace(c) == n {
					return true
				}
			}
		}
	case termStrongAcid:
		return in.StrongAcidMol > 0
	case termStrongBase:
		return in.StrongBaseMol > 0
	case termNumber:
		x, ok := st.number(t.vname)
		if !ok {
			return false
		}
		switch t.op {
		case "<":
			return x < t.val
		case "<=":
			return x <= t.val
		case ">":
			return x > t.val
		case ">=":
			return x >= t.val
		}
	}
	return false
}

func (st *hzState) number(name string) (float64, bool) {
	in := st.in
	var x float64
	switch name {
	case "ph":
		x = in.PH
	case "temp":
		x = in.TemperatureC
	case "rise":
		if in.TemperatureRiseC == nil {
			return 0, false
		}
		x = *in.TemperatureRiseC
	case "final":
		if in.TemperatureRiseC == nil {
			return 0, false
		}
		x = in.TemperatureC + *in.TemperatureRiseC
	default:
		return 0, false
	}
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return 0, false
	}
	return x, true
}

// EvaluateHazards applies the rules to the mix. Rules that release a gas
// (acid with sulfide releases H2S) are applied first, until no new gas
// appears, so that the gas rules then see those gases too. The hazards come
// danger first, then warning, then info, each group in table order; a hazard
// with the same code and message as an earlier one is dropped.
func EvaluateHazards(rules []*HazardRule, in HazardInput) []Hazard {
	st := newHzState(&in)
	for changed := true; changed; {
		changed = false
		for _, r := range rules {
			if len(r.Releases) == 0 || !r.cond.eval(st) {
				continue
			}
			for _, g := range r.Releases {
				if _, ok := st.released[g]; !ok {
					st.released[g] = nil
					changed = true
				}
			}
		}
	}
	type fired struct {
		h     Hazard
		order int
	}
	var out []fired
	seen := map[string]bool{}
	for i, r := range rules {
		if !r.cond.eval(st) {
			continue
		}
		h := Hazard{Code: r.Code, Severity: r.Severity, Message: st.expand(r), Source: r.Source}
		key := h.Code + "\x00" + h.Message
		if seen[key] {
			continue
		}
		seen[key] = true
		out = append(out, fired{h, i})
	}
	sort.SliceStable(out, func(i, j int) bool {
		si, sj := severityRank(out[i].h.Severity), severityRank(out[j].h.Severity)
		if si != sj {
			return si > sj
		}
		return out[i].order < out[j].order
	})
	hs := make([]Hazard, len(out))
	for i, f := range out {
		hs[i] = f.h
	}
	return hs
}

func severityRank(s Severity) int { return s.Rank() }

// Rank orders severities: 3 danger, 2 warning, 1 info, 0 anything else.
func (s Severity) Rank() int {
	switch s {
	case Danger:
		return 3
	case Warning:
		return 2
	case Info:
		return 1
	}
	return 0
}

// expand fills in the placeholders of the rule's message.
func (st *hzState) expand(r *HazardRule) string {
	if !strings.Contains(r.Message, "{") {
		return r.Message
	}
	var b strings.Builder
	s := r.Message
	for {
		i := strings.IndexByte(s, '{')
		if i < 0 {
			b.WriteString(s)
			return b.String()
		}
		j := strings.IndexByte(s[i:], '}')
		if j < 0 {
			b.WriteString(s)
			return b.String()
		}
		j += i
		b.WriteString(s[:i])
		ph := s[i+1 : j]
		switch {
		case ph == "gas":
			b.WriteString(st.gasPhrase(r))
		case ph == "ph":
			b.WriteString(strconv.FormatFloat(round(st.in.PH, 1), 'f', 1, 64))
		case ph == "rise", ph == "final", ph == "temp":
			if x, ok := st.number(ph); ok {
				b.WriteString(strconv.FormatFloat(math.Round(x), 'f', 0, 64))
			} else {
				b.WriteString("an unknown number of")
			}
		case strings.HasPrefix(ph, "limit:"):
			if l, ok := r.Limit(strings.TrimPrefix(ph, "limit:")); ok {
				b.WriteString(l.String())
			}
		}
		s = s[j+1:]
	}
}

// gasPhrase is " (about 0.52 mol, 12.7 L)" for the first gas of the rule
// whose amount is known, or "" when none is.
func (st *hzState) gasPhrase(r *HazardRule) string {
	names := append(r.Gases(), r.Releases...)
	for _, n := range names {
		g := st.released[n]
		if g == nil || !(g.Mol > 0) || math.IsInf(g.Mol, 0) {
			continue
		}
		p := " (about " + quantityText(g.Mol) + " mol"
		if g.VolumeL > 0 && !math.IsInf(g.VolumeL, 0) {
			p += ", " + quantityText(g.VolumeL) + " L"
			if g.VolumeL >= 1000 {
				p += " = " + quantityText(g.VolumeL/1000) + " m³"
			}
		}
		return p + ")"
	}
	return ""
}

// quantityText writes an amount for an operator: three significant figures,
// no exponent.
func quantityText(v float64) string {
	switch a := math.Abs(v); {
	case a >= 100:
		return strconv.FormatFloat(math.Round(v), 'f', 0, 64)
	case a >= 0.001:
		return strconv.FormatFloat(roundSig(v, 3), 'f', -1, 64)
	case a == 0:
		return "0"
	default:
		return "less than 0.001"
	}
}

func roundSig(v float64, sig int) float64 {
	if v == 0 {
		return 0
	}
	d := math.Ceil(math.Log10(math.Abs(v)))
	p := math.Pow(10, float64(sig)-d)
	return math.Round(v*p) / p
}

func round(v float64, digits int) float64 {
	p := math.Pow(10, float64(digits))
	return math.Round(v*p) / p
}
