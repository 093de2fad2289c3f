package engine

import (
	"fmt"
	"io/fs"
	"math"
	"strconv"
	"strings"

	"mixward/engine/state"
)

// DilutionFile is the name of the table of heats of concentrated solutions
// at the root of the data FS.
const DilutionFile = "dilution.txt"

// DilutionPoint is one row of data/dilution.txt: a solution of N mol of
// water per mol of solute holds the solute L kJ/mol above its infinitely
// dilute form (the form chemicals.txt gives).
type DilutionPoint struct {
	N, L   float64
	Source string
}

// Dilution is data/dilution.txt: the heats of concentrated solutions by
// solute formula, each solute's rows in rising N, and the specific heat
// capacity each solute counts with in a mix, J/(g·K).
type Dilution struct {
	Points map[string][]DilutionPoint
	Cp     map[string]float64
}

// loadDilution reads data/dilution.txt.
func loadDilution(fsys fs.FS) (*Dilution, error) {
	b, err := fs.ReadFile(fsys, DilutionFile)
	if err != nil {
		return nil, fmt.Errorf("read heats of concentrated solutions: %w", err)
	}
	return parseDilution(DilutionFile, b)
}

func parseDilution(name string, b []byte) (*Dilution, error) {
	out := map[string][]DilutionPoint{}
	cp := map[string]float64{}
	sc := newLineReader(b)
	line := 0
	for sc.Scan() {
		line++
		text := strings.TrimSpace(sc.Text())
		if text == "" || strings.HasPrefix(text, "#") {
			continue
		}
		f := strings.Split(text, "|")
		if len(f) != 4 {
			return nil, fmt.Errorf("%s:%d: %q: write SOLUTE | N | L | SOURCE, like `HCl | 3 | 17.99 | NBS Tables 1982`", name, line, text)
		}
		for i := range f {
			f[i] = strings.TrimSpace(f[i])
		}
		solute, src := f[0], f[3]
		if solute == "" || strings.ContainsAny(solute, " \t") {
			return nil, fmt.Errorf("%s:%d: %q is not a solute formula; write it as in chemicals.txt (H2SO4, NaOH)", name, line, f[0])
		}
		n, err1 := strconv.ParseFloat(f[1], 64)
		l, err2 := strconv.ParseFloat(strings.ReplaceAll(f[2], "−", "-"), 64)
		if f[1] == "cp" {
			if _, dup := cp[solute]; dup || err2 != nil || !(l >= 0 && l <= 5) || src == "" {
				return nil, fmt.Errorf("%s:%d: %q: write one `%s | cp | J/(g·K) from 0 to 5 | SOURCE` per solute", name, line, text, solute)
			}
			cp[solute] = l
			continue
		}
		switch {
		case err1 != nil || !(n >= 0) || math.IsInf(n, 0):
			return nil, fmt.Errorf("%s:%d: %q is not a water ratio; write mol of water per mol of solute, 0 or more", name, line, f[1])
		case err2 != nil || math.IsNaN(l) || math.Abs(l) > 500:
			return nil, fmt.Errorf("%s:%d: %q is not a relative enthalpy in kJ/mol; write a number such as 17.99", name, line, f[2])
		case src == "":
			return nil, fmt.Errorf("%s:%d: the row has no source; name where the value comes from", name, line)
		}
		pts := out[solute]
		if k := len(pts); k > 0 && n <= pts[k-1].N {
			return nil, fmt.Errorf("%s:%d: %s at n = %g follows n = %g; list each solute's rows in rising n, once each", name, line, solute, n, pts[k-1].N)
		}
		out[solute] = append(pts, DilutionPoint{N: n, L: l, Source: src})
	}
	if err := sc.Err(); err != nil {
		return nil, fmt.Errorf("%s: %w", name, err)
	}
	if len(out) == 0 {
		return nil, fmt.Errorf("%s: no rows found", name)
	}
	return &Dilution{Points: out, Cp: cp}, nil
}

// RelativeEnthalpy is L in kJ per mol of solute at n mol of water per mol:
// linear in n between rows, the first row's value below it, zero (infinite
// dilution) beyond the last row.
func RelativeEnthalpy(pts []DilutionPoint, n float64) float64 {
	if len(pts) == 0 || math.IsNaN(n) || n > pts[len(pts)-1].N {
		return 0
	}
	if n <= pts[0].N {
		return pts[0].L
	}
	for i := 1; i < len(pts); i++ {
		if n <= pts[i].N {
			a, b := pts[i-1], pts[i]
			return a.L + (b.L-a.L)*(n-a.N)/(b.N-a.N)
		}
	}
	return pts[len(pts)-1].L
}

// soluteIn is a solute of data/dilution.txt as one stream brings it.
type soluteIn struct {
	chem     *Chemical
	stream   int // index of the stream in the request
	mol      float64
	waterMol float64 // the stream's water; 0 for a solid stream
	liquid   bool    // from a liquid stream: counted at its water ratio, 0 for one with no water (oleum)
}

// recordSolutes notes the solutes of a stream that have heats of
// concentrated solution, and takes near-pure liquids among them off the
// list of reagents whose heat of solution the formation-enthalpy table
// counts: the dilution table counts them from their own strength.
func (m *mixture) recordSolutes(t *Tables, found []soluteIn, waterMol float64, liquid bool) {
	if t.Dilution == nil {
		return
	}
	for _, s := range found {
		if _, ok := t.Dilution.Points[s.chem.Formula]; !ok {
			continue
		}
		if liquid {
			s.waterMol, s.liquid = waterMol, true
			m.undissolveLiquid(s.chem)
		}
		m.solutes = append(m.solutes, s)
	}
}

