// Package thermo holds the species data (data/species.txt) and the quantities
// derived from it: Gibbs energies of formation at any temperature, and ΔrG°,
// ΔrH°, log K and E° of any reaction written in the species notation. It is
// pure computation: it reads only the fs.FS handed to Load, keeps no mutable
// globals, and a loaded DB is safe for concurrent use.
//
// Conventions: 298.15 K and 1 bar; the aqueous standard state is 1 mol/kg;
// ΔfG°, ΔfH° and S° of H+(aq) are zero and the electron counts zero, so E° is
// on the standard hydrogen scale. R and F are the CODATA values of gonum's
// unit/constant package.
package thermo

import (
	"errors"
	"fmt"
	"io/fs"
	"math"
	"sort"
	"strconv"
	"strings"
	"sync"

	"gonum.org/v1/gonum/unit/constant"

	"mixward/engine/chem"
)

// SpeciesFile is the name of the species table at the root of the data FS.
const SpeciesFile = "species.txt"

// T0 is the reference temperature of the data, K.
const T0 = 298.15

// R is the molar gas constant in J/(mol·K): Avogadro times Boltzmann, both
// exact in CODATA 2018 (gonum unit/constant).
const R = float64(constant.Avogadro) * float64(constant.Boltzmann)

// F is the Faraday constant in C/mol (CODATA 2018, exact; gonum unit/constant).
const F = float64(constant.Faraday)

// tableDir prefixes file names in error messages, so that a maintainer can
// open the file at once.
const tableDir = "data/"

// Species is one row of species.txt: a species in one phase with its standard
// properties of formation at 298.15 K.
type Species struct {
	chem.Species
	Text   string     // as written in species.txt
	Atoms  chem.Atoms // atom counts of the formula
	DfG    float64    // ΔfG°, kJ/mol at 298.15 K
	DfH    float64    // ΔfH°, kJ/mol at 298.15 K, when HasDfH
	HasDfH bool
	S      float64 // S°, J/(mol·K), when HasS
	HasS   bool
	// Ox is the average oxidation state of each element, by the rules of
	// chem.OxidationStates with the row's X=n overrides. It is nil when the
	// rules cannot assign them; Check reports that row.
	Ox       map[string]float64
	Override map[string]float64 // the X=n attributes of the row
	Inert    bool               // anchored only for acid–base/complexation; kept out of redox
	// Free lists the elements of an inert species that sit outside its
	// anchored carrier and take part in changes as any atom does (the
	// active chlorine of trichloroisocyanuric acid on its cyanurate
	// carrier): attribute free=X.
	Free   map[string]bool
	Minor  bool // included in the solve, not headlined in the answer
	Source string
	Line   int // line in species.txt

	oxErr error // why Ox is nil
}

// DB is the loaded species table.
type DB struct {
	list   []*Species
	others [][]string                // elements of list[i] other than H and O (for Within)
	byKey  map[chem.Species]*Species // by formula, charge and phase
	byText map[string]*Species       // by Text as written
	atomic map[string]float64        // atomic weights, for Check
	file   string                    // "data/species.txt", for messages

	withheld map[string]*Withheld // by chemical formula (withheld.txt)

	// water is the ionization of water, parsed once on first use (every
	// answer asks for the neutral pH several times).
	water struct {
		once sync.Once
		r    Reaction
		err  error
	}
}

// WaterIonization is H2O → H+ + OH- over the species of the DB, parsed once.
// The reaction returned is shared: read only.
func (db *DB) WaterIonization() (Reaction, error) {
	db.water.once.Do(func() { db.water.r, db.water.err = ParseReaction(db, "H2O -> H+ + OH-") })
	return db.water.r, db.water.err
}

// RowError is one bad row of a table: `FILE:LINE: what is wrong; what to do`.
type RowError struct {
	File string
	Line int
	Msg  string
}

func (e *RowError) Error() string {
	if e.Line == 0 {
		return e.File + ": " + e.Msg
	}
	return e.File + ":" + strconv.Itoa(e.Line) + ": " + e.Msg
}

