package state

import (
	"errors"
	"fmt"
	"maps"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"
	"sync"

	"gonum.org/v1/gonum/mat"

	"mixward/engine/chem"
	"mixward/engine/equilibrium"
	"mixward/engine/thermo"
)

// dump, when set by a test, receives every problem built.
var (
	dump       func(name string, p equilibrium.Problem)
	dumpPrefix string
	dumpN      int
	dumpMu     sync.Mutex
)

// presence is the concentration (mol/L) above which a group counts as
// present in a lock's condition.
const presence = 1e-5

// solveLocked solves n0 twice: as combined (no redox change) and at
// equilibrium under the locks whose conditions hold for the combined state.
// A lock of two alternatives is solved both ways and the lower Gibbs energy
// kept.
func (m *Model) solveLocked(mx *Mix, n0 []float64, volL float64) (*State, error) {
	combined, err := m.solveCombined(mx, n0, volL)
	if err != nil {
		return nil, fmt.Errorf("as combined: %w", err)
	}
	return m.solveFrom(mx, n0, combined, volL)
}

// solveCombined is n0 as combined: acid–base and complexing only, every
// element in its oxidation state, under the locks that keep listed species
// from forming. A stated pH is fitted on this same state, so that the acid
// or base it stands for is what the stream then holds (without the
// formation locks cyanide would fit its pH as carbon monoxide and ammonia).
func (m *Model) solveCombined(mx *Mix, n0 []float64, volL float64) (*State, error) {
	return m.solve(mx, n0, true, m.formationRules(mx, n0, volL), volL, n0, nil)
}

// formationRules are the rules of the locks that only keep listed species
// (or an element's atoms outside some compounds: ammonia nitrogen, not
// cyanate's) from forming (crystalline oxides, hydrogen sulfide from
// thiocyanate, ammonia from cyanate) or
// from falling apart (hexacyanoferrates in acid): they hold for the mix as
// combined too, judged on the temperature and on what the streams bring (the
// pH of the mix as combined is not known yet, so a pH condition does not
// hold). Without them a change that is not a redox change (thiocyanate
// hydrolysed to sulfide, ammonium and bicarbonate) would run in the mix as
// combined, before any lock could keep the reagent.
func (m *Model) formationRules(mx *Mix, n0 []float64, volL float64) []lockRule {
	env := m.env(mx, &State{Amount: n0, PH: math.NaN()}, volL)
	env.Molar = nil
	var out []lockRule
	for i := range m.Locks {
		l := &m.Locks[i]
		if g := l.Rules[0].Group; len(l.Rules) != 1 || l.Rules[0].Dir == Fixed || l.Rules[0].Never || (len(g.Species) == 0 && g.Without == "") {
			continue
		}
		if l.When == nil || l.When.Holds(env) {
			r := l.Rules[0]
			out = append(out, lockRule{c: ruleConstraint(mx, l.ID+"#0", r, n0), g: r.Group})
		}
	}
	return out
}

// Without solves the mix again with one lock lifted: what the lock held back.
// The locks that apply are those of the mix's own solve but the one lifted:
// their conditions were judged on the same state as combined, at the same
// temperatures.
func (m *Model) Without(mx *Mix, lockID string) (*State, error) {
	var applied []*Lock
	if mx.Final != nil && mx.Final.Applied != nil {
		applied = make([]*Lock, 0, len(mx.Final.Applied))
		for _, l := range mx.Final.Applied {
			if l.ID != lockID {
				applied = append(applied, l)
			}
		}
	} else {
		applied = m.applied(mx, mx.Combined, mx.VolumeL, lockID)
	}
	// The solve starts cold, from the dominant species the linear program
	// finds, like a titration point: lifting a lock can move the state far
	// from the mix's own equilibrium, and Newton from there took 63 steps per held-back
	// solve of BenchmarkAskWithAmounts against 19 cold (252 → 93 for the
	// four). The minimum is the same either way.
	return m.solveUnder(mx, mx.Initial, mx.Combined, mx.VolumeL, applied, nil)
}

// applied lists the locks (but skip) whose conditions hold for the state as
// combined, in the order of the table.
func (m *Model) applied(mx *Mix, combined *State, volL float64, skip string) []*Lock {
	env := m.env(mx, combined, volL)
	var applied []*Lock
	for i := range m.Locks {
		l := &m.Locks[i]
		if l.ID != skip && (l.When == nil || l.When.Holds(env)) {
			applied = append(applied, l)
		}
	}
	return applied
}

// solveFrom solves n0 at equilibrium under the locks whose conditions hold
// for its combined state.
func (m *Model) solveFrom(mx *Mix, n0 []float64, combined *State, volL float64) (*State, error) {
	return m.solveUnder(mx, n0, combined, volL, m.applied(mx, combined, volL, ""), combined.Amount)
}

