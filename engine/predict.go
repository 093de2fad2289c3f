package engine

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
)

// side is one half-reaction usable in the mix, in one role.
type side struct {
	row       *HalfReaction
	idx       int // row index in the table, for stable ordering
	role      Role
	main      Species   // the species that is reduced (oxidizer) or oxidized (reducer)
	partners  []Species // other species the couple needs, besides water, H+ and OH-
	e         float64   // reduction potential of the couple under the mix's conditions
	discount  float64   // kinetic allowance in volts, always ≥ 0
	allowance *KineticRule
	cpl       *Couple // the couple as reported, built on first use
	mainKey   string  // mixKey(main)
}

// pair is an oxidizer side and a reducer side that can react.
type pair struct {
	ox, red  *side
	eCell    float64 // E(ox) − E(red) under the mix's conditions
	eCellStd float64
	eff      float64      // eCell less the kinetic allowances, used for ranking
	med      Medium       // medium of the mix the equation is written for
	self     *KineticRule // allowance on the pair as such (see PairRole)
	rx       *netReaction
	rxDone   bool
}

// rxn balances the pair's net equation on first use; nil when the two
// couples cancel out or do not balance.
func (p *pair) rxn() *netReaction {
	if p.rxDone {
		return p.rx
	}
	p.rxDone = true
	rx, err := combine(p.ox.row, p.red.row, p.med)
	if err != nil || len(rx.reactants) == 0 || len(rx.products) == 0 {
		return nil
	}
	p.rx = rx
	return rx
}

// netReaction is a balanced net ionic equation.
type netReaction struct {
	reactants []Term
	products  []Term
	electrons int
	keyText   string // cached key
}

func isSolvent(s Species) bool { return s.IsWater() || s.IsProton() || s.IsHydroxide() }

// mediumOf is the half-reaction medium that fits a pH.
func mediumOf(pH float64) Medium {
	if pH < 7 {
		return Acid
	}
	return Base
}

// sides lists every half-reaction that can act in the mix, as an oxidizer
// (all its oxidized-side species present) and as a reducer (all its
// reduced-side species present).
func (e *Engine) sides(m *mixture) (ox, red []*side) {
	if !m.aqueous {
		return nil, nil
	}
	med := mediumOf(m.pH)
	rows := e.Tables.rows[med]
	for _, i := range rows.fitting {
		h := e.Tables.Half[i]
		if s := e.makeSide(m, h, i, OxidizerRole, h.Reactants); s != nil {
			ox = append(ox, s)
		}
		if s := e.makeSide(m, h, i, ReducerRole, h.Products); s != nil {
			red = append(red, s)
		}
	}
	// A couple written only for the other medium (HOCl/Cl- in a mix at pH
	// 7.8, MnO2/Mn^2+ in caustic) still acts: the Nernst correction makes
	// its potential right at the mix's pH, and combine rewrites H+ or OH-
	// into the mix's medium. It must not form a dissolved species the mix
	// lacks, though: that species would enter the Nernst term at 1 mol/L,
	// which the other medium cannot hold (Mn^2+ in caustic precipitates).
	for _, i := range rows.fallback {
		h := e.Tables.Half[i]
		if s := e.makeSide(m, h, i, OxidizerRole, h.Reactants); s != nil && !s.isWaterSide() && formsOnlyKnown(m, e.Tables, h.Products) {
			ox = append(ox, s)
		}
		if s := e.makeSide(m, h, i, ReducerRole, h.Products); s != nil && !s.isWaterSide() && formsOnlyKnown(m, e.Tables, h.Reactants) {
			red = append(red, s)
		}
	}
	return ox, red
}

