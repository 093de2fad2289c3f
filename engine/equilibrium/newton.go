package equilibrium

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack/lapack64"
	"gonum.org/v1/gonum/mat"
)

// Newton solve limits and tolerances.
const (
	maxNewton = 200 // iterations per Newton solve
	// maxSolveSteps bounds the accepted Newton steps of one Solve over all
	// its rounds (activity, phases, constraints), each bounded by itself
	// but not their product: a solve that has not settled by then is
	// reported as not converging rather than left to run for minutes.
	// Solves of plant mixes take a few hundred.
	maxSolveSteps = 4000
	maxFlat       = 10    // accepted steps in a row that do not lower the merit
	flatGain      = 1e-8  // by more than this fraction
	tolBalance    = 1e-12 // balance residual relative to the row's scale
	tolStalled    = 1e-10 // accepted when the line search can do no better
	tolLog        = 1e-10 // saturation and gas residuals (natural-log units)
	armijo        = 1e-4
	maxBacktrak   = 50
	maxExtend     = 256  // longest extrapolated step, in Newton steps
	stepGrow      = 2.0  // a species may rise this much (ln units) above the totals' scale per step
	stepFall      = 30.0 // the main carrier of a balance may fall this much (ln units) per step
)

// linearMode selects how solveLinear solves the Newton equations.
type linearMode int

const (
	// luOrSVD: LU, or the least-squares SVD step when the pivot ratio is
	// below 1e-15.
	luOrSVD linearMode = iota
	// leastSquares: the SVD step, singular values below 1e-12 of the
	// largest cut off.
	leastSquares
	// luAnyPivot: LU with refinement whatever the pivot ratio (SVD only
	// when the factorisation breaks down or is not finite).
	luAnyPivot
)

var errStall = errors.New("line search found no decrease")

