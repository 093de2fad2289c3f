package engine

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io/fs"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"
	"sync"

	"mixward/engine/chem"
)

// Names of the tables Load reads from the root of the data FS.
const (
	ElementsFile      = "elements.txt"
	ChemicalsFile     = "chemicals.txt"
	HalfReactionsFile = "halfreactions.txt"
	AcidBaseFile      = "acidbase.txt"
	DensitiesFile     = "densities.txt"
)

// tableDir is the directory the tables live in within the repository. Error
// messages name it so that a maintainer can open the file at once.
const tableDir = "data/"

// Limits the loader enforces on table values.
const (
	maxAbsE0   = 3.5  // V; every standard potential in water lies within ±3.5 V
	minPKa     = -5.0 // pKa values outside this range are typing errors
	maxPKa     = 25.0
	minDensity = 0.5 // g/mL; aqueous solutions lie well inside 0.5…2.5
	maxDensity = 2.5
	// maxNeatDensity bounds a 100 % row, a liquid sold neat: bromine is
	// 3.12 g/mL (CRC Handbook, Physical Constants of Inorganic Compounds;
	// from memory).
	maxNeatDensity = 3.5
	// maxDensitySlope bounds the change of density per % w/w between two
	// neighbouring rows; the steepest real table (sulfuric acid) changes by
	// about 0.012 g/mL per %, so a larger step is a typing error.
	maxDensitySlope = 0.02
)

// ErrUnbalanced is wrapped by BalanceError when the atoms or the charge of an
// equation do not balance.
var ErrUnbalanced = errors.New("equation does not balance")

// TableError is one bad row of a data table. Load joins every TableError it
// finds (errors.Join), so a maintainer sees all bad rows at once.
type TableError struct {
	File  string // path of the table, e.g. "data/halfreactions.txt"
	Line  int    // 1-based line number; 0 for a problem with the whole file
	Field string // name of the offending field (reduction, formula, ...)
	Value string // the field's text
	Msg   string // what is wrong and what to do
}

func (e *TableError) Error() string {
	var b strings.Builder
	b.WriteString(e.File)
	if e.Line > 0 {
		fmt.Fprintf(&b, ":%d", e.Line)
	}
	b.WriteString(": ")
	if e.Field != "" {
		b.WriteString(e.Field)
		if e.Value != "" {
			v := e.Value
			if r := []rune(v); len(r) > 70 {
				v = string(r[:67]) + "..."
			}
			fmt.Fprintf(&b, " %q", v)
		}
		b.WriteString(": ")
	}
	b.WriteString(e.Msg)
	return b.String()
}

// Load reads and validates elements.txt, chemicals.txt, halfreactions.txt,
// acidbase.txt and densities.txt from the root of fsys (normally data.FS). It
// fills every table of Tables that these files describe and sets Hash. Every
// problem found is reported, each naming its file, line and field and saying
// what to do; the errors are joined with errors.Join.
//
// Hash is the hex SHA-256 over every *.txt file at the root of fsys, taken in
// name order: for each file its name, a NUL byte, its length in decimal, a
// NUL byte and its content.
func Load(fsys fs.FS) (*Tables, error) { return load(fsys, false) }

// loadFast reads the same tables as Load into the same Tables, but only
// parses: it skips every check that the tests run through Load on the tables
// of data/ (balance, spellings, classes, names, pair shapes, density order),
// so that a process starts quickly. Use it only on tables that Load accepts.
func loadFast(fsys fs.FS) (*Tables, error) { return load(fsys, true) }

func load(fsys fs.FS, fast bool) (*Tables, error) {
	l := &loader{
		fast:       fast,
		t:          &Tables{Densities: map[string][]DensityPoint{}},
		spellings:  map[string]string{},
		byComp:     map[string]spellingUse{},
		acids:      map[string]bool{},
		bases:      map[string]bool{},
		chemByForm: map[string]*Chemical{},
	}
	names, contents, err := readTables(fsys)
	if err != nil {
		return nil, err
	}
	// The hash does not depend on the parse: New's loader takes it on a
	// goroutine of its own.
	var hashing sync.WaitGroup
	hashing.Go(func() { l.t.Hash = hashTables(names, contents) })
	if !fast {
		hashing.Wait()
	}
	defer hashing.Wait()
	files := []struct {
		name string
		read func([]string, int)
		n    int
	}{
		{ElementsFile, l.element, 4},
		{AcidBaseFile, l.acidBase, 4},
		{ChemicalsFile, l.chemical, 5},
		{HalfReactionsFile, l.halfReaction, 5},
		{DensitiesFile, l.density, 4},
	}
	if fast {
		files[1].read, files[2].read, files[3].read, files[4].read = l.fastAcidBase, l.fastChemical, l.fastHalfReaction, l.fastDensity
	}
	for _, f := range files {
		l.file = tableDir + f.name
		b, ok := contents[f.name]
		if !ok {
			b, err = fs.ReadFile(fsys, f.name)
		}
		rows := 0
		if err != nil {
			l.errs = append(l.errs, &TableError{File: l.file, Msg: fmt.Sprintf("cannot read the table (%v); it must sit at the root of the data directory", err)})
		} else if rows = l.rows(b, f.n, f.read); rows == 0 {
			l.errs = append(l.errs, &TableError{File: l.file, Msg: "the table has no rows; restore it from version control"})
		}
		if f.name == ElementsFile && len(l.t.Atomic) == 0 {
			// Nothing else can be checked without atomic weights.
			return nil, errors.Join(l.errs...)
		}
	}
	if !fast {
		l.checkDensityOrder()
	}
	if len(l.errs) > 0 {
		return nil, errors.Join(l.errs...)
	}
	return l.t, nil
}