func (e *Engine) makeSide(m *mixture, h *HalfReaction, idx int, role Role, terms []Term) *side {
	keys := h.redKeys
	if role == OxidizerRole {
		keys = h.oxKeys
	}
	for _, k := range keys {
		if m.lookup(k, e.Tables) == nil {
			return nil
		}
	}
	s := &side{row: h, idx: idx, role: role}
	found := false
	for _, k := range keys {
		if !found {
			p := m.lookup(k, e.Tables)
			s.main, s.mainKey = p.sp, p.key
			found = true
		} else {
			s.partners = append(s.partners, m.lookup(k, e.Tables).sp)
		}
	}
	if !found {
		// A water couple: H+ (acid) or H2O (base) is reduced; H2O (acid) or
		// OH- (base) is oxidized.
		pick := Species{}
		for _, t := range terms {
			if t.IsProton() || t.IsHydroxide() {
				pick = t.Species
			}
		}
		if pick.Formula == "" {
			for _, t := range terms {
				if t.IsWater() {
					pick = t.Species
				}
			}
		}
		if pick.Formula == "" {
			return nil
		}
		s.main = pick
		s.mainKey = mixKey(pick)
	}
	s.e = m.potential(h)
	e.applyKinetics(m, s)
	return s
}

// formsOnlyKnown reports whether every species a couple would form is in
// the mix already, or is a solid or a gas (whose activity does not hang on
// the standard-state assumption) — but not a metal oxide or hydroxide in an
// acid mix, which would dissolve again (Cu2O, Fe(OH)3 in acid; common
// practice, no source).
func formsOnlyKnown(m *mixture, t *Tables, formed []Term) bool {
	for i := range formed {
		tm := &formed[i]
		if tm.Phase == Solid && m.pH < 7 {
			if _, oxide := t.standIn[tm.mixKey()]; oxide {
				return false
			}
		}
		if isSolvent(tm.Species) || tm.Phase == Solid || tm.Phase == Gas || m.has(tm.Species) {
			continue
		}
		return false
	}
	return true
}

// isWaterSide reports whether a side is water's own couple (H+/H2, H2O/H2,
// O2/H2O, O2/OH-).
func (s *side) isWaterSide() bool { return isSolvent(s.main) }

// effE is the potential used for ranking: an oxidizer's is lowered and a
// reducer's raised by its kinetic allowance.
func (s *side) effE() float64 {
	if s.role == OxidizerRole {
		return s.e - s.discount
	}
	return s.e + s.discount
}

// pairs forms every oxidizer–reducer pair, balanced, ranked by effective
// cell potential.
func (e *Engine) pairs(m *mixture, ox, red []*side) []*pair {
	var out []*pair
	med := mediumOf(m.pH)
	for _, o := range ox {
		for _, r := range red {
			// A couple against itself in another form (OCl-/Cl- with
			// HOCl/Cl-) transfers no electrons: it is acid–base only.
			if o.row == r.row || o.row.canon == r.row.canon || (o.isWaterSide() && r.isWaterSide()) {
				continue
			}
			p := &pair{ox: o, red: r, eCell: o.e - r.e, eCellStd: o.row.E0 - r.row.E0, med: med}
			p.eff = o.effE() - r.effE()
			if e.Tables.pairRules[o.mainKey] {
				if a := e.pairAllowance(m, o.main, r.main); a != nil {
					p.eff -= a.Volts
					p.self = a
				}
			}
			out = append(out, p)
		}
	}
	sort.SliceStable(out, func(i, j int) bool {
		a, b := out[i], out[j]
		if a.eff != b.eff {
			return a.eff > b.eff
		}
		if a.eCell != b.eCell {
			return a.eCell > b.eCell
		}
		if a.ox.idx != b.ox.idx {
			return a.ox.idx < b.ox.idx
		}
		return a.red.idx < b.red.idx
	})
	return out
}