// solveUnder solves n0 at equilibrium under the applied locks, its Newton
// iterations starting from the amounts start.
func (m *Model) solveUnder(mx *Mix, n0 []float64, combined *State, volL float64, applied []*Lock, start []float64) (*State, error) {
	best, err := m.solveSets(mx, n0, applied, volL, nil, start, nil)
	if err != nil {
		return nil, err
	}
	// A lock that lets its group grow by the acid the mix holds: only when
	// it held something back at no allowance is the acid titrated.
	allow := m.acidAllowances(mx, applied, best, n0, combined, volL)
	if allow != nil {
		// The solve with the allowances starts where the one without
		// them ended, with the same constraints active: only the bounds
		// of the allowed rules have moved.
		if best, err = m.solveSets(mx, n0, applied, volL, allow, best.Amount, best.Eq.Active); err != nil {
			return nil, err
		}
	}
	// The reaction the allowance (or none) let run may itself make acid or
	// base: bisulfite taken to sulfate by chlorite makes two protons for
	// each chlorite (ClO2- + 2 HSO3- → Cl- + 2 SO4^2- + 2 H+), and that acid
	// then breaks down the chlorite left over (5 HClO2 → 4 ClO2 + HCl +
	// 2 H2O; White's Handbook of Chlorination, chlorite, from memory). The
	// acid (or base) the state at equilibrium still holds beyond the pH of a
	// rule that held something back is counted too, a few rounds at most.
	for round := 0; round < maxAllowanceRounds; round++ {
		more := m.madeAllowances(mx, applied, best, combined, volL)
		if more == nil {
			break
		}
		if allow == nil {
			allow = map[string]float64{}
		}
		for k, v := range more {
			allow[k] += v
		}
		if best, err = m.solveSets(mx, n0, applied, volL, allow, best.Amount, best.Eq.Active); err != nil {
			return nil, err
		}
	}
	best.Applied = applied
	best.Held = heldLocks(applied, best.Eq.Active)
	for _, l := range heldLocks(applied, best.maybe) {
		if !slices.Contains(best.Held, l) {
			best.Undecided = append(best.Undecided, l)
		}
	}
	best.combined = combined
	return best, nil
}

// env is what lock conditions are judged against.
func (m *Model) env(mx *Mix, s *State, volL float64) Env {
	total := func(g Group) float64 {
		tot := 0.0
		for i, w := range mx.weightsOf(g) {
			if w > 0 {
				tot += w * s.Amount[i]
			}
		}
		return tot
	}
	molar := func(g Group) float64 {
		tot := total(g)
		if volL <= 0 {
			return 0
		}
		return tot / volL
	}
	return Env{
		TempC:  mx.TempK - 273.15,
		ReachC: mx.reachC(),
		PH:     s.PH,
		Molar:  molar,
		Has: func(g Group) bool {
			tot := total(g)
			return volL > 0 && tot/volL >= presence
		},
	}
}

// reachC is the temperature the mix reaches by its own heat: as given, or
// its starting temperature.
func (mx *Mix) reachC() float64 {
	if mx.ReachedC != nil {
		return *mx.ReachedC
	}
	return mx.TempK - 273.15
}

// HeatDecides reports whether the mix's own heat, taking it to reachedC,
// changes which locks apply to it (a lock that can hold nothing back in this
// mix does not count): the mix must then be solved again with
// Feed.ReachedC set.
func (m *Model) HeatDecides(mx *Mix, reachedC float64) bool {
	if mx.Combined == nil || math.IsNaN(reachedC) {
		return false
	}
	now := m.env(mx, mx.Combined, mx.VolumeL)
	hot := now
	hot.ReachC = reachedC
	for i := range m.Locks {
		l := &m.Locks[i]
		if l.When != nil && l.When.Holds(now) != l.When.Holds(hot) && !vacuous(mx, l, mx.Initial) {
			return true
		}
	}
	return false
}

// constraintSets lists the constraint sets to try: every combination of the
// alternatives of two-way locks (one set when there are none).
// solveSets solves n0 under every combination of the locks' alternatives
// and keeps the state of least Gibbs energy. allow adds to the bound of the
// named rules; start and active are the warm start (see
// equilibrium.Problem.StartActive).
func (m *Model) solveSets(mx *Mix, n0 []float64, applied []*Lock, volL float64, allow map[string]float64, start []float64, active []string) (*State, error) {
	var best *State
	for _, cons := range constraintSets(mx, applied, n0, allow) {
		st, err := m.solve(mx, n0, false, cons, volL, start, active)
		if err != nil {
			return nil, err
		}
		if best == nil || st.Eq.G < best.Eq.G {
			best = st
		}
	}
	return best, nil
}

// acidAllowances titrates the mix as combined for each "+ acid to ph N" or
// "+ base to ph N" rule that held something back; nil when none did.
func (m *Model) acidAllowances(mx *Mix, applied []*Lock, st *State, n0 []float64, combined *State, volL float64) map[string]float64 {
	var out map[string]float64
	for _, l := range applied {
		for k, r := range l.Rules {
			name := l.ID + "#" + strconv.Itoa(k)
			if !contains(st.Eq.Active, name) {
				continue
			}
			spend, ok := m.allowanceSpend(mx, r, n0, combined.PH, 0, volL)
			if !ok {
				continue
			}
			if out == nil {
				out = map[string]float64{}
			}
			out[name] = spend
		}
	}
	return out
}

