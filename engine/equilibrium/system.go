package equilibrium

import "math"

// system is a Problem prepared for the Newton solve with a given set of
// equality rows (balances plus active constraints).
type system struct {
	p       *Problem
	ns      int
	solvent int
	off     []bool
	lnP     float64
	daviesA float64
	z2      []float64 // z² of aqueous species
	aq, gas []int     // aqueous and gas species that are not off
	pure    []int     // pure species that are not off (solvent excluded)
	logBig  float64   // ln of the largest amount scale of the problem
	// smallTotal is the smallest nonzero |total| (floor of the merit scales).
	smallTotal float64
	// ub is an upper bound on each species amount from the totals of the
	// components that every species carries with a coefficient ≥ 0.
	ub []float64

	rows  []balanceRow
	noise float64 // largest rounding carried by a row's right-hand side
	// lpNoLocks leaves the inequality constraints out of the linear program.
	lpNoLocks bool
	// Sparse columns over rows: colIdx[i], colVal[i] list the nonzero rows
	// of species i.
	colIdx [][]int
	colVal [][]float64
}

func newSystem(p *Problem, solvent int, off []bool) *system {
	s := &system{p: p, ns: len(p.Species), solvent: solvent, off: off,
		lnP: math.Log(p.PressureBar), daviesA: DaviesA(p.TemperatureK)}
	s.z2 = make([]float64, s.ns)
	big := 1e-300
	for _, t := range p.Totals {
		big = math.Max(big, math.Abs(t))
	}
	s.logBig = math.Log(big)
	s.smallTotal = big
	for _, t := range p.Totals {
		if t != 0 {
			s.smallTotal = math.Min(s.smallTotal, math.Abs(t))
		}
	}
	s.ub = upperBounds(p, off, big)
	for i, sp := range p.Species {
		if off[i] {
			continue
		}
		switch sp.Phase {
		case Aqueous:
			s.aq = append(s.aq, i)
			s.z2[i] = float64(sp.Charge * sp.Charge)
		case Gas:
			s.gas = append(s.gas, i)
		case Pure:
			s.pure = append(s.pure, i)
		}
	}
	return s
}

// setRows installs the equality rows and rebuilds the sparse columns.
func (s *system) setRows(rows []balanceRow) {
	s.rows = rows
	s.noise = 0
	for _, r := range rows {
		s.noise = math.Max(s.noise, r.noise)
	}
	s.colIdx = make([][]int, s.ns)
	s.colVal = make([][]float64, s.ns)
	for k := range rows {
		// The merit scale: |rhs| plus the amounts (added in residual),
		// and never finer than the rounding in rhs allows.
		sc := math.Abs(rows[k].rhs) + math.Max(rows[k].noise, roundoff*math.Abs(rows[k].rhs))/tolBalance
		for i, v := range rows[k].coef {
			if v != 0 {
				s.colIdx[i] = append(s.colIdx[i], k)
				s.colVal[i] = append(s.colVal[i], v)
			}
		}
		rows[k].scale = sc
	}
}

// potential returns aᵢ·θ for species i.
func (s *system) potential(i int, theta []float64) float64 {
	v := 0.0
	for k, r := range s.colIdx[i] {
		v += s.colVal[i][k] * theta[r]
	}
	return v
}

// point is an iterate of the solve.
type point struct {
	theta   []float64 // potentials of the rows
	amt     []float64 // species amounts (pure amounts are unknowns; the rest follow from theta)
	logAmt  []float64 // ln n for aqueous, ln x for gas species (from theta)
	present []bool    // pure phases (and the solvent) present
	gasOn   bool
	ng      float64 // gas phase amount
	gamma   float64 // ln γ per unit z²
}

func newPoint(ns, nrows int) *point {
	return &point{theta: make([]float64, nrows), amt: make([]float64, ns),
		logAmt: make([]float64, ns), present: make([]bool, ns)}
}

func newPointLike(o *point) *point {
	return newPoint(len(o.amt), len(o.theta))
}

func (pt *point) copyFrom(o *point) {
	pt.theta = append(pt.theta[:0], o.theta...)
	copy(pt.amt, o.amt)
	copy(pt.logAmt, o.logAmt)
	copy(pt.present, o.present)
	pt.gasOn, pt.ng, pt.gamma = o.gasOn, o.ng, o.gamma
}

// expCap keeps exp, and the squares of amounts in the Newton matrix, from
// overflowing: amounts beyond e^230 (1e100) mol are never meaningful and
// the line search rejects such points.
const expCap = 230

