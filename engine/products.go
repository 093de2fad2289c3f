package engine

import (
	"errors"
	"fmt"
	"io/fs"
	"sort"
	"strconv"
	"strings"
)

// ProductsFile holds the commercial products sold under one chemical's
// name that carry other chemicals with them (data/products.txt).
const ProductsFile = "products.txt"

// Product is one grade of a commercial product as sold.
type Product struct {
	Formula    string  // the chemical the product is named by
	Grade      float64 // its % w/w in the product
	Companions []Companion
	Source     string
}

// Companion is a chemical a product carries, at its % w/w in the product,
// or (Rest) as the whole balance of the product in place of water: oleum
// is free sulfur trioxide in sulfuric acid, "oleum 20 %" 20 % SO3 and 80 %
// H2SO4 with no water at all.
type Companion struct {
	Formula   string
	PercentWW float64
	Rest      bool
}

// LoadProducts reads and validates data/products.txt from fsys against the
// chemicals of t. The grades of one formula come back rising. A missing file
// is no products.
func LoadProducts(fsys fs.FS, t *Tables) (map[string][]Product, error) {
	l := &productLoader{loader: &loader{t: t, file: tableDir + ProductsFile}, out: map[string][]Product{}, chem: map[string]bool{}}
	for _, c := range t.Chemicals {
		l.chem[c.Formula] = true
	}
	b, err := fs.ReadFile(fsys, ProductsFile)
	if errors.Is(err, fs.ErrNotExist) {
		return l.out, nil
	}
	if err != nil {
		return nil, fmt.Errorf("%s: cannot read the table (%v)", l.file, err)
	}
	l.rows(b, 4, l.product)
	if len(l.errs) > 0 {
		return nil, errors.Join(l.errs...)
	}
	for _, ps := range l.out {
		sort.Slice(ps, func(i, j int) bool { return ps[i].Grade < ps[j].Grade })
	}
	return l.out, nil
}

type productLoader struct {
	*loader
	out  map[string][]Product
	chem map[string]bool
}

// product reads `formula | grade | companions | source`.
func (l *productLoader) product(f []string, _ int) {
	if !l.chem[f[0]] {
		l.fail("formula", f[0], "is not a chemical of %s%s; add it there first", tableDir, ChemicalsFile)
		return
	}
	grade, ok := l.number("grade", f[1])
	if !ok || !(grade > 0 && grade <= 100) {
		l.fail("grade", f[1], "must be a %% w/w above 0 and at most 100")
		return
	}
	p := Product{Formula: f[0], Grade: grade, Source: f[3]}
	total := grade
	parts := strings.Split(f[2], ", ")
	for _, part := range parts {
		formula, pct, found := strings.Cut(strings.TrimSpace(part), " ")
		if found && pct == "rest" {
			if len(parts) != 1 || !l.chem[formula] || formula == f[0] {
				l.fail("companions", part, "\"FORMULA rest\" stands alone and names another chemical of %s%s", tableDir, ChemicalsFile)
				return
			}
			p.Companions = append(p.Companions, Companion{Formula: formula, Rest: true})
			continue
		}
		v, err := strconv.ParseFloat(pct, 64)
		if !found || err != nil || !(v > 0) {
			l.fail("companions", part, "write each as \"FORMULA %% w/w\" (\"H2O2 23\"), separated by \", \", or one \"FORMULA rest\"")
			return
		}
		if !l.chem[formula] || formula == f[0] {
			l.fail("companions", formula, "is not another chemical of %s%s", tableDir, ChemicalsFile)
			return
		}
		total += v
		p.Companions = append(p.Companions, Companion{Formula: formula, PercentWW: v})
	}
	if total > 100 {
		l.fail("companions", f[2], "with the grade add up to %g %% w/w, more than the whole product", total)
		return
	}
	if f[3] == "" {
		l.fail("source", "", "name the source of the grade")
		return
	}
	l.out[f[0]] = append(l.out[f[0]], p)
}

// gradeFor is the grade of a product that a named strength (% w/w) is read
// as: the smallest grade at or above it, the top grade above them all.
func gradeFor(ps []Product, pct float64) Product {
	for _, p := range ps {
		if p.Grade >= pct {
			return p
		}
	}
	return ps[len(ps)-1]
}

// massUnits are the concentration units a product's proportions carry over
// to: the companions scale with the named chemical.
var massUnits = map[ConcUnit]bool{PctWW: true, PctWV: true, GPerL: true, MgPerL: true, PPM: true}

// asSold adds to a stream the companions of a commercial product it names
// (data/products.txt), scaled to the named strength, unless the stream
// names them itself, and notes what it assumed.
func (p *parser) asSold(st *Stream) {
	named := map[string]bool{}
	for _, c := range st.Components {
		named[c.Chemical.Formula] = true
	}
	for _, c := range st.Components {
		ps := p.t.Products[c.Chemical.Formula]
		if len(ps) == 0 || !massUnits[c.Unit] || !(c.Value > 0) {
			continue
		}
		pct := c.Value
		if c.Unit != PctWW {
			pct = percentOf(c.Value, c.Unit)
		}
		g := gradeFor(ps, pct)
		var added []string
		rest := false
		for _, k := range g.Companions {
			if named[k.Formula] {
				continue
			}
			chem, ok := p.t.Lookup(k.Formula)
			if !ok {
				continue
			}
			v := k.PercentWW / g.Grade * c.Value
			if k.Rest {
				if c.Unit != PctWW {
					continue // the balance of a product is only read beside a % w/w
				}
				v = 100 - namedPctWW(st)
				if !(v > 0) {
					continue
				}
				rest = true
			}
			st.Components = append(st.Components, Component{Chemical: chem, Name: k.Formula, Pos: c.Pos, Value: v, Unit: c.Unit,
				numText: strconv.FormatFloat(v, 'g', 3, 64), numPos: c.Pos})
			named[k.Formula] = true
			added = append(added, fmtNum(v)+" "+unitText(c.Unit)+" "+k.Formula)
		}
		if rest {
			p.note("%s %s %s read as the trade grade: %s %s %s in %s, with no water (%s)",
				c.Name, fmtNum(c.Value), unitText(c.Unit), fmtNum(c.Value), unitText(c.Unit), c.Chemical.Formula, strings.Join(added, " and "), g.Source)
		} else if len(added) > 0 {
			p.note("%s %s %s read as the commercial product, with %s (typical %g %% grade, suppliers' data, from memory; name them in the stream to override)",
				c.Name, fmtNum(c.Value), unitText(c.Unit), strings.Join(added, " and "), g.Grade)
		}
	}
}

// namedPctWW is the sum of the % w/w the stream's components name.
func namedPctWW(st *Stream) float64 {
	sum := 0.0
	for _, c := range st.Components {
		if c.Unit == PctWW {
			sum += c.Value
		}
	}
	return sum
}

// percentOf is a mass concentration in % w/w, taking a dilute solution's
// density as 1 kg/L (only to choose the product grade).
func percentOf(v float64, u ConcUnit) float64 {
	switch u {
	case PctWV:
		return v
	case GPerL:
		return v / 10
	case MgPerL, PPM:
		return v / 1e4
	}
	return v
}