// readTables reads every *.txt file at the root of fsys, and returns their
// names in order and their contents by name, so that each file is read once.
func readTables(fsys fs.FS) ([]string, map[string][]byte, error) {
	names, err := fs.Glob(fsys, "*.txt")
	if err != nil {
		return nil, nil, fmt.Errorf("list the data tables: %w", err)
	}
	sort.Strings(names)
	contents := make(map[string][]byte, len(names))
	for _, n := range names {
		b, err := fs.ReadFile(fsys, n)
		if err != nil {
			return nil, nil, fmt.Errorf("read %s%s for the table hash: %w", tableDir, n, err)
		}
		contents[n] = b
	}
	return names, contents, nil
}

// hashTables hashes the tables in name order (see Load for the layout).
func hashTables(names []string, contents map[string][]byte) string {
	h := sha256.New()
	for _, n := range names {
		b := contents[n]
		fmt.Fprintf(h, "%s\x00%d\x00", n, len(b))
		h.Write(b)
	}
	return hex.EncodeToString(h.Sum(nil))
}

// spellingUse remembers where a species spelling was first used.
type spellingUse struct {
	spelling string
	where    string
}

type loader struct {
	fast bool // loadFast: parse only
	t    *Tables
	errs []error
	file string
	line int

	elementNames map[string]int         // element name → line
	spellings    map[string]string      // spelling → composition key
	byComp       map[string]spellingUse // composition key → first spelling
	acids, bases map[string]bool        // Ion() of every acid and base of acidbase.txt
	halfIDs      map[string]int         // id → line
	halfEqs      map[string]string      // canonical equation → id
	chemByForm   map[string]*Chemical   // formula → chemical
	names        map[string]string      // name → formula
	densityLines map[string][]int       // formula → lines of its rows
	abPairs      map[string]int         // "acid|base" → line
	abAcidLine   map[string]int         // acid Ion() → line
	chemLine     map[*Chemical]int      // chemical → line
	parsed       map[string]Species     // loadFast: species by text
}

// fail records a problem with the current row.
func (l *loader) fail(field, value, format string, args ...any) {
	l.errs = append(l.errs, &TableError{File: l.file, Line: l.line, Field: field, Value: value, Msg: fmt.Sprintf(format, args...)})
}

// maxLine bounds the length of a table line.
const maxLine = 1 << 20

// rows splits a table into rows of n fields and hands each to read. It
// returns the number of rows seen. The text is copied once: every field is a
// substring of that copy, and the slice of fields is reused from row to row
// (read must not keep it).
func (l *loader) rows(b []byte, n int, read func([]string, int)) int {
	rest := string(b)
	fields := make([]string, 0, 8)
	l.line = 0
	count := 0
	for rest != "" {
		var line string
		if i := strings.IndexByte(rest, '\n'); i >= 0 {
			line, rest = rest[:i], rest[i+1:]
		} else {
			line, rest = rest, ""
		}
		l.line++
		if len(line) > maxLine {
			l.errs = append(l.errs, &TableError{File: l.file, Line: l.line, Msg: "cannot read the line (token too long); keep lines under 1 MiB"})
			return count
		}
		text := strings.TrimSpace(strings.TrimPrefix(line, "\ufeff"))
		if text == "" || text[0] == '#' {
			continue
		}
		count++
		fields = splitFields(fields[:0], text)
		if len(fields) != n {
			l.fail("row", text, "has %d fields but this table has %d, separated by \" | \"; see the header comment of the file", len(fields), n)
			continue
		}
		empty := false
		for i, f := range fields {
			if f == "" {
				l.fail(fmt.Sprintf("field %d", i+1), "", "is empty; every field, the source last, must be filled in")
				empty = true
			}
		}
		if empty {
			continue
		}
		read(fields, l.line)
	}
	return count
}

