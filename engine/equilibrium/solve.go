package equilibrium

import (
	"errors"
	"fmt"
	"math"
	"slices"
)

// solve is Solve with an optional debug trace.
func solve(p *Problem, tr *trace) (State, error) {
	solvent, err := validate(p)
	if err != nil {
		return State{}, err
	}
	off := make([]bool, len(p.Species))
	if err := eliminate(p, off); err != nil {
		return State{}, err
	}
	if off[solvent] {
		return State{}, fmt.Errorf("equilibrium: the solvent %q contains a component with zero total: %w", p.Species[solvent].Name, ErrInfeasible)
	}
	base, err := balanceRows(p, off, &rowSet{}, solvent)
	if err != nil {
		return State{}, err
	}
	s := newSystem(p, solvent, off)
	ls := &lockSolver{s: s, base: base, tr: tr}
	pt, err := ls.run()
	if err != nil {
		return State{}, err
	}
	return s.state(pt, ls.activeNames(), ls.w.iter), nil
}

// trace records the accepted Newton iterations for tests.
type trace struct {
	steps []traceStep
	notes []string
}

type traceStep struct {
	alpha, before, after float64 // step length, merit before and after
	g                    float64 // Σ nᵢ(μ°ᵢ + ln aᵢ) of the iterate (not balanced until the end)
}

func (t *trace) record(s *system, pt *point, alpha, before, after float64) {
	if t == nil {
		return
	}
	t.steps = append(t.steps, traceStep{alpha: alpha, before: before, after: after, g: s.gibbs(pt)})
}

func (t *trace) note(format string, args ...any) {
	if t != nil {
		t.notes = append(t.notes, fmt.Sprintf(format, args...))
	}
}

// lockSolver runs the active set over the constraints.
type lockSolver struct {
	s      *system
	base   []balanceRow
	active []int // constraint indices treated as equalities
	// dropped marks the constraints the active set has dropped once. A
	// constraint that comes back after being dropped is kept from then on
	// (anti-cycling): this happens when it holds at a bound the problem
	// pins exactly, e.g. two locks of opposite sense on the same amount
	// with the same bound, where the multiplier of the one kept in the rows
	// may have either sign.
	dropped map[int]bool
	w       newtonWork
	tr      *trace
	// before is the active set before activateAtStart added the
	// constraints of Problem.StartActive (nil when it added none).
	before []int
}

// activateAtStart takes the inequality constraints named in
// Problem.StartActive as active for the warm start's first round. A name
// the problem does not hold is ignored; when the rows cannot take the set,
// the warm start goes without it.
func (ls *lockSolver) activateAtStart() error {
	p := ls.s.p
	if len(p.StartActive) == 0 {
		return nil
	}
	var add []int
	for k, c := range p.Constraints {
		if c.Rel != Exactly && slices.Contains(p.StartActive, c.Name) && !slices.Contains(ls.active, k) {
			add = append(add, k)
		}
	}
	if len(add) == 0 {
		return nil
	}
	ls.before = append([]int{}, ls.active...)
	ls.active = append(ls.active, add...)
	rows, err := ls.rows()
	if err != nil {
		return ls.restoreActive()
	}
	ls.s.setRows(rows)
	ls.tr.note("constraints active at the warm start: %v", add)
	return nil
}

// restoreActive returns to the active set before activateAtStart, so that
// the cold start begins as it would without Problem.StartActive.
func (ls *lockSolver) restoreActive() error {
	if ls.before == nil {
		return nil
	}
	ls.active, ls.before = ls.before, nil
	rows, err := ls.rows()
	if err != nil {
		return err
	}
	ls.s.setRows(rows)
	return nil
}

func (ls *lockSolver) activeNames() []string {
	var out []string
	for _, r := range ls.s.rows {
		if r.lock >= 0 {
			out = append(out, r.name)
		}
	}
	return out
}

