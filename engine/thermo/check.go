package thermo

import (
	"errors"
	"fmt"
	"math"

	"mixward/engine/chem"
)

// Bounds of Check. They catch typing slips (a kJ value written in J, a sign
// lost, ΔfH° and ΔfG° in the wrong columns), not the last kJ of a value.
const (
	// maxFormationEntropy bounds |ΔfS°| = |ΔfH° − ΔfG°|/298.15 K per atom and
	// unit of charge, J/(mol·K). Real values lie well inside: liquid water
	// −163 for three atoms, Al^3+ about −154 for one atom of charge 3.
	maxFormationEntropy = 200.0
	// maxEntropyPerAtom and entropyBase bound S° from above:
	// S° ≤ entropyBase + maxEntropyPerAtom·atoms (gases stay below ~70 per atom).
	maxEntropyPerAtom = 100.0
	entropyBase       = 250.0
	// minIonEntropy bounds S° of an ion from below per unit of charge (on the
	// H+ = 0 scale strongly hydrated cations go negative: Fe^3+ −316, Th^4+ −423).
	minIonEntropy = -160.0
	// entropyTolerance is how far ΔfH° − ΔfG° may differ from 298.15 K·ΔfS°
	// computed from S° and the elements' S°, kJ/mol.
	entropyTolerance = 3.0
)

// Check validates the whole table, beyond what Load needs to read it: every
// row has a source; its elements are in elements.txt; the oxidation states can
// be assigned and are plausible; H+ is zero; S° is sane; ΔfH° and ΔfG° imply a
// sane entropy of formation, and, where S° of the species and of every
// element's reference row (ΔfG° = ΔfH° = 0) are given, agree with it within
// 3 kJ/mol. Every problem is reported, each as `data/species.txt:LINE: what is
// wrong; what to do`, joined with errors.Join. Tests run it on data/, and so
// can a maintainer after editing the table.
func (db *DB) Check() error {
	refS := db.referenceEntropies()
	var errs []error
	for _, sp := range db.list {
		for _, msg := range db.checkRow(sp, refS) {
			errs = append(errs, &RowError{File: db.file, Line: sp.Line, Msg: msg})
		}
	}
	return errors.Join(errs...)
}

// checkRow returns what is wrong with one row.
func (db *DB) checkRow(sp *Species, refS map[string]float64) []string {
	var bad []string
	if sp.Source == "" || sp.Source == "-" {
		bad = append(bad, fmt.Sprintf("%s has no source; name where the values come from (\"from memory\" if recalled)", sp.Text))
	}
	known := true
	for el := range sp.Atoms {
		if _, ok := db.atomic[el]; !ok {
			bad = append(bad, fmt.Sprintf("%s: element %q is not in %s%s; add it there or fix the formula", sp.Text, el, tableDir, chem.ElementsFile))
			known = false
		}
	}
	if !known {
		return bad
	}
	bad = append(bad, checkOx(sp)...)
	if sp.IsProton() && (sp.DfG != 0 || sp.DfH != 0 || sp.S != 0) {
		bad = append(bad, "H+ is zero in ΔfG°, ΔfH° and S° by convention; write 0 in each")
	}
	bad = append(bad, checkEntropy(sp)...)
	if msg := checkPair(sp, refS); msg != "" {
		bad = append(bad, msg)
	}
	return bad
}

// checkOx reports oxidation states that could not be assigned or are
// implausible.
func checkOx(sp *Species) []string {
	if sp.oxErr != nil {
		return []string{fmt.Sprintf("%s: oxidation states: %v", sp.Text, sp.oxErr)}
	}
	var bad []string
	for _, el := range sortedKeys(sp.Ox) {
		if v := sp.Ox[el]; !chem.PlausibleState(el, v) {
			bad = append(bad, fmt.Sprintf("%s: the rules give %s an oxidation state of %.3g, which it cannot have; check formula and charge, or give it as an attribute (%s=n)", sp.Text, el, v, el))
		}
	}
	return bad
}

// checkEntropy bounds S° and the entropy of formation implied by ΔfH° − ΔfG°.
func checkEntropy(sp *Species) []string {
	var bad []string
	atoms := 0
	for _, n := range sp.Atoms {
		atoms += n
	}
	z := math.Abs(float64(sp.Charge))
	if sp.HasS {
		hi := entropyBase + maxEntropyPerAtom*float64(atoms)
		lo := 0.0
		if sp.Charge != 0 {
			lo = minIonEntropy * z
		}
		if (sp.Charge == 0 && sp.S <= 0) || sp.S < lo || sp.S > hi {
			bad = append(bad, fmt.Sprintf("S° %g J/(mol·K) is outside the sane range for %s (%g…%g; above 0 for a neutral species); check the value and its units", sp.S, sp.Text, lo, hi))
		}
	}
	if sp.HasDfH {
		dS := (sp.DfH - sp.DfG) * 1000 / T0
		if lim := maxFormationEntropy * (float64(atoms) + z); math.Abs(dS) > lim {
			bad = append(bad, fmt.Sprintf("ΔfH° %g and ΔfG° %g kJ/mol imply an entropy of formation of %.0f J/(mol·K), beyond ±%.0f for %s; check both values, their signs and their columns", sp.DfH, sp.DfG, dS, lim, sp.Text))
		}
	}
	return bad
}

// referenceEntropies returns S° per atom of each element's reference row: a
// neutral row of that element alone with ΔfG° = ΔfH° = 0 and S° given
// (H2(g), Cl2(g), Fe(s)).
func (db *DB) referenceEntropies() map[string]float64 {
	ref := map[string]float64{}
	for _, sp := range db.list {
		if len(sp.Atoms) != 1 || sp.Charge != 0 || sp.DfG != 0 || !sp.HasDfH || sp.DfH != 0 || !sp.HasS {
			continue
		}
		for el, n := range sp.Atoms {
			if _, seen := ref[el]; !seen {
				ref[el] = sp.S / float64(n)
			}
		}
	}
	return ref
}

// checkPair compares ΔfH° − ΔfG° with 298.15 K·ΔfS°, ΔfS° from S° of the
// species less S° of its elements; an ion is formed with z/2 H2 given off
// (z H+ taken up), so ΔfS° = S° − Σ S°(elements) + (z/2)·S°(H2) (S°(H+) = 0).
func checkPair(sp *Species, refS map[string]float64) string {
	if !sp.HasS || !sp.HasDfH || sp.DfG == 0 && sp.DfH == 0 {
		return ""
	}
	dS := sp.S
	for el, n := range sp.Atoms {
		s, ok := refS[el]
		if !ok {
			return ""
		}
		dS -= float64(n) * s
	}
	if sp.Charge != 0 {
		h, ok := refS["H"]
		if !ok {
			return ""
		}
		dS += float64(sp.Charge) * h // z/2 H2 = z H atoms
	}
	want := T0 * dS / 1000
	if got := sp.DfH - sp.DfG; math.Abs(got-want) > entropyTolerance {
		return fmt.Sprintf("ΔfH° − ΔfG° is %.2f kJ/mol but S° and the elements' S° give T·ΔfS° = %.2f kJ/mol (more than %g apart); check ΔfG°, ΔfH° and S°", got, want, entropyTolerance)
	}
	return ""
}
