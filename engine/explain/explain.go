package explain

import (
	"errors"
	"fmt"
	"math"

	"mixward/engine/chem"
	"mixward/engine/state"
	"mixward/engine/thermo"
)

// Couple is one side of a redox change: the agent, what it turns into, and
// the half-reaction written as a reduction in the mix's medium.
type Couple struct {
	Agent   *thermo.Species // the oxidizing agent, or the reducing agent
	Product *thermo.Species // what the agent turns into
	Half    thermo.Reaction // the reduction oxidized form + n e- → reduced form
	E0      float64         // V at the mix's temperature, from the species data
	E       float64         // V at the mix's conditions as combined (Nernst); what is not yet there at its standard state
	// Ereached is E with what is not yet there taken at the level the
	// change brings it to (its activity in the mixed state).
	Ereached float64
	Element  string
	From     float64 // oxidation state of Element in Agent
	To       float64 // in Product
}

// Step is one redox change between the mix as combined and the mix at
// equilibrium, explained as an oxidizing agent and a reducing agent.
type Step struct {
	Oxidizer, Reducer Couple
	Net               thermo.Reaction // the net ionic equation, whole numbers, no electrons
	N                 int             // electrons per reaction as written
	Medium            Medium
	E0Cell, ECell     float64 // V
	DeltaG0, DeltaG   float64 // kJ per reaction as written: standard, and at the mix's conditions
	Log10K            float64
	Extent            float64 // mol of the reaction as written
	ElectronsMol      float64 // mol of electrons that passed
}

// Steps explains the redox changes of a solved mix, the one that moves the
// most electrons first, the headline written in HeadlineMedium. A mix
// without any redox change gives none.
func Steps(db *thermo.DB, mx *state.Mix) ([]Step, error) {
	return StepsIn(db, mx, HeadlineMedium(db, mx))
}

// StepsIn is Steps with the headline written in the medium med (a change
// held back is written in the medium of the mixed state it would start
// from, whatever the pH it would end at).
func StepsIn(db *thermo.DB, mx *state.Mix, med Medium) ([]Step, error) {
	ts := Transfers(mx.Species, mx.Combined.Amount, mx.Final.Amount)
	matches := significant(mx, Pairs(ts, 1e-4))
	if len(matches) == 0 {
		return nil, nil
	}
	x, err := newExplainer(db, mx, med)
	if err != nil {
		return nil, err
	}
	// Every change is first written in the medium of the mix as combined,
	// where its E is worked out.
	var out []Step
	var done []Match
	var firstErr error
	for _, m := range matches {
		st, err := x.step(m)
		if err != nil {
			if firstErr == nil {
				firstErr = err
			}
			continue // a change the species at hand cannot write out is left unexplained
		}
		out, done = append(out, st), append(done, m)
	}
	if len(out) == 0 && firstErr != nil {
		return nil, fmt.Errorf("%w: %v", ErrUnexplained, firstErr)
	}
	order := crossFirst(out)
	// The smaller changes happen on the way to the mixed state and are
	// written in its medium (chlorine formed as a falling pH passes neutral
	// is not written beside hydroxide).
	x.med = MediumAt(db, mx.Final.PH, mx.TempK)
	final := make([]Step, len(order))
	for k, i := range order {
		final[k] = out[i]
		if k > 0 {
			if st, err := x.step(done[i]); err == nil {
				final[k] = st
			}
		}
	}
	return final, nil
}

// crossFirst is the order of the steps with, first, the largest change
// between two different agents when the largest of all is an agent reacting
// with itself (peroxide or hypochlorite falling apart, sulfur species
// disproportionating): what reacts with what is the answer's headline; the
// self-reaction follows, with its amounts. The order is otherwise kept.
func crossFirst(sts []Step) []int {
	idx := make([]int, len(sts))
	for i := range idx {
		idx[i] = i
	}
	if len(sts) < 2 || !selfReaction(sts[0]) {
		return idx
	}
	for i := 1; i < len(sts); i++ {
		if !selfReaction(sts[i]) {
			out := append([]int{i}, idx[:i]...)
			return append(out, idx[i+1:]...)
		}
	}
	return idx
}

