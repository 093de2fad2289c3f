package engine

import (
	"math"
	"slices"
)

// maxSteps bounds the follow-on reactions predicted after the headline.
const maxSteps = 10

// limitingPH: below this pH the free H+ of the mix is a reagent that can run
// out; above its mirror (14 − limitingPH) OH- is. In between, buffers and
// water supply what a reaction takes, and the pH moves instead.
const limitingPH = 4.0

// setSolvent sets the H+ and OH- amounts from the pH.
func (m *mixture) setSolvent() {
	h := Species{Formula: "H", Charge: 1, Phase: Aqueous}
	oh := Species{Formula: "OH", Charge: -1, Phase: Aqueous}
	m.add(h, 0, false)
	m.add(oh, 0, false)
	m.get(h).mol = math.Pow(10, -m.pH) * m.volumeL
	m.get(oh).mol = math.Pow(10, m.pH-pKw(m.tempK)) * m.volumeL
}

func (m *mixture) amounts() []SpeciesAmount {
	var out []SpeciesAmount
	for _, p := range m.list() {
		sa := SpeciesAmount{Species: p.sp, Mol: p.mol}
		if p.sp.Phase == Aqueous && m.volumeL > 0 {
			sa.Molar = p.mol / m.volumeL
		}
		out = append(out, sa)
	}
	return out
}

// volatile lists dissolved molecules that leave an aqueous mix as gas, with
// their Henry's-law solubility in mol/(L·bar) at 25 °C (Sander, Compilation
// of Henry's law constants for water, Atmos. Chem. Phys. 15, 2015; from
// memory). What the liquid holds at the mix's pressure stays dissolved; the
// rest is given off.
var volatile = []struct {
	aq, gas string
	kH      float64
}{
	{"H2CO3", "CO2(g)", 0.034},
	{"H2S", "H2S(g)", 0.10},
	{"Cl2", "Cl2(g)", 0.062},
	{"H2SO3", "SO2(g)", 1.3},
	{"ClO2", "ClO2(g)", 1.0},
	{"HCN", "HCN(g)", 9},
	{"O3", "O3(g)", 0.010},
}

// solutionHeat is the heat released (kJ) by dissolving the solid and
// near-pure liquid reagents of the mix into it, from formation enthalpies
// (data/enthalpies.txt, and data/species.txt for the dissolved species of a
// solid that it lacks): caustic pellets, quicklime, 96 % sulfuric acid, boric acid.
// leftOut names the reagents without data, which the estimate leaves out.
func (m *mixture) solutionHeat(t *Tables) (kJ float64, leftOut []string) {
	if !m.aqueous {
		return 0, nil
	}
	for _, d := range m.dissolved {
		rx, err := dissolution(d, t)
		if err != nil {
			leftOut = append(leftOut, d.chem.Formula)
			continue
		}
		// Only the ions of a solid, or of a liquid that ionises (tin(IV)
		// chloride), are taken from the species data where enthalpies.txt
		// lacks them: a neat molecular liquid (ethanol) mixes with water
		// with a heat that depends on the ratio, which infinite dilution
		// overstates many times where the liquid is the bulk.
		ions := d.phase == Solid || givesIons(d.chem)
		dh, missing := reactionEnthalpyBy(rx, func(key, text string) (float64, bool) {
			if e, ok := t.Enthalpies[key]; ok {
				return e.DeltaHf, true
			}
			if sp, ok := t.Thermo.Get(text); ok && sp.HasDfH && ions {
				return sp.DfH, true
			}
			return 0, false
		})
		if len(missing) > 0 {
			leftOut = append(leftOut, d.chem.Formula)
			continue
		}
		kJ += -dh * d.mol
	}
	return kJ, leftOut
}

// ionicOnly keeps the reagents of formulas that dissolve into ions: the
// heat of mixing a molecular liquid (ethanol) is left out by design.
func (m *mixture) ionicOnly(formulas []string) []string {
	var out []string
	for _, d := range m.dissolved {
		if givesIons(d.chem) && slices.Contains(formulas, d.chem.Formula) && !slices.Contains(out, d.chem.Formula) {
			out = append(out, d.chem.Formula)
		}
	}
	return out
}

// givesIons says the chemical dissolves into ions rather than as a molecule.
func givesIons(c *Chemical) bool {
	for _, g := range c.Gives {
		if g.Charge != 0 {
			return true
		}
	}
	return false
}

// dissolution writes "NaOH(s) → Na+ + OH-" for a dissolving reagent, with
// the water it takes up or gives off.
func dissolution(d dissolved, t *Tables) (*Reaction, error) {
	solid := Species{Formula: d.chem.Formula, Phase: d.phase}
	atoms, err := t.atomsOf(d.chem.Formula)
	if err != nil {
		return nil, err
	}
	diff := Atoms{}
	for el, n := range atoms {
		diff[el] = -n
	}
	r := &Reaction{Reactants: []EqTerm{{Formula: solid.Formula, Phase: solid.Phase, Coef: 1, Text: solid.Text()}}}
	for _, g := range d.chem.Gives {
		a, err := t.atomsOf(g.Formula)
		if err != nil {
			return nil, err
		}
		diff.Add(a, g.Coef)
		r.Products = append(r.Products, EqTerm{Formula: g.Formula, Charge: g.Charge, Phase: g.Phase, Coef: g.Coef, Text: g.Species.Text()})
	}
	// What is left over is water taken up (CaO + H2O) or given off.
	if k := diff["O"]; k != 0 {
		w := EqTerm{Formula: "H2O", Phase: Liquid, Text: "H2O(l)"}
		if k > 0 {
			w.Coef = k
			r.Reactants = append(r.Reactants, w)
		} else {
			w.Coef = -k
			r.Products = append(r.Products, w)
		}
	}
	return r, nil
}
