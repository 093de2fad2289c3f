package thermo

import (
	"errors"
	"fmt"
	"io/fs"
	"strings"

	"mixward/engine/chem"
)

// WithheldFile is the name of the table of chemicals known by name whose
// thermodynamic data are not known well enough to answer with.
const WithheldFile = "withheld.txt"

// ErrWithheld is wrapped by WithheldError.
var ErrWithheld = errors.New("answer withheld")

// Withheld is one row of withheld.txt: a chemical of chemicals.txt (by its
// formula) that the engine knows by name but answers no request with, and why.
type Withheld struct {
	Formula string // as in chemicals.txt
	Missing string // what data is missing or unreliable
	// Role is what the chemical may do in a mix when the row gives it
	// (the optional column): RoleReductant, RoleOxidant or RoleInert. A
	// row without a role withholds every answer that names the chemical;
	// one with a role lets the engine answer for the rest of the mix and
	// mark the chemical not assessed, unless it may be the agent of
	// concern (engine.notAssessed decides).
	Role   string
	Source string
	Line   int
}

// Roles a withheld chemical may be given (withheld.txt, third column of a
// four-column row).
const (
	RoleReductant = "reductant" // can be oxidized: an oxygen scavenger, an aldehyde
	RoleOxidant   = "oxidant"   // can be reduced: combined chlorine
	RoleInert     = "inert"     // takes part in no redox or acid–base change of concern: a surfactant
)

// WithheldError is the answer to a request naming a withheld chemical.
type WithheldError struct {
	Formula, Missing string
}

func (e *WithheldError) Error() string {
	return fmt.Sprintf("no thermodynamic data for %s; answer withheld (%s)", e.Formula, e.Missing)
}

// Unwrap returns ErrWithheld.
func (e *WithheldError) Unwrap() error { return ErrWithheld }

// Withheld returns the row of withheld.txt for a chemical formula.
func (db *DB) Withheld(formula string) (*Withheld, bool) {
	w, ok := db.withheld[formula]
	return w, ok
}

// WithheldError returns the error to answer a request naming formula with, or
// nil when the chemical is not withheld.
func (db *DB) WithheldError(formula string) error {
	if w, ok := db.withheld[formula]; ok {
		return &WithheldError{Formula: w.Formula, Missing: w.Missing}
	}
	return nil
}

// AllWithheld returns the rows of withheld.txt in file order.
func (db *DB) AllWithheld() []*Withheld {
	out := make([]*Withheld, 0, len(db.withheld))
	for _, w := range db.withheld {
		out = append(out, w)
	}
	sortWithheld(out)
	return out
}

func sortWithheld(ws []*Withheld) {
	for i := 1; i < len(ws); i++ {
		for j := i; j > 0 && ws[j].Line < ws[j-1].Line; j-- {
			ws[j], ws[j-1] = ws[j-1], ws[j]
		}
	}
}

// loadWithheld reads withheld.txt when fsys has it: rows of
// `formula | what is missing | source`. A missing file withholds nothing.
func loadWithheld(fsys fs.FS) (map[string]*Withheld, error) {
	b, err := fs.ReadFile(fsys, WithheldFile)
	if errors.Is(err, fs.ErrNotExist) {
		return map[string]*Withheld{}, nil
	}
	file := tableDir + WithheldFile
	if err != nil {
		return nil, fmt.Errorf("%s: cannot read the table (%v)", file, err)
	}
	out := map[string]*Withheld{}
	var errs []error
	for i, row := range strings.Split(string(b), "\n") {
		row = strings.TrimSpace(row)
		if row == "" || row[0] == '#' {
			continue
		}
		bad := func(format string, args ...any) {
			errs = append(errs, &RowError{File: file, Line: i + 1, Msg: fmt.Sprintf(format, args...)})
		}
		f := strings.Split(row, "|")
		if len(f) != 3 && len(f) != 4 {
			bad("has %d fields, want 3 (formula | what is missing | source) or 4 (formula | what is missing | role | source) separated by \" | \"", len(f))
			continue
		}
		for k := range f {
			f[k] = strings.TrimSpace(f[k])
		}
		role := ""
		if len(f) == 4 {
			role = f[2]
			f = []string{f[0], f[1], f[3]}
			if role != RoleReductant && role != RoleOxidant && role != RoleInert {
				bad("role %q: write %s, %s or %s", role, RoleReductant, RoleOxidant, RoleInert)
				continue
			}
		}
		if f[1] == "" || f[2] == "" {
			bad("say what is missing and name the source; neither may be empty")
			continue
		}
		if _, err := chem.ParseFormula(f[0]); err != nil {
			bad("%v; write the formula as in chemicals.txt", err)
			continue
		}
		if prev, dup := out[f[0]]; dup {
			bad("%s is already listed at line %d; keep one row", f[0], prev.Line)
			continue
		}
		out[f[0]] = &Withheld{Formula: f[0], Missing: f[1], Role: role, Source: f[2], Line: i + 1}
	}
	return out, errors.Join(errs...)
}