// rows builds the equality rows: the balances and the active constraints.
// A constraint that depends on the rows before it is dropped when its bound
// agrees with them and makes the problem infeasible when it does not.
func (ls *lockSolver) rows() ([]balanceRow, error) {
	if len(ls.active) == 0 {
		return append([]balanceRow(nil), ls.base...), nil
	}
	set := &rowSet{}
	rows := make([]balanceRow, 0, len(ls.base)+len(ls.active))
	for _, r := range ls.base {
		set.add(r.coef, r.rhs, r.noise)
		rows = append(rows, balanceRow{name: r.name, coef: r.coef, rhs: r.rhs, lock: -1, noise: r.noise})
	}
	kept := ls.active[:0]
	for _, k := range ls.active {
		r := constraintRow(ls.s.p, k, ls.s.off)
		indep, implied, tol := set.add(r.coef, r.rhs, roundoff*math.Abs(r.rhs))
		if indep {
			rows = append(rows, r)
			kept = append(kept, k)
			continue
		}
		if !holds(ls.s.p.Constraints[k].Rel, implied, r.rhs, tol) {
			return nil, fmt.Errorf("equilibrium: constraint %q cannot hold: the totals fix its left side at %g against the bound %g: %w", r.name, implied, r.rhs, ErrInfeasible)
		}
	}
	ls.active = kept
	return rows, nil
}

func holds(rel Relation, v, bound, tol float64) bool {
	switch rel {
	case AtMost:
		return v <= bound+tol
	case AtLeast:
		return v >= bound-tol
	}
	return math.Abs(v-bound) <= tol
}

// run solves with the active set: add the violated constraints, drop the
// one whose multiplier has the wrong sign, repeat.
func (ls *lockSolver) run() (*point, error) {
	p := ls.s.p
	for k, c := range p.Constraints {
		if c.Rel == Exactly {
			ls.active = append(ls.active, k)
		}
	}
	var pt *point
	var prev []balanceRow
	limit := 3*len(p.Constraints) + 4
	var history []string
	for round := 0; ; round++ {
		rows, err := ls.rows()
		if err != nil {
			return nil, err
		}
		ls.s.setRows(rows)
		if pt, err = ls.solveRound(pt, prev); err != nil {
			return nil, err
		}
		prev = ls.s.rows // solveRound may have activated constraints
		change := ls.update(pt)
		if change == "" {
			return pt, nil
		}
		history = append(history, change)
		if round == limit {
			return nil, fmt.Errorf("equilibrium: the set of active constraints does not settle after %d rounds (%v): %w", round+1, history, ErrNoConvergence)
		}
		ls.tr.note("constraints: %s", change)
	}
}

