package equilibrium

import (
	"fmt"
	"math"
	"sort"
	"strings"
)

// rowSet keeps an orthonormal basis of the balance rows taken so far
// (modified Gram–Schmidt) and, for each basis vector, its right-hand side, so
// that a new row can be tested for independence and, when dependent, for
// consistency of its right-hand side with the rows before it.
type rowSet struct {
	q   [][]float64
	rho []float64
	mag []float64 // magnitude of the terms that made rho
	nz  []float64 // rounding carried in rho
}

// dependentTol is the relative norm below which a row counts as a linear
// combination of the rows before it.
const dependentTol = 1e-9

// add offers row r with right-hand side b (rounded by noise). It returns
// whether r is independent (then it is kept); for a dependent row it
// returns the right-hand side the other rows imply and the tolerance within
// which b must agree with it.
func (s *rowSet) add(r []float64, b, noise float64) (indep bool, implied, tol float64) {
	v := append([]float64(nil), r...)
	rb := b
	norm := math.Sqrt(dot(r, r))
	scale, nz := math.Abs(b), noise
	for k, q := range s.q {
		c := dot(q, v)
		axpy(v, -c, q)
		rb -= c * s.rho[k]
		implied += c * s.rho[k]
		scale += math.Abs(c) * s.mag[k]
		nz += math.Abs(c) * s.nz[k]
	}
	nv := math.Sqrt(dot(v, v))
	if nv <= dependentTol*norm {
		return false, implied, 1e-9*scale + nz + 1e-300
	}
	for i := range v {
		v[i] /= nv
	}
	s.q = append(s.q, v)
	s.rho = append(s.rho, rb/nv)
	s.mag = append(s.mag, scale/nv)
	s.nz = append(s.nz, nz/nv)
	return true, 0, 0
}

func dot(a, b []float64) float64 {
	s := 0.0
	for i, x := range a {
		s += x * b[i]
	}
	return s
}

func axpy(dst []float64, a float64, x []float64) {
	for i, v := range x {
		dst[i] += a * v
	}
}

// balanceRow is one equality row of the solve: a component balance, the
// charge balance or an active constraint.
type balanceRow struct {
	name  string
	coef  []float64 // per species
	rhs   float64
	lock  int // constraint index, −1 for balances
	scale float64
	// noise is the size of the rounding in rhs: a row formed by subtracting
	// a multiple of the solvent row inherits that row's rounding. Residuals
	// below it are not meaningful.
	noise float64
}

// roundoff is the relative rounding assumed in the totals (a few ulps).
const roundoff = 1e-15

// eliminate marks species that cannot be present because a component they
// contain has a zero total and no species carries it negatively. It returns
// an ErrInfeasible error for a total whose sign no species can match.
func eliminate(p *Problem, off []bool) error {
	for changed := true; changed; {
		changed = false
		for j, name := range p.Components {
			pos, neg := false, false
			for i := range p.Species {
				if off[i] {
					continue
				}
				a := p.Species[i].Amounts[j]
				pos = pos || a > 0
				neg = neg || a < 0
			}
			b := p.Totals[j]
			switch {
			case b > 0 && !pos:
				return fmt.Errorf("equilibrium: component %q has total %g mol but no species that can carry it positively: %w", name, b, ErrInfeasible)
			case b < 0 && !neg:
				return fmt.Errorf("equilibrium: component %q has a negative total (%g mol); totals must be amounts ≥ 0 for components all species carry positively: %w", name, b, ErrInfeasible)
			case b == 0 && !neg:
				for i := range p.Species {
					if !off[i] && p.Species[i].Amounts[j] > 0 {
						off[i], changed = true, true
					}
				}
			case b == 0 && !pos:
				for i := range p.Species {
					if !off[i] && p.Species[i].Amounts[j] < 0 {
						off[i], changed = true, true
					}
				}
			}
		}
	}
	return nil
}