// lineReader walks the lines of a table held in one string, as a
// bufio.Scanner splitting lines would (a trailing \r dropped, lines over
// maxLine an error), without copying each line.
type lineReader struct {
	rest, line string
	err        error
}

func newLineReader(b []byte) *lineReader { return &lineReader{rest: string(b)} }

// Scan moves to the next line; it returns false at the end or on an error.
func (r *lineReader) Scan() bool {
	if r.rest == "" || r.err != nil {
		return false
	}
	if i := strings.IndexByte(r.rest, '\n'); i >= 0 {
		r.line, r.rest = r.rest[:i], r.rest[i+1:]
	} else {
		r.line, r.rest = r.rest, ""
	}
	r.line = strings.TrimSuffix(r.line, "\r")
	if len(r.line) > maxLine {
		r.err = errors.New("token too long")
		return false
	}
	return true
}

// Text is the current line.
func (r *lineReader) Text() string { return r.line }

// Err is the error that stopped Scan, if any.
func (r *lineReader) Err() error { return r.err }

// splitFields appends the "|"-separated fields of text, trimmed, to dst.
func splitFields(dst []string, text string) []string {
	for {
		i := strings.IndexByte(text, '|')
		if i < 0 {
			return append(dst, strings.TrimSpace(text))
		}
		dst = append(dst, strings.TrimSpace(text[:i]))
		text = text[i+1:]
	}
}

// number parses a finite decimal number.
// strengthDensity reads a % w/w and a density in g/mL, both in range (the
// density and ceiling tables share them).
func (l *loader) strengthDensity(pctText, rhoText string) (pct, rho float64, ok bool) {
	pct, ok1 := l.number("% w/w", pctText)
	rho, ok2 := l.number("density", rhoText)
	if !ok1 || !ok2 {
		return 0, 0, false
	}
	if pct <= 0 || pct > 100 {
		l.fail("% w/w", pctText, "must be above 0 and at most 100")
		return 0, 0, false
	}
	top := maxDensity
	if pct == 100 {
		top = maxNeatDensity
	}
	if rho < minDensity || rho > top {
		l.fail("density", rhoText, "must lie between %g and %g g/mL (%g for a neat liquid at 100 %%)", minDensity, maxDensity, maxNeatDensity)
		return 0, 0, false
	}
	return pct, rho, true
}

func (l *loader) number(field, s string) (float64, bool) {
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		l.fail(field, s, "is not a number; write a plain decimal number such as 1.507")
		return 0, false
	}
	return v, true
}

// element reads `symbol | name | weight | source`.
func (l *loader) element(f []string, line int) {
	sym, name := f[0], f[1]
	if l.t.Atomic == nil {
		l.t.Atomic = map[string]float64{}
		l.elementNames = map[string]int{}
	}
	if !isElementSymbol(sym) {
		l.fail("symbol", sym, "is not an element symbol; write a capital letter followed by up to two small letters (Fe, Cl)")
		return
	}
	if _, dup := l.t.Atomic[sym]; dup {
		l.fail("symbol", sym, "is listed twice; keep one row per element")
		return
	}
	if prev, dup := l.elementNames[name]; dup {
		l.fail("name", name, "is already used by the element at line %d", prev)
		return
	}
	w, ok := l.number("atomic weight", f[2])
	if !ok {
		return
	}
	if w <= 0 || w > 300 {
		l.fail("atomic weight", f[2], "must be a standard atomic weight in g/mol between 0 and 300")
		return
	}
	l.elementNames[name] = line
	l.t.Atomic[sym] = w
}

func isElementSymbol(s string) bool { return chem.IsElementSymbol(s) }

// atoms parses a formula and checks its elements against elements.txt.
func (l *loader) atoms(field, formula string) (Atoms, bool) {
	a, err := ParseFormula(formula)
	if err != nil {
		l.fail(field, formula, "%v; fix the formula", err)
		return nil, false
	}
	ok := true
	for _, el := range sortedElements(a) {
		if _, known := l.t.Atomic[el]; !known {
			l.fail(field, formula, "element %q is not in %s%s; add it there or fix the formula", el, tableDir, ElementsFile)
			ok = false
		}
	}
	return a, ok
}

func sortedElements(a Atoms) []string {
	els := make([]string, 0, len(a))
	for el := range a {
		els = append(els, el)
	}
	sort.Strings(els)
	return els
}