// selfReaction reports whether one species, or two forms of one compound
// (H2O2 and HO2-, HOCl and OCl-), is both the oxidizing and the reducing
// agent (2 H2O2 → 2 H2O + O2; 2 OCl- → 2 Cl- + O2).
//
// Oxygen from water or hydroxide counts as such a breakdown too: it is how
// the table writes hypochlorite or peroxide falling apart (OCl- oxidizing
// OH- to O2).
func selfReaction(st Step) bool {
	a, b := st.Oxidizer.Agent, st.Reducer.Agent
	if a == nil || b == nil {
		return false
	}
	if b.Text == "H2O" || b.Text == "OH-" {
		return true
	}
	return a == b || skeletonOf(a) == skeletonOf(b)
}

// skeletonOf is a species' atoms other than hydrogen with its charge left
// out: acid and base forms of one compound share it.
func skeletonOf(sp *thermo.Species) string {
	k := chem.Atoms{}
	for el, n := range sp.Atoms {
		if el != "H" {
			k[el] = n
		}
	}
	return k.String()
}

// ErrUnexplained is a mixed state whose changes of oxidation state cannot
// be written out as half-reactions of the species at hand (average states of
// peroxo and mixed-valence species can pair up in ways no equation shows).
var ErrUnexplained = errors.New("the changes of oxidation state cannot be written as half-reactions")

// Negligible is the share of an agent below which a change does not count
// as proceeding: when it turns over less than 1 % of each agent's amount as
// combined, the equilibrium lies far to the left (copper in hydrochloric
// acid gives a trace of hydrogen in a closed vessel, not a reaction). An
// agent present only as a trace (below 1 µmol/L, such as chlorine left by a
// stream's own equilibrium) does not count either way.
const Negligible = 1e-2

// significant keeps the matches that turn over at least Negligible of an
// agent present above trace; water itself is left out of the amounts, so
// that hydrogen from acid is weighed against the acid.
func significant(mx *state.Mix, ms []Match) []Match {
	trace := 1e-6 * mx.VolumeL
	var out []Match
	for _, m := range ms {
		keep := false
		for _, t := range []Transfer{m.Red, m.Ox} {
			p := agentPool(mx, t)
			moved := m.Electrons / math.Abs(t.From-t.To)
			keep = keep || (p >= trace && moved >= Negligible*p)
		}
		if keep {
			out = append(out, m)
		}
	}
	return out
}

// agentPool is the mol of an element's atoms in state t.From as combined, outside
// water.
func agentPool(mx *state.Mix, t Transfer) float64 {
	total := 0.0
	for i, sp := range mx.Species {
		if n := sp.Atoms[t.Element]; n > 0 && sp.Text != "H2O" && redoxElement(sp, t.Element) && roundOx(sp.Ox[t.Element]) == t.From {
			total += mx.Combined.Amount[i] * float64(n)
		}
	}
	return total
}

type explainer struct {
	db  *thermo.DB
	mx  *state.Mix
	bal *balancer
	med Medium
	lnA []float64 // ln activity as combined (NaN: not present, taken at its standard state)
	// lnReached is lnA with what is absent as combined taken at its
	// activity in the mixed state.
	lnReached []float64
}

func newExplainer(db *thermo.DB, mx *state.Mix, med Medium) (*explainer, error) {
	x := &explainer{db: db, mx: mx, lnA: mx.Combined.LnA, med: med}
	x.lnReached = make([]float64, len(mx.Species))
	for i, v := range x.lnA {
		x.lnReached[i] = v
		if sp := mx.Species[i]; sp.Text == "H+" || sp.Text == "OH-" {
			// The medium counts at its activity as combined, as in LnQ:
			// a change that carries the pH across neutral (chlorite
			// disproportionating until the acid is spent) is driven by
			// the medium it starts in, not judged at the end it reaches.
			continue
		}
		if math.IsNaN(v) || v <= traceLnA {
			x.lnReached[i] = mx.Final.LnA[i]
		}
	}
	b, err := newBalancer(db, x.partner)
	if err != nil {
		return nil, err
	}
	x.bal = b
	return x, nil
}

// crossing is how far (pH units) past neutral the mixed state must end up,
// on the other side from the mix as combined, for the change to be
// written in the medium it makes.
const crossing = 1.0

