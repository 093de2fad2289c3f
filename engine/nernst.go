package engine

import (
	"math"

	"gonum.org/v1/gonum/unit/constant"
)

// Physical constants from gonum's CODATA 2018 values: the molar gas constant
// is the Boltzmann constant times the Avogadro constant (both exact in SI).
var (
	faraday     = float64(constant.Faraday)                                // C/mol
	gasConstant = float64(constant.Boltzmann) * float64(constant.Avogadro) // J/(mol·K)
)

// activity of a species in the mix for the Nernst equation: H+ and OH- from
// the pH; water, solids and pure liquids 1; dissolved species by their
// concentration in mol/L; gases by partial pressure in bar. A species not in
// the mix (a product before any reaction) is taken at its standard state
// (1 mol/L, 1 bar) so that a verdict never hinges on a trace.
func (m *mixture) activity(s Species) float64 {
	switch {
	case s.IsProton():
		return math.Pow(10, -m.pH)
	case s.IsHydroxide():
		return math.Pow(10, m.pH-pKw(m.tempK))
	case s.IsWater(), s.Phase == Solid, s.Phase == Liquid:
		return 1
	case s.Phase == Gas:
		return 1
	}
	c := m.molar(s)
	if c <= 0 {
		return 1
	}
	return c
}

// potential is the reduction potential of h under the mix's conditions:
// E = E° − (RT/nF)·ln Q, with Q the activity quotient of the reduction as
// written.
func (m *mixture) potential(h *HalfReaction) float64 {
	lnQ := 0.0
	for _, p := range h.Products {
		lnQ += float64(p.Coef) * math.Log(m.activity(p.Species))
	}
	for _, r := range h.Reactants {
		lnQ -= float64(r.Coef) * math.Log(m.activity(r.Species))
	}
	return h.E0 - gasConstant*m.tempK/(float64(h.Electrons)*faraday)*lnQ
}

// nernstSlope is RT·ln10/F at temperature T in volts.
func nernstSlope(tempK float64) float64 { return gasConstant * tempK * math.Ln10 / faraday }