// species parses a species and records its spelling. loadFast only parses,
// once per spelling.
func (l *loader) species(field, text string) (Species, bool) {
	if l.fast {
		if sp, ok := l.parsed[text]; ok {
			return sp, true
		}
	}
	sp, err := ParseSpecies(text)
	if err != nil {
		l.fail(field, text, "%v; write species like H+, MnO4-, Fe^3+, Cu(s), Cl2(g)", err)
		return Species{}, false
	}
	if l.fast {
		if l.parsed == nil {
			l.parsed = map[string]Species{}
		}
		l.parsed[text] = sp
		return sp, true
	}
	if sp.IsElectron() {
		return sp, true
	}
	a, ok := l.atoms(field, sp.Formula)
	if !ok {
		return Species{}, false
	}
	if sp.Charge == 0 && sp.Phase == Aqueous && len(a) == 1 && a[sp.Formula] == 1 {
		l.fail(field, text, "a single neutral atom does not dissolve; write its phase, like Cu(s), Hg(l), S(s) or Ar(g)")
		return Species{}, false
	}
	l.spelling(sp.Ion(), a, sp.Charge)
	return sp, true
}

// spelling records that the ion spelling s (formula and charge, no phase)
// stands for atoms a with charge z, and reports a second spelling of the
// same composition (ClO- beside OCl-).
func (l *loader) spelling(s string, a Atoms, z int) {
	comp := a.String() + chargeText(z)
	if _, seen := l.spellings[s]; seen {
		return
	}
	l.spellings[s] = comp
	where := fmt.Sprintf("%s:%d", l.file, l.line)
	prev, seen := l.byComp[comp]
	if !seen {
		l.byComp[comp] = spellingUse{s, where}
		return
	}
	if isomers(prev.spelling, s) {
		return
	}
	l.fail("species", s, "has the same atoms and charge as %s (first used at %s); use one spelling in every table", prev.spelling, prev.where)
}

// isomers lists the pairs of spellings that are truly different substances
// with the same atoms and charge, and so may both appear in the tables.
func isomers(a, b string) bool {
	if a > b {
		a, b = b, a
	}
	switch a + " " + b {
	case "C2H5OH CH3OCH3": // ethanol, dimethyl ether
		return true
	}
	return false
}

// terms parses `2 Fe^3+ + 3 SO4^2-`. It returns the terms without the
// electrons and the number of electrons.
func (l *loader) terms(field, text string) ([]Term, int, bool) {
	var out []Term
	electrons := 0
	ok := true
	var seen map[string]bool
	if !l.fast {
		seen = map[string]bool{}
	}
	for _, part := range strings.Split(text, " + ") {
		part = strings.TrimSpace(part)
		words := strings.Fields(part)
		coef := 1
		switch len(words) {
		case 1:
		case 2:
			n, err := strconv.Atoi(words[0])
			if err != nil || n <= 0 || n > 1000 {
				l.fail(field, text, "coefficient %q of %s must be a whole number from 1 to 1000", words[0], words[1])
				ok = false
				continue
			}
			coef = n
		default:
			l.fail(field, text, "term %q is not `species` or `coefficient species`; separate terms with \" + \"", part)
			ok = false
			continue
		}
		sp, good := l.species(field, words[len(words)-1])
		if !good {
			ok = false
			continue
		}
		if sp.IsElectron() {
			electrons += coef
			continue
		}
		if l.fast {
			out = append(out, Term{Species: sp, Coef: coef})
			continue
		}
		if seen[sp.Key()] {
			l.fail(field, text, "%s appears twice on one side; add the coefficients together", sp.Text())
			ok = false
			continue
		}
		seen[sp.Key()] = true
		out = append(out, Term{Species: sp, Coef: coef})
	}
	return out, electrons, ok
}