// solveRound solves with the current rows, from the previous round's point,
// the warm start or the cold start, falling back to the cold start once.
func (ls *lockSolver) solveRound(prevPt *point, prevRows []balanceRow) (*point, error) {
	s := ls.s
	var pt *point
	switch {
	case prevPt != nil:
		pt = remap(prevPt, prevRows, s.rows)
	case len(s.p.Start) > 0:
		if err := ls.activateAtStart(); err != nil {
			return nil, err
		}
		pt = s.startFrom(s.p.Start, true)
	}
	if pt != nil {
		// The cold start below is the fallback: a stalled solve from
		// here gives up early.
		ls.w.quitFlat = true
		err := s.solveGamma(pt, &ls.w, ls.tr)
		ls.w.quitFlat = false
		if err == nil {
			return pt, nil
		}
		ls.tr.note("warm start failed: %v", err)
		if err := ls.restoreActive(); err != nil {
			return nil, err
		}
	}
	n, tight, err := s.lpStartTight()
	if errors.Is(err, ErrInfeasible) {
		n, tight, err = ls.releaseActive(n, tight, err)
	}
	var used *solventUsedUp
	if errors.As(err, &used) {
		return nil, err
	}
	var lpErr error // the linear program's verdict of infeasibility, checked below
	if err == nil && len(tight) > 0 {
		// Locks the dominant-species composition meets with equality are
		// taken as active from the start; the active-set loop corrects.
		ls.active = append(ls.active, tight...)
		rows, rerr := ls.rows()
		if rerr != nil {
			return nil, rerr
		}
		s.setRows(rows)
		ls.tr.note("constraints active at the start: %v", tight)
	}
	if err != nil {
		if errors.Is(err, ErrInfeasible) {
			lpErr = err
		}
		ls.tr.note("linear-programming start failed: %v", err)
		n = s.crudeStart()
	}
	pt = s.startFrom(n, false)
	err = s.solveGamma(pt, &ls.w, ls.tr)
	if err != nil && lpErr == nil && !errors.As(err, &used) {
		// The weak pull of the species the linear program leaves out
		// can put the start where the merit has a local minimum (a
		// species that must grow by tens of ln units along a direction
		// of nearly no curvature): retry with the potentials fitted to
		// the dominant species alone.
		ls.tr.note("cold start failed: %v; retried with the exact fit", err)
		pt = s.startFrom(n, true)
		err = s.solveGamma(pt, &ls.w, ls.tr)
	}
	if err != nil {
		if lpErr != nil {
			// Two independent verdicts: the linear program found no
			// composition and Newton from a plain start found none.
			return nil, ls.blame(lpErr)
		}
		if errors.Is(err, ErrNoConvergence) || errors.Is(err, ErrInfeasible) {
			return nil, fmt.Errorf("equilibrium: %w", err)
		}
		return nil, fmt.Errorf("equilibrium: %v (cold start from the dominant species): %w", err, ErrNoConvergence)
	}
	return pt, nil
}

// releaseActive answers a linear program found infeasible with the active
// inequality constraints taken as equalities. The active set is a guess
// (violated constraints are added together, a warm start brings its own),
// and two inequalities that each hold can contradict each other as
// equalities: with the balances they may pin a third amount (no-gain of
// nitrogen(II..V) and no-gain of nitrogen(−III..IV), their bounds adding up
// beyond the nitrogen total, ask nitric acid to be reduced with nothing to
// reduce it when both are equalities, while as inequalities they leave the
// nitrate as it is). The program is then solved with the inequalities as
// inequalities, and the ones it meets with equality are the new active set;
// when that program too is infeasible, the active set and the verdict stand
// (blame names the constraints).
func (ls *lockSolver) releaseActive(n []float64, tight []int, err error) ([]float64, []int, error) {
	p := ls.s.p
	var eqs []int
	for _, k := range ls.active {
		if p.Constraints[k].Rel == Exactly {
			eqs = append(eqs, k)
		}
	}
	if len(eqs) == len(ls.active) {
		return n, tight, err
	}
	was, wasRows := ls.active, ls.s.rows
	ls.active = eqs
	rows, rerr := ls.rows()
	if rerr != nil {
		ls.active = was
		return n, tight, err
	}
	ls.s.setRows(rows)
	n2, tight2, err2 := ls.s.lpStartTight()
	if err2 != nil {
		ls.active = was
		ls.s.setRows(wasRows)
		return n, tight, err
	}
	ls.tr.note("the active constraints cannot hold together as equalities (%v); released", err)
	return n2, tight2, nil
}

// blame names the active constraints when the balances alone are feasible.
func (ls *lockSolver) blame(err error) error {
	if len(ls.active) == 0 {
		return err
	}
	rows := ls.s.rows
	ls.s.setRows(ls.base)
	ls.s.lpNoLocks = true
	_, err2 := ls.s.lpStart()
	ls.s.lpNoLocks = false
	ls.s.setRows(rows)
	if err2 != nil {
		return err
	}
	var names []string
	for _, r := range rows {
		if r.lock >= 0 {
			names = append(names, fmt.Sprintf("%q", r.name))
		}
	}
	return fmt.Errorf("equilibrium: the totals can be met but not together with the constraints %v: %w", names, ErrInfeasible)
}

