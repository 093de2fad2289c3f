package equilibrium

import (
	"fmt"
	"math"
	"strings"
)

// Assemblage and activity loop limits.
const (
	tolSaturation = 1e-8  // ln units of supersaturation before a phase is added
	tolNegative   = 1e-12 // relative amount below zero before a phase is removed
	maxGammaLoop  = 60
	tolGamma      = 1e-11
)

// assemblageKey describes the present phases, for cycle detection.
func (s *system) assemblageKey(pt *point) string {
	var b strings.Builder
	for _, i := range s.pure {
		if pt.present[i] {
			fmt.Fprintf(&b, "%d,", i)
		}
	}
	if pt.gasOn {
		b.WriteString("gas")
	}
	return b.String()
}

// phaseChange applies the single most needed change to the assemblage and
// reports whether it changed anything.
func (s *system) phaseChange(pt *point) (bool, string) {
	scale := math.Exp(s.logBig)
	worst, which := -tolNegative*scale, -1
	for _, i := range s.pure {
		if pt.present[i] && pt.amt[i] < worst {
			worst, which = pt.amt[i], i
		}
	}
	if pt.gasOn && pt.ng < worst {
		pt.gasOn, pt.ng = false, 0
		return true, "gas phase removed"
	}
	if which >= 0 {
		pt.present[which], pt.amt[which] = false, 0
		return true, s.p.Species[which].Name + " removed"
	}
	best, add := tolSaturation, -1
	for _, i := range s.pure {
		if pt.present[i] {
			continue
		}
		if sat := s.potential(i, pt.theta) - s.p.Species[i].Mu0; sat > best {
			best, add = sat, i
		}
	}
	if !pt.gasOn && len(s.gas) > 0 {
		if lse := s.gasLogSum(pt); lse > best {
			// Start the phase small: its most supersaturated member at a
			// thousandth of what the totals allow.
			top := s.gas[0]
			for _, g := range s.gas {
				if pt.logAmt[g] > pt.logAmt[top] {
					top = g
				}
			}
			pt.gasOn, pt.ng = true, 1e-3*s.ub[top]*math.Exp(-math.Max(lse, 0))
			return true, "gas phase added"
		}
	}
	if add >= 0 {
		pt.present[add], pt.amt[add] = true, 0
		return true, s.p.Species[add].Name + " added"
	}
	return false, ""
}

// dropNegative removes the present phase with the most negative amount.
func (s *system) dropNegative(pt *point) (bool, string) {
	worst, which := 0.0, -1
	for _, i := range s.pure {
		if pt.present[i] && pt.amt[i] < worst {
			worst, which = pt.amt[i], i
		}
	}
	if pt.gasOn && pt.ng < worst {
		pt.gasOn, pt.ng = false, 0
		return true, "gas phase removed"
	}
	if which < 0 {
		return false, ""
	}
	pt.present[which], pt.amt[which] = false, 0
	return true, s.p.Species[which].Name + " removed"
}

// solveAssemblage runs Newton solves and phase changes until no phase is
// undersaturated-but-present or supersaturated-but-absent.
func (s *system) solveAssemblage(pt *point, w *newtonWork, tr *trace) error {
	seen := map[string]int{}
	limit := 3*len(s.pure) + 12
	var history []string
	for round := 0; ; round++ {
		var changed bool
		var what string
		if err := s.newton(pt, w, tr); err != nil {
			// A phase whose amount has gone negative may be what keeps the
			// equations from a solution: drop it and go on.
			if changed, what = s.dropNegative(pt); !changed {
				return fmt.Errorf("with phases [%s]: %v", s.assemblageKeyNames(pt), err)
			}
		} else {
			changed, what = s.phaseChange(pt)
		}
		if !changed {
			// Amounts within the tolerance below zero are zero.
			for _, i := range s.pure {
				if pt.present[i] && pt.amt[i] < 0 {
					pt.amt[i] = 0
				}
			}
			if pt.gasOn && pt.ng <= 0 {
				pt.gasOn, pt.ng = false, 0
				s.evaluate(pt)
			}
			return nil
		}
		history = append(history, what)
		key := s.assemblageKey(pt)
		// An assemblage may be revisited from a better point, but not
		// endlessly.
		if seen[key] == 3 || round == limit {
			return fmt.Errorf("the phase assemblage does not settle (%s): %w", strings.Join(history, "; "), ErrNoConvergence)
		}
		seen[key]++
	}
}

func (s *system) assemblageKeyNames(pt *point) string {
	var parts []string
	for _, i := range s.pure {
		if pt.present[i] {
			parts = append(parts, s.p.Species[i].Name)
		}
	}
	if pt.gasOn {
		parts = append(parts, "gas")
	}
	return strings.Join(parts, ", ")
}

// ionic returns the ionic strength (mol/kg) of the aqueous amounts in pt.
func (s *system) ionic(pt *point) float64 {
	sum := 0.0
	for _, i := range s.aq {
		sum += s.z2[i] * pt.amt[i]
	}
	return sum / (2 * pt.amt[s.solvent] * MolarMassWater)
}

// solveGamma iterates the activity coefficients to a fixed point: the scalar
// g = ln γ per unit z² is updated from the ionic strength of the solution,
// with a secant step once two values are known.
func (s *system) solveGamma(pt *point, w *newtonWork, tr *trace) error {
	var gPrev, hPrev float64
	for round := 0; round < maxGammaLoop; round++ {
		if err := s.solveAssemblage(pt, w, tr); err != nil {
			return err
		}
		g := pt.gamma
		h := daviesLn(s.daviesA, s.ionic(pt)) - g
		if math.Abs(h) <= tolGamma {
			return nil
		}
		next := g + h
		if round > 0 && h != hPrev {
			sec := g - h*(g-gPrev)/(h-hPrev)
			if finite(sec) && math.Abs(sec-g) <= 4*math.Abs(h) {
				next = sec
			}
		}
		gPrev, hPrev = g, h
		pt.gamma = next
		tr.note("ln γ per z² → %.6g", next)
	}
	return fmt.Errorf("activity coefficients did not settle in %d rounds (ionic strength %.3g mol/kg): %w", maxGammaLoop, s.ionic(pt), ErrNoConvergence)
}