// allowanceSpend is what rule r lets its group grow by for the amounts n at
// pH ph: when ph lies beyond the rule's pH by more than slack, the base (or
// acid) it takes to bring n to that pH, times the rule's Per. ok is false
// when there is none.
func (m *Model) allowanceSpend(mx *Mix, r Rule, n []float64, ph, slack, volL float64) (spend float64, ok bool) {
	switch {
	case r.AcidTo != nil && ph < *r.AcidTo-slack:
		x, err := m.titrateCapacity(mx, n, volL, *r.AcidTo)
		if err != nil || x >= 0 {
			return 0, false
		}
		return -x * r.Per, true // the base it takes to reach the pH: the acid that can be spent
	case r.BaseTo != nil && ph > baseTarget(mx, *r.BaseTo)+slack:
		x, err := m.titrateCapacity(mx, n, volL, baseTarget(mx, *r.BaseTo))
		if err != nil || x <= 0 {
			return 0, false
		}
		return x * r.Per, true // the acid it takes: the base that can be spent
	}
	return 0, false
}

// maxAllowanceRounds bounds the recounts of acid or base made by the
// reaction an allowance let run.
const maxAllowanceRounds = 3

// madeAllowances titrates the state at equilibrium st, as it stands, to the
// pH of each "+ acid to ph N" or "+ base to ph N" rule that held something
// back while st is still beyond that pH and the reaction made it more acid
// (or more alkaline) than the mix as combined: the acid or base the
// reaction made. Nil when there is none worth a solve. A reaction that
// spent acid (a metal in acid, whose salt hydrolyses a little: aluminium
// and iron(III) ions are weak acids) leaves the mix less acid than
// combined and is not counted again.
func (m *Model) madeAllowances(mx *Mix, applied []*Lock, st, combined *State, volL float64) map[string]float64 {
	var out map[string]float64
	for _, l := range applied {
		for k, r := range l.Rules {
			name := l.ID + "#" + strconv.Itoa(k)
			if !contains(st.Eq.Active, name) {
				continue
			}
			// Only what the reaction made: the state beyond the mix as
			// combined, in the rule's direction.
			if r.AcidTo != nil && !(st.PH < combined.PH-allowanceSlack) || r.BaseTo != nil && !(st.PH > combined.PH+allowanceSlack) {
				continue
			}
			spend, ok := m.allowanceSpend(mx, r, st.Amount, st.PH, allowanceSlack, volL)
			if !ok {
				continue
			}
			if spend < allowanceMin*volL {
				continue
			}
			if out == nil {
				out = map[string]float64{}
			}
			out[name] = spend
		}
	}
	return out
}

// allowanceSlack (pH units) and allowanceMin (mol/L) keep the recount from
// chasing the rounding of a state that already sits at the rule's pH.
const (
	allowanceSlack = 0.05
	allowanceMin   = 1e-4
)