// HeadlineMedium is the medium the headline is written in: the mix's as
// combined, unless the change itself carries the mix more than a pH unit
// past neutral to the other side (nitrogen dioxide dissolving in water makes
// nitric acid; hypochlorite spent on thiosulfate leaves acid): then the
// medium it runs in, so that an acid mix is not written with hydroxide.
func HeadlineMedium(db *thermo.DB, mx *state.Mix) Medium {
	comb := MediumAt(db, mx.Combined.PH, mx.TempK)
	if mx.Final == nil || math.IsNaN(mx.Final.PH) {
		return comb
	}
	fin := MediumAt(db, mx.Final.PH, mx.TempK)
	if fin != comb && math.Abs(mx.Final.PH-NeutralPH(db, mx.TempK)) > crossing {
		return fin
	}
	return comb
}

// MediumAt is acid below neutral pH at the temperature (pKw/2 from the
// species data), base at or above it.
func MediumAt(db *thermo.DB, pH, tempK float64) Medium {
	if pH < NeutralPH(db, tempK) {
		return Acid
	}
	return Base
}

// NeutralPH is pKw/2 at tempK from the species data (7.00 at 25 °C).
func NeutralPH(db *thermo.DB, tempK float64) float64 {
	r, err := db.WaterIonization()
	if err != nil {
		return 7
	}
	return -r.LogK(tempK) / 2
}

// partnerShare is the least share of an element's atoms in the mix a
// carrier in the agent's own state of that element must hold to be taken
// as its partner.
const partnerShare = 0.01

// partner is the main carrier of an element in the mix at equilibrium (or as
// combined) other than the given species and free of the couple's key
// element.
func (x *explainer) partner(el, key string, not ...*thermo.Species) *thermo.Species {
	skip := map[string]bool{}
	if key != "H" && key != "O" { // hydrogen and oxygen are in nearly every carrier
		skip[key] = true
	}
	// An element that does not change state stays in its state: the
	// sulfur of persulfate reduced at its peroxo oxygen ends in sulfate,
	// not in the thiosulfate that happens to carry most sulfur in the mix.
	for _, sp := range not {
		if sp == nil || sp.Atoms[el] == 0 || sp.Ox == nil || el == key {
			continue
		}
		for _, amount := range [][]float64{x.mx.Final.Amount, x.mx.Combined.Amount} {
			// Only a carrier that holds a real share of the element: a
			// trace of bare Cu+ beside copper cyanide is no partner.
			total := 0.0
			for i, c := range x.mx.Species {
				total += amount[i] * float64(c.Atoms[el])
			}
			same := func(i int, c *thermo.Species) bool {
				return c.Ox != nil && math.Abs(c.Ox[el]-sp.Ox[el]) < 0.01 && amount[i]*float64(c.Atoms[el]) >= partnerShare*total
			}
			if best := x.carrierWhere(el, amount, false, skip, not, same); best != nil {
				return best
			}
		}
		// No carrier free of the key element holds a real share: the
		// element stays with the part of the key element that does not
		// change, in the same states (the copper of Cu(CN)3^2- whose
		// cyanide is partly taken to cyanate stays as Cu(CN)2- or
		// CuCN(s), not as a trace of CuCl2- that exists only in strong
		// acid chloride liquors). Only where the mix at equilibrium
		// still holds it so: copper cyanide under excess peroxide ends as
		// copper(II) hydroxide, and the fallback below writes that.
		if el != key && key != "H" && key != "O" && sp.Atoms[key] > 0 {
			keyOx := sp.Ox[key]
			for _, amount := range [][]float64{x.mx.Final.Amount} {
				total := 0.0
				for i, c := range x.mx.Species {
					total += amount[i] * float64(c.Atoms[el])
				}
				sameKey := func(i int, c *thermo.Species) bool {
					if c.Ox == nil || math.Abs(c.Ox[el]-sp.Ox[el]) >= 0.01 || amount[i]*float64(c.Atoms[el]) < partnerShare*total {
						return false
					}
					// Not the agent again in another acid–base form
					// (CN- beside HCN): that carries no element apart.
					if skeletonOf(c) == skeletonOf(sp) {
						return false
					}
					return c.Atoms[key] == 0 || math.Abs(c.Ox[key]-keyOx) < 0.01
				}
				if best := x.carrierWhere(el, amount, false, nil, not, sameKey); best != nil {
					return best
				}
			}
		}
		break
	}
	// Main species first: an ion pair (FeSO4+, NaSO4-) would drag a metal
	// into a half-reaction that does not concern it.
	for _, minor := range []bool{false, true} {
		for _, amount := range [][]float64{x.mx.Final.Amount, x.mx.Combined.Amount} {
			if best := x.carrier(el, amount, minor, skip, not); best != nil {
				return best
			}
		}
	}
	return nil
}

