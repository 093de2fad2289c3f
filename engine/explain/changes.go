// Package explain turns the states of a mix into the redox explanation an
// operator knows: which oxidizing agent took electrons from which reducing
// agent, both half-reactions and the net equation written in the mix's
// medium, and E°, E, ΔG and log K belonging to the equation printed. Every
// number is derived from the species data and the states of package state.
package explain

import (
	"math"
	"sort"

	"mixward/engine/chem"
	"mixward/engine/state"
	"mixward/engine/thermo"
)

// Transfer is the change of one element from one oxidation state to another
// between the mix as combined and the mix at equilibrium.
type Transfer struct {
	Element  string
	From, To float64 // average oxidation states
	Mol      float64 // atoms that moved
}

// Electrons is the mol of electrons the transfer takes up (a reduction) or
// gives off (an oxidation).
func (t Transfer) Electrons() float64 { return t.Mol * math.Abs(t.From-t.To) }

// Reduction reports whether the element was reduced.
func (t Transfer) Reduction() bool { return t.To < t.From }

// pool is mol of atoms of each element in each oxidation state.
type pool map[string]map[float64]float64

func roundOx(x float64) float64 { return math.Round(x*100) / 100 }

// redoxElement reports whether the element of a species can change state in
// the solve: an inert species' non-metals cannot.
func redoxElement(sp *thermo.Species, el string) bool {
	return !(sp.Inert && el != "H" && el != "O" && !chem.IsMetal(el) && !sp.Free[el])
}

func poolOf(species []*thermo.Species, amount []float64) pool {
	p := pool{}
	for i, sp := range species {
		if amount[i] == 0 {
			continue
		}
		for el, n := range sp.Atoms {
			if !redoxElement(sp, el) {
				continue
			}
			m := p[el]
			if m == nil {
				m = map[float64]float64{}
				p[el] = m
			}
			m[roundOx(sp.Ox[el])] += amount[i] * float64(n)
		}
	}
	return p
}

// Transfers lists what changed oxidation state between two states of the
// same species list, largest first. Within one element, atoms leaving and
// entering states are matched in order of oxidation state, which pairs them
// with the least total change (comproportionation and disproportionation
// come out as two transfers).
func Transfers(species []*thermo.Species, before, after []float64) []Transfer {
	pb, pa := poolOf(species, before), poolOf(species, after)
	var out []Transfer
	for _, el := range elementsOf(pb, pa) {
		out = append(out, matchElement(el, pb[el], pa[el])...)
	}
	sort.SliceStable(out, func(i, j int) bool { return out[i].Electrons() > out[j].Electrons() })
	return out
}

func elementsOf(ps ...pool) []string {
	seen := map[string]bool{}
	var out []string
	for _, p := range ps {
		for el := range p {
			if !seen[el] {
				seen[el] = true
				out = append(out, el)
			}
		}
	}
	sort.Strings(out)
	return out
}

type level struct{ ox, mol float64 }

// matchElement pairs the states an element left with those it entered.
func matchElement(el string, before, after map[float64]float64) []Transfer {
	total := 0.0
	for _, v := range before {
		total += v
	}
	tol := 1e-9*total + 1e-12
	var src, dst []level
	for _, ox := range unionKeys(before, after) {
		d := after[ox] - before[ox]
		switch {
		case d < -tol:
			src = append(src, level{ox, -d})
		case d > tol:
			dst = append(dst, level{ox, d})
		}
	}
	var out []Transfer
	i, j := 0, 0
	for i < len(src) && j < len(dst) {
		m := math.Min(src[i].mol, dst[j].mol)
		if m > tol && src[i].ox != dst[j].ox {
			out = append(out, Transfer{Element: el, From: src[i].ox, To: dst[j].ox, Mol: m})
		}
		src[i].mol -= m
		dst[j].mol -= m
		if src[i].mol <= tol {
			i++
		}
		if dst[j].mol <= tol {
			j++
		}
	}
	return out
}

func unionKeys(a, b map[float64]float64) []float64 {
	seen := map[float64]bool{}
	var out []float64
	for _, m := range []map[float64]float64{a, b} {
		for k := range m {
			if !seen[k] {
				seen[k] = true
				out = append(out, k)
			}
		}
	}
	sort.Float64s(out)
	return out
}

// Match is a reduction paired with an oxidation, with the mol of electrons
// that passed between them.
type Match struct {
	Red, Ox   Transfer
	Electrons float64
}

// Pairs matches reductions with oxidations, largest first: the electrons one
// reduction took up are shared out over the oxidations that gave them off.
// Tiny matches (below frac of the largest) are dropped.
func Pairs(ts []Transfer, frac float64) []Match {
	var red, ox []Transfer
	var re, oe []float64
	for _, t := range ts {
		if t.Reduction() {
			red, re = append(red, t), append(re, t.Electrons())
		} else {
			ox, oe = append(ox, t), append(oe, t.Electrons())
		}
	}
	var out []Match
	i, j := 0, 0
	for i < len(red) && j < len(ox) {
		e := math.Min(re[i], oe[j])
		out = append(out, Match{Red: red[i], Ox: ox[j], Electrons: e})
		re[i] -= e
		oe[j] -= e
		if re[i] <= 1e-12*(1+e) {
			i++
		}
		if oe[j] <= 1e-12*(1+e) {
			j++
		}
	}
	sort.SliceStable(out, func(a, b int) bool { return out[a].Electrons > out[b].Electrons })
	if len(out) == 0 {
		return nil
	}
	keep := out[:0]
	for _, m := range out {
		if m.Electrons >= frac*out[0].Electrons {
			keep = append(keep, m)
		}
	}
	return keep
}

// dominant is the species holding the most atoms of el in oxidation state ox
// in a state (nil when none does). Minor species (ion pairs, hydrolysis
// forms) stand in only when no main species holds any, but they count for
// their phase: iron(III) carried mostly as sulfato complexes is written as
// the dissolved ion Fe^3+, not as the smaller amount of hydroxide that
// precipitated beside it.
func dominant(mx *state.Mix, amount []float64, el string, ox float64) *thermo.Species {
	byPhase := map[chem.Phase]float64{}
	for i, sp := range mx.Species {
		if n := sp.Atoms[el]; n > 0 && redoxElement(sp, el) && roundOx(sp.Ox[el]) == ox {
			byPhase[sp.Phase] += amount[i] * float64(n)
		}
	}
	var phase chem.Phase
	most := 0.0
	for _, ph := range []chem.Phase{chem.Aqueous, chem.Solid, chem.Gas, chem.Liquid} {
		if byPhase[ph] > most {
			phase, most = ph, byPhase[ph]
		}
	}
	if sp := dominantIn(mx, amount, el, ox, phase); sp != nil {
		return sp
	}
	return dominantIn(mx, amount, el, ox, "")
}

// dominantIn is dominant among the species of one phase ("" for any).
func dominantIn(mx *state.Mix, amount []float64, el string, ox float64, phase chem.Phase) *thermo.Species {
	for _, minor := range []bool{false, true} {
		var best *thermo.Species
		bestMol := 0.0
		for i, sp := range mx.Species {
			n := sp.Atoms[el]
			if n == 0 || sp.Minor != minor || !redoxElement(sp, el) || roundOx(sp.Ox[el]) != ox || phase != "" && sp.Phase != phase {
				continue
			}
			if m := amount[i] * float64(n); m > bestMol {
				best, bestMol = sp, m
			}
		}
		if best != nil {
			return best
		}
	}
	return nil
}