// Load reads species.txt, elements.txt and, when present, withheld.txt from
// the root of fsys (normally data.FS). It parses every row and checks only what reading needs: six
// fields, numbers, the species notation, the attributes, one row per species.
// Everything else — sources, known elements, plausible values — is Check's.
// The errors of all bad rows are joined (errors.Join).
func Load(fsys fs.FS) (*DB, error) {
	eb, err := fs.ReadFile(fsys, chem.ElementsFile)
	if err != nil {
		return nil, fmt.Errorf("%s%s: cannot read the table (%v); it must sit at the root of the data directory", tableDir, chem.ElementsFile, err)
	}
	atomic, err := chem.ReadAtomicWeights(tableDir+chem.ElementsFile, eb)
	if err != nil {
		return nil, err
	}
	b, err := fs.ReadFile(fsys, SpeciesFile)
	if err != nil {
		return nil, fmt.Errorf("%s%s: cannot read the table (%v); it must sit at the root of the data directory", tableDir, SpeciesFile, err)
	}
	db, err := parseTable(tableDir+SpeciesFile, string(b), atomic)
	if err != nil {
		return nil, err
	}
	if db.withheld, err = loadWithheld(fsys); err != nil {
		return nil, err
	}
	return db, nil
}

// parseTable reads the text of species.txt.
func parseTable(file, text string, atomic map[string]float64) (*DB, error) {
	n := strings.Count(text, "\n") + 1
	db := &DB{byKey: make(map[chem.Species]*Species, n), byText: make(map[string]*Species, n), atomic: atomic, file: file}
	var errs []error
	for line := 1; text != ""; line++ {
		var row string
		if i := strings.IndexByte(text, '\n'); i >= 0 {
			row, text = text[:i], text[i+1:]
		} else {
			row, text = text, ""
		}
		row = strings.TrimSpace(strings.TrimPrefix(row, "\ufeff"))
		if row == "" || row[0] == '#' {
			continue
		}
		sp, err := parseRow(row)
		if err != nil {
			errs = append(errs, &RowError{File: file, Line: line, Msg: err.Error()})
			continue
		}
		sp.Line = line
		if prev, dup := db.byKey[sp.Species]; dup {
			errs = append(errs, &RowError{File: file, Line: line, Msg: fmt.Sprintf("%s is already listed at line %d; keep one row per species and phase", sp.Text, prev.Line)})
			continue
		}
		db.list = append(db.list, sp)
		db.others = append(db.others, othersOf(sp.Atoms))
		db.byKey[sp.Species] = sp
		db.byText[sp.Text] = sp
	}
	if len(db.list) == 0 && len(errs) == 0 {
		errs = append(errs, &RowError{File: file, Msg: "the table has no rows; restore it from version control"})
	}
	if len(errs) > 0 {
		return nil, errors.Join(errs...)
	}
	return db, nil
}

// parseRow reads `species | ΔfG° | ΔfH° | S° | attributes | source`.
func parseRow(row string) (*Species, error) {
	var f [6]string
	n := 0
	for rest := row; ; n++ {
		i := strings.IndexByte(rest, '|')
		if n < len(f) {
			if i < 0 {
				f[n] = strings.TrimSpace(rest)
			} else {
				f[n] = strings.TrimSpace(rest[:i])
			}
		}
		if i < 0 {
			break
		}
		rest = rest[i+1:]
	}
	if n+1 != len(f) {
		return nil, fmt.Errorf("has %d fields, want 6 (species | ΔfG° | ΔfH° | S° | attributes | source) separated by \" | \"; see the header of the file", n+1)
	}
	cs, atoms, err := chem.ParseSpeciesAtoms(f[0])
	if err != nil {
		return nil, fmt.Errorf("%v; write species like H+, MnO4-, Fe^3+, Cu(s), Cl2(g)", err)
	}
	if cs.IsElectron() {
		return nil, fmt.Errorf("the electron has no row (it counts zero by convention); remove the row")
	}
	sp := &Species{Species: cs, Text: f[0], Source: f[5], Atoms: atoms}
	if sp.DfG, _, err = number("ΔfG°", f[1], false); err != nil {
		return nil, err
	}
	if sp.DfH, sp.HasDfH, err = number("ΔfH°", f[2], true); err != nil {
		return nil, err
	}
	if sp.S, sp.HasS, err = number("S°", f[3], true); err != nil {
		return nil, err
	}
	if err := sp.attributes(f[4]); err != nil {
		return nil, err
	}
	sp.Ox, sp.oxErr = chem.OxidationStates(sp.Atoms, sp.Charge, sp.Override)
	return sp, nil
}

