package equilibrium

import (
	"fmt"
	"math"
)

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

func badInput(format string, args ...any) error {
	return fmt.Errorf("equilibrium: %s: %w", fmt.Sprintf(format, args...), ErrBadInput)
}

// validate checks the shape and values of p and returns the solvent index.
func validate(p *Problem) (int, error) {
	nc, ns := len(p.Components), len(p.Species)
	if len(p.Totals) != nc {
		return 0, badInput("%d totals for %d components", len(p.Totals), nc)
	}
	if ns == 0 {
		return 0, badInput("no species")
	}
	if !finite(p.TemperatureK) || p.TemperatureK <= 0 {
		return 0, badInput("temperature %g K is not a positive number", p.TemperatureK)
	}
	if !finite(p.PressureBar) || p.PressureBar <= 0 {
		return 0, badInput("pressure %g bar is not a positive number", p.PressureBar)
	}
	for j, t := range p.Totals {
		if !finite(t) {
			return 0, badInput("total of component %q is %g", p.Components[j], t)
		}
	}
	solvent := -1
	for i := range p.Species {
		if err := validateSpecies(&p.Species[i], nc); err != nil {
			return 0, err
		}
		if p.Species[i].Phase == Solvent {
			if solvent >= 0 {
				return 0, badInput("two solvent species, %q and %q; give exactly one", p.Species[solvent].Name, p.Species[i].Name)
			}
			solvent = i
		}
	}
	if solvent < 0 {
		return 0, badInput("no solvent species; give water with Phase Solvent")
	}
	for k := range p.Constraints {
		if err := validateConstraint(&p.Constraints[k], ns); err != nil {
			return 0, err
		}
	}
	if len(p.Start) != 0 && len(p.Start) != ns {
		return 0, badInput("start has %d amounts for %d species", len(p.Start), ns)
	}
	for i, v := range p.Start {
		if !finite(v) || v < 0 {
			return 0, badInput("start amount of %q is %g; give a finite amount ≥ 0", p.Species[i].Name, v)
		}
	}
	return solvent, nil
}

func validateSpecies(s *Species, nc int) error {
	if s.Phase < Aqueous || s.Phase > Solvent {
		return badInput("species %q has unknown phase %d", s.Name, int(s.Phase))
	}
	if len(s.Amounts) != nc {
		return badInput("species %q has %d component amounts for %d components", s.Name, len(s.Amounts), nc)
	}
	if !finite(s.Mu0) {
		return badInput("species %q has μ°/RT %g", s.Name, s.Mu0)
	}
	if s.Charge != 0 && s.Phase != Aqueous {
		return badInput("species %q is charged (%+d) but not aqueous; only aqueous species may carry a charge", s.Name, s.Charge)
	}
	empty := s.Charge == 0
	for _, a := range s.Amounts {
		if !finite(a) {
			return badInput("species %q has component amount %g", s.Name, a)
		}
		if a != 0 {
			empty = false
		}
	}
	if empty {
		return badInput("species %q contains no component and no charge", s.Name)
	}
	return nil
}

func validateConstraint(c *Constraint, ns int) error {
	if len(c.Coef) != ns {
		return badInput("constraint %q has %d coefficients for %d species", c.Name, len(c.Coef), ns)
	}
	if c.Rel < AtMost || c.Rel > Exactly {
		return badInput("constraint %q has unknown relation %d", c.Name, int(c.Rel))
	}
	if !finite(c.Bound) {
		return badInput("constraint %q has bound %g", c.Name, c.Bound)
	}
	zero := true
	for _, v := range c.Coef {
		if !finite(v) {
			return badInput("constraint %q has coefficient %g", c.Name, v)
		}
		if v != 0 {
			zero = false
		}
	}
	if zero {
		return badInput("constraint %q has no nonzero coefficient", c.Name)
	}
	return nil
}