// carrier is the species holding the most atoms of el in a state, of the
// main species (minor false) or of all of them, other than those listed or
// holding a skipped element.
func (x *explainer) carrier(el string, amount []float64, minor bool, skip map[string]bool, not []*thermo.Species) *thermo.Species {
	return x.carrierWhere(el, amount, minor, skip, not, func(int, *thermo.Species) bool { return true })
}

// carrierWhere is carrier among the species ok accepts (given each
// species' index in the mix and the species).
func (x *explainer) carrierWhere(el string, amount []float64, minor bool, skip map[string]bool, not []*thermo.Species, ok func(int, *thermo.Species) bool) *thermo.Species {
	var best *thermo.Species
	bestMol := 0.0
	for i, sp := range x.mx.Species {
		if sp.Atoms[el] == 0 || (sp.Minor && !minor) || contains(not, sp) || hasAny(sp, skip) || !ok(i, sp) {
			continue
		}
		if m := amount[i] * float64(sp.Atoms[el]); m > bestMol {
			best, bestMol = sp, m
		}
	}
	return best
}

func contains(list []*thermo.Species, sp *thermo.Species) bool {
	for _, s := range list {
		if s == sp {
			return true
		}
	}
	return false
}

func hasAny(sp *thermo.Species, els map[string]bool) bool {
	for e := range sp.Atoms {
		if els[e] {
			return true
		}
	}
	return false
}

// couple writes one side of a match: the agent as combined, its product at
// equilibrium, the reduction between the oxidized and reduced forms.
func (x *explainer) couple(t Transfer) (Couple, error) {
	agent := x.medium(t.Element, t.From)
	if agent == nil {
		agent = x.agentOf(t.Element, t.From)
	}
	product := x.medium(t.Element, t.To)
	if product == nil {
		product = dominant(x.mx, x.mx.Final.Amount, t.Element, t.To)
	}
	if agent == nil || product == nil {
		return Couple{}, fmt.Errorf("explain: no species holds %s in state %g or %g", t.Element, t.From, t.To)
	}
	half, err := x.half(t, agent, product)
	if err != nil {
		// The product that holds the most atoms may be one that moves
		// electrons inside itself (cyanogen chloride holds chlorine(-I)
		// beside carbon(IV): HOCl + HCN → CNCl + H2O needs none from
		// outside). The change is then written to the main dissolved
		// carrier of the same state (chloride), which the other half
		// takes up again.
		alt := dominantIn(x.mx, x.mx.Final.Amount, t.Element, t.To, chem.Aqueous)
		if alt == nil || alt == product {
			return Couple{}, fmt.Errorf("explain: %w", err)
		}
		if half, err = x.half(t, agent, alt); err != nil {
			return Couple{}, fmt.Errorf("explain: %w", err)
		}
		product = alt
	}
	c := Couple{Agent: agent, Product: mainProduct(half, agent, product), Half: half, Element: t.Element, From: t.From, To: t.To}
	c.E0 = half.E0(x.mx.TempK)
	c.E = c.E0 - thermo.R*x.mx.TempK/(float64(half.Electrons)*thermo.F)*x.lnQ(half)
	// Ereached: what the change formed counted at the level it reaches
	// rather than at its standard state.
	c.Ereached = c.E0 - thermo.R*x.mx.TempK/(float64(half.Electrons)*thermo.F)*LnQ(x.mx.Species, x.lnReached, half)
	return c, nil
}

