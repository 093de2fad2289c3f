package hazard

import (
	"bufio"
	"bytes"
	"fmt"
	"io/fs"
	"math"
	"strconv"
	"strings"

	"mixward/engine/thermo"
)

// FamilyHeatFile is the table of the reaction families' enthalpies at the
// root of the data FS.
const FamilyHeatFile = "familyheats.txt"

// FamilyHeat is one row of FamilyHeatFile: the reaction a family names and
// its enthalpy per mole of reaction as written.
type FamilyHeat struct {
	Code     string
	Reaction string
	// DeltaH is the reaction enthalpy used, kJ/mol: from the ΔfH° of the
	// species data when every species has one (FromSpecies), else Stated.
	DeltaH      float64
	Stated      float64 // the row's number; NaN when written "-"
	FromSpecies bool
	// Electrons is the electrons a half-reaction row takes up (0 for a
	// reaction): its DeltaH is then per that many mol of electrons.
	Electrons int
	// Protons is the H+ a half-reaction row takes up (net, left less
	// right).
	Protons float64
	Source  string
}

func parseFamilyHeats(b []byte) (map[string]*FamilyHeat, error) {
	out := map[string]*FamilyHeat{}
	sc := bufio.NewScanner(bytes.NewReader(b))
	for n := 1; sc.Scan(); n++ {
		line := strings.TrimSpace(sc.Text())
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		f := strings.Split(line, " | ")
		if len(f) != 4 {
			return nil, fmt.Errorf("%s:%d: want 4 fields separated by \" | \" (code | reaction | ΔrH kJ/mol or - | source), got %d", FamilyHeatFile, n, len(f))
		}
		for i := range f {
			f[i] = strings.TrimSpace(f[i])
		}
		// A family may have a row of its own for one reagent with species
		// data ("nitric-organic-runaway:formic"): the part before the colon
		// is the hazard code.
		if base, _, _ := strings.Cut(f[0], ":"); !knownCode(base) {
			return nil, fmt.Errorf("%s:%d: %q is not a hazard code; use one of the codes in engine/hazard/codes.go", FamilyHeatFile, n, base)
		}
		if _, dup := out[f[0]]; dup {
			return nil, fmt.Errorf("%s:%d: %s is listed twice; keep one row per family", FamilyHeatFile, n, f[0])
		}
		v := math.NaN()
		if f[2] != "-" {
			x, err := strconv.ParseFloat(strings.ReplaceAll(f[2], "−", "-"), 64)
			if err != nil || math.IsInf(x, 0) || math.Abs(x) > 1e5 {
				return nil, fmt.Errorf("%s:%d: %q is not a reaction enthalpy in kJ/mol; write a number such as -141.5, or - when the species data gives it", FamilyHeatFile, n, f[2])
			}
			v = x
		}
		if f[3] == "" {
			return nil, fmt.Errorf("%s:%d: the row has no source; name it", FamilyHeatFile, n)
		}
		out[f[0]] = &FamilyHeat{Code: f[0], Reaction: f[1], DeltaH: v, Stated: v, Source: f[3]}
	}
	if err := sc.Err(); err != nil {
		return nil, fmt.Errorf("%s: %w", FamilyHeatFile, err)
	}
	return out, nil
}

// loadFamilyHeats reads FamilyHeatFile from fsys; a data FS without it
// gives no family heats.
func loadFamilyHeats(fsys fs.FS) (map[string]*FamilyHeat, error) {
	b, err := fs.ReadFile(fsys, FamilyHeatFile)
	if err != nil {
		return nil, fmt.Errorf("read family heats: %w", err)
	}
	return parseFamilyHeats(b)
}

// UseSpecies computes each family's reaction enthalpy from the species
// data where every species of its reaction has ΔfH°; a row that the
// species data cannot give and that states no number is an error.
func (d *Data) UseSpecies(db *thermo.DB) error {
	for _, fh := range d.Families {
		if db != nil {
			if r, err := thermo.ParseReaction(db, fh.Reaction); err == nil {
				if dh, ok := r.DeltaH(); ok {
					fh.DeltaH, fh.FromSpecies, fh.Electrons = dh, true, r.Electrons
					for _, t := range r.Terms {
						if t.Species.Text == "H+" {
							fh.Protons -= t.Nu
						}
					}
					continue
				}
			}
		}
		if math.IsNaN(fh.Stated) {
			return fmt.Errorf("%s: %s: the species data cannot give the enthalpy of %q; state it in kJ/mol with its source", FamilyHeatFile, fh.Code, fh.Reaction)
		}
	}
	return nil
}

// family is the reaction of a family code as the data give it; ok is false
// when the data have no usable row.
func (o *Outcome) family(code string) (familyReaction, bool) {
	fh, ok := o.families[code]
	if !ok || math.IsNaN(fh.DeltaH) {
		return familyReaction{}, false
	}
	src := fh.Source
	if fh.FromSpecies && !strings.HasPrefix(src, "ΔfH° of data/species.txt") {
		src = "ΔfH° of data/species.txt; " + src
	}
	base, _, _ := strings.Cut(code, ":")
	return familyReaction{code: base, reaction: strings.ReplaceAll(fh.Reaction, "->", "→"), dH: fh.DeltaH, source: src}, true
}

func knownCode(code string) bool {
	for _, c := range codes {
		if c.Code == code {
			return true
		}
	}
	return false
}