// number reads a finite decimal number; with optional, "-" reads as absent.
func number(field, s string, optional bool) (float64, bool, error) {
	if optional && s == "-" {
		return 0, false, nil
	}
	// A typographic minus is a common slip when values are copied.
	v, err := strconv.ParseFloat(strings.Replace(s, "−", "-", 1), 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		if optional {
			return 0, false, fmt.Errorf("%s %q is not a number; write a decimal number such as -237.129, or - when unknown", field, s)
		}
		return 0, false, fmt.Errorf("%s %q is not a number; write a decimal number such as -237.129 (it is required)", field, s)
	}
	return v, true, nil
}

// attributes reads `-` or tokens X=n, inert, minor, free=X.
func (sp *Species) attributes(s string) error {
	if s == "-" {
		return nil
	}
	if s == "" {
		return fmt.Errorf("attributes are empty; write - when there are none")
	}
	for _, tok := range strings.Fields(s) {
		switch tok {
		case "inert":
			sp.Inert = true
			continue
		case "minor":
			sp.Minor = true
			continue
		}
		if el, ok := strings.CutPrefix(tok, "free="); ok {
			if !chem.IsElementSymbol(el) || sp.Atoms[el] == 0 || el == "H" {
				return fmt.Errorf("attribute %q: free= names an element of %s other than H, like free=Cl", tok, sp.Formula)
			}
			if sp.Free == nil {
				sp.Free = map[string]bool{}
			}
			sp.Free[el] = true
			continue
		}
		el, val, ok := strings.Cut(tok, "=")
		if !ok {
			return fmt.Errorf("attribute %q is not X=n, inert, minor or free=X; fix or remove it", tok)
		}
		v, err := strconv.ParseFloat(strings.Replace(val, "−", "-", 1), 64)
		if err != nil || math.IsNaN(v) || math.IsInf(v, 0) || !chem.IsElementSymbol(el) {
			return fmt.Errorf("attribute %q: write an element and its oxidation state, like O=-1", tok)
		}
		if sp.Atoms[el] == 0 {
			return fmt.Errorf("attribute %q names %s, which %s does not contain; fix the element", tok, el, sp.Formula)
		}
		if _, dup := sp.Override[el]; dup {
			return fmt.Errorf("attribute %q: %s is given twice; keep one", tok, el)
		}
		if sp.Override == nil {
			sp.Override = map[string]float64{}
		}
		sp.Override[el] = v
	}
	return nil
}

// Get returns the species written text (in the notation of every table:
// H2O, Fe^3+, Cl2(g); Cl2(aq) and Cl2 are the same species).
func (db *DB) Get(text string) (*Species, bool) {
	if sp, ok := db.byText[text]; ok {
		return sp, true
	}
	cs, err := chem.ParseSpecies(text)
	if err != nil {
		return nil, false
	}
	sp, ok := db.byKey[cs]
	return sp, ok
}

// All returns every species in the order of the file. The slice is a copy;
// the species are shared and must not be modified.
func (db *DB) All() []*Species { return append([]*Species(nil), db.list...) }

// Within returns every species made only of the given elements, H and O
// always allowed (water is the solvent), in the order of the file.
func (db *DB) Within(elements map[string]bool) []*Species {
	var out []*Species
	for i, sp := range db.list {
		ok := true
		for _, el := range db.others[i] {
			if !elements[el] {
				ok = false
				break
			}
		}
		if ok {
			out = append(out, sp)
		}
	}
	return out
}

// othersOf lists the elements of a formula other than H and O.
func othersOf(a chem.Atoms) []string {
	var out []string
	for el := range a {
		if el != "H" && el != "O" {
			out = append(out, el)
		}
	}
	return out
}

// DfGAt is ΔfG of the species at tempK in kJ/mol, on the assumption that ΔfH°
// (and so ΔfS° = (ΔfH° − ΔfG°)/298.15 K) does not change with temperature:
// ΔfG(T) = ΔfH° − T·(ΔfH° − ΔfG°)/298.15 K. Without ΔfH° it is ΔfG° at every
// temperature.
func (s *Species) DfGAt(tempK float64) float64 {
	if !s.HasDfH {
		return s.DfG
	}
	return s.DfH - tempK*(s.DfH-s.DfG)/T0
}

// GibbsRT is μ°/(RT) at tempK: DfGAt(tempK) in J/mol over R·T. The constant
// ΔfH° assumption (van 't Hoff) is DfGAt's.
func (s *Species) GibbsRT(tempK float64) float64 {
	return s.DfGAt(tempK) * 1000 / (R * tempK)
}

func sortedKeys(m map[string]float64) []string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	return keys
}