// half writes the reduction of a transfer between its agent and product.
func (x *explainer) half(t Transfer, agent, product *thermo.Species) (thermo.Reaction, error) {
	ox, red := agent, product
	if !t.Reduction() {
		ox, red = product, agent
	}
	return x.bal.Reduction(ox, red, t.Element, x.med)
}

// agentOf is the species that stands for an agent (el in state ox): its
// main carrier as combined, unless that is a solid or a gas the mix at
// equilibrium does not hold. Such a phase belongs to the moment of
// combining, not to the mix: iron(III) hydroxide that a rising pH throws down
// as the streams meet, but which redissolves as the reaction takes the pH
// back down, or hydrogen sulfide above its saturation before it reacts. The
// agent is then written as what it is in solution: the same compound
// dissolved (H2S), or the main dissolved carrier at equilibrium (Fe^3+) when
// the equilibrium still holds a tenth or more of the agent dissolved. A
// solid the mix still holds (metal in excess, iron(III) hydroxide at pH 8)
// or that reacts away whole (chromium(III) hydroxide taken to chromate)
// stays as it is.
func (x *explainer) agentOf(el string, ox float64) *thermo.Species {
	agent := dominant(x.mx, x.mx.Combined.Amount, el, ox)
	if agent == nil || agent.Phase == chem.Aqueous || x.held(agent) {
		return agent
	}
	if sp := x.dissolvedForm(agent); sp != nil {
		return sp
	}
	left := atomsIn(x.mx, x.mx.Final.Amount, el, ox, chem.Aqueous)
	if left >= 0.1*atomsIn(x.mx, x.mx.Combined.Amount, el, ox, "") {
		if sp := dominantIn(x.mx, x.mx.Final.Amount, el, ox, chem.Aqueous); sp != nil {
			return sp
		}
	}
	return agent
}

// atomsIn is the mol of el atoms in state ox held by the species of one
// phase ("" for any) in a state.
func atomsIn(mx *state.Mix, amount []float64, el string, ox float64, phase chem.Phase) float64 {
	tot := 0.0
	for i, sp := range mx.Species {
		if n := sp.Atoms[el]; n > 0 && redoxElement(sp, el) && roundOx(sp.Ox[el]) == ox && (phase == "" || sp.Phase == phase) {
			tot += amount[i] * float64(n)
		}
	}
	return tot
}

// held reports whether the mix at equilibrium still holds a species.
func (x *explainer) held(sp *thermo.Species) bool {
	for i, s := range x.mx.Species {
		if s == sp {
			return x.mx.Final.Amount[i] > 0
		}
	}
	return false
}

// dissolvedForm is the aqueous species of the same formula and charge as a
// gas or solid, present in the mix as combined (nil when none is).
func (x *explainer) dissolvedForm(sp *thermo.Species) *thermo.Species {
	for i, s := range x.mx.Species {
		if s != sp && s.Phase == chem.Aqueous && s.Formula == sp.Formula && s.Charge == sp.Charge && x.mx.Combined.Amount[i] > 0 {
			return s
		}
	}
	return nil
}

// medium is the species that stands for hydrogen(I) or oxygen(−II) of the
// water itself in the mix's medium: H+ and H2O in acid, H2O and OH- in
// base (2 H+ + 2 e- → H2 in acid, 2 H2O + 2 e- → H2 + 2 OH- in base). Nil
// for any other element or state.
func (x *explainer) medium(el string, ox float64) *thermo.Species {
	var text string
	switch {
	case el == "H" && ox == 1 && x.med == Acid:
		text = "H+"
	case el == "H" && ox == 1, el == "O" && ox == -2 && x.med == Acid:
		text = "H2O"
	case el == "O" && ox == -2:
		text = "OH-"
	default:
		return nil
	}
	sp, _ := x.db.Get(text)
	return sp
}

// mainProduct is what the agent turns into: product when the half-reaction
// forms it, else the first species it forms other than water, H+ and OH-
// (persulfate's peroxo oxygen ends as sulfate's, not as water).
func mainProduct(half thermo.Reaction, agent, product *thermo.Species) *thermo.Species {
	for _, t := range half.Terms {
		if t.Species == product && t.Nu != 0 {
			return product
		}
	}
	for _, t := range half.Terms {
		switch t.Species.Text {
		case "H2O", "H+", "OH-":
			continue
		}
		if t.Species != agent && t.Species != product {
			return t.Species
		}
	}
	return product
}

