package engine

import (
	"errors"
	"fmt"
	"io/fs"
	"math"
)

// SolubilityFile holds how much of each solid dissolves in water at 20 °C
// (data/solubility.txt).
const SolubilityFile = "solubility.txt"

// Solubility is how much of a solid water takes up at 20 °C.
type Solubility struct {
	GPer100G float64 // grams of the anhydrous formula per 100 g of water
	Source   string
}

// capMaxC is the warmest stated stream temperature at which a solid is
// capped at its 20 °C solubility: hotter water dissolves more of most salts,
// and a cap read too low would understate the heat.
const capMaxC = 40.0

// ceilingAgreement is how far a solubility row may stand from the same
// chemical's saturated row in ceilings.txt.
const ceilingAgreement = 0.05

// LoadSolubility reads and validates data/solubility.txt from fsys against
// the chemicals of t and its saturated ceilings (LoadCeilings first).
func LoadSolubility(fsys fs.FS, t *Tables) (map[string]Solubility, error) {
	l := &loader{t: t, file: tableDir + SolubilityFile, chemByForm: map[string]*Chemical{}}
	for _, c := range t.Chemicals {
		l.chemByForm[c.Formula] = c
	}
	b, err := fs.ReadFile(fsys, SolubilityFile)
	if err != nil {
		return nil, fmt.Errorf("%s: cannot read the table (%v); it must sit at the root of the data directory", l.file, err)
	}
	out := map[string]Solubility{}
	lines := map[string]int{}
	read := func(f []string, line int) {
		formula := f[0]
		ch, known := l.chemByForm[formula]
		if !known {
			l.fail("formula", formula, "is not a chemical of %s%s; add the chemical there first or fix the formula", tableDir, ChemicalsFile)
			return
		}
		if prev, dup := lines[formula]; dup {
			l.fail("formula", formula, "already has a row at line %d; keep one row per chemical", prev)
			return
		}
		g, ok := l.number("g per 100 g water", f[1])
		if !ok {
			return
		}
		if g <= 0 || g > 1000 {
			l.fail("g per 100 g water", f[1], "must be above 0 and at most 1000; a chemical that mixes with water in every proportion has no row")
			return
		}
		if c, ok := t.Ceilings[formula]; ok && !c.Pure {
			sat := 100 * c.PercentWW / (100 - c.PercentWW)
			if math.Abs(g-sat) > ceilingAgreement*sat {
				l.fail("g per 100 g water", f[1], "disagrees with %s's saturated row in %s%s (%.3g %% w/w, %.3g g per 100 g water); one of the two is wrong", ch.Formula, tableDir, CeilingsFile, c.PercentWW, sat)
				return
			}
		}
		out[formula] = Solubility{GPer100G: g, Source: f[2]}
		lines[formula] = line
	}
	if l.rows(b, 3, read) == 0 {
		return nil, fmt.Errorf("%s: the table has no rows; restore it from version control", l.file)
	}
	if len(l.errs) > 0 {
		return nil, errors.Join(l.errs...)
	}
	return out, nil
}

// capSolids keeps a make-up to what its water dissolves: when every stream
// is plain water or one solid given by mass, at or below capMaxC, each solid
// with a row in data/solubility.txt counts only up to its solubility in all
// the water of the mix; the rest stays as solid, outside the answer's state,
// heat and pour, and a note says so. Streams that may react with the solid
// (any solution, water of a stated pH), a stated pH of the mix, and hot
// water leave every solid as given. The cap is
// idempotent: a capped request reads the same again.
func capSolids(req *Request, t *Tables, note func(string, ...any)) {
	if req.TemperatureK > capMaxC+273.15 || req.PH != nil {
		return
	}
	streams := req.Streams
	waterKg := 0.0
	var solids []int
	for i := range streams {
		st := &streams[i]
		if st.TemperatureK != nil && *st.TemperatureK > capMaxC+273.15 {
			return
		}
		switch {
		case isPlainWater(st):
			waterKg += st.VolumeL + st.MassKg // 1 kg/L at the temperatures capped
		case st.MassKg > 0 && st.VolumeL <= 0 && len(st.Components) == 1 && st.Components[0].Unit == NoConc:
			solids = append(solids, i)
		default:
			return
		}
	}
	if waterKg <= 0 {
		return
	}
	for _, i := range solids {
		st := &streams[i]
		ch := st.Components[0].Chemical
		s, ok := t.Solubility[ch.Formula]
		if !ok {
			continue
		}
		most := s.GPer100G / 100 * waterKg
		if st.MassKg <= most*(1+1e-9) {
			continue
		}
		note("only %s kg of the %s kg of %s dissolves in %s L of water (about %s g per 100 g of water at 20 °C, %s%s): the rest stays as solid and is not counted in this answer; anhydrous salt still takes up water of crystallisation with some heat",
			trimNum(most), trimNum(st.MassKg), ch.Formula, trimNum(waterKg), trimNum(s.GPer100G), tableDir, SolubilityFile)
		st.MassKg = most
	}
}

// isPlainWater: a stream of water alone, given by volume or mass, without
// a stated pH.
func isPlainWater(st *Stream) bool {
	if len(st.Components) == 0 || st.PH != nil {
		return false
	}
	for _, c := range st.Components {
		if c.Chemical == nil || c.Chemical.Formula != "H2O" {
			return false
		}
	}
	return st.VolumeL > 0 || st.MassKg > 0
}
