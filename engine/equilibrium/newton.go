package equilibrium

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
)

// Newton solve limits and tolerances.
const (
	maxNewton   = 200   // iterations per Newton solve
	tolBalance  = 1e-12 // balance residual relative to the row's scale
	tolLog      = 1e-10 // saturation and gas residuals (natural-log units)
	armijo      = 1e-4
	maxBacktrak = 50
	stepGrow    = 2.0 // a species may rise this much (ln units) above the totals' scale per step
)

var errStall = errors.New("line search found no decrease")

// newtonWork holds the buffers of one Newton solve.
type newtonWork struct {
	pures    []int
	f, sc    []float64
	jac      []float64
	rhs, dx  []float64
	rs, cs   []float64
	trial    *point
	lu       mat.LU
	iter     int
	lastStep float64
}

// jacobian fills w.jac (d×d, row-major) at pt.
func (s *system) jacobian(pt *point, w *newtonWork, d int) {
	q := len(s.rows)
	jac := w.jac[:d*d]
	for i := range jac {
		jac[i] = 0
	}
	col := func(i int) int { // unknown column of pure species i
		for k, p := range w.pures {
			if p == i {
				return q + k
			}
		}
		return -1
	}
	nw := pt.amt[s.solvent]
	wcol := q // the solvent is the first pure unknown
	for _, i := range s.aq {
		n := pt.amt[i]
		idx, val := s.colIdx[i], s.colVal[i]
		for a, r := range idx {
			for b, c := range idx {
				jac[r*d+c] += val[a] * val[b] * n
			}
			jac[r*d+wcol] += val[a] * n / nw
		}
	}
	gcol := q + len(w.pures)
	if pt.gasOn {
		for _, g := range s.gas {
			x := math.Exp(math.Min(pt.logAmt[g], expCap))
			n := pt.ng * x
			idx, val := s.colIdx[g], s.colVal[g]
			for a, r := range idx {
				for b, c := range idx {
					jac[r*d+c] += val[a] * val[b] * n
				}
				jac[r*d+gcol] += val[a] * x
				jac[gcol*d+r] += val[a] * x
			}
		}
	}
	for _, i := range w.pures {
		c := col(i)
		for a, r := range s.colIdx[i] {
			jac[r*d+c] += s.colVal[i][a]
			jac[c*d+r] += s.colVal[i][a]
		}
	}
}

// solveLinear solves jac·dx = −f with row and column equilibration; it
// falls back to a least-squares SVD solve when the matrix is singular.
func solveLinear(w *newtonWork, d int) error {
	jac := w.jac[:d*d]
	rs, cs := w.rs[:d], w.cs[:d]
	for r := 0; r < d; r++ {
		m := 0.0
		for c := 0; c < d; c++ {
			m = math.Max(m, math.Abs(jac[r*d+c]))
		}
		rs[r] = 1 / math.Max(m, 1e-300)
		cs[r] = 0
	}
	for r := 0; r < d; r++ {
		for c := 0; c < d; c++ {
			cs[c] = math.Max(cs[c], math.Abs(jac[r*d+c]*rs[r]))
		}
	}
	for c := range cs {
		cs[c] = 1 / math.Max(cs[c], 1e-300)
	}
	for r := 0; r < d; r++ {
		for c := 0; c < d; c++ {
			jac[r*d+c] *= rs[r] * cs[c]
		}
		w.rhs[r] = -w.f[r] * rs[r]
	}
	a := mat.NewDense(d, d, jac)
	b := mat.NewVecDense(d, w.rhs[:d])
	x := mat.NewVecDense(d, w.dx[:d])
	w.lu.Factorize(a)
	err := w.lu.SolveVecTo(x, false, b)
	if err != nil || w.lu.Cond() > 1e13 {
		if err := solveSVD(a, b, x); err != nil {
			return err
		}
	}
	for c := 0; c < d; c++ {
		w.dx[c] *= cs[c]
		if !finite(w.dx[c]) {
			return fmt.Errorf("Newton step is not finite")
		}
	}
	return nil
}

func solveSVD(a *mat.Dense, b, x *mat.VecDense) error {
	var svd mat.SVD
	if !svd.Factorize(a, mat.SVDThin) {
		return fmt.Errorf("singular value decomposition failed")
	}
	vals := svd.Values(nil)
	rank := 0
	for _, v := range vals {
		if v > 1e-12*vals[0] {
			rank++
		}
	}
	if rank == 0 {
		return fmt.Errorf("Newton matrix is zero")
	}
	var dst mat.Dense
	svd.SolveTo(&dst, b, rank)
	x.CopyVec(dst.ColView(0))
	return nil
}

