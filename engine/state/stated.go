package state

import (
	"fmt"
	"math"

	"mixward/engine/chem"
	"mixward/engine/thermo"
)

// A stated pH (of a stream, or of the whole mix) stands for acid or base the
// request does not name: a strong acid or base of a stand-in ion is added
// until the solution as combined shows that pH. The stand-in ions are their
// own components, so they never react; they are not listed in answers.
var (
	standInAnion  = standIn("Xa", -1)
	standInCation = standIn("Xc", 1)
)

func standIn(el string, z int) *thermo.Species {
	sp := chem.Species{Formula: el, Charge: z, Phase: chem.Aqueous}
	return &thermo.Species{Species: sp, Text: "(stand-in " + sp.Ion() + ")", Atoms: chem.Atoms{el: 1},
		HasDfH: true, Ox: map[string]float64{el: float64(z)}, Inert: true, Minor: true,
		Source: "stand-in for the acid or base behind a stated pH"}
}

// IsStandIn reports whether a species is a stand-in ion of a stated pH.
func IsStandIn(sp *thermo.Species) bool { return sp == standInAnion || sp == standInCation }

// fitPH adds to n0 the stand-in strong acid (x > 0 mol) or base (x < 0) that
// brings the solution as combined to pH target, by bisection on asinh(x).
func (m *Model) fitPH(mx *Mix, n0 []float64, volL, target float64) ([]float64, error) {
	idx := map[*thermo.Species]int{}
	for i, sp := range mx.Species {
		idx[sp] = i
	}
	h, _ := m.DB.Get("H+")
	oh, _ := m.DB.Get("OH-")
	with := func(x float64) []float64 {
		n := append([]float64(nil), n0...)
		if x > 0 {
			n[idx[h]] += x
			n[idx[standInAnion]] += x
		} else {
			n[idx[oh]] -= x
			n[idx[standInCation]] -= x
		}
		return n
	}
	limit := math.Asinh(20 * volL) // up to 20 mol/L of acid or base
	lo, hi := -limit, limit        // pH falls as x rises
	var best []float64
	for it := 0; it < 60 && hi-lo > 1e-7; it++ {
		mid := (lo + hi) / 2
		n := with(math.Sinh(mid))
		s, err := m.solve(mx, n, true, nil, volL)
		if err != nil {
			return nil, fmt.Errorf("fitting the stated pH %g: %w", target, err)
		}
		best = n
		switch d := s.PH - target; {
		case math.Abs(d) < 0.002:
			return n, nil
		case d > 0:
			lo = mid
		default:
			hi = mid
		}
	}
	if best == nil {
		return nil, fmt.Errorf("the stated pH %g cannot be reached", target)
	}
	return best, nil
}
