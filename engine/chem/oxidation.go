package chem

import (
	"fmt"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"
)

// OxidationStates assigns the average oxidation state of every element of a
// species with the given atoms and charge. The states add up to the charge.
//
// The rules, in order (the usual textbook rules, common practice, no source):
//
//  1. override fixes the states it names (O=-1 in a peroxide, Cl=1 in
//     monochloramine where water treatment counts its chlorine as +1).
//  2. When one element is left undetermined it takes the balance, which may be
//     a fraction: the average state (S +2 in S2O3^2-, S +2.5 in S4O6^2-, Fe +8/3
//     in Fe3O4). A species of one element has the charge shared out.
//  3. Otherwise: F −1; O −2 unless F is present (OF2); H +1, but −1 when every
//     other element is a metal or boron (the hydrides NaH, BH4-, AlH4-); the
//     alkali metals +1, the alkaline-earth metals +2; Cl, Br and I −1 unless
//     the species has O or a more electronegative halogen (ClO-, ICl). Then
//     rule 2 again; when every element is fixed the states must add up to the
//     charge, else the species needs an override (H2O2, KO2) and the error
//     says so.
//  4. Two or more left undetermined: a metal among them takes one of its
//     common states (metalStates, most common first); the non-metals take, in
//     order of decreasing Pauling electronegativity (Electronegativity), their
//     lowest state (valence electrons less eight: N −3, S −2, C −4) except the
//     least electronegative, which takes the balance. So CN- is C +2 N −3, and
//     SCN- is S −2, C +4, N −3 (the convention that treats thiocyanate like
//     cyanate with S for O), CH3NH2 is C −2, Fe(CN)6^3- is Fe +3, C +2, N −3.
//     The first choice of metal states that leaves every state plausible
//     (PlausibleState) and the balance whole is taken; failing that, the first
//     plausible one; failing that, the least electronegative metal takes the
//     balance instead (MoS2: S −2, Mo +4); failing that, an error asks for an
//     override.
//
// Without an override NH2Cl comes out N −1, Cl −1 (Cl is the more
// electronegative by Pauling's scale); water treatment's convention, Cl +1 and
// N −3, is had with the override Cl=1.
func OxidationStates(atoms Atoms, charge int, override map[string]float64) (map[string]float64, error) {
	if len(atoms) == 0 {
		return nil, fmt.Errorf("no atoms to assign oxidation states to")
	}
	st := make(map[string]float64, len(atoms))
	for el, n := range atoms {
		if n <= 0 {
			return nil, fmt.Errorf("element %s has count %d; counts must be positive", el, n)
		}
		if len(atoms) == 1 && len(override) == 0 {
			st[el] = float64(charge) / float64(n) // O2, Fe^3+, Hg2^2+
			return st, nil
		}
	}
	for el, v := range override {
		if atoms[el] == 0 {
			return nil, fmt.Errorf("the override %s=%g names an element the formula does not contain; remove it or fix the element", el, v)
		}
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("the override %s=%g is not a number", el, v)
		}
		st[el] = v
	}
	und := undetermined(atoms, st)
	if len(und) > 1 {
		usualRules(atoms, st, und)
		left := und[:0]
		for _, el := range und {
			if _, ok := st[el]; !ok {
				left = append(left, el)
			}
		}
		und = left
	}
	switch len(und) {
	case 0:
		if sum := stateSum(atoms, st); math.Abs(sum-float64(charge)) > 1e-9 {
			return nil, fmt.Errorf("the usual rules give %s, which add up to %s, not the charge %+d; give the odd element's state as an attribute (O=-1 for a peroxide)",
				statesText(st), strconv.FormatFloat(sum, 'g', 6, 64), charge)
		}
	case 1:
		el := und[0]
		st[el] = (float64(charge) - stateSum(atoms, st)) / float64(atoms[el])
	default:
		if err := fallbackStates(atoms, charge, st, und); err != nil {
			return nil, err
		}
	}
	return st, nil
}

// undetermined lists the elements of atoms without a state in st, in no
// particular order.
func undetermined(atoms Atoms, st map[string]float64) []string {
	out := make([]string, 0, len(atoms))
	for el := range atoms {
		if _, ok := st[el]; !ok {
			out = append(out, el)
		}
	}
	return out
}

// byElectronegativity sorts els most electronegative first (ties by symbol,
// elements without a value last) and returns it.
func byElectronegativity(els []string) []string {
	slices.SortFunc(els, func(x, y string) int {
		a, b := pauling[x], pauling[y]
		switch {
		case a > b:
			return -1
		case a < b:
			return 1
		}
		return strings.Compare(x, y)
	})
	return els
}