// converged reports whether the residual meets the tolerances.
func converged(f, sc []float64, q int) bool {
	for k, v := range f {
		if k < q {
			if math.Abs(v) > tolBalance*(sc[k]+1e-300) {
				return false
			}
		} else if math.Abs(v) > tolLog {
			return false
		}
	}
	return true
}

// newton solves the equations for a fixed phase assemblage and fixed
// activity coefficients, starting from pt (updated in place).
func (s *system) newton(pt *point, w *newtonWork, tr *trace) error {
	q := len(s.rows)
	if !s.evaluate(pt) {
		return fmt.Errorf("the solvent amount is not positive (%g mol)", pt.amt[s.solvent])
	}
	for it := 0; ; it++ {
		w.pures = s.unknowns(pt, w.pures)
		d := q + len(w.pures)
		if pt.gasOn {
			d++
		}
		w.grow(d, s.ns, q)
		phi := s.residual(pt, w.pures, w.f[:d], w.sc[:d])
		if converged(w.f[:d], w.sc[:d], q) {
			return nil
		}
		if it == maxNewton {
			return fmt.Errorf("%d Newton iterations (merit %.3g)", maxNewton, phi)
		}
		s.jacobian(pt, w, d)
		if err := solveLinear(w, d); err != nil {
			return err
		}
		alpha, after, err := s.lineSearch(pt, w, d, phi)
		if err != nil {
			return err
		}
		w.iter++
		w.lastStep = alpha
		tr.record(s, pt, alpha, phi, after)
	}
}

func (w *newtonWork) grow(d, ns, q int) {
	if cap(w.f) < d {
		w.f, w.sc = make([]float64, d), make([]float64, d)
		w.rhs, w.dx = make([]float64, d), make([]float64, d)
		w.rs, w.cs = make([]float64, d), make([]float64, d)
	}
	if cap(w.jac) < d*d {
		w.jac = make([]float64, d*d)
	}
	if w.trial == nil || len(w.trial.amt) != ns {
		w.trial = newPoint(ns, q)
	}
}

// maxStep limits the step so that no aqueous amount rises far above the
// scale of the totals and the solvent stays positive.
func (s *system) maxStep(pt *point, w *newtonWork) float64 {
	q := len(s.rows)
	alpha := 1.0
	nw := pt.amt[s.solvent]
	dnw := w.dx[q]
	if dnw < 0 {
		alpha = math.Min(alpha, 0.9*nw/(-dnw))
	}
	for _, i := range s.aq {
		rate := s.potential(i, w.dx[:q]) + dnw/nw
		if rate <= 0 {
			continue
		}
		room := math.Max(s.logBig-pt.logAmt[i], 0) + stepGrow
		alpha = math.Min(alpha, room/rate)
	}
	for _, g := range s.gas {
		rate := s.potential(g, w.dx[:q])
		if rate <= 0 {
			continue
		}
		room := math.Max(-pt.logAmt[g], 0) + stepGrow
		alpha = math.Min(alpha, room/rate)
	}
	return alpha
}

// lineSearch backtracks from the limited Newton step until the merit drops
// (Armijo); it moves pt to the accepted point and returns the step length.
func (s *system) lineSearch(pt *point, w *newtonWork, d int, phi float64) (alpha, after float64, err error) {
	q := len(s.rows)
	alpha = s.maxStep(pt, w)
	tp := w.trial
	f, sc := w.rhs[:d], w.rs[:d] // scratch: the Newton step is in dx
	for try := 0; try < maxBacktrak; try++ {
		tp.copyFrom(pt)
		for k := 0; k < q; k++ {
			tp.theta[k] += alpha * w.dx[k]
		}
		for k, i := range w.pures {
			tp.amt[i] += alpha * w.dx[q+k]
		}
		if pt.gasOn {
			tp.ng += alpha * w.dx[d-1]
		}
		if s.evaluate(tp) {
			// Scales are kept from the current point so that the merit is
			// one function along the search.
			s.residual(tp, w.pures, f, sc)
			m := merit(f, w.sc[:d])
			if m <= (1-2*armijo*alpha)*phi || m == 0 {
				pt.copyFrom(tp)
				return alpha, m, nil
			}
		}
		alpha /= 2
	}
	return 0, phi, fmt.Errorf("%w (merit %.3g)", errStall, phi)
}