// combine adds the reduction ox and the reversed reduction red, each scaled
// to the lowest common multiple of their electrons, cancels what appears on
// both sides, rewrites H+ or OH- into the medium of the mix, and divides by
// the greatest common divisor of the coefficients.
func combine(ox, red *HalfReaction, med Medium) (*netReaction, error) {
	l := lcm(ox.Electrons, red.Electrons)
	a, b := l/ox.Electrons, l/red.Electrons
	// A handful of terms: a slice searched by key beats maps here.
	type acc struct {
		key, text string
		sp        Species
		n         int
	}
	terms := make([]acc, 0, 12)
	addT := func(t *Term, k int) {
		// Dissolved and gaseous forms of one molecule (Cl2, Cl2(g)) are one
		// term; the first form met is kept.
		key := t.mixKey()
		for i := range terms {
			if terms[i].key == key {
				terms[i].n += k
				return
			}
		}
		terms = append(terms, acc{key: key, text: t.textOf(), sp: t.Species, n: k})
	}
	for i := range ox.Reactants {
		addT(&ox.Reactants[i], -ox.Reactants[i].Coef*a)
	}
	for i := range red.Products {
		addT(&red.Products[i], -red.Products[i].Coef*b)
	}
	for i := range ox.Products {
		addT(&ox.Products[i], ox.Products[i].Coef*a)
	}
	for i := range red.Reactants {
		addT(&red.Reactants[i], red.Reactants[i].Coef*b)
	}
	// H+ and OH- on opposite sides make water; rewrite the one foreign to
	// the medium.
	foreign, native := &hydroxideTerm, &protonTerm
	if med != Acid {
		foreign, native = &protonTerm, &hydroxideTerm
	}
	for i := range terms {
		if k := terms[i].n; k != 0 && terms[i].key == foreign.key {
			terms[i].n = 0
			addT(&waterTerm, k)
			addT(native, -k)
			break
		}
	}
	g := 0
	for _, t := range terms {
		g = gcd(g, abs(t.n))
	}
	if g == 0 {
		return &netReaction{}, nil
	}
	if l%g != 0 {
		return nil, fmt.Errorf("engine: electrons %d not divisible by %d", l, g)
	}
	rx := &netReaction{electrons: l / g}
	for _, t := range terms {
		c := t.n / g
		switch {
		case c < 0:
			rx.reactants = append(rx.reactants, Term{Species: t.sp, Coef: -c, key: t.key, text: t.text})
		case c > 0:
			rx.products = append(rx.products, Term{Species: t.sp, Coef: c, key: t.key, text: t.text})
		}
	}
	return rx, nil
}

func gcd(a, b int) int {
	for b != 0 {
		a, b = b, a%b
	}
	return a
}

func lcm(a, b int) int { return a / gcd(a, b) * b }

func abs(x int) int {
	if x < 0 {
		return -x
	}
	return x
}

// equationText writes terms as "2 MnO4- + 16 H+".
func termsText(ts []Term) string {
	var b strings.Builder
	for i := range ts {
		if i > 0 {
			b.WriteString(" + ")
		}
		if ts[i].Coef != 1 {
			b.WriteString(strconv.Itoa(ts[i].Coef))
			b.WriteByte(' ')
		}
		b.WriteString(ts[i].textOf())
	}
	return b.String()
}

// The solvent terms combine adds when it rewrites H+ or OH-.
var (
	waterTerm     = solventTerm(Species{Formula: "H2O", Phase: Liquid})
	protonTerm    = solventTerm(Species{Formula: "H", Charge: 1, Phase: Aqueous})
	hydroxideTerm = solventTerm(Species{Formula: "OH", Charge: -1, Phase: Aqueous})
)

func solventTerm(s Species) Term { return Term{Species: s, key: mixKey(s), text: s.Text()} }

// key identifies the net reaction regardless of phases, so that one
// reaction reached through different couples is listed once.
func (rx *netReaction) key() string {
	if rx.keyText != "" {
		return rx.keyText
	}
	side := func(ts []Term) string {
		parts := make([]string, len(ts))
		for i := range ts {
			parts[i] = strconv.Itoa(ts[i].Coef) + " " + ts[i].mixKey()
		}
		sort.Strings(parts)
		return strings.Join(parts, " + ")
	}
	rx.keyText = side(rx.reactants) + " = " + side(rx.products)
	return rx.keyText
}

func (rx *netReaction) text() string {

	return termsText(rx.reactants) + " → " + termsText(rx.products)
}

func (rx *netReaction) out() *Reaction {
	conv := func(ts []Term) []EqTerm {
		out := make([]EqTerm, len(ts))
		for i, t := range ts {
			out[i] = EqTerm{Formula: t.Formula, Charge: t.Charge, Phase: t.Phase, Coef: t.Coef, Text: t.textOf()}
		}
		return out
	}
	return &Reaction{Reactants: conv(rx.reactants), Products: conv(rx.products), Text: rx.text(), Electrons: rx.electrons}
}

