package engine

import (
	"errors"
	"fmt"
	"io/fs"
	"sort"
	"strconv"
)

// CeilingsFile holds the most concentrated water solution of each chemical
// that has one on record (data/ceilings.txt).
const CeilingsFile = "ceilings.txt"

// Ceiling is the most concentrated water solution of a chemical at 20 °C and
// one standard atmosphere: its saturated solution, or the pure substance
// where it mixes with water in every proportion.
type Ceiling struct {
	PercentWW float64 // grams of the chemical per 100 g of that solution
	GPerML    float64 // density of that solution at 20 °C
	Pure      bool    // the pure substance (else a saturated solution)
	Source    string
}

// GPerL is the mass of the chemical in one litre of the solution.
func (c Ceiling) GPerL() float64 { return c.PercentWW * c.GPerML * 10 }

// LoadCeilings reads and validates data/ceilings.txt from fsys against the
// chemicals and density tables of t, which Load has filled. Every bad row is
// reported, as Load does.
func LoadCeilings(fsys fs.FS, t *Tables) (map[string]Ceiling, error) {
	l := &ceilingLoader{
		loader: &loader{t: t, file: tableDir + CeilingsFile, chemByForm: map[string]*Chemical{}},
		out:    map[string]Ceiling{},
		lines:  map[string]int{},
	}
	for _, c := range t.Chemicals {
		l.chemByForm[c.Formula] = c
	}
	b, err := fs.ReadFile(fsys, CeilingsFile)
	if err != nil {
		return nil, fmt.Errorf("%s: cannot read the table (%v); it must sit at the root of the data directory", l.file, err)
	}
	if l.rows(b, 5, l.ceiling) == 0 {
		return nil, fmt.Errorf("%s: the table has no rows; restore it from version control", l.file)
	}
	l.check()
	if len(l.errs) > 0 {
		return nil, errors.Join(l.errs...)
	}
	return l.out, nil
}

// ceilingLoader reads ceilings.txt with the checks of the other tables.
type ceilingLoader struct {
	*loader
	out   map[string]Ceiling
	lines map[string]int // formula → line of its row
}

// ceiling reads `formula | % w/w | g/mL | state | source`.
func (l *ceilingLoader) ceiling(f []string, line int) {
	formula := f[0]
	if _, known := l.chemByForm[formula]; !known {
		l.fail("formula", formula, "is not a chemical of %s%s; add the chemical there first or fix the formula", tableDir, ChemicalsFile)
		return
	}
	if prev, dup := l.lines[formula]; dup {
		l.fail("formula", formula, "already has a row at line %d; keep one row per chemical", prev)
		return
	}
	pct, rho, ok := l.strengthDensity(f[1], f[2])
	if !ok {
		return
	}
	var pure bool
	switch f[3] {
	case "pure":
		pure = true
		if pct != 100 {
			l.fail("% w/w", f[1], "a pure substance is 100 %% w/w")
			return
		}
	case "saturated":
	default:
		l.fail("state", f[3], "must be saturated or pure")
		return
	}
	l.out[formula] = Ceiling{PercentWW: pct, GPerML: rho, Pure: pure, Source: f[4]}
	l.lines[formula] = line
}

// check checks that no density table lists a solution stronger than the
// chemical's ceiling: a row above it would be a solution that cannot exist,
// or a ceiling set too low.
func (l *ceilingLoader) check() {
	formulas := make([]string, 0, len(l.out))
	for f := range l.out {
		formulas = append(formulas, f)
	}
	sort.Strings(formulas)
	for _, f := range formulas {
		c := l.out[f]
		pts := l.t.Densities[f]
		if len(pts) == 0 {
			continue
		}
		if top := pts[len(pts)-1]; top.PercentWW > c.PercentWW {
			l.line = l.lines[f]
			l.fail("% w/w", strconv.FormatFloat(c.PercentWW, 'f', -1, 64), "is below the top row of %s in %s%s (%g %%); one of the two is wrong", f, tableDir, DensitiesFile, top.PercentWW)
		}
	}
}