// undissolveLiquid takes a near-pure liquid reagent off the dissolved list.
func (m *mixture) undissolveLiquid(ch *Chemical) {
	keep := m.dissolved[:0]
	for _, d := range m.dissolved {
		if d.chem != ch || d.phase != Liquid {
			keep = append(keep, d)
		}
	}
	m.dissolved = keep
}

// dilutionHeat is the heat released (kJ) beyond what the species at
// infinite dilution account for: each liquid stream's solutes give off L at
// the stream's own water ratio, and what is left of them in the mix takes L
// back at the mix's ratio. In the mix every solute of the table is counted
// at the same ratio, the water over all of them (the mixture rule of Young,
// from memory: each component at the total concentration). What is left of
// a solute is the share of its marker species (H+ for an acid, OH- for a
// base, else the molecule it gives) that the mix still holds.
func dilutionHeat(mx *state.Mix, solutes []soluteIn, t *Tables) float64 {
	if len(solutes) == 0 {
		return 0
	}
	q := 0.0
	inStream := map[int]float64{} // solute mol by stream: one stream's solutes share its water
	for _, s := range solutes {
		inStream[s.stream] += s.mol
	}
	for _, s := range solutes {
		if s.liquid {
			q += s.mol * RelativeEnthalpy(t.Dilution.Points[s.chem.Formula], math.Max(0, s.waterMol)/inStream[s.stream])
		}
	}
	left := soluteLeft(mx, solutes)
	total := 0.0
	for i, s := range solutes {
		total += s.mol * left[i]
	}
	w := speciesAmount(mx, mx.Final, "H2O")
	if total <= 0 || w <= 0 {
		return q
	}
	for i, s := range solutes {
		q -= s.mol * left[i] * RelativeEnthalpy(t.Dilution.Points[s.chem.Formula], w/total+waterTaken(s.chem))
	}
	return q
}

// waterTaken is the water one formula unit of a chemical takes up as it
// gives its species (SO3 + H2O → H+ + HSO4-: one), zero for most. Its rows
// in data/dilution.txt count that water as part of the solution, while the
// mix's water is counted after it has been taken.
func waterTaken(ch *Chemical) float64 {
	own, err := ParseFormula(ch.Formula)
	if err != nil {
		return 0
	}
	h := 0.0
	for _, g := range ch.Gives {
		a, err := ParseFormula(g.Species.Formula)
		if err != nil {
			return 0
		}
		h += float64(g.Coef) * float64(a["H"])
	}
	return math.Max(0, (h-float64(own["H"]))/2)
}

// heatCapacityOf is the specific heat capacity of the mix, kJ/(kg·K): water's,
// with the solutes of data/dilution.txt counted at their own (a mass-weighted
// sum, which puts 98 % H2SO4 at 1.47 against 1.42 measured and 50 % NaOH at
// 2.84 against about 3.2: CRC Handbook, from memory); never below 1.
func heatCapacityOf(massKg float64, solutes []soluteIn, t *Tables) float64 {
	if !(massKg > 0) || t.Dilution == nil {
		return heatCapacity
	}
	less := 0.0
	for _, s := range solutes {
		if c, ok := t.Dilution.Cp[s.chem.Formula]; ok {
			less += s.mol * s.chem.MolarMass / 1000 * (heatCapacity - c)
		}
	}
	return math.Max(1, heatCapacity-less/massKg)
}

// soluteLeft is, per solute, the fraction the mix still holds: the final
// amount of its marker species over what all the table's solutes with that
// marker brought (or what the streams' states held, if more), from 0 to 1.
func soluteLeft(mx *state.Mix, solutes []soluteIn) []float64 {
	brought := map[string]float64{}
	markers := make([]string, len(solutes))
	for i, s := range solutes {
		mk, coef := marker(s.chem)
		markers[i] = mk
		brought[mk] += s.mol * coef
	}
	out := make([]float64, len(solutes))
	for i := range solutes {
		mk := markers[i]
		if mk == "" {
			continue
		}
		d := math.Max(brought[mk], speciesAmountIn(mx, mx.Initial, mk))
		if d > 0 {
			out[i] = math.Min(1, math.Max(0, speciesAmount(mx, mx.Final, mk)/d))
		}
	}
	return out
}

// marker is the species whose amount says how much of a solute is left:
// H+ for an acid, OH- for a base, else the one species it gives.
func marker(ch *Chemical) (text string, coef float64) {
	for _, g := range ch.Gives {
		switch {
		case g.IsProton():
			return "H+", float64(g.Coef)
		case g.IsHydroxide():
			return "OH-", float64(g.Coef)
		}
	}
	if len(ch.Gives) == 1 {
		return ch.Gives[0].Species.Text(), float64(ch.Gives[0].Coef)
	}
	return "", 0
}

func speciesAmount(mx *state.Mix, s *state.State, text string) float64 {
	if s == nil {
		return 0
	}
	return speciesAmountIn(mx, s.Amount, text)
}

func speciesAmountIn(mx *state.Mix, amounts []float64, text string) float64 {
	for i, sp := range mx.Species {
		if sp.Text == text && i < len(amounts) {
			return amounts[i]
		}
	}
	return 0
}