// acidBase reads `acid | base | pKa | source`.
func (l *loader) acidBase(f []string, line int) {
	if l.abPairs == nil {
		l.abPairs = map[string]int{}
		l.abAcidLine = map[string]int{}
	}
	acid, ok1 := l.species("acid", f[0])
	base, ok2 := l.species("base", f[1])
	pka, ok3 := l.number("pKa", f[2])
	if !ok1 || !ok2 || !ok3 {
		return
	}
	if acid.IsElectron() || base.IsElectron() || acid.Phase != Aqueous || base.Phase != Aqueous {
		l.fail("acid", f[0]+" / "+f[1], "both members of a pair are dissolved species, written without a phase suffix")
		return
	}
	if pka < minPKa || pka > maxPKa {
		l.fail("pKa", f[2], "is outside %g…%g; check the value", minPKa, maxPKa)
		return
	}
	diff, _ := ParseFormula(acid.Formula)
	bb, _ := ParseFormula(base.Formula)
	diff.Add(bb, -1)
	// A hydrated metal ion loses H+ from a bound water (Fe^3+ + H2O =
	// FeOH^2+ + H+): the base may then carry one H2O more than the acid.
	hydrolysis := len(diff) == 2 && diff["O"] == -1 && diff["H"] == -1
	if !hydrolysis && (len(diff) != 1 || diff["H"] != 1) || acid.Charge-base.Charge != 1 {
		l.fail("base", f[1], "must be %s less one H+, or %s + H2O less one H+ (atoms differ by %s, charge by %+d); fix the pair", acid.Ion(), acid.Ion(), atomDiffText(diff), acid.Charge-base.Charge)
		return
	}

	key := acid.Ion() + "|" + base.Ion()
	if prev, dup := l.abPairs[key]; dup {
		l.fail("acid", f[0], "the pair %s / %s is already listed at line %d", acid.Ion(), base.Ion(), prev)
		return
	}
	if prev, dup := l.abAcidLine[acid.Ion()]; dup {
		l.fail("acid", f[0], "already has a pKa at line %d; an acid loses one proton at a time", prev)
		return
	}
	l.abPairs[key] = line
	l.abAcidLine[acid.Ion()] = line
	l.acids[acid.Ion()] = true
	l.bases[base.Ion()] = true
	l.t.AcidBase = append(l.t.AcidBase, &AcidBasePair{Acid: acid, Base: base, PKa: pka, Source: f[3]})
}

func atomDiffText(d Atoms) string {
	if len(d) == 0 {
		return "nothing"
	}
	var parts []string
	for _, el := range sortedElements(d) {
		parts = append(parts, fmt.Sprintf("%s %+d", el, d[el]))
	}
	return strings.Join(parts, ", ")
}

// validClass reports whether c is one of the classes of types.go.
func validClass(c Class) bool {
	switch c {
	case StrongAcid, WeakAcid, StrongBase, WeakBase, SolubleSalt, SparingSalt, Metal, Molecular, GasClass:
		return true
	}
	return false
}

// chemical reads `formula | class | gives | names; synonyms | source`.
func (l *loader) chemical(f []string, line int) {
	if l.names == nil {
		l.names = map[string]string{}
		l.chemLine = map[*Chemical]int{}
	}
	formula, class := f[0], Class(f[1])
	a, ok := l.atoms("formula", formula)
	if !ok {
		return
	}
	l.spelling(formula, a, 0)
	if prev, dup := l.chemByForm[formula]; dup {
		l.fail("formula", formula, "is already listed at line %d; keep one row per chemical and put every name on it", l.chemLine[prev])
		return
	}
	if !validClass(class) {
		l.fail("class", f[1], "is not a class; use strong-acid, weak-acid, strong-base, weak-base, soluble-salt, sparingly-soluble-salt, metal, molecular or gas")
		return
	}
	gives, electrons, ok := l.terms("gives", f[2])
	if !ok {
		return
	}
	if electrons != 0 || strings.Contains(f[2], "->") {
		l.fail("gives", f[2], "lists what one formula unit gives in water, without electrons or arrows")
		return
	}
	if !l.givesBalance(formula, a, gives, f[2]) || !l.classFits(class, formula, gives, f[2]) {
		return
	}
	names, ok := l.chemicalNames(formula, f[3])
	if !ok {
		return
	}
	ch := &Chemical{Formula: formula, Names: names, Class: class, Gives: gives, Source: f[4]}
	ch.MolarMass = massOf(a, l.t.Atomic)
	l.chemByForm[formula] = ch
	l.chemLine[ch] = line
	l.t.Chemicals = append(l.t.Chemicals, ch)
}

// givesBalance checks that the gives column conserves the formula's atoms,
// allowing a whole number of water molecules taken up or given off, and is
// neutral.
func (l *loader) givesBalance(formula string, a Atoms, gives []Term, text string) bool {
	diff := Atoms{}
	diff.Add(a, 1)
	z := 0
	for _, t := range gives {
		ta, _ := ParseFormula(t.Formula)
		diff.Add(ta, -t.Coef)
		z += t.Coef * t.Charge
	}
	ok := true
	if z != 0 {
		l.fail("gives", text, "is not neutral (charge %+d); one formula unit gives ions whose charges add up to zero", z)
		ok = false
	}
	// diff = formula − gives; whole water molecules may be the difference.
	h, o := diff["H"], diff["O"]
	if len(diff) > 0 && !(len(diff) == 2 && h != 0 && h == 2*o) {
		l.fail("gives", text, "does not conserve the atoms of %s (formula less gives: %s); fix the coefficients (whole H2O may be taken up or given off)", formula, atomDiffText(diff))
		ok = false
	}
	return ok
}