// lnQ is ln of the reaction quotient as combined.
func (x *explainer) lnQ(r thermo.Reaction) float64 { return LnQ(x.mx.Species, x.lnA, r) }

// traceLnA is ln of the activity below which a species counts as not yet
// present: it is then taken at its standard state, so that a potential
// never hinges on a trace (1e-6 mol/kg or bar). H+ and OH- are the medium
// and always count at their activity.
var traceLnA = math.Log(1e-6)

// LnQ is ln of a reaction's quotient at the activities lnA (ln a per
// species of the list); a species absent or below trace is taken at its
// standard state.
func LnQ(species []*thermo.Species, lnA []float64, r thermo.Reaction) float64 {
	q := 0.0
	for _, t := range r.Terms {
		for i, sp := range species {
			if sp == t.Species && !math.IsNaN(lnA[i]) && (lnA[i] > traceLnA || sp.Text == "H+" || sp.Text == "OH-") {
				q += t.Nu * lnA[i]
			}
		}
	}
	return q
}

func (x *explainer) step(m Match) (Step, error) {
	oc, err := x.couple(m.Red)
	if err != nil {
		return Step{}, err
	}
	rc, err := x.couple(m.Ox)
	if err != nil {
		return Step{}, err
	}
	net, n := Combine(oc.Half, rc.Half)
	st := Step{Oxidizer: oc, Reducer: rc, Net: net, N: n, Medium: x.med}
	st.E0Cell = oc.E0 - rc.E0
	// E cell at the mix's conditions: the reactants as combined, the
	// products at the level the change brings them to (a product not yet
	// there would otherwise count at 1 mol/L and make a change that does
	// proceed, to a small extent, look uphill).
	st.ECell = oc.Ereached - rc.Ereached
	st.DeltaG0 = st.Net.DeltaG(x.mx.TempK)
	st.DeltaG = -float64(st.N) * thermo.F * st.ECell / 1000
	st.Log10K = st.Net.LogK(x.mx.TempK)
	st.ElectronsMol = m.Electrons
	st.Extent = m.Electrons / float64(st.N)
	return st, nil
}

type netResult struct {
	r   thermo.Reaction
	div int
}

// combine adds a·red + b·(ox reversed), cancels what stands on both sides
// and divides by the common factor.
func combine(red thermo.Reaction, a int, ox thermo.Reaction, b int, electrons int) netResult {
	sum := map[*thermo.Species]float64{}
	var order []*thermo.Species
	add := func(r thermo.Reaction, k float64) {
		for _, t := range r.Terms {
			if _, ok := sum[t.Species]; !ok {
				order = append(order, t.Species)
			}
			sum[t.Species] += k * t.Nu
		}
	}
	add(red, float64(a))
	add(ox, -float64(b))
	g := 0
	for _, sp := range order {
		if v := int(math.Round(sum[sp])); v != 0 {
			g = gcd(g, abs(v))
		}
	}
	if g == 0 || electrons%g != 0 {
		g = 1
	}
	var out thermo.Reaction
	for _, sp := range order {
		if v := math.Round(sum[sp]); v != 0 {
			out.Terms = append(out.Terms, thermo.Term{Species: sp, Nu: v / float64(g)})
		}
	}
	return netResult{r: out, div: g}
}

func gcd(a, b int) int {
	for b != 0 {
		a, b = b, a%b
	}
	return a
}

func abs(a int) int {
	if a < 0 {
		return -a
	}
	return a
}

// Combine writes the net equation of a reduction and an oxidation (given
// as its reduction), each scaled to the least common multiple of their
// electrons, with what stands on both sides cancelled. It returns the
// equation and the electrons that pass per equation as written.
func Combine(red, ox thermo.Reaction) (thermo.Reaction, int) {
	n1, n2 := red.Electrons, ox.Electrons
	l := n1 / gcd(n1, n2) * n2
	net := combine(red, l/n1, ox, l/n2, l)
	return net.r, l / net.div
}