// baseTarget is the pH at the mix's temperature with the hydroxide that pH
// ph has at 25 °C: a "+ base to ph N" allowance counts the hydroxide held
// above a hydroxide level ("while the solution stays strongly alkaline"),
// and water ionises more when hot (pKw about 14.0 at 25 °C, 12.6 at 80 °C:
// CRC Handbook, Ionization Constant of Water, from memory), so the same
// caustic reads about 1.4 pH units lower at 80 °C. From the species data:
// pKw(T) = (G(H+) + G(OH-) − G(H2O)) / (RT ln 10).
func baseTarget(mx *Mix, ph float64) float64 {
	pkw := func(tempK float64) (float64, bool) {
		var g float64
		n := 0
		for _, sp := range mx.Species {
			switch sp.Text {
			case "H+", "OH-":
				g += sp.GibbsRT(tempK)
				n++
			case "H2O":
				g -= sp.GibbsRT(tempK)
				n++
			}
		}
		return g / math.Ln10, n == 3
	}
	hot, ok1 := pkw(mx.TempK)
	cold, ok2 := pkw(298.15)
	if !ok1 || !ok2 {
		return ph
	}
	return ph - (cold - hot)
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

func constraintSets(mx *Mix, locks []*Lock, n0 []float64, allow map[string]float64) [][]lockRule {
	sets := [][]lockRule{make([]lockRule, 0, len(locks))}
	fork := func(alts []lockRule) {
		if len(alts) == 1 {
			// One alternative joins every set as it stands: each set
			// owns its backing array (a fork below copies), so the
			// append cannot reach another set.
			for i := range sets {
				sets[i] = append(sets[i], alts[0])
			}
			return
		}
		var next [][]lockRule
		for _, c := range alts {
			for _, s := range sets {
				next = append(next, append(append([]lockRule(nil), s...), c))
			}
		}
		sets = next
	}
	for _, l := range locks {
		if len(l.Rules) == 1 && l.Rules[0].Dir == NoNewBonds {
			for _, r := range chainRules(mx) {
				name := l.ID + "#" + r.Group.text
				c := lockRule{c: ruleConstraint(mx, name, r, n0), g: r.Group}
				for i := range sets {
					sets[i] = append(sets[i], c)
				}
			}
			continue
		}
		if len(l.Rules) == 1 && l.Rules[0].Dir == OneWay {
			for k, pair := range oneWayRules(mx, l.Rules[0].Group.Element, n0) {
				var alts []lockRule
				for j, r := range pair {
					name := l.ID + "#" + strconv.Itoa(k) + "ab"[j:j+1]
					alts = append(alts, lockRule{c: ruleConstraint(mx, name, r, n0), g: r.Group})
				}
				fork(alts)
			}
			continue
		}
		if l.Rules[0].Never {
			for _, c := range neverRules(mx, l, n0) {
				fork([]lockRule{c})
			}
			continue
		}
		if vacuous(mx, l, n0) {
			continue
		}
		var alts []lockRule
		for k, r := range l.Rules {
			name := l.ID + "#" + strconv.Itoa(k)
			c := lockRule{c: ruleConstraint(mx, name, r, n0), g: r.Group, paired: r.With != nil}
			c.c.Bound += allow[name]
			alts = append(alts, c)
		}
		fork(alts)
	}
	return sets
}

// neverRules spells out a never rule for the species of mx: one no-gain
// rule for each listed species among them.
func neverRules(mx *Mix, l *Lock, n0 []float64) []lockRule {
	var out []lockRule
	for _, sp := range l.Rules[0].Group.Species {
		g := Group{Species: []string{sp}, Per: []float64{1}, text: "{" + sp + "}"}
		r := Rule{Dir: NoGain, Group: g}
		c := ruleConstraint(mx, l.ID+"#0"+sp, r, n0)
		if !slices.ContainsFunc(c.Coef, func(w float64) bool { return w > 0 }) {
			continue
		}
		out = append(out, lockRule{c: c, g: g})
	}
	return out
}

// oneWayRules spells out a one-way rule on element el for the amounts n0:
// for every oxidation state s the element is brought in (at least a
// millionth of its atoms) with species of the mix both below and above it,
// the pair "no-gain el below s" or "no-gain el above s". Atoms in state s
// may then be reduced or oxidized, not both: a reagent does not fall apart
// into a more reduced and a more oxidized product by itself (hydrazine into
// ammonia and azide, nitrite into nitric oxide and nitrate), while the same
// element brought in two states may still meet in between (nitrite and
// ammonium to nitrogen).
func oneWayRules(mx *Mix, el string, n0 []float64) [][2]Rule {
	const gap = 0.05 // states closer than this are one state
	total := elementTotal(mx, n0, el)
	if total <= 0 {
		return nil
	}
	atState := map[float64]float64{}
	var lows, highs []float64
	for i, sp := range mx.Species {
		n := sp.Atoms[el]
		if n == 0 {
			continue
		}
		ox := math.Round(sp.Ox[el]*100) / 100
		atState[ox] += n0[i] * float64(n)
		lows, highs = append(lows, ox), append(highs, ox)
	}
	var states []float64
	for s, n := range atState {
		if n >= 1e-6*total && slices.ContainsFunc(lows, func(x float64) bool { return x < s-gap }) &&
			slices.ContainsFunc(highs, func(x float64) bool { return x > s+gap }) {
			states = append(states, s)
		}
	}
	sort.Float64s(states)
	out := make([][2]Rule, 0, len(states))
	for _, s := range states {
		below := Group{Element: el, Lo: -8, Hi: s - gap, text: fmt.Sprintf("%s(<%g)", el, s)}
		above := Group{Element: el, Lo: s + gap, Hi: 8, text: fmt.Sprintf("%s(>%g)", el, s)}
		out = append(out, [2]Rule{{Dir: NoGain, Group: below}, {Dir: NoGain, Group: above}})
	}
	return out
}

// chainRules spells out a no-new-bonds rule for the species of mx. For
// every carbon count k of two or more up to the largest organic species of
// the mix, two rules: "no-gain C in organic species of k or more carbon
// atoms" (the carbon atoms) and "no-gain blocks of k carbon atoms" (each
// species counted as the number of whole k-carbon pieces it could be broken
// into). Carbon may then pass from larger compounds to smaller ones
// (ethanol to acetic acid keeps its two carbons, glycerol to oxalic acid and
// carbon dioxide loses one) but never from smaller ones to larger: methanol
// gives no acetic acid, acetone or isopropanol, and two glycerols give no
// three acetic acids (a glycerol holds one two-carbon piece, not one and a
// half). What a feed brings none of is shut out of the problem (presolve),
// so the rules cost the solver constraints only for compounds the streams
// bring.
func chainRules(mx *Mix) []Rule {
	counts := map[int]bool{}
	most := 0
	for _, sp := range mx.Species {
		if n := sp.Atoms["C"]; n >= 2 && IsOrganic(sp.Atoms, sp.Ion()) {
			counts[n] = true
			most = max(most, n)
		}
	}
	var out []Rule
	for k := 2; k <= most; k++ {
		if counts[k] {
			g := Group{Element: "C", Organic: true, MinAtoms: k, text: fmt.Sprintf("C(organic, %d or more C)", k)}
			out = append(out, Rule{Dir: NoGain, Group: g})
		}
		if k < most { // at the largest count the blocks are the species counted above
			g := Group{Element: "C", Organic: true, MinAtoms: k, Blocks: true, text: fmt.Sprintf("C(organic, pieces of %d C)", k)}
			out = append(out, Rule{Dir: NoGain, Group: g})
		}
	}
	return out
}

// vacuous reports whether a lock cannot hold anything back in n0: a single
// rule that keeps nothing, or two rules of which one keeps nothing (either
// may hold, so the lock as a whole asks nothing).
func vacuous(mx *Mix, l *Lock, n0 []float64) bool {
	for _, r := range l.Rules {
		if r.Dir == OneWay {
			return len(oneWayRules(mx, r.Group.Element, n0)) == 0
		}
		if r.Dir == NoNewBonds {
			return len(chainRules(mx)) == 0
		}
		c := ruleConstraint(mx, "", r, n0)
		switch {
		case r.Dir == NoLoss && c.Bound <= traceLevel(n0):
			return true
		case r.Dir == NoGain && r.With == nil && len(r.Group.Species) == 0 && !r.Group.Above && c.Bound >= (1-1e-12)*elementTotal(mx, n0, r.Group.Element):
			return true
		}
	}
	return false
}

// traceLevel is the amount below which what n0 brings is a trace an earlier
// solve left (a stream's own equilibrium keeps a few 1e-14 mol of a species
// a lock shut out): 1e-14 of the largest amount, as newProblem drops such
// components. A lock that keeps only a trace from being lost asks nothing,
// and as a constraint it would only stall the solve.
func traceLevel(n0 []float64) float64 {
	most := 0.0
	for _, n := range n0 {
		most = math.Max(most, n)
	}
	return 1e-14 * most
}

// lockRule is one rule of a lock as a constraint on the species of a mix.
type lockRule struct {
	c    equilibrium.Constraint
	g    Group
	shut []int // species a pinned rule shut out of the problem
	// paired: the rule counts one group less another ("+ with"), so its
	// weights may be negative and it pins nothing.
	paired bool
	// whole: the rule pinned every atom of its element in the group (all
	// chromium is chromium(VI)); whether it held anything back cannot
	// always be read from the potentials of the state, which then leave the
	// electron's potential undetermined.
	whole bool
}

// ruleConstraint is rule r as a constraint on the species of mx. Its Coef
// is the mix's cached weights of the group: read only (addConstraints
// copies it onto the problem's species).
func ruleConstraint(mx *Mix, name string, r Rule, n0 []float64) equilibrium.Constraint {
	c := equilibrium.Constraint{Name: name, Coef: mx.weightsOf(r.Group)}
	if r.With != nil {
		// The shared weights are read-only: the paired rule gets its own row.
		coef := append([]float64(nil), c.Coef...)
		for i, w := range mx.weightsOf(*r.With) {
			coef[i] -= w
		}
		c.Coef = coef
	}
	for i, w := range c.Coef {
		c.Bound += w * n0[i]
	}
	if r.SpentBy != nil {
		spent := 0.0
		for i, w := range mx.weightsOf(*r.SpentBy) {
			spent += w * n0[i]
		}
		c.Bound = math.Max(0, c.Bound-r.Per*spent)
	}
	switch r.Dir {
	case NoGain:
		c.Rel = equilibrium.AtMost
	case NoLoss:
		c.Rel = equilibrium.AtLeast
	default:
		c.Rel = equilibrium.Exactly
	}
	return c
}

func heldLocks(applied []*Lock, active []string) []*Lock {
	var out []*Lock
	for _, l := range applied {
		for _, a := range active {
			if len(a) > len(l.ID) && a[:len(l.ID)+1] == l.ID+"#" {
				out = append(out, l)
				break
			}
		}
	}
	return out
}

// solve builds and solves one equilibrium problem. With frozen set, every
// element in each oxidation state is a component of its own, so only
// acid–base, complex and solid changes can happen.
func (m *Model) solve(mx *Mix, n0 []float64, frozen bool, cons []lockRule, volL float64, start []float64, active []string) (*State, error) {
	// A lock that fixes organic carbon is met by giving each organic
	// compound its own component (see components), not by a constraint.
	// One that leaves some compounds out (C(organic without N)) stays a
	// constraint on the carbon of the others.
	organicLocked := frozen
	left := make([]lockRule, 0, len(cons))
	for _, lr := range cons {
		if lr.g.Organic && lr.g.Without == "" && lr.g.MinAtoms == 0 && lr.c.Rel == equilibrium.Exactly {
			organicLocked = true
			continue
		}
		left = append(left, lr)
	}
	rows := mx.componentRows(frozen, organicLocked)
	b := newProblem(mx, n0, rows)
	cons, shut := presolve(mx, n0, left)
	b.addSpecies(mx, rows, shut)
	b.addConstraints(cons, start)
	if start != nil {
		b.p.StartActive = active
	}
	if dump != nil {
		dumpMu.Lock() // the ends of a titration are solved side by side
		dumpN++
		dump(fmt.Sprintf("%s-%d-frozen%v", dumpPrefix, dumpN, frozen), b.p)
		dumpMu.Unlock()
	}
	eq, err := solveSafely(b.p)
	if err != nil {
		return nil, err
	}
	held, maybe := pinnedHeld(mx, b.p, eq, rows, b.comps, cons)
	eq.Active = append(eq.Active, held...)
	st := b.state(mx, eq, shut, volL)
	st.maybe = maybe
	return st, nil
}

// problemBuilder holds an equilibrium problem while it is built from a mix:
// its components, and which mix species its species are.
type problemBuilder struct {
	p     equilibrium.Problem
	comps map[string]int // component → index
	keep  []int          // problem species → mix species
}

// newProblem sets up the components the amounts n0 bring. Components the
// feed does not bring leave the problem with every species that holds them;
// so do traces left by an earlier solve (a stream's own equilibrium), below
// 1e-14 of the largest total.
func newProblem(mx *Mix, n0 []float64, rows []map[string]float64) *problemBuilder {
	totals := map[string]float64{}
	for i, n := range n0 {
		for k, a := range rows[i] {
			totals[k] += n * a
		}
	}
	most := 0.0
	for _, t := range totals {
		most = math.Max(most, t)
	}
	var names []string
	for k, t := range totals {
		if t > 1e-14*most {
			names = append(names, k)
		}
	}
	sort.Strings(names)
	b := &problemBuilder{comps: map[string]int{}}
	b.p = equilibrium.Problem{Components: names, Totals: make([]float64, len(names)), TemperatureK: mx.TempK, PressureBar: mx.Pressure}
	for i, k := range names {
		b.comps[k] = i
		b.p.Totals[i] = totals[k]
	}
	return b
}

// addSpecies takes in every species the components can form and no lock
// shut out.
func (b *problemBuilder) addSpecies(mx *Mix, rows []map[string]float64, shut map[int]bool) {
	for i, sp := range mx.Species {
		if !formable(rows[i], b.p.Totals, b.comps) || shut[i] {
			continue
		}
		b.p.Species = append(b.p.Species, problemSpecies(sp, rows[i], b.comps, len(b.p.Components), mx.TempK))
		b.keep = append(b.keep, i)
	}
}

// addConstraints maps the lock rules left after presolve, and the warm
// start, onto the problem's species.
func (b *problemBuilder) addConstraints(cons []lockRule, start []float64) {
	for _, lr := range cons {
		c := lr.c
		if strings.HasSuffix(c.Name, "=pinned") {
			continue
		}
		pc := c
		pc.Coef = make([]float64, len(b.keep))
		any := false
		for j, i := range b.keep {
			pc.Coef[j] = c.Coef[i]
			any = any || pc.Coef[j] != 0
		}
		if any { // a lock on a group the mix cannot hold has nothing to keep
			b.p.Constraints = append(b.p.Constraints, pc)
		}
	}
	if start != nil {
		b.p.Start = make([]float64, len(b.keep))
		for j, i := range b.keep {
			b.p.Start[j] = start[i]
		}
	}
}

// state maps a solved problem back onto the mix's species.
func (b *problemBuilder) state(mx *Mix, eq equilibrium.State, shut map[int]bool, volL float64) *State {
	st := &State{Amount: make([]float64, len(mx.Species)), LnA: make([]float64, len(mx.Species)), Eq: eq,
		VolumeL: volL, Shut: map[*thermo.Species]bool{}, PH: math.NaN()}
	for i := range shut {
		st.Shut[mx.Species[i]] = true
	}
	for i := range st.LnA {
		st.LnA[i] = math.NaN()
	}
	for j, i := range b.keep {
		st.Amount[i] = eq.Amount[j]
		st.LnA[i] = lnActivity(b.p.Species[j].Phase, eq, j)
		if mx.Species[i].Text == "H+" {
			st.PH = -(math.Log(eq.Molality[j]) + eq.LogGamma[j]) / math.Ln10
		}
	}
	return st
}

// formable reports whether every component of a species is brought by the
// feed.
func formable(row map[string]float64, totals []float64, comps map[string]int) bool {
	for k := range row {
		if j, ok := comps[k]; !ok || totals[j] <= 0 {
			return false
		}
	}
	return true
}

func problemSpecies(sp *thermo.Species, row map[string]float64, comps map[string]int, nc int, tempK float64) equilibrium.Species {
	ps := equilibrium.Species{Name: sp.Text, Charge: sp.Charge, Amounts: make([]float64, nc), Mu0: sp.GibbsRT(tempK)}
	for k, a := range row {
		ps.Amounts[comps[k]] = a
	}
	switch {
	case sp.Text == "H2O":
		ps.Phase = equilibrium.Solvent
	case sp.Phase == chem.Gas:
		ps.Phase = equilibrium.Gas
	case sp.Phase == chem.Solid || sp.Phase == chem.Liquid:
		ps.Phase = equilibrium.Pure
	default:
		ps.Phase = equilibrium.Aqueous
	}
	return ps
}

// components is the component make-up of one formula unit. Elements of an
// inert species other than H, O and metals are components of their own, so
// that it never takes part in a redox change.
//
// The non-metal skeleton of an inert species, and of an organic species
// while organic carbon is locked (and always in a frozen solve), is one
// component of its own ({C2O2} for acetic acid and acetate, {C10N2O8} for
// EDTA and its complexes): such a compound keeps its skeleton, gaining or
// losing only H+ and metal ions, and never turns into another compound.
// The free elements of an inert species (free=Cl) are outside its skeleton:
// trichloroisocyanuric acid shares cyanuric acid's skeleton and gives up
// its chlorine as hypochlorous acid.
func components(sp *thermo.Species, frozen, organicLocked bool) map[string]float64 {
	row := make(map[string]float64, len(sp.Atoms))
	whole := sp.Inert || (organicLocked && IsOrganic(sp.Atoms, sp.Ion()))
	if whole {
		row[skeleton(sp)] = 1
	}
	for el, n := range sp.Atoms {
		key := el
		switch {
		case whole && el != "H" && !chem.IsMetal(el) && !sp.Free[el]:
			continue
		case frozen:
			key = el + "@" + strconv.FormatFloat(math.Round(sp.Ox[el]*100)/100, 'f', -1, 64)
		}
		row[key] += float64(n)
	}
	return row
}

// skeleton names the non-metal atoms of a species other than hydrogen, in
// Hill order, with their average oxidation states: "{C2O2 C@3 O@-2}".
// Acid and base forms of one compound share it; isomers in other oxidation
// states do not (peracetic acid, its peroxide oxygen at −1, is not glycolic
// acid, though both are C2H4O3).
func skeleton(sp *thermo.Species) string {
	k := chem.Atoms{}
	for el, n := range sp.Atoms {
		if el != "H" && !chem.IsMetal(el) && !sp.Free[el] {
			k[el] = n
		}
	}
	key := "{" + k.String()
	for _, el := range slices.Sorted(maps.Keys(k)) {
		key += " " + el + "@" + strconv.FormatFloat(math.Round(sp.Ox[el]*100)/100, 'f', -1, 64)
	}
	return key + "}"
}

// lnActivity is ln a of problem species j in a solved state: γm for a
// solute, the partial pressure in bar for a gas, 1 for water and a pure phase
// that is present; NaN for an absent species (taken at its standard state by
// the Nernst equation).
func lnActivity(ph equilibrium.Phase, eq equilibrium.State, j int) float64 {
	switch ph {
	case equilibrium.Solvent:
		return 0
	case equilibrium.Pure:
		if eq.Amount[j] > 0 {
			return 0
		}
	case equilibrium.Gas:
		if eq.Partial[j] > 0 {
			return math.Log(eq.Partial[j])
		}
	default:
		if eq.Molality[j] > 0 {
			return math.Log(eq.Molality[j]) + eq.LogGamma[j]
		}
	}
	return math.NaN()
}

// presolve turns the rules that pin a group at an end of its range into
// species left out of the problem: "may not grow" from nothing (no O2 where
// none was brought), or "may not shrink" when the group already holds every
// atom of its element (all sulfur is sulfate). A solver on component
// potentials cannot meet such rules any other way (their multipliers run to
// infinity). It returns the rules left and the species shut out; a rule that
// shut out a species the free problem would form is reported active by
// solve's caller through the names it keeps.
func presolve(mx *Mix, n0 []float64, cons []lockRule) ([]lockRule, map[int]bool) {
	shut := map[int]bool{}
	left := make([]lockRule, 0, len(cons))
	for _, lr := range cons {
		c, g := lr.c, lr.g
		var list []int
		whole := false
		switch {
		case lr.paired:
			left = append(left, lr) // a difference of two groups: never pinned at an end
			continue
		case c.Rel != equilibrium.AtLeast && c.Bound <= 1e-300:
			for i, w := range c.Coef {
				if w > 0 {
					list = append(list, i)
				}
			}
		case c.Rel == equilibrium.AtMost && len(g.Species) == 0 && !g.Above && !g.Blocks && c.Bound >= (1-1e-12)*elementTotal(mx, n0, g.Element):
			continue // the group cannot grow beyond every atom of its element
		case c.Rel != equilibrium.AtMost && len(g.Species) == 0 && !g.Above && c.Bound >= (1-1e-12)*elementTotal(mx, n0, g.Element):
			whole = true
			for i, sp := range mx.Species {
				if sp.Atoms[g.Element] > 0 && c.Coef[i] == 0 {
					list = append(list, i)
				}
			}
		default:
			left = append(left, lr)
			continue
		}
		for _, i := range list {
			shut[i] = true
		}
		left = append(left, lockRule{c: equilibrium.Constraint{Name: c.Name + "=pinned"}, g: g, shut: list, whole: whole})
	}
	return left, shut
}

func elementTotal(mx *Mix, n0 []float64, el string) float64 {
	t := 0.0
	for i, sp := range mx.Species {
		t += n0[i] * float64(sp.Atoms[el])
	}
	return t
}

// pinnedHeld names the pinned rules that held something back: a species they
// shut out would be present at the potentials of the solved state (a solute
// or gas above 1e-6, a solid supersaturated). maybe names the rules that
// pinned a whole element and were not found so: the caller judges those by
// lifting the lock (Model.Without).
func pinnedHeld(mx *Mix, p equilibrium.Problem, eq equilibrium.State, rows []map[string]float64, comps map[string]int, cons []lockRule) (held, maybe []string) {
	var pinned []*lockRule
	for i := range cons {
		if lr := &cons[i]; strings.HasSuffix(lr.c.Name, "=pinned") {
			pinned = append(pinned, lr)
		}
	}
	if len(pinned) == 0 {
		return nil, nil
	}
	for _, lr := range pinned {
		if lr.whole {
			maybe = append(maybe, strings.TrimSuffix(lr.c.Name, "=pinned"))
		}
	}
	lam, fixed, ok := potentials(p, eq)
	if !ok {
		return nil, maybe
	}
	var out []string
	for _, lr := range pinned {
		for _, i := range lr.shut {
			sp := mx.Species[i]
			lnA := lam[len(lam)-1] * float64(sp.Charge)
			okRow := true
			vec := make([]float64, len(lam))
			vec[len(vec)-1] = float64(sp.Charge)
			for k, a := range rows[i] {
				j, found := comps[k]
				if !found {
					okRow = false
					break
				}
				lnA += a * lam[j]
				vec[j] = a
			}
			okRow = okRow && fixed(vec)
			lnA -= sp.GibbsRT(mx.TempK)
			pure := sp.Phase == chem.Solid || sp.Phase == chem.Liquid
			if okRow && (pure && lnA > 0 || !pure && lnA > math.Log(1e-6)) {
				out = append(out, strings.TrimSuffix(lr.c.Name, "=pinned"))
				break
			}
		}
	}
	return out, maybe
}

// potentials recovers the component potentials (and, last, the charge
// potential) of a solved state from the species present: for each,
// ln a + μ°/RT = Σ A·λ + z·ψ, solved in the least-squares sense, with the
// least norm where the species present do not fix every potential (the
// carbon and nitrogen of cyanate when cyanate is their only carrier). fixed
// reports whether a combination of the potentials (a species' row) is
// settled by the species present, so that a species shut out is judged
// only where its potential is known.
func potentials(p equilibrium.Problem, eq equilibrium.State) (lam []float64, fixed func([]float64) bool, ok bool) {
	nc := len(p.Components) + 1
	var rowsA [][]float64
	var rhs []float64
	for j, sp := range p.Species {
		var lnA float64
		switch sp.Phase {
		case equilibrium.Solvent:
		case equilibrium.Pure:
			if eq.Amount[j] <= 0 {
				continue
			}
		case equilibrium.Gas:
			if eq.Partial[j] <= 1e-200 {
				continue
			}
			lnA = math.Log(eq.Partial[j])
		default:
			if eq.Molality[j] <= 1e-200 {
				continue
			}
			lnA = math.Log(eq.Molality[j]) + eq.LogGamma[j]
		}
		row := append(append([]float64(nil), sp.Amounts...), float64(sp.Charge))
		rowsA = append(rowsA, row)
		rhs = append(rhs, lnA+sp.Mu0)
	}
	if len(rowsA) == 0 {
		return nil, nil, false
	}
	a := mat.NewDense(len(rowsA), nc, nil)
	for i, r := range rowsA {
		a.SetRow(i, r)
	}
	var svd mat.SVD
	if !svd.Factorize(a, mat.SVDThin) {
		return nil, nil, false
	}
	vals := svd.Values(nil)
	rank := 0
	for _, v := range vals {
		if v > 1e-10*vals[0] {
			rank++
		}
	}
	var x mat.Dense
	svd.SolveTo(&x, mat.NewDense(len(rhs), 1, rhs), rank)
	var v mat.Dense
	svd.VTo(&v)
	basis := v.Slice(0, nc, 0, rank)
	fixed = func(r []float64) bool {
		// r lies in the row space when its projection on the right
		// singular vectors kept gives it back.
		rv := mat.NewVecDense(len(r), r)
		var c, back mat.VecDense
		c.MulVec(basis.T(), rv)
		back.MulVec(basis, &c)
		back.SubVec(&back, rv)
		return mat.Norm(&back, 2) <= 1e-8*math.Max(1, mat.Norm(rv, 2))
	}
	return mat.Col(nil, 0, &x), fixed, true
}

// solveSafely runs the solver and turns a panic inside it (a linear-algebra
// routine refusing a singular basis) into an error, so that no request can
// take the process down.
// A warm start that leads nowhere is dropped for a cold start.
func solveSafely(p equilibrium.Problem) (st equilibrium.State, err error) {
	st, err = solveRecovered(p)
	if err != nil && p.Start != nil && !errors.Is(err, equilibrium.ErrInfeasible) {
		p.Start = nil
		st, err = solveRecovered(p)
	}
	return st, err
}

func solveRecovered(p equilibrium.Problem) (st equilibrium.State, err error) {
	defer func() {
		if r := recover(); r != nil {
			err = fmt.Errorf("%w: the solver failed (%v)", equilibrium.ErrNoConvergence, r)
		}
	}()
	return equilibrium.Solve(p)
}