// crudeStart is all water, used when the linear program fails numerically.
func (s *system) crudeStart() []float64 {
	n := make([]float64, s.ns)
	nw := math.Inf(1)
	for j, a := range s.p.Species[s.solvent].Amounts {
		if a > 0 && s.p.Totals[j] > 0 {
			nw = math.Min(nw, s.p.Totals[j]/a)
		}
	}
	if math.IsInf(nw, 1) {
		nw = 1
	}
	n[s.solvent] = nw
	return n
}

// remap carries a point to a new set of rows (constraints added or
// dropped): balance potentials are kept, new constraint potentials start at 0.
func remap(pt *point, from, to []balanceRow) *point {
	theta := make([]float64, len(to))
	for k, r := range to {
		for j, o := range from {
			if o.lock == r.lock && o.name == r.name {
				theta[k] = pt.theta[j]
				break
			}
		}
	}
	pt.theta = theta
	return pt
}

// update adds the violated inactive constraints or, when none is violated,
// drops the active inequality whose multiplier has the wrong sign. It
// returns a description of the change, "" for none.
func (ls *lockSolver) update(pt *point) string {
	s, p := ls.s, ls.s.p
	isActive := make(map[int]int, len(ls.active))
	for k, r := range s.rows {
		if r.lock >= 0 {
			isActive[r.lock] = k
		}
	}
	// A violation below a millionth of a micromole per mole of the totals
	// is rounding: a lock on a trace (1e-13 mol of an intermediate beside
	// 30 mol of hydrazine) that the rows drop as implied by the balances
	// would otherwise be added back every round.
	floor := 1e-300
	for _, x := range p.Totals {
		floor = math.Max(floor, 1e-12*math.Abs(x))
	}
	var added []string
	for k, c := range p.Constraints {
		if _, ok := isActive[k]; ok {
			continue
		}
		v, scale := 0.0, math.Abs(c.Bound)
		for i, a := range c.Coef {
			v += a * pt.amt[i]
			scale += math.Abs(a * pt.amt[i])
		}
		if !holds(c.Rel, v, c.Bound, 1e-9*scale+floor) {
			ls.active = append(ls.active, k)
			added = append(added, c.Name+" added")
		}
	}
	if len(added) > 0 {
		return fmt.Sprint(added)
	}
	worst, drop := 1e-9, -1
	for k, row := range isActive {
		if ls.dropped[k] {
			continue
		}
		eta := pt.theta[row]
		switch p.Constraints[k].Rel {
		case AtMost:
			if eta > worst {
				worst, drop = eta, k
			}
		case AtLeast:
			if -eta > worst {
				worst, drop = -eta, k
			}
		}
	}
	if drop < 0 {
		return ""
	}
	kept := ls.active[:0]
	for _, k := range ls.active {
		if k != drop {
			kept = append(kept, k)
		}
	}
	ls.active = kept
	if ls.dropped == nil {
		ls.dropped = map[int]bool{}
	}
	ls.dropped[drop] = true
	return p.Constraints[drop].Name + " dropped"
}

// dump notes the residuals of a failed Newton solve.
func (t *trace) dump(s *system, pt *point, f, sc []float64) {
	if t == nil {
		return
	}
	for k, v := range f {
		name := "saturation/gas"
		if k < len(s.rows) {
			name = s.rows[k].name
		}
		t.note("row %d %s: residual %.3g scale %.3g theta %.4g", k, name, v, sc[k], func() float64 {
			if k < len(pt.theta) {
				return pt.theta[k]
			}
			return 0
		}())
	}
	for i := range pt.amt {
		t.note("  %s n=%.4g log=%.4g", s.p.Species[i].Name, pt.amt[i], pt.logAmt[i])
	}
}
