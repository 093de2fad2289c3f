package thermo

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"mixward/engine/chem"
)

// Term is one species of a reaction with its coefficient: Nu < 0 consumed,
// Nu > 0 formed.
type Term struct {
	Species *Species
	Nu      float64
}

// Reaction is a balanced reaction between species of a DB. A half-reaction is
// written as a reduction and consumes Electrons on the left; a full reaction
// has Electrons 0.
type Reaction struct {
	Terms     []Term
	Electrons int
}

// maxCoef bounds a coefficient of ParseReaction.
const maxCoef = 1000

// ParseReaction reads a reaction in the notation of the half-reaction table:
// terms `[coefficient] species` joined by " + ", the two sides by "->" (or
// "→"), electrons written e- on the left of a reduction:
//
//	Fe^3+ + e- -> Fe^2+
//	2 H+ + 2 e- -> H2(g)
//	AgCl(s) -> Ag+ + Cl-
//
// Coefficients may be decimal (0.5 O2(g)). Every species must have a row in
// db, and atoms and charge must balance.
func ParseReaction(db *DB, text string) (Reaction, error) {
	t := strings.Replace(text, "→", "->", 1)
	left, right, ok := strings.Cut(t, "->")
	if !ok || strings.Contains(right, "->") || strings.Contains(right, "→") {
		return Reaction{}, fmt.Errorf("reaction %q needs exactly one -> between the two sides", text)
	}
	var r Reaction
	sides := [2]string{left, right}
	for i, side := range sides {
		sign := -1.0
		if i == 1 {
			sign = 1
		}
		e, err := r.addSide(db, side, sign)
		if err != nil {
			return Reaction{}, fmt.Errorf("reaction %q: %w", text, err)
		}
		if i == 1 && e != 0 {
			return Reaction{}, fmt.Errorf("reaction %q: write a half-reaction as a reduction, with the electrons on the left", text)
		}
		r.Electrons += e
	}
	if len(r.Terms) == 0 {
		return Reaction{}, fmt.Errorf("reaction %q has no species", text)
	}
	if err := r.balance(); err != nil {
		return Reaction{}, fmt.Errorf("reaction %q: %w", text, err)
	}
	return r, nil
}

// addSide parses one side and appends its terms with the given sign. It
// returns the number of electrons on the side.
func (r *Reaction) addSide(db *DB, side string, sign float64) (int, error) {
	side = strings.TrimSpace(side)
	if side == "" {
		return 0, fmt.Errorf("one side is empty")
	}
	electrons := 0
	for _, part := range strings.Split(side, " + ") {
		words := strings.Fields(part)
		coef := 1.0
		switch len(words) {
		case 1:
		case 2:
			c, err := strconv.ParseFloat(words[0], 64)
			if err != nil || !(c > 0) || c > maxCoef {
				return 0, fmt.Errorf("coefficient %q of %s must be a number above 0 and at most %d", words[0], words[1], maxCoef)
			}
			coef = c
		default:
			return 0, fmt.Errorf("term %q is not `species` or `coefficient species`; separate terms with \" + \"", strings.TrimSpace(part))
		}
		name := words[len(words)-1]
		if name == "e-" {
			if coef != math.Trunc(coef) {
				return 0, fmt.Errorf("the electrons must be a whole number, not %s", words[0])
			}
			electrons += int(coef)
			continue
		}
		sp, ok := db.Get(name)
		if !ok {
			if _, err := chem.ParseSpecies(name); err != nil {
				return 0, fmt.Errorf("%v; write species like H+, MnO4-, Fe^3+, Cu(s), Cl2(g)", err)
			}
			return 0, fmt.Errorf("no species row for %s; add it to %s%s", name, tableDir, SpeciesFile)
		}
		r.Terms = append(r.Terms, Term{Species: sp, Nu: sign * coef})
	}
	return electrons, nil
}

// balance checks atoms and charge, electrons counting −1 each on the left.
func (r Reaction) balance() error {
	atoms := map[string]float64{}
	charge := float64(r.Electrons) // electrons consumed: −(−1)·n
	for _, t := range r.Terms {
		for el, n := range t.Species.Atoms {
			atoms[el] += t.Nu * float64(n)
		}
		charge += t.Nu * float64(t.Species.Charge)
	}
	var off []string
	for el, n := range atoms {
		if math.Abs(n) > 1e-9 {
			off = append(off, fmt.Sprintf("%s %+g", el, n))
		}
	}
	sort.Strings(off)
	if math.Abs(charge) > 1e-9 {
		off = append(off, fmt.Sprintf("charge %+g", charge))
	}
	if len(off) > 0 {
		return fmt.Errorf("does not balance (right less left: %s); fix the coefficients", strings.Join(off, ", "))
	}
	return nil
}

// DeltaG is ΔrG at tempK in kJ/mol: Σ ν·ΔfG(T) with each species' ΔfG(T)
// from DfGAt (constant ΔfH°).
func (r Reaction) DeltaG(tempK float64) float64 {
	g := 0.0
	for _, t := range r.Terms {
		g += t.Nu * t.Species.DfGAt(tempK)
	}
	return g
}

// DeltaH is ΔrH° in kJ/mol, and false when a species has no ΔfH°.
func (r Reaction) DeltaH() (float64, bool) {
	h := 0.0
	for _, t := range r.Terms {
		if !t.Species.HasDfH {
			return 0, false
		}
		h += t.Nu * t.Species.DfH
	}
	return h, true
}

// LogK is log10 of the equilibrium constant at tempK: −ΔrG/(RT ln 10). For a
// half-reaction it is the constant with the electron's activity left out.
func (r Reaction) LogK(tempK float64) float64 {
	return -r.DeltaG(tempK) * 1000 / (R * tempK * math.Ln10)
}

// E0 is the standard potential of a half-reaction at tempK in volts,
// −ΔrG/(nF). It panics for a reaction without electrons.
func (r Reaction) E0(tempK float64) float64 {
	if r.Electrons == 0 {
		panic("thermo: E0 of a reaction without electrons")
	}
	return -r.DeltaG(tempK) * 1000 / (float64(r.Electrons) * F)
}

// String writes the reaction back in the notation ParseReaction reads.
func (r Reaction) String() string {
	var left, right []string
	for _, t := range r.Terms {
		s := t.Species.Text
		if n := math.Abs(t.Nu); n != 1 {
			s = strconv.FormatFloat(n, 'g', -1, 64) + " " + s
		}
		if t.Nu < 0 {
			left = append(left, s)
		} else {
			right = append(right, s)
		}
	}
	if r.Electrons > 0 {
		e := "e-"
		if r.Electrons != 1 {
			e = strconv.Itoa(r.Electrons) + " e-"
		}
		left = append(left, e)
	}
	return strings.Join(left, " + ") + " -> " + strings.Join(right, " + ")
}