// usualRules applies rule 3 of OxidationStates to the undetermined elements.
func usualRules(atoms Atoms, st map[string]float64, und []string) {
	has := func(el string) bool { return atoms[el] > 0 }
	onlyMetalsOrBoron := true
	for el := range atoms {
		if el != "H" && el != "B" && !IsMetal(el) {
			onlyMetalsOrBoron = false
		}
	}
	halogens := []string{"F", "Cl", "Br", "I"}
	for _, el := range und {
		switch {
		case el == "F":
			st[el] = -1
		case el == "O" && !has("F"):
			st[el] = -2
		case el == "H" && onlyMetalsOrBoron:
			st[el] = -1
		case el == "H":
			st[el] = 1
		case alkali[el]:
			st[el] = 1
		case alkalineEarth[el]:
			st[el] = 2
		case el == "Cl" || el == "Br" || el == "I":
			free := !has("O")
			for _, h := range halogens {
				if h == el {
					break
				}
				free = free && !has(h)
			}
			if free {
				st[el] = -1
			}
		}
	}
}

// fallbackStates applies rule 4 of OxidationStates. When no choice of the
// metals' common states works, the least electronegative metal takes the
// balance instead (MoS2: S −2, Mo +4).
func fallbackStates(atoms Atoms, charge int, st map[string]float64, und []string) error {
	und = byElectronegativity(und)
	var metals, others []string
	for _, el := range und {
		if _, ok := metalStates[el]; ok {
			metals = append(metals, el)
		} else {
			others = append(others, el)
		}
	}
	if len(others) == 0 {
		// Only metals with common states are left: the least
		// electronegative takes the balance.
		others, metals = metals[len(metals)-1:], metals[:len(metals)-1]
	}
	found := tryMetalStates(atoms, charge, st, metals, others)
	if found == nil && len(metals) > 0 {
		last := metals[len(metals)-1]
		others = byElectronegativity(append(append([]string(nil), others...), last))
		found = tryMetalStates(atoms, charge, st, metals[:len(metals)-1], others)
	}
	if found == nil {
		return fmt.Errorf("cannot assign oxidation states to %s by the usual rules; give them as attributes (like Fe=2)", strings.Join(und, ", "))
	}
	for el, v := range found {
		st[el] = v
	}
	return nil
}

// tryMetalStates tries every choice of the metals' common states and returns
// the first that leaves every state plausible and the balance whole, else the
// first plausible one, else nil.
func tryMetalStates(atoms Atoms, charge int, st map[string]float64, metals, others []string) map[string]float64 {
	var plausible map[string]float64
	for _, combo := range stateCombos(metals) {
		trial := make(map[string]float64, len(atoms))
		for el, v := range st {
			trial[el] = v
		}
		for i, el := range metals {
			trial[el] = float64(combo[i])
		}
		whole, ok := balanceNonMetals(atoms, charge, trial, others)
		if !ok {
			continue
		}
		if whole {
			return trial
		}
		if plausible == nil {
			plausible = trial
		}
	}
	return plausible
}

// balanceNonMetals gives each element of others (most electronegative first)
// its lowest state, except the last, which takes the balance. It reports
// whether every state is plausible, and whether the balance is whole.
func balanceNonMetals(atoms Atoms, charge int, trial map[string]float64, others []string) (whole, ok bool) {
	last := others[len(others)-1]
	for _, el := range others[:len(others)-1] {
		v, nonMetal := valence[el]
		if !nonMetal {
			return false, false // two metals without common states
		}
		trial[el] = float64(v - 8)
	}
	b := (float64(charge) - stateSum(atoms, trial)) / float64(atoms[last])
	trial[last] = b
	for el, v := range trial {
		if !PlausibleState(el, v) {
			return false, false
		}
	}
	return math.Abs(b-math.Round(b)) < 1e-9, true
}

// stateCombos lists every choice of one common state per metal, the most
// common choices first.
func stateCombos(metals []string) [][]int {
	combos := [][]int{nil}
	for _, el := range metals {
		var next [][]int
		for _, c := range combos {
			for _, s := range metalStates[el] {
				next = append(next, append(append([]int(nil), c...), s))
			}
		}
		combos = next
	}
	return combos
}

func stateSum(atoms Atoms, st map[string]float64) float64 {
	sum := 0.0
	for el, v := range st {
		sum += v * float64(atoms[el])
	}
	return sum
}

// statesText writes states as "H +1, O -2" in symbol order.
func statesText(st map[string]float64) string {
	els := make([]string, 0, len(st))
	for el := range st {
		els = append(els, el)
	}
	sort.Strings(els)
	parts := make([]string, len(els))
	for i, el := range els {
		parts[i] = el + " " + strconv.FormatFloat(st[el], 'g', 4, 64)
		if st[el] > 0 {
			parts[i] = el + " +" + strconv.FormatFloat(st[el], 'g', 4, 64)
		}
	}
	return strings.Join(parts, ", ")
}
