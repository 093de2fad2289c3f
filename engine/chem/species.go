// Package chem holds the project's chemical notation: species as written in
// every data table (Fe^3+, SO4^2-, Cu(s), Cl2(g)), formulas and their atom
// counts, atomic weights, and average oxidation states. It is pure
// computation: no I/O beyond the bytes handed in, no globals that mutate.
package chem

import (
	"fmt"
	"strconv"
	"strings"
)

// Phase is the physical state of a species: aqueous, solid, liquid or gas.
type Phase string

// The phases a species can be in. Their string values are part of the JSON
// contract of `mixward ask --format json`.
const (
	Aqueous Phase = "aq"
	Solid   Phase = "s"
	Liquid  Phase = "l"
	Gas     Phase = "g"
)

// Species is one chemical entity in one phase: Fe^3+(aq), Cu(s), Cl2(g).
// Formula is the neutral part as usually written (Cr2O7, H2O, Fe).
type Species struct {
	Formula string
	Charge  int
	Phase   Phase
}

// Text is the species as shown to operators: the formula followed by the
// charge. A charge of ±1 is written as a bare sign (MnO4-, H+); larger charges
// are written after a caret (Fe^3+, SO4^2-) so that the charge can never be
// read as a subscript. Aqueous species carry no phase suffix; other phases do
// (Cu(s), Cl2(g), H2O(l)).
func (s Species) Text() string {
	if s.Phase == Aqueous || s.Phase == "" {
		return s.Ion()
	}
	t := s.Formula + ChargeText(s.Charge)
	if s.Phase != Aqueous && s.Phase != "" {
		t += "(" + string(s.Phase) + ")"
	}
	return t
}

// Ion is the species text without its phase suffix (Fe^3+, Cu, Cl2).
func (s Species) Ion() string {
	if s.Charge == 0 {
		return s.Formula
	}
	return s.Formula + ChargeText(s.Charge)
}

// ChargeText is the charge as written after a formula: "" for 0, "+" and "-"
// for ±1, "^2+", "^3-" and so on for larger charges.
func ChargeText(z int) string {
	switch z {
	case 0:
		return ""
	case 1:
		return "+"
	case -1:
		return "-"
	case 2:
		return "^2+"
	case 3:
		return "^3+"
	case -2:
		return "^2-"
	case -3:
		return "^3-"
	}
	switch {
	case z > 1:
		return "^" + strconv.Itoa(z) + "+"
	default:
		return "^" + strconv.Itoa(-z) + "-"
	}
}

// Key identifies a species uniquely, phase included.
func (s Species) Key() string { return s.Ion() + "(" + string(s.Phase) + ")" }

// IsWater reports whether s is liquid water.
func (s Species) IsWater() bool { return s.Formula == "H2O" && s.Charge == 0 }

// IsProton reports whether s is the hydrogen ion H+.
func (s Species) IsProton() bool { return s.Formula == "H" && s.Charge == 1 }

// IsHydroxide reports whether s is the hydroxide ion OH-.
func (s Species) IsHydroxide() bool { return s.Formula == "OH" && s.Charge == -1 }

// IsElectron reports whether s is the electron, written e- in tables.
func (s Species) IsElectron() bool { return s.Formula == "e" && s.Charge == -1 }

// ParseSpecies reads a species in the notation of the data tables:
// a formula, an optional charge, an optional phase suffix.
//
//	H+  OH-  MnO4-  Fe^3+  SO4^2-  Cu(s)  Cl2(g)  H2O(l)  Cl2(aq)  e-
//
// A charge other than ±1 must follow a caret. Without a phase suffix an ion is
// aqueous, and a neutral species is aqueous too except water, which is liquid
// (H2O(aq) is read as H2O(l) as well).
func ParseSpecies(text string) (Species, error) {
	sp, _, err := parseSpecies(text, false)
	return sp, err
}

// ParseSpeciesAtoms is ParseSpecies that also returns the atom counts of the
// formula (nil for the electron), parsed once for both.
func ParseSpeciesAtoms(text string) (Species, Atoms, error) {
	return parseSpecies(text, true)
}

// parseSpecies reads a species; with atoms it also returns the formula's atom
// counts, without it only checks the formula.
func parseSpecies(text string, atoms bool) (Species, Atoms, error) {
	t := strings.TrimSpace(text)
	if t == "" {
		return Species{}, nil, fmt.Errorf("empty species")
	}
	var sp Species
	// Phase suffix.
	for _, ps := range phaseSuffixes {
		if strings.HasSuffix(t, ps.suffix) {
			sp.Phase = ps.phase
			t = t[:len(t)-len(ps.suffix)]
			break
		}
	}
	// Charge.
	if i := strings.IndexByte(t, '^'); i >= 0 {
		ch := t[i+1:]
		t = t[:i]
		if len(ch) < 2 {
			return Species{}, nil, fmt.Errorf("species %q: charge after '^' must be digits and a sign, like ^2+", text)
		}
		sign := ch[len(ch)-1]
		n, err := strconv.Atoi(ch[:len(ch)-1])
		if err != nil || n <= 0 || (sign != '+' && sign != '-') {
			return Species{}, nil, fmt.Errorf("species %q: charge after '^' must be digits and a sign, like ^2+", text)
		}
		if sign == '-' {
			n = -n
		}
		sp.Charge = n
	} else if strings.HasSuffix(t, "+") {
		sp.Charge = 1
		t = t[:len(t)-1]
	} else if strings.HasSuffix(t, "-") {
		sp.Charge = -1
		t = t[:len(t)-1]
	}
	if t == "" {
		return Species{}, nil, fmt.Errorf("species %q has no formula", text)
	}
	sp.Formula = t
	if t == "e" {
		if sp.Charge != -1 {
			return Species{}, nil, fmt.Errorf("species %q: the electron is written e-", text)
		}
		sp.Phase = Aqueous
		return sp, nil, nil
	}
	var a Atoms
	var err error
	if atoms {
		a, err = ParseFormula(t)
	} else {
		err = CheckFormula(t)
	}
	if err != nil {
		return Species{}, nil, fmt.Errorf("species %q: %w", text, err)
	}
	if sp.Phase == "" {
		sp.Phase = Aqueous
	}
	if sp.Phase == Aqueous && sp.Charge == 0 && t == "H2O" {
		// Water in water is the solvent: H2O and H2O(aq) both mean H2O(l),
		// so that the two spellings give one species with one Key.
		sp.Phase = Liquid
	}
	return sp, a, nil
}

// phaseSuffixes are the phase suffixes ParseSpecies reads.
var phaseSuffixes = [...]struct {
	suffix string
	phase  Phase
}{{"(aq)", Aqueous}, {"(s)", Solid}, {"(l)", Liquid}, {"(g)", Gas}}