// evaluate sets the aqueous and gas amounts from theta. It reports false
// when the solvent amount is not positive.
func (s *system) evaluate(pt *point) bool {
	nw := pt.amt[s.solvent]
	if !(nw > 0) || math.IsInf(nw, 0) {
		return false
	}
	lnW := math.Log(nw * MolarMassWater)
	mu := s.p.Species
	for _, i := range s.aq {
		e := s.potential(i, pt.theta) - mu[i].Mu0 - s.z2[i]*pt.gamma + lnW
		pt.logAmt[i] = e
		pt.amt[i] = math.Exp(math.Min(e, expCap))
	}
	for _, g := range s.gas {
		e := s.potential(g, pt.theta) - mu[g].Mu0 - s.lnP
		pt.logAmt[g] = e
		pt.amt[g] = 0
		if pt.gasOn {
			pt.amt[g] = pt.ng * math.Exp(math.Min(e, expCap))
		}
	}
	return true
}

// unknowns lists the pure species whose amounts are unknowns (solvent first).
func (s *system) unknowns(pt *point, dst []int) []int {
	dst = append(dst[:0], s.solvent)
	for _, i := range s.pure {
		if pt.present[i] {
			dst = append(dst, i)
		}
	}
	return dst
}

// residual fills f with the balance, saturation and gas equations and sc
// with their scales (|rhs| plus the amounts in the row, floored by the
// rounding of rhs; 1 for the equations in log units).
func (s *system) residual(pt *point, pures []int, f, sc []float64) {
	q := len(s.rows)
	for k := range s.rows {
		f[k] = -s.rows[k].rhs
		sc[k] = s.rows[k].scale
	}
	for i := 0; i < s.ns; i++ {
		n := pt.amt[i]
		if n == 0 {
			continue
		}
		for k, r := range s.colIdx[i] {
			v := s.colVal[i][k] * n
			f[r] += v
			sc[r] += math.Abs(v)
		}
	}
	for k, i := range pures {
		f[q+k] = s.potential(i, pt.theta) - s.p.Species[i].Mu0
		sc[q+k] = 1
	}
	if pt.gasOn {
		f[q+len(pures)] = s.gasLogSum(pt)
		sc[q+len(pures)] = 1
	}
}

// gasLogSum returns ln Σ x_g, the log of the summed partial pressures over
// the ambient pressure.
func (s *system) gasLogSum(pt *point) float64 {
	m := math.Inf(-1)
	for _, g := range s.gas {
		m = math.Max(m, pt.logAmt[g])
	}
	if math.IsInf(m, -1) {
		return m
	}
	sum := 0.0
	for _, g := range s.gas {
		sum += math.Exp(pt.logAmt[g] - m)
	}
	return m + math.Log(sum)
}

func merit(f, sc []float64) float64 {
	m := 0.0
	for k, v := range f {
		r := v / (sc[k] + 1e-300)
		m += r * r
	}
	return m / 2
}

func upperBounds(p *Problem, off []bool, big float64) []float64 {
	ub := make([]float64, len(p.Species))
	for i := range ub {
		ub[i] = 10 * big
	}
	for j := range p.Components {
		nonneg := true
		for i, sp := range p.Species {
			nonneg = nonneg && (off[i] || sp.Amounts[j] >= 0)
		}
		if !nonneg {
			continue
		}
		for i, sp := range p.Species {
			if a := sp.Amounts[j]; a > 0 {
				ub[i] = math.Min(ub[i], math.Max(p.Totals[j], 0)/a)
			}
		}
	}
	return ub
}

// meritScales fills fix with the scales of the merit for one Newton solve:
// like residual's scales, with each amount capped by its upper bound so
// that a wild start cannot make the merit blind.
func (s *system) meritScales(pt *point, d int, fix []float64) []float64 {
	fix = fix[:0]
	for k := range s.rows {
		fix = append(fix, s.rows[k].scale)
	}
	for i := 0; i < s.ns; i++ {
		n := math.Min(math.Abs(pt.amt[i]), s.ub[i])
		if n == 0 {
			continue
		}
		for k, r := range s.colIdx[i] {
			fix[r] += math.Abs(s.colVal[i][k] * n)
		}
	}
	// A row whose carriers are all trace species (the charge row when the
	// ions are trace, a recombined row near zero) would otherwise weigh
	// its residual against a collapsing scale and veto every step that
	// moves a vanishing species by a factor e, as Newton does: its merit
	// scale is floored at the smallest nonzero component total.
	for k := range fix {
		fix[k] = math.Max(fix[k], s.smallTotal)
	}
	for len(fix) < d {
		fix = append(fix, 1)
	}
	return fix
}
