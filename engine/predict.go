package engine

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

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

func (rx *netReaction) text() string {

	return termsText(rx.reactants) + " → " + termsText(rx.products)
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
