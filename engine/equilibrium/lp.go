package equilibrium

import (
	"errors"
	"math"
)

// A small dense simplex method with Bland's rule and an iteration cap, for
// the cold start: least Σ cⱼxⱼ under A·x = b, x ≥ 0.
//
// gonum's lp.Simplex was used first and is not used because, in v0.17.0, it
// looped without end on two fuzz inputs (a degenerate program whose totals
// ran from 1e-38 to 55) and panicked on a third; this solver must never
// hang. Bland's rule cannot cycle, and the cap bounds the work regardless of
// rounding.

var (
	errLPInfeasible = errors.New("no composition with amounts ≥ 0 meets the balances")
	errLPCap        = errors.New("linear program reached its iteration cap")
)

// lpTol is the pivot and reduced-cost tolerance on the scaled tableau.
const lpTol = 1e-11

type tableau struct {
	m, n  int         // constraints, variables (artificials follow the variables)
	t     [][]float64 // m rows of n+m+1 (last: right-hand side)
	basis []int
	cost  []float64 // phase cost per column (n+m)
}

// minimize solves the program; A has m rows of n columns. Rows and columns
// should be scaled to entries of order one by the caller.
func minimize(c []float64, a [][]float64, b []float64) ([]float64, error) {
	m, n := len(a), len(c)
	tb := &tableau{m: m, n: n, basis: make([]int, m), cost: make([]float64, n+m)}
	scale := 0.0
	for i := 0; i < m; i++ {
		row := make([]float64, n+m+1)
		sign := 1.0
		if b[i] < 0 {
			sign = -1
		}
		for j := 0; j < n; j++ {
			row[j] = sign * a[i][j]
		}
		row[n+i] = 1
		row[n+m] = sign * b[i]
		scale += math.Abs(b[i])
		tb.t = append(tb.t, row)
		tb.basis[i] = n + i
	}
	// Phase one: least sum of artificials.
	for j := n; j < n+m; j++ {
		tb.cost[j] = 1
	}
	if err := tb.run(n + m); err != nil {
		return nil, err
	}
	if tb.objective() > 1e-9*scale+1e-300 {
		return nil, errLPInfeasible
	}
	tb.evictArtificials()
	// Phase two: the real costs; artificials may not enter.
	for j := range tb.cost {
		tb.cost[j] = 0
	}
	copy(tb.cost, c)
	if err := tb.run(n); err != nil {
		return nil, err
	}
	x := make([]float64, n)
	for i, bj := range tb.basis {
		if bj < n {
			x[bj] = math.Max(tb.t[i][n+m], 0)
		}
	}
	return x, nil
}

func (tb *tableau) objective() float64 {
	v := 0.0
	for i, bj := range tb.basis {
		v += tb.cost[bj] * tb.t[i][tb.n+tb.m]
	}
	return v
}

// reduced returns the reduced cost of column j.
func (tb *tableau) reduced(j int) float64 {
	r := tb.cost[j]
	for i, bj := range tb.basis {
		r -= tb.cost[bj] * tb.t[i][j]
	}
	return r
}

// run pivots until no column below limit has a negative reduced cost.
func (tb *tableau) run(limit int) error {
	rhs := tb.n + tb.m
	maxIter := 20*(tb.n+tb.m) + 100
	blocked := make([]bool, limit)
	for it := 0; it < maxIter; it++ {
		enter := -1
		for j := 0; j < limit; j++ { // Bland: the lowest index that improves
			if !blocked[j] && tb.reduced(j) < -lpTol {
				enter = j
				break
			}
		}
		if enter < 0 {
			return nil
		}
		leave, best := -1, math.Inf(1)
		for i := 0; i < tb.m; i++ {
			if p := tb.t[i][enter]; p > lpTol {
				ratio := tb.t[i][rhs] / p
				switch {
				case leave < 0 || ratio < best-1e-15*math.Abs(best):
					leave, best = i, ratio
				case ratio <= best+1e-15*math.Abs(best) && tb.basis[i] < tb.basis[leave]:
					leave, best = i, math.Min(ratio, best) // Bland's tie rule
				}
			}
		}
		if leave < 0 {
			// No entry above the tolerance: on a bounded program this is
			// rounding in a column of tiny entries; leave it out.
			blocked[enter] = true
			continue
		}
		tb.pivot(leave, enter)
	}
	return errLPCap
}

func (tb *tableau) pivot(r, c int) {
	row := tb.t[r]
	p := row[c]
	for j := range row {
		row[j] /= p
	}
	for i := 0; i < tb.m; i++ {
		if i == r {
			continue
		}
		f := tb.t[i][c]
		if f == 0 {
			continue
		}
		ri := tb.t[i]
		for j := range ri {
			ri[j] -= f * row[j]
		}
		ri[c] = 0
	}
	tb.basis[r] = c
}

// evictArtificials pivots artificials left in the basis (at zero) out, on
// any real column with a usable entry; rows with none are redundant.
func (tb *tableau) evictArtificials() {
	for i, bj := range tb.basis {
		if bj < tb.n {
			continue
		}
		for j := 0; j < tb.n; j++ {
			if math.Abs(tb.t[i][j]) > 1e-9 {
				tb.pivot(i, j)
				break
			}
		}
	}
}