// HalfText writes a half-reaction as a reduction ("MnO4- + 8 H+ + 5 e- →
// Mn^2+ + 4 H2O(l)") or, reversed, as an oxidation.
func HalfText(h *HalfReaction, reversed bool) string {
	if reversed && h.textOx != "" {
		return h.textOx
	}
	if !reversed && h.textRed != "" {
		return h.textRed
	}
	return halfText(h, reversed)
}

func halfText(h *HalfReaction, reversed bool) string {
	e := strconv.Itoa(h.Electrons) + " e-"
	if h.Electrons == 1 {
		e = "e-"
	}
	if reversed {
		return termsText(h.Products) + " → " + termsText(h.Reactants) + " + " + e
	}
	return termsText(h.Reactants) + " + " + e + " → " + termsText(h.Products)
}

func (s *side) couple() *Couple {
	if s.cpl != nil {
		c := *s.cpl
		return &c
	}
	s.cpl = &Couple{
		Species:      s.main.Text(),
		HalfReaction: HalfText(s.row, s.role == ReducerRole),
		EStandard:    s.row.E0,
		E:            roundDec(s.e, 4),
		ID:           s.row.ID,
		Medium:       s.row.Medium,
		Electrons:    s.row.Electrons,
		Source:       s.row.Source,
	}
	c := *s.cpl
	return &c
}

// round rounds x to d decimals, so that JSON carries no float noise.
func roundDec(x float64, d int) float64 {
	p := math.Pow(10, float64(d))
	return math.Round(x*p) / p
}

func ptr(x float64) *float64 { return &x }

// terminal re-picks the headline oxidizer couple so that its product is an
// end product. When the oxidizer's first product would itself be reduced by
// the same reducer (MnO4- to MnO2, which iron(II) takes on to Mn^2+), the
// tank ends with the deeper product, so the headline uses the couple that
// goes there directly when the table has it (MnO4-/Mn^2+). Gaseous
// products count as end products: they leave the liquid.

func (e *Engine) terminal(m *mixture, ps []*pair) *pair {
	head := ps[0]
	if head.eCell <= 0 {
		return head
	}
	for _, p := range ps {
		if p.ox.main.Ion() != head.ox.main.Ion() || p.red.row != head.red.row || p.eff <= 0 || p.eCell <= 0 || p.rxn() == nil {
			continue
		}
		if !e.reducedFurther(m, p.ox, p.red) {
			return p
		}
	}
	return head
}

// reducedFurther reports whether a product of ox's couple would be reduced
// by red, spontaneously and without a kinetic allowance against it.
func (e *Engine) reducedFurther(m *mixture, ox, red *side) bool {
	med := mediumOf(m.pH)
	for _, prod := range ox.row.Products {
		// A gas leaves the liquid before it can react on (common
		// practice): NO from nitric acid, Cl2 from hypochlorite.
		if isSolvent(prod.Species) || prod.Phase == Gas {
			continue
		}

		for i, h := range e.Tables.Half {
			if h == ox.row || h == red.row || (h.Medium != Any && h.Medium != med) {
				continue
			}
			uses := false
			ok := true
			for _, r := range h.Reactants {
				switch {
				case isSolvent(r.Species):
				case mixKey(r.Species) == mixKey(prod.Species):
					uses = true
				case !m.has(r.Species):
					ok = false
				}
			}
			if !uses || !ok || !e.firstOxidized(h, prod.Species) {
				continue
			}
			s := &side{row: h, idx: i, role: OxidizerRole, main: prod.Species, e: m.potential(h)}
			e.applyKinetics(m, s)
			if s.effE()-red.effE() > 0 {
				return true
			}
		}
	}
	return false
}

// firstOxidized reports whether sp is the species a couple reduces (its
// first reactant other than water, H+ and OH-).
func (e *Engine) firstOxidized(h *HalfReaction, sp Species) bool {
	for _, r := range h.Reactants {
		if isSolvent(r.Species) {
			continue
		}
		return mixKey(r.Species) == mixKey(sp)
	}
	return false
}