// classFits checks the gives column against the class.
func (l *loader) classFits(class Class, formula string, gives []Term, text string) bool {
	has := func(pred func(Species) bool) bool {
		for _, t := range gives {
			if pred(t.Species) {
				return true
			}
		}
		return false
	}
	var msg string
	switch class {
	case StrongAcid:
		if !has(Species.IsProton) {
			msg = "a strong acid gives H+; list it"
		}
	case StrongBase:
		if !has(Species.IsHydroxide) {
			msg = "a strong base gives OH-; list it"
		}
	case WeakAcid:
		if !has(func(s Species) bool { return l.acids[s.Ion()] && s.Phase == Aqueous }) {
			msg = "a weak acid gives its acid form, which must be an acid of " + tableDir + AcidBaseFile + " so that it can be distributed by pKa"
		}
	case WeakBase:
		if !has(func(s Species) bool { return l.bases[s.Ion()] && s.Phase == Aqueous }) {
			msg = "a weak base gives its base form, which must be a base of " + tableDir + AcidBaseFile + " so that it can be distributed by pKa"
		}
	case Metal:
		if len(gives) != 1 || gives[0].Formula != formula || gives[0].Charge != 0 || (gives[0].Phase != Solid && gives[0].Phase != Liquid) {
			msg = "a metal stays as itself: write " + formula + "(s) (or (l) for mercury)"
		}
	case SparingSalt:
		if len(gives) != 1 || gives[0].Phase != Solid || gives[0].Charge != 0 {
			msg = "a sparingly soluble salt stays as one solid, like AgCl(s)"
		}
	}
	if msg != "" {
		l.fail("gives", text, "%s", msg)
		return false
	}
	return true
}

// chemicalNames splits and checks the names column.
func (l *loader) chemicalNames(formula, text string) ([]string, bool) {
	var names []string
	ok := true
	mine := map[string]bool{}
	for _, n := range strings.Split(text, ";") {
		n = strings.TrimSpace(n)
		if n == "" {
			l.fail("names", text, "has an empty name; separate names with \"; \" and leave none empty")
			ok = false
			continue
		}
		if norm := normName(n); norm != n {
			l.fail("names", n, "write names in lower case with single spaces: %q", norm)
			ok = false
			continue
		}
		if mine[n] {
			l.fail("names", n, "is listed twice for %s", formula)
			ok = false
			continue
		}
		if other, dup := l.names[n]; dup {
			l.fail("names", n, "is already a name of %s; a name may belong to one chemical only", other)
			ok = false
			continue
		}
		mine[n] = true
		names = append(names, n)
	}
	if !ok {
		return nil, false
	}
	for _, n := range names {
		l.names[n] = formula
	}
	return names, true
}

// halfReaction reads `id | medium | reduction | E°/V | source`.
func (l *loader) halfReaction(f []string, line int) {
	if l.halfIDs == nil {
		l.halfIDs = map[string]int{}
		l.halfEqs = map[string]string{}
	}
	id, medium, eq := f[0], Medium(f[1]), f[2]
	if !isID(id) {
		l.fail("id", id, "use lower-case letters, digits and hyphens, like mno4-mn2")
		return
	}
	if prev, dup := l.halfIDs[id]; dup {
		l.fail("id", id, "is already used at line %d; give each half-reaction its own id", prev)
		return
	}
	l.halfIDs[id] = line
	if medium != Acid && medium != Base && medium != Any {
		l.fail("medium", f[1], "is not a medium; use acid, base or any")
		return
	}
	sides := strings.Split(eq, "->")
	if len(sides) != 2 {
		l.fail("reduction", eq, "needs exactly one \"->\" between the oxidized and the reduced form")
		return
	}
	left, le, ok1 := l.terms("reduction", strings.TrimSpace(sides[0]))
	right, re, ok2 := l.terms("reduction", strings.TrimSpace(sides[1]))
	e0, ok3 := l.number("E°", f[3])
	if !ok1 || !ok2 || !ok3 {
		return
	}
	if re != 0 || le == 0 {
		l.fail("reduction", eq, "write it as a reduction, with the electrons on the left (MnO4- + 8 H+ + 5 e- -> ...)")
		return
	}
	if err := BalanceError(left, right, le); err != nil {
		l.fail("reduction", eq, "%s", strings.TrimPrefix(err.Error(), ErrUnbalanced.Error()+": "))
		return
	}
	has := func(pred func(Species) bool) bool {
		for _, side := range [][]Term{left, right} {
			for _, t := range side {
				if pred(t.Species) {
					return true
				}
			}
		}
		return false
	}
	proton, hydroxide := has(Species.IsProton), has(Species.IsHydroxide)
	switch {
	case medium == Acid && hydroxide:
		l.fail("medium", f[1], "an acid half-reaction cannot contain OH-; write it with H+ and H2O, or mark it base")
		return
	case medium == Base && proton:
		l.fail("medium", f[1], "a base half-reaction cannot contain H+; write it with OH- and H2O, or mark it acid")
		return
	case medium == Base && !hydroxide:
		l.fail("medium", f[1], "a base half-reaction contains OH-; this one has neither H+ nor OH-, so mark it any")
		return
	case medium == Any && (proton || hydroxide):
		l.fail("medium", f[1], "the reduction contains H+ or OH-; mark it acid or base")
		return
	}
	if e0 < -maxAbsE0 || e0 > maxAbsE0 {
		l.fail("E°", f[3], "is outside −%g…+%g V; check the value and its sign", maxAbsE0, maxAbsE0)
		return
	}
	canon := canonicalEquation(left, right, le)
	if prev, dup := l.halfEqs[canon]; dup {
		l.fail("reduction", eq, "is the same reduction as %s; keep one row", prev)
		return
	}
	l.halfEqs[canon] = id
	l.t.Half = append(l.t.Half, &HalfReaction{ID: id, Reactants: left, Products: right, Electrons: le, E0: e0, Medium: medium, Source: f[4]})
}