// balanceRows returns the independent component rows and the charge row (if
// independent). A dependent row whose total disagrees with the others makes
// the problem infeasible.
func balanceRows(p *Problem, off []bool, set *rowSet, solvent int) ([]balanceRow, error) {
	ns := len(p.Species)
	charge := make([]float64, ns)
	for i, s := range p.Species {
		if !off[i] && s.Phase == Aqueous {
			charge[i] = float64(s.Charge)
		}
	}
	comps := componentRows(p, off, solvent)
	// The charge row goes first and the components follow by increasing
	// total, so that a dependent row, which is only conserved through the
	// others, is a large or a rounded one: neutrality and trace components
	// are then enforced directly, each to its own relative tolerance.
	var rows []balanceRow
	set.add(charge, 0, 0)
	rows = append(rows, balanceRow{name: "charge", coef: charge, lock: -1})
	// Exact rows before rows that carry rounding (recombined with the
	// solvent row), so that when a row is implied by others it is a
	// rounded one that is dropped; by total within each group.
	sort.SliceStable(comps, func(a, b int) bool {
		na, nb := comps[a].noise > 0, comps[b].noise > 0
		if na != nb {
			return !na
		}
		return comps[a].scale < comps[b].scale
	})
	for _, r := range comps {
		indep, implied, tol := set.add(r.coef, r.rhs, r.noise)
		if !indep {
			if math.Abs(implied-r.rhs) > tol {
				return nil, fmt.Errorf("equilibrium: the totals are inconsistent: %s is %g mol but with these species electroneutrality and the other totals tie it to %g mol: %w", r.name, r.rhs, implied, ErrInfeasible)
			}
			continue
		}
		rows = append(rows, r)
	}
	if dot(charge, charge) == 0 {
		rows = rows[1:] // no charged species
	}
	return rows, nil
}

// componentRows returns one balance row per component, with the solvent
// carried by one row only: every other row that contains the solvent has
// that row's multiple subtracted (for water, "H" becomes "H beyond water",
// H − 2·O). The big solvent amount then no longer swamps the balances of
// acidity and oxidation state, which are enforced to their own scale. The
// row carrying the solvent sorts last (scale = +Inf).
func componentRows(p *Problem, off []bool, solvent int) []balanceRow {
	ns := len(p.Species)
	rows := make([]balanceRow, len(p.Components))
	pivot := -1
	for j, name := range p.Components {
		r := make([]float64, ns)
		for i := range p.Species {
			if !off[i] {
				r[i] = p.Species[i].Amounts[j]
			}
		}
		rows[j] = balanceRow{name: fmt.Sprintf("component %q", name), coef: r, rhs: p.Totals[j], lock: -1}
		if r[solvent] != 0 && (pivot < 0 || math.Abs(p.Totals[j]) > math.Abs(p.Totals[pivot])) {
			pivot = j
		}
	}
	for j := range rows {
		rows[j].scale = math.Abs(rows[j].rhs)
		if pivot < 0 || j == pivot || rows[j].coef[solvent] == 0 {
			continue
		}
		f := rows[j].coef[solvent] / rows[pivot].coef[solvent]
		for i, v := range rows[pivot].coef {
			rows[j].coef[i] -= f * v
		}
		rows[j].coef[solvent] = 0
		rows[j].noise = roundoff * (math.Abs(rows[j].rhs) + math.Abs(f*rows[pivot].rhs))
		rows[j].rhs -= f * rows[pivot].rhs
		rows[j].scale = math.Abs(rows[j].rhs)
		rows[j].name = fmt.Sprintf("component %q beyond what the solvent carries", p.Components[j])
	}
	if pivot >= 0 {
		rows[pivot].scale = math.Inf(1)
	}
	return rows
}

// constraintRow builds the row of constraint k with the species that are
// off zeroed.
func constraintRow(p *Problem, k int, off []bool) balanceRow {
	c := p.Constraints[k]
	r := make([]float64, len(p.Species))
	for i, v := range c.Coef {
		if !off[i] {
			r[i] = v
		}
	}
	return balanceRow{name: c.Name, coef: r, rhs: c.Bound, lock: k}
}

func names(rows []balanceRow) string {
	var b strings.Builder
	for k, r := range rows {
		if k > 0 {
			b.WriteString(", ")
		}
		b.WriteString(r.name)
	}
	return b.String()
}
