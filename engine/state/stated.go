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
// brings the solution as combined to pH target.
func (m *Model) fitPH(mx *Mix, n0 []float64, volL, target float64) ([]float64, error) {
	x, err := m.titrate(mx, n0, volL, target)
	if err != nil {
		return nil, err
	}
	return m.withAcid(mx, n0, x), nil
}

// withAcid is n0 with x mol of the stand-in strong acid (x > 0) or base
// (x < 0) added.
func (m *Model) withAcid(mx *Mix, n0 []float64, x float64) []float64 {
	n := append([]float64(nil), n0...)
	for i, sp := range mx.Species {
		switch {
		case x > 0 && (sp.Text == "H+" || sp == standInAnion):
			n[i] += x
		case x < 0 && (sp.Text == "OH-" || sp == standInCation):
			n[i] -= x
		}
	}
	return n
}

// titrate finds the mol of stand-in strong acid (> 0) or base (< 0) that
// brings the solution as combined to pH target, by bisection on asinh(x).
func (m *Model) titrate(mx *Mix, n0 []float64, volL, target float64) (float64, error) {
	limit := math.Asinh(20 * volL) // up to 20 mol/L of acid or base
	lo, hi := -limit, limit        // pH falls as x rises
	mid := 0.0
	for it := 0; it < 60 && hi-lo > 1e-7; it++ {
		mid = (lo + hi) / 2
		s, err := m.solve(mx, m.withAcid(mx, n0, math.Sinh(mid)), true, nil, volL)
		if err != nil {
			return 0, fmt.Errorf("fitting the stated pH %g: %w", target, err)
		}
		switch d := s.PH - target; {
		case math.Abs(d) < 0.002:
			return math.Sinh(mid), nil
		case d > 0:
			lo = mid
		default:
			hi = mid
		}
	}
	if mid <= -limit+1e-6 || mid >= limit-1e-6 {
		return 0, fmt.Errorf("the stated pH %g cannot be reached", target)
	}
	return math.Sinh(mid), nil
}