func isID(s string) bool {
	for i := 0; i < len(s); i++ {
		c := s[i]
		if !(c >= 'a' && c <= 'z' || c >= '0' && c <= '9' || c == '-' && i > 0 && i < len(s)-1) {
			return false
		}
	}
	return s != ""
}

func canonicalEquation(left, right []Term, electrons int) string {
	side := func(ts []Term) string {
		parts := make([]string, len(ts))
		for i, t := range ts {
			parts[i] = strconv.Itoa(t.Coef) + " " + t.Key()
		}
		sort.Strings(parts)
		return strings.Join(parts, " + ")
	}
	return fmt.Sprintf("%s + %d e- -> %s", side(left), electrons, side(right))
}

// density reads `formula | % w/w | density g/mL | source`.
func (l *loader) density(f []string, line int) {
	if l.densityLines == nil {
		l.densityLines = map[string][]int{}
	}
	formula := f[0]
	if _, known := l.chemByForm[formula]; !known {
		l.fail("formula", formula, "is not a chemical of %s%s; add the chemical there first or fix the formula", tableDir, ChemicalsFile)
		return
	}
	pct, rho, ok := l.strengthDensity(f[1], f[2])
	if !ok {
		return
	}
	l.t.Densities[formula] = append(l.t.Densities[formula], DensityPoint{PercentWW: pct, GPerML: rho})
	l.densityLines[formula] = append(l.densityLines[formula], line)
}

// checkDensityOrder checks that each formula's rows rise in % and that the
// density changes smoothly from row to row.
func (l *loader) checkDensityOrder() {
	l.file = tableDir + DensitiesFile
	formulas := make([]string, 0, len(l.t.Densities))
	for f := range l.t.Densities {
		formulas = append(formulas, f)
	}
	sort.Strings(formulas)
	for _, f := range formulas {
		pts := l.t.Densities[f]
		lines := l.densityLines[f]
		if len(pts) < 2 && pts[0].PercentWW != 100 {
			l.line = lines[0]
			l.fail("formula", f, "has one density row; give at least two so that concentrations between them can be interpolated (a single row is allowed only at 100 %%, for a liquid sold neat)")
			continue
		}
		for i := 1; i < len(pts); i++ {
			l.line = lines[i]
			a, b := pts[i-1], pts[i]
			if b.PercentWW <= a.PercentWW {
				l.fail("% w/w", strconv.FormatFloat(b.PercentWW, 'f', -1, 64), "rows of %s must rise in %% w/w; this row follows %g %% at line %d", f, a.PercentWW, lines[i-1])
				continue
			}
			if slope := math.Abs(b.GPerML-a.GPerML) / (b.PercentWW - a.PercentWW); slope > maxDensitySlope {
				l.fail("density", strconv.FormatFloat(b.GPerML, 'f', -1, 64), "jumps by %.3f g/mL per %% from line %d; check both values", slope, lines[i-1])
			}
		}
	}
}

// massOf is the molar mass of atoms a from the atomic weights w.
func massOf(a Atoms, w map[string]float64) float64 {
	var buf [16]string
	els := buf[:0]
	for el := range a {
		els = append(els, el)
	}
	slices.Sort(els) // a fixed order of summing: the same mass every run
	m := 0.0
	for _, el := range els {
		m += float64(a[el]) * w[el]
	}
	return m
}

