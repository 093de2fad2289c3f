package equilibrium

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
)

// traceMolality is where the start places species the starting
// composition does not contain (mol/kg, or bar for gases).
const traceMolality = 1e-10

// lpStart returns the composition of least Σ nᵢ μ°ᵢ/RT under the equality
// rows, ignoring mixing: the dominant species of the equilibrium. It returns
// an ErrInfeasible error when no composition with amounts ≥ 0 meets them.
func (s *system) lpStart() ([]float64, error) {
	n, _, err := s.lpStartTight()
	return n, err
}

// lpStartTight is lpStart that also returns the inequality constraints
// (outside the rows) that the composition meets with equality.
func (s *system) lpStartTight() ([]float64, []int, error) {
	var cols []int
	for i := 0; i < s.ns; i++ {
		if !s.off[i] && len(s.colIdx[i]) > 0 {
			cols = append(cols, i)
		}
	}
	// Inequality constraints not in the rows join with a slack column each,
	// so that the start respects every lock.
	var extra []int
	active := map[int]bool{}
	for _, r := range s.rows {
		if r.lock >= 0 {
			active[r.lock] = true
		}
	}
	for k, c := range s.p.Constraints {
		if !active[k] && c.Rel != Exactly && !s.lpNoLocks {
			extra = append(extra, k)
		}
	}
	q := len(s.rows) + len(extra)
	nc := len(cols) + len(extra)
	if nc < q {
		return nil, nil, fmt.Errorf("equilibrium: %d independent balances for %d species: %w", q, len(cols), ErrInfeasible)
	}
	a := mat.NewDense(q, nc, nil)
	c := make([]float64, nc)
	b := make([]float64, q)
	for k, r := range s.rows {
		b[k] = r.rhs
		if math.Abs(r.rhs) <= 10*r.noise {
			b[k] = 0 // rounding only: the start need not honour it
		}
		for j, i := range cols {
			a.Set(k, j, r.coef[i])
		}
	}
	for e, k := range extra {
		row := len(s.rows) + e
		con := s.p.Constraints[k]
		b[row] = con.Bound
		for j, i := range cols {
			if !s.off[i] {
				a.Set(row, j, con.Coef[i])
			}
		}
		slack := 1.0 // AtMost: Σ + s = bound
		if con.Rel == AtLeast {
			slack = -1
		}
		a.Set(row, len(cols)+e, slack)
	}
	for j, i := range cols {
		c[j] = s.p.Species[i].Mu0
	}
	x, err := solveLP(c, a, b, s, cols)
	if err != nil {
		if errors.Is(err, errLPInfeasible) {
			return nil, nil, fmt.Errorf("equilibrium: no composition with amounts ≥ 0 meets the balances [%s]: %w", names(s.rows), ErrInfeasible)
		}
		return nil, nil, err
	}
	n := make([]float64, s.ns)
	for j, i := range cols {
		n[i] = math.Max(x[j], 0)
	}
	if n[s.solvent] <= 1e-9*math.Exp(s.logBig) {
		return nil, nil, &solventUsedUp{name: s.p.Species[s.solvent].Name, left: n[s.solvent]}
	}
	var tight []int
	for e, k := range extra {
		if x[len(cols)+e] <= 1e-9*math.Abs(s.p.Constraints[k].Bound)+1e-300 {
			tight = append(tight, k)
		}
	}
	return n, tight, nil
}

// startFrom builds an iterate from a composition: the potentials that best
// reproduce the chemical potentials of the species present (weighted least
// squares with a small ridge for directions the composition leaves free),
// the pure phases present in it, and the gas phase when a gas is present.
func (s *system) startFrom(n []float64, warm bool) *point {
	q := len(s.rows)
	pt := newPoint(s.ns, q)
	scale := math.Exp(s.logBig)
	nw := math.Max(n[s.solvent], 1e-6*scale)
	pt.amt[s.solvent] = nw
	for _, i := range s.aq {
		pt.amt[i] = n[i]
	}
	pt.gamma = daviesLn(s.daviesA, s.ionic(pt))
	ng := 0.0
	for _, g := range s.gas {
		ng += n[g]
	}
	f := &fit{s: s, ata: mat.NewSymDense(q, nil), atb: make([]float64, q), lnW: math.Log(nw * MolarMassWater), gamma: pt.gamma}
	f.add(s.solvent, s.p.Species[s.solvent].Mu0, 100)
	for _, i := range s.pure {
		if n[i] > 0 {
			pt.present[i], pt.amt[i] = true, n[i]
			f.add(i, s.p.Species[i].Mu0, 100)
		}
	}
	// Species in the composition are fitted; the others get a weak pull
	// towards a trace molality, which settles the directions the
	// composition leaves free without pushing any species far from the
	// scale of the totals. (From the linear program, tiny positive amounts
	// are degenerate vertices, not information; from a warm start every
	// amount counts.)
	f.tiny, f.ridge = 1e-12*scale, 1e-8
	if warm {
		f.tiny, f.ridge = 0, 1e-14
	}
	for _, i := range s.aq {
		if n[i] > f.tiny {
			f.add(i, s.p.Species[i].Mu0+s.z2[i]*pt.gamma+math.Log(n[i]/(nw*MolarMassWater)), 1)
		} else {
			f.add(i, s.p.Species[i].Mu0+s.z2[i]*pt.gamma+math.Log(traceMolality), 1e-4)
		}
	}
	if ng > 1e-9*scale {
		pt.gasOn, pt.ng = true, ng
		for _, g := range s.gas {
			if n[g] > 0 {
				f.add(g, s.p.Species[g].Mu0+s.lnP+math.Log(n[g]/ng), 1)
			}
		}
	} else {
		for _, g := range s.gas {
			f.add(g, s.p.Species[g].Mu0+math.Log(traceMolality), 1e-4)
		}
	}
	f.solve(pt, n)
	return pt
}

