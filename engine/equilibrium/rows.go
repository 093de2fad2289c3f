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
	mag []float64 // magnitude of the terms that made rho, for tolerances
}

// dependentTol is the relative norm below which a row counts as a linear
// combination of the rows before it.
const dependentTol = 1e-9

// add offers row r with right-hand side b. It returns whether r is
// independent (then it is kept); for a dependent row it returns the
// right-hand side the other rows imply and the scale to compare against.
func (s *rowSet) add(r []float64, b float64) (indep bool, implied, scale float64) {
	v := append([]float64(nil), r...)
	rb := b
	norm := math.Sqrt(dot(r, r))
	for k, q := range s.q {
		c := dot(q, v)
		axpy(v, -c, q)
		rb -= c * s.rho[k]
		implied += c * s.rho[k]
		scale += math.Abs(c) * s.mag[k]
	}
	nv := math.Sqrt(dot(v, v))
	if nv <= dependentTol*norm {
		return false, implied, scale + math.Abs(b)
	}
	for i := range v {
		v[i] /= nv
	}
	s.q = append(s.q, v)
	s.rho = append(s.rho, rb/nv)
	s.mag = append(s.mag, (scale+math.Abs(b))/nv)
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
}

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
func balanceRows(p *Problem, off []bool, set *rowSet) ([]balanceRow, error) {
	ns := len(p.Species)
	charge := make([]float64, ns)
	for i, s := range p.Species {
		if !off[i] && s.Phase == Aqueous {
			charge[i] = float64(s.Charge)
		}
	}
	// The charge row goes first and the components follow by increasing
	// total, so that a dependent row, which is only conserved through the
	// others, is a large one: neutrality and trace components are then
	// enforced directly, each to its own relative tolerance.
	var rows []balanceRow
	set.add(charge, 0)
	rows = append(rows, balanceRow{name: "charge", coef: charge, lock: -1})
	order := make([]int, len(p.Components))
	for j := range order {
		order[j] = j
	}
	sort.SliceStable(order, func(a, b int) bool { return math.Abs(p.Totals[order[a]]) < math.Abs(p.Totals[order[b]]) })
	for _, j := range order {
		r := make([]float64, ns)
		for i := range p.Species {
			if !off[i] {
				r[i] = p.Species[i].Amounts[j]
			}
		}
		name := p.Components[j]
		indep, implied, scale := set.add(r, p.Totals[j])
		if !indep {
			if math.Abs(implied-p.Totals[j]) > 1e-9*scale+1e-300 {
				return nil, fmt.Errorf("equilibrium: the totals are inconsistent: component %q has %g mol but with these species electroneutrality and the other totals tie it to %g mol: %w", name, p.Totals[j], implied, ErrInfeasible)
			}
			continue
		}
		rows = append(rows, balanceRow{name: name, coef: r, rhs: p.Totals[j], lock: -1})
	}
	if dot(charge, charge) == 0 {
		rows = rows[1:] // no charged species
	}
	return rows, nil
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
