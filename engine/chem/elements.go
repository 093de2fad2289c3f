package chem

import (
	"bufio"
	"bytes"
	"fmt"
	"math"
	"strconv"
	"strings"
)

// ElementsFile is the name of the atomic-weight table at the root of the data
// directory.
const ElementsFile = "elements.txt"

// ReadAtomicWeights reads an atomic-weight table (data/elements.txt): rows of
// `symbol | name | standard atomic weight g/mol | source`, blank lines and
// #-comments skipped. It returns the weights by symbol. Every bad row is
// reported, joined in one error, each as `FILE:LINE: what is wrong; what to do`
// with FILE the name given.
func ReadAtomicWeights(file string, b []byte) (map[string]float64, error) {
	w := map[string]float64{}
	names := map[string]int{}
	var errs []string
	sc := bufio.NewScanner(bytes.NewReader(b))
	line := 0
	for sc.Scan() {
		line++
		text := strings.TrimSpace(strings.TrimPrefix(sc.Text(), "\ufeff"))
		if text == "" || strings.HasPrefix(text, "#") {
			continue
		}
		if msg := readElementRow(text, line, w, names); msg != "" {
			errs = append(errs, fmt.Sprintf("%s:%d: %s", file, line, msg))
		}
	}
	if err := sc.Err(); err != nil {
		errs = append(errs, fmt.Sprintf("%s:%d: cannot read the line (%v); keep lines under 64 KiB", file, line+1, err))
	}
	if len(w) == 0 && len(errs) == 0 {
		errs = append(errs, file+": the table has no rows; restore it from version control")
	}
	if len(errs) > 0 {
		return nil, fmt.Errorf("%s", strings.Join(errs, "\n"))
	}
	return w, nil
}

// readElementRow checks one row and records it; it returns what is wrong, or
// "" when the row is good.
func readElementRow(text string, line int, w map[string]float64, names map[string]int) string {
	f := strings.Split(text, "|")
	if len(f) != 4 {
		return fmt.Sprintf("has %d fields, want 4 (symbol | name | weight | source); separate them with \" | \"", len(f))
	}
	for i := range f {
		f[i] = strings.TrimSpace(f[i])
		if f[i] == "" {
			return fmt.Sprintf("field %d is empty; fill in every field, the source last", i+1)
		}
	}
	sym, name := f[0], f[1]
	if !IsElementSymbol(sym) {
		return fmt.Sprintf("%q is not an element symbol; write a capital letter followed by up to two small letters (Fe, Cl)", sym)
	}
	if _, dup := w[sym]; dup {
		return fmt.Sprintf("%s is listed twice; keep one row per element", sym)
	}
	if prev, dup := names[name]; dup {
		return fmt.Sprintf("name %q is already used by the element at line %d; fix one of them", name, prev)
	}
	v, err := strconv.ParseFloat(f[2], 64)
	if err != nil || math.IsNaN(v) || v <= 0 || v > 300 {
		return fmt.Sprintf("atomic weight %q must be a standard atomic weight in g/mol between 0 and 300", f[2])
	}
	names[name] = line
	w[sym] = v
	return ""
}

// IsElementSymbol reports whether s is written like an element symbol: a
// capital letter followed by up to two small letters.
func IsElementSymbol(s string) bool {
	if len(s) == 0 || len(s) > 3 || s[0] < 'A' || s[0] > 'Z' {
		return false
	}
	for i := 1; i < len(s); i++ {
		if s[i] < 'a' || s[i] > 'z' {
			return false
		}
	}
	return true
}

// Electronegativity is the Pauling electronegativity of an element, and false
// for an element without a value (He, Ne, Ar). Values on the Pauling scale as
// tabulated in the CRC Handbook of Chemistry and Physics, "Electronegativity"
// (Pauling's values as revised by Allred 1961); from memory. They are used only
// to order elements whose oxidation states no other rule fixes.
func Electronegativity(el string) (float64, bool) {
	v, ok := pauling[el]
	return v, ok
}