// newtonWork holds the buffers of one Newton solve.
type newtonWork struct {
	pures    []int
	f, sc    []float64
	fix      []float64 // merit scales, fixed for one Newton solve
	noisy    []bool    // rows whose right-hand side carries rounding
	carrier  []int     // main aqueous carrier of each row (maxStep)
	most     []float64
	jac, fac []float64
	ipiv     []int
	ref      []float64
	rhs, dx  []float64
	rs, cs   []float64
	trial    *point
	iter     int
	svdUsed  int
	lastStep float64
	// quitFlat lets a stalled solve give up (see maxFlat): set while a
	// start is tried that has a fallback.
	quitFlat bool
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
		lse := s.gasLogSum(pt)
		for _, g := range s.gas {
			x := math.Exp(math.Min(pt.logAmt[g], expCap))
			share := math.Exp(pt.logAmt[g] - lse) // x / Σx: the gas row is ln Σx = 0
			n := pt.ng * x
			idx, val := s.colIdx[g], s.colVal[g]
			for a, r := range idx {
				for b, c := range idx {
					jac[r*d+c] += val[a] * val[b] * n
				}
				jac[r*d+gcol] += val[a] * x
				jac[gcol*d+r] += val[a] * share
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
func solveLinear(w *newtonWork, d int, mode linearMode) error {
	useSVD, pivot := mode == leastSquares, 1e-15
	if mode == luAnyPivot {
		pivot = 0
	}
	jac := w.jac[:d*d]
	for _, v := range jac {
		if !finite(v) {
			// (gonum's SVD does not return on NaN input.)
			return fmt.Errorf("Newton matrix is not finite")
		}
	}
	for _, v := range w.f[:d] {
		if !finite(v) {
			return fmt.Errorf("residual is not finite")
		}
	}
	rs, cs := w.rs[:d], w.cs[:d]
	for r := 0; r < d; r++ {
		m := 0.0
		for c := 0; c < d; c++ {
			m = math.Max(m, math.Abs(jac[r*d+c]))
		}
		rs[r] = scaleOf(m)
		cs[r] = 0
	}
	for r := 0; r < d; r++ {
		for c := 0; c < d; c++ {
			cs[c] = math.Max(cs[c], math.Abs(jac[r*d+c]*rs[r]))
		}
	}
	for c := range cs {
		cs[c] = scaleOf(cs[c])
	}
	for r := 0; r < d; r++ {
		for c := 0; c < d; c++ {
			jac[r*d+c] *= rs[r] * cs[c]
		}
		w.rhs[r] = -w.f[r] * rs[r]
	}
	x := w.dx[:d]
	if !useSVD {
		useSVD = !luSolve(w, d, pivot)
	}
	if useSVD {
		w.svdUsed++
		// Rows whose totals carry rounding (those recombined with the
		// solvent row) are weighted down, so that the least-squares step
		// leaves an inconsistency that cannot be removed in them rather
		// than in the balance of a trace component.
		for r := 0; r < d && r < len(w.noisy); r++ {
			if w.noisy[r] {
				for c := 0; c < d; c++ {
					jac[r*d+c] *= 1e-6
				}
				w.rhs[r] *= 1e-6
			}
		}
		a := mat.NewDense(d, d, jac)
		if err := solveSVD(a, mat.NewVecDense(d, w.rhs[:d]), mat.NewVecDense(d, x)); err != nil {
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

// scaleOf is the equilibration factor for a row or column whose largest
// entry is m: 1/m, and 1 for an empty one (so that 0·∞ cannot arise).
func scaleOf(m float64) float64 {
	if !(m > 1e-280) {
		return 1
	}
	return 1 / m
}

// luSolve solves the equilibrated system in w by LU with partial pivoting
// and one step of iterative refinement. It reports false when the matrix is
// numerically singular (pivot ratio below pivot), leaving the choice of a
// least-squares step to the caller.
func luSolve(w *newtonWork, d int, pivot float64) bool {
	fac := w.fac[:d*d]
	copy(fac, w.jac[:d*d])
	g := blas64.General{Rows: d, Cols: d, Stride: d, Data: fac}
	ipiv := w.ipiv[:d]
	if !lapack64.Getrf(g, ipiv) {
		return false
	}
	lo, hi := math.Inf(1), 0.0
	for i := 0; i < d; i++ {
		v := math.Abs(fac[i*d+i])
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	if !(lo > pivot*hi) {
		return false
	}
	x := w.dx[:d]
	copy(x, w.rhs[:d])
	lapack64.Getrs(blas.NoTrans, g, blas64.General{Rows: d, Cols: 1, Stride: 1, Data: x}, ipiv)
	// r = b − A·x, then x += A⁻¹ r
	r := w.ref[:d]
	copy(r, w.rhs[:d])
	blas64.Gemv(blas.NoTrans, -1, g0(w, d), blas64.Vector{N: d, Inc: 1, Data: x}, 1, blas64.Vector{N: d, Inc: 1, Data: r})
	lapack64.Getrs(blas.NoTrans, g, blas64.General{Rows: d, Cols: 1, Stride: 1, Data: r}, ipiv)
	for i := range x {
		x[i] += r[i]
	}
	for _, v := range x {
		if !finite(v) {
			return false
		}
	}
	return true
}

func g0(w *newtonWork, d int) blas64.General {
	return blas64.General{Rows: d, Cols: d, Stride: d, Data: w.jac[:d*d]}
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
			if math.Abs(v) > tolBalance*sc[k]+1e-300 {
				return false
			}
		} else if math.Abs(v) > tolLog {
			return false
		}
	}
	return true
}

// updateGamma sets ln γ per z² from the ionic strength of pt and reports
// whether it moved by more than the tolerance.
func (s *system) updateGamma(pt *point) bool {
	g := daviesLn(s.daviesA, s.ionic(pt))
	if math.Abs(g-pt.gamma) <= tolGamma {
		return false
	}
	pt.gamma = g
	return true
}

// closeEnough is the looser test applied when rounding stops progress: a
// balance may also miss by the rounding carried in the totals (noise), which
// a direction of the equations with vanishing curvature — species forced to
// zero, such as an oxidation state with nothing to reduce it — cannot absorb.
func (s *system) closeEnough(f, sc []float64) bool {
	q := len(s.rows)
	for k, v := range f {
		if k < q && math.Abs(v) > tolStalled*sc[k]+s.noise+1e-300 || k >= q && math.Abs(v) > 1e3*tolLog {
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
	w.pures = s.unknowns(pt, w.pures)
	d := q + len(w.pures)
	if pt.gasOn {
		d++
	}
	w.grow(d, s.ns, q)
	w.fix = s.meritScales(pt, d, w.fix)
	w.noisy = w.noisy[:0]
	for _, r := range s.rows {
		w.noisy = append(w.noisy, r.noise > 0)
	}
	nearby := false
	flat := 0 // accepted steps in a row that left the merit where it was
	for it := 0; ; it++ {
		// Once the balances are nearly met, the activity coefficients
		// follow the ionic strength at every iteration (a fixed point
		// inside Newton); the outer loop in solveGamma only confirms it.
		if nearby && s.updateGamma(pt) {
			s.evaluate(pt)
		}
		s.residual(pt, w.pures, w.f[:d], w.sc[:d])
		phi := merit(w.f[:d], w.fix)
		if converged(w.f[:d], w.sc[:d], q) {
			// A fresh activity coefficient is worth another pass, but
			// not endlessly: a coefficient that keeps moving by a hair
			// at every pass (the ionic strength of a strong caustic
			// with a trace of aluminate) made this loop run for ever.
			// The outer loop of solveGamma settles what is left.
			if it < maxNewton && s.updateGamma(pt) {
				nearby = true
				continue
			}
			return nil
		}
		nearby = phi < 1e-6
		if it == maxNewton {
			tr.dump(s, pt, w.f[:d], w.sc[:d])
			return fmt.Errorf("%d Newton iterations (merit %.3g)", maxNewton, phi)
		}
		if w.iter >= maxSolveSteps {
			return fmt.Errorf("%d Newton steps in one solve without settling: %w", maxSolveSteps, ErrNoConvergence)
		}
		s.jacobian(pt, w, d)
		if err := solveLinear(w, d, luOrSVD); err != nil {
			return err
		}
		alpha, after, err := s.lineSearch(pt, w, d, phi)
		if err != nil || alpha < 1e-10 && !s.closeEnough(w.f[:d], w.sc[:d]) {
			// The matrix may be too ill-conditioned for the plain solve:
			// retry with the least-squares step. When that stalls too,
			// the direction it cuts off may be the one the residual
			// needs (a balance whose only moving carrier is a trace
			// species, a curvature 1e-12 of the largest, such as a
			// dissolved metal beside its solid with nothing to oxidise
			// it): retry with the plain LU step whatever its pivots.
			for _, mode := range []linearMode{leastSquares, luAnyPivot} {
				s.residual(pt, w.pures, w.f[:d], w.sc[:d])
				s.jacobian(pt, w, d)
				if lerr := solveLinear(w, d, mode); lerr != nil {
					if err == nil {
						break // keep the step already taken
					}
					return lerr
				}
				a2, after2, err2 := s.lineSearch(pt, w, d, phi)
				if err2 == nil || err != nil {
					alpha, after, err = a2, after2, err2
				}
				if err == nil && after < phi || s.closeEnough(w.f[:d], w.sc[:d]) {
					break
				}
			}
		}
		if err != nil && s.closeEnough(w.f[:d], w.sc[:d]) {
			return nil
		}
		if err != nil {
			s.residual(pt, w.pures, w.f[:d], w.sc[:d])
			tr.dump(s, pt, w.f[:d], w.sc[:d])
			return err
		}
		if (alpha < 1e-10 || after > 0.99*phi) && s.closeEnough(w.f[:d], w.sc[:d]) {
			return nil
		}
		if after < (1-flatGain)*phi {
			flat = 0
		} else if flat++; flat == maxFlat && w.quitFlat {
			tr.dump(s, pt, w.f[:d], w.sc[:d])
			return fmt.Errorf("%w: %d steps in a row left the merit at %.3g", errStall, maxFlat, phi)
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
		w.jac, w.fac = make([]float64, d*d), make([]float64, d*d)
	}
	if cap(w.ipiv) < d {
		w.ipiv, w.ref = make([]int, d), make([]float64, d)
	}
	if w.trial == nil || len(w.trial.amt) != ns {
		w.trial = newPoint(ns, q)
	}
}

// maxStep limits the step so that no aqueous amount rises far above the
// scale of the totals and the solvent stays positive.
func (s *system) maxStep(pt *point, w *newtonWork) float64 {
	q := len(s.rows)
	alpha := float64(maxExtend)
	nw := pt.amt[s.solvent]
	dnw := w.dx[q]
	if dnw < 0 {
		alpha = math.Min(alpha, 0.9*nw/(-dnw))
	}
	// The main aqueous carrier of each balance may fall by at most
	// stepFall ln units per step: if every carrier of a component
	// underflowed to zero its column would vanish and Newton could not
	// bring it back.
	carrier, most := w.carrier[:0], w.most[:0]
	for range s.rows {
		carrier, most = append(carrier, -1), append(most, 0)
	}
	for _, i := range s.aq {
		rate := s.potential(i, w.dx[:q]) + dnw/nw
		for a, r := range s.colIdx[i] {
			if v := s.colVal[i][a] * pt.amt[i]; v > most[r] {
				carrier[r], most[r] = i, v
			}
		}
		if rate <= 0 {
			continue
		}
		room := math.Max(math.Log(s.ub[i])-pt.logAmt[i], 0) + stepGrow
		alpha = math.Min(alpha, room/rate)
	}
	for r, i := range carrier {
		if i < 0 || s.rows[r].rhs <= 0 {
			continue
		}
		if rate := s.potential(i, w.dx[:q]) + dnw/nw; rate < -stepFall {
			alpha = math.Min(alpha, stepFall/-rate)
		}
	}
	w.carrier, w.most = carrier, most
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

// trialMerit evaluates the point alpha along the Newton step into
// w.trial; it returns +Inf when the point is not admissible.
func (s *system) trialMerit(pt *point, w *newtonWork, d int, alpha float64) float64 {
	q := len(s.rows)
	tp := w.trial
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
	if !s.evaluate(tp) {
		return math.Inf(1)
	}
	// The merit scales are fixed for the whole Newton solve so that the
	// merit is one function along it.
	s.residual(tp, w.pures, w.rhs[:d], w.rs[:d])
	return merit(w.rhs[:d], w.fix)
}

// lineSearch backtracks from the limited Newton step until the merit drops
// (Armijo); it moves pt to the accepted point and returns the step length.
// When the full step only shrinks the merit linearly (a species being driven
// towards zero, where Newton on an exponential gains one ln unit per step),
// it tries longer steps while they keep paying.
func (s *system) lineSearch(pt *point, w *newtonWork, d int, phi float64) (alpha, after float64, err error) {
	alpha = math.Min(1, s.maxStep(pt, w))
	full := alpha == 1
	for try := 0; try < maxBacktrak; try++ {
		m := s.trialMerit(pt, w, d, alpha)
		if m <= (1-2*armijo*alpha)*phi || m == 0 {
			pt.copyFrom(w.trial)
			if full && try == 0 && m > 1e-3*phi {
				alpha, m = s.extrapolate(pt, w, d, m)
			}
			return alpha, m, nil
		}
		alpha /= 2
	}
	return 0, phi, fmt.Errorf("%w (merit %.3g)", errStall, phi)
}

// extrapolate tries steps of 2, 4, … times the Newton step from the point
// before pt (pt is the full step) and keeps the best while the merit at
// least halves with each doubling. The step limit still applies.
func (s *system) extrapolate(pt *point, w *newtonWork, d int, m float64) (float64, float64) {
	q := len(s.rows)
	base := newPointLike(pt)
	base.copyFrom(pt)
	// step back to the start so that trial points are start + alpha·dx
	for k := 0; k < q; k++ {
		base.theta[k] -= w.dx[k]
	}
	for k, i := range w.pures {
		base.amt[i] -= w.dx[q+k]
	}
	if pt.gasOn {
		base.ng -= w.dx[d-1]
	}
	s.evaluate(base)
	limit := s.maxStep(base, w)
	best := 1.0
	for a := 2.0; a <= maxExtend && a <= limit; a *= 2 {
		mt := s.trialMerit(base, w, d, a)
		if !(mt < m/2) {
			break
		}
		pt.copyFrom(w.trial)
		best, m = a, mt
	}
	return best, m
}