// fit holds the weighted least-squares fit of the potentials to a
// composition (normal equations).
type fit struct {
	s           *system
	ata         *mat.SymDense
	atb         []float64
	lnW, gamma  float64
	tiny, ridge float64
}

// add asks that species i have aᵢ·θ = target, with a weight.
func (f *fit) add(i int, target, weight float64) {
	idx, val := f.s.colIdx[i], f.s.colVal[i]
	for a, r := range idx {
		f.atb[r] += weight * val[a] * target
		for b, c := range idx {
			if c >= r {
				f.ata.SetSym(r, c, f.ata.At(r, c)+weight*val[a]*val[b])
			}
		}
	}
}

// solve fits pt.theta, then repairs: a species the fit puts far above what
// the totals allow gets an equation holding it at a thousandth of its
// bound, and the fit is repeated (three rounds at most).
func (f *fit) solve(pt *point, n []float64) {
	s := f.s
	for round := 0; ; round++ {
		solveNormal(f.ata, f.atb, pt.theta, f.ridge)
		if round == 3 {
			return
		}
		repaired := false
		for _, i := range append(s.aq, s.gas...) {
			if n[i] > f.tiny || (pt.gasOn && s.p.Species[i].Phase == Gas) {
				continue
			}
			lnBound := math.Log(s.ub[i] * 1e-3)
			ln := s.potential(i, pt.theta) - s.p.Species[i].Mu0
			if s.p.Species[i].Phase == Aqueous {
				ln += f.lnW - s.z2[i]*f.gamma
			} else {
				ln += math.Log(s.ub[i]) - s.lnP
			}
			if ln > lnBound+1 {
				f.add(i, s.potential(i, pt.theta)-(ln-lnBound), 1)
				repaired = true
			}
		}
		if !repaired {
			return
		}
	}
}

// solveNormal solves the normal equations with a small ridge; theta is left
// at zero when they cannot be solved.
func solveNormal(ata *mat.SymDense, atb, theta []float64, rel float64) {
	q := len(theta)
	a := mat.NewSymDense(q, nil)
	a.CopySym(ata)
	ridge := 0.0
	for k := 0; k < q; k++ {
		ridge = math.Max(ridge, a.At(k, k))
	}
	for k := 0; k < q; k++ {
		a.SetSym(k, k, a.At(k, k)+rel*ridge+1e-300)
	}
	var ch mat.Cholesky
	x := mat.NewVecDense(q, theta)
	if !ch.Factorize(a) {
		x.Zero()
		return
	}
	if err := ch.SolveVecTo(x, mat.NewVecDense(q, atb)); err != nil {
		for _, v := range theta {
			if !finite(v) {
				x.Zero()
				return
			}
		}
	}
}

// solveLP scales the program (columns by the species' upper bounds, rows
// by their largest entry) and solves it with minimize.
func solveLP(c []float64, a *mat.Dense, b []float64, s *system, cols []int) ([]float64, error) {
	m, n := a.Dims()
	cs := make([]float64, n)
	for j := range cs {
		cs[j] = 1
		if j < len(cols) && s.ub[cols[j]] > 0 && !math.IsInf(s.ub[cols[j]], 0) {
			cs[j] = s.ub[cols[j]]
		}
	}
	rows := make([][]float64, m)
	bs := make([]float64, m)
	for i := range rows {
		rows[i] = make([]float64, n)
		mx := 0.0
		for j := 0; j < n; j++ {
			rows[i][j] = a.At(i, j) * cs[j]
			mx = math.Max(mx, math.Abs(rows[i][j]))
		}
		f := scaleOf(mx)
		for j := range rows[i] {
			rows[i][j] *= f
		}
		bs[i] = b[i] * f
	}
	cc := make([]float64, n)
	cmax := 0.0
	for j := range cc {
		cc[j] = c[j] * cs[j]
		cmax = math.Max(cmax, math.Abs(cc[j]))
	}
	for j := range cc {
		cc[j] *= scaleOf(cmax)
	}
	x, err := minimize(cc, rows, bs)
	if err != nil {
		return nil, err
	}
	for j := range x {
		x[j] *= cs[j]
	}
	return x, nil
}

// solventUsedUp reports totals whose reactions would consume all the water.
type solventUsedUp struct {
	name string
	left float64
}

func (e *solventUsedUp) Error() string {
	return fmt.Sprintf("equilibrium: the reactions would use up the solvent %q (with no mixing terms the least-Gibbs-energy composition keeps %.3g mol of it); "+
		"there is no aqueous phase left to solve for: give more water or lock the reaction that consumes it: %v", e.name, e.left, ErrInfeasible)
}

func (e *solventUsedUp) Unwrap() error { return ErrInfeasible }