var pauling = map[string]float64{
	"H": 2.20, "Li": 0.98, "Be": 1.57, "B": 2.04, "C": 2.55, "N": 3.04, "O": 3.44, "F": 3.98,
	"Na": 0.93, "Mg": 1.31, "Al": 1.61, "Si": 1.90, "P": 2.19, "S": 2.58, "Cl": 3.16,
	"K": 0.82, "Ca": 1.00, "Sc": 1.36, "Ti": 1.54, "V": 1.63, "Cr": 1.66, "Mn": 1.55, "Fe": 1.83,
	"Co": 1.88, "Ni": 1.91, "Cu": 1.90, "Zn": 1.65, "Ga": 1.81, "Ge": 2.01, "As": 2.18, "Se": 2.55,
	"Br": 2.96, "Kr": 3.00, "Rb": 0.82, "Sr": 0.95, "Y": 1.22, "Zr": 1.33, "Nb": 1.6, "Mo": 2.16,
	"Tc": 1.9, "Ru": 2.2, "Rh": 2.28, "Pd": 2.20, "Ag": 1.93, "Cd": 1.69, "In": 1.78, "Sn": 1.96,
	"Sb": 2.05, "Te": 2.1, "I": 2.66, "Xe": 2.6, "Cs": 0.79, "Ba": 0.89, "La": 1.10, "Ce": 1.12,
	"Pr": 1.13, "Nd": 1.14, "Pm": 1.13, "Sm": 1.17, "Eu": 1.2, "Gd": 1.20, "Tb": 1.1, "Dy": 1.22,
	"Ho": 1.23, "Er": 1.24, "Tm": 1.25, "Yb": 1.1, "Lu": 1.27, "Hf": 1.3, "Ta": 1.5, "W": 2.36,
	"Re": 1.9, "Os": 2.2, "Ir": 2.20, "Pt": 2.28, "Au": 2.54, "Hg": 2.00, "Tl": 1.62, "Pb": 2.33,
	"Bi": 2.02, "Th": 1.3, "Pa": 1.5, "U": 1.38,
}

// valence is the number of valence electrons of the non-metals (metalloids
// Ge, As, Sb, Te included): their lowest oxidation state is valence−8, their
// highest is valence (O and F excepted, see stateRange).
var valence = map[string]int{
	"H": 1, "He": 8, "B": 3, "C": 4, "N": 5, "O": 6, "F": 7, "Ne": 8, "Si": 4, "P": 5, "S": 6,
	"Cl": 7, "Ar": 8, "Ge": 4, "As": 5, "Se": 6, "Br": 7, "Kr": 8, "Sb": 5, "Te": 6, "I": 7, "Xe": 8,
}

// IsMetal reports whether el counts as a metal for the oxidation-state rules:
// every element that is not a non-metal or one of the metalloids B, Si, Ge,
// As, Sb, Te.
func IsMetal(el string) bool {
	_, nonMetal := valence[el]
	return !nonMetal
}

var (
	alkali        = map[string]bool{"Li": true, "Na": true, "K": true, "Rb": true, "Cs": true}
	alkalineEarth = map[string]bool{"Be": true, "Mg": true, "Ca": true, "Sr": true, "Ba": true}
)

// metalStates lists, for metals met in plant chemistry, their common positive
// oxidation states, most common first in the compounds where the fallback
// rule is needed (Au(I) in cyanide; common practice, no source). The
// fallback rule of OxidationStates tries them in this order.
var metalStates = map[string][]int{
	"Fe": {3, 2}, "Co": {2, 3}, "Ni": {2}, "Cu": {2, 1}, "Mn": {2, 4}, "Cr": {3, 6}, "Ag": {1},
	"Au": {1, 3}, "Zn": {2}, "Cd": {2}, "Hg": {2, 1}, "Pb": {2, 4}, "Sn": {2, 4}, "Al": {3},
	"Ti": {4}, "Pt": {2, 4}, "Pd": {2}, "Rh": {3}, "V": {5, 4}, "Mo": {6}, "W": {6}, "U": {6},
	"Ga": {3}, "In": {3}, "Tl": {1}, "Bi": {3}, "Ce": {3, 4}, "La": {3}, "Zr": {4},
}

// metalMax is the highest oxidation state the plausibility check accepts for
// a metal; metals not listed may go up to +8.
var metalMax = map[string]int{
	"Zn": 2, "Cd": 2, "Hg": 2, "Al": 3, "Ga": 3, "In": 3, "Tl": 3, "Ag": 3, "Cu": 4, "Ni": 4,
	"Pb": 4, "Sn": 4, "Ti": 4, "Zr": 4, "Cr": 6, "Mn": 7, "Fe": 6, "Co": 5, "Bi": 5, "U": 6,
}

// stateRange is the range of oxidation states an element can plausibly have.
func stateRange(el string) (lo, hi float64) {
	switch {
	case el == "H":
		return -1, 1
	case el == "O":
		return -2, 2
	case el == "F":
		return -1, 0
	case alkali[el]:
		return 0, 1
	case alkalineEarth[el]:
		return 0, 2
	}
	if v, ok := valence[el]; ok {
		if v == 8 {
			return 0, 8
		}
		return float64(v - 8), float64(v)
	}
	if m, ok := metalMax[el]; ok {
		return 0, float64(m)
	}
	return 0, 8
}

// PlausibleState reports whether v lies within the oxidation states element el
// can have: for a non-metal from its valence count less eight up to its
// valence count (N −3…+5, S −2…+6, Cl −1…+7; O −2…+2, F −1…0), for a metal from
// 0 up to its highest known state (Mn +7, Cr +6, Zn +2; +8 when not listed).
func PlausibleState(el string, v float64) bool {
	lo, hi := stateRange(el)
	return v >= lo-1e-9 && v <= hi+1e-9
}