// BalanceError checks that reactants plus electrons (on the reactant side;
// a negative count puts them on the product side) balance the products in
// every element and in charge. It returns nil when they do, and otherwise an
// error wrapping ErrUnbalanced that lists each element and the charge that
// differ. Electrons may also be given as e- terms. Every coefficient must be
// positive.
func BalanceError(reactants, products []Term, electrons int) error {
	return balanceErrorWith(ParseFormula, reactants, products, electrons)
}

// balanceErrorWith is BalanceError with the atom counts of a formula
// taken from atomsOf (a cache of the tables' formulas on the hot path).
func balanceErrorWith(atomsOf func(string) (Atoms, error), reactants, products []Term, electrons int) error {
	left, right := Atoms{}, Atoms{}
	lz, rz := -electrons, 0
	add := func(ts []Term, a Atoms, z *int) error {
		for _, t := range ts {
			if t.Coef <= 0 {
				return fmt.Errorf("%s has coefficient %d; coefficients must be positive", t.Text(), t.Coef)
			}
			*z += t.Coef * t.Charge
			if t.IsElectron() {
				continue
			}
			ta, err := atomsOf(t.Formula)
			if err != nil {
				return err
			}
			a.Add(ta, t.Coef)
		}
		return nil
	}
	if err := add(reactants, left, &lz); err != nil {
		return err
	}
	if err := add(products, right, &rz); err != nil {
		return err
	}
	var probs []string
	els := map[string]bool{}
	for el := range left {
		els[el] = true
	}
	for el := range right {
		els[el] = true
	}
	var diff []string
	for el := range els {
		if left[el] != right[el] {
			diff = append(diff, el)
		}
	}
	sort.Strings(diff)
	if len(diff) > 0 {
		parts := make([]string, len(diff))
		for i, el := range diff {
			parts[i] = fmt.Sprintf("%s: left %d, right %d", el, left[el], right[el])
		}
		probs = append(probs, "atoms do not balance ("+strings.Join(parts, "; ")+"); fix the coefficients")
	}
	if lz != rz {
		probs = append(probs, fmt.Sprintf("charge does not balance (left %+d, right %+d); fix the electrons or the charges", lz, rz))
	}
	if len(probs) == 0 {
		return nil
	}
	return fmt.Errorf("%w: %s", ErrUnbalanced, strings.Join(probs, "; "))
}

// fastAcidBase is acidBase without its checks (loadFast).
func (l *loader) fastAcidBase(f []string, _ int) {
	acid, ok1 := l.species("acid", f[0])
	base, ok2 := l.species("base", f[1])
	pka, ok3 := l.number("pKa", f[2])
	if ok1 && ok2 && ok3 {
		l.t.AcidBase = append(l.t.AcidBase, &AcidBasePair{Acid: acid, Base: base, PKa: pka, Source: f[3]})
	}
}

// fastChemical is chemical without its checks (loadFast).
func (l *loader) fastChemical(f []string, _ int) {
	mass, err := chem.MolarMass(f[0], l.t.Atomic)
	if err != nil {
		l.fail("formula", f[0], "%v; fix the formula", err)
		return
	}
	gives, _, ok := l.terms("gives", f[2])
	if !ok {
		return
	}
	names := strings.Split(f[3], ";")
	for i := range names {
		names[i] = strings.TrimSpace(names[i])
	}
	ch := &Chemical{Formula: f[0], Names: names, Class: Class(f[1]), Gives: gives, Source: f[4], MolarMass: mass}
	l.t.Chemicals = append(l.t.Chemicals, ch)
}

// fastHalfReaction is halfReaction without its checks (loadFast).
func (l *loader) fastHalfReaction(f []string, _ int) {
	left, right, ok := strings.Cut(f[2], "->")
	if !ok {
		l.fail("reduction", f[2], "needs exactly one \"->\" between the oxidized and the reduced form")
		return
	}
	lt, le, ok1 := l.terms("reduction", strings.TrimSpace(left))
	rt, _, ok2 := l.terms("reduction", strings.TrimSpace(right))
	e0, ok3 := l.number("E°", f[3])
	if ok1 && ok2 && ok3 {
		l.t.Half = append(l.t.Half, &HalfReaction{ID: f[0], Reactants: lt, Products: rt, Electrons: le, E0: e0, Medium: Medium(f[1]), Source: f[4]})
	}
}

// fastDensity is density without its checks (loadFast).
func (l *loader) fastDensity(f []string, _ int) {
	pct, ok1 := l.number("% w/w", f[1])
	rho, ok2 := l.number("density", f[2])
	if ok1 && ok2 {
		l.t.Densities[f[0]] = append(l.t.Densities[f[0]], DensityPoint{PercentWW: pct, GPerML: rho})
	}
}
