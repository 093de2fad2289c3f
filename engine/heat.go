package engine

import (
	"fmt"
	"io/fs"
	"math"
	"sort"
	"strconv"
	"strings"

	"gonum.org/v1/gonum/unit/constant"
)

// EnthalpyFile is the name of the formation-enthalpy table at the root of the
// data FS.
const EnthalpyFile = "enthalpies.txt"

// atmosphereKPa is the pressure gas volumes are given at when the request
// states none: one standard atmosphere (exact by definition).
const atmosphereKPa = 101.325

// WaterHeatCapacity is the specific heat capacity assumed for a mixed
// aqueous liquid, J/(g·K).
const WaterHeatCapacity = 4.18

// HeatAssumption states how the temperature rise is estimated.
const HeatAssumption = "Adiabatic estimate: all the heat stays in the liquid (none lost to the tank, the air or evaporation), " +
	"and the whole mixed liquid is taken to have the heat capacity of water, 4.18 J/(g·K), over its total mass. " +
	"Reaction heat is from standard enthalpies of formation at 25 °C (NBS 1982 tables); " +
	"strong acid with strong base is counted at the heat of forming water from H+ and OH- in the same table (about -55.8 kJ/mol)."

// Enthalpy is one row of the formation-enthalpy table (data/enthalpies.txt).
type Enthalpy struct {
	Species Species
	DeltaHf float64 // kJ/mol at 298.15 K
	Source  string
}

// MolarGasConstant is R in J/(mol·K), the product of the Avogadro and
// Boltzmann constants (both exact in CODATA 2018).
func MolarGasConstant() float64 {
	return float64(constant.Avogadro) * float64(constant.Boltzmann)
}

// LoadEnthalpies reads and checks enthalpies.txt from the root of fsys. Each
// line is a species, its standard enthalpy of formation in kJ/mol and its
// source; '#' starts a comment line. The map is keyed by Species.Key().
func LoadEnthalpies(fsys fs.FS) (map[string]Enthalpy, error) {
	b, err := fs.ReadFile(fsys, EnthalpyFile)
	if err != nil {
		return nil, fmt.Errorf("read formation enthalpies: %w", err)
	}
	return parseEnthalpies(EnthalpyFile, b)
}

func parseEnthalpies(name string, b []byte) (map[string]Enthalpy, error) {
	out := map[string]Enthalpy{}
	lines := map[string]int{}
	sc := newLineReader(b)
	line := 0
	for sc.Scan() {
		line++
		text := strings.TrimSpace(sc.Text())
		if text == "" || strings.HasPrefix(text, "#") {
			continue
		}
		f := strings.Fields(text)
		if len(f) < 3 {
			return nil, fmt.Errorf("%s:%d: %q: write SPECIES DELTA_HF SOURCE, like `Cl-  -167.16  NBS 1982 (from memory)`", name, line, text)
		}
		sp, err := ParseSpecies(f[0])
		if err != nil {
			return nil, fmt.Errorf("%s:%d: %w; write species as in the other tables (Fe^3+, Cl2(g), H2O(l))", name, line, err)
		}
		if sp.IsElectron() {
			return nil, fmt.Errorf("%s:%d: the electron has no formation enthalpy; remove the row", name, line)
		}
		num := strings.ReplaceAll(f[1], "−", "-")
		v, err := strconv.ParseFloat(num, 64)
		if err != nil || math.IsNaN(v) || math.IsInf(v, 0) || math.Abs(v) > 1e5 {
			return nil, fmt.Errorf("%s:%d: %q is not a formation enthalpy in kJ/mol; write a number such as -167.16", name, line, f[1])
		}
		key := sp.Key()
		if prev, dup := lines[key]; dup {
			return nil, fmt.Errorf("%s:%d: %s is already given at line %d; keep one row per species and phase", name, line, key, prev)
		}
		lines[key] = line
		out[key] = Enthalpy{Species: sp, DeltaHf: v, Source: strings.Join(f[2:], " ")}
	}
	if err := sc.Err(); err != nil {
		return nil, fmt.Errorf("%s: %w", name, err)
	}
	if len(out) == 0 {
		return nil, fmt.Errorf("%s: no rows found", name)
	}
	return out, nil
}

func termKey(t EqTerm) (key, text string) {
	sp := Species{Formula: t.Formula, Charge: t.Charge, Phase: t.Phase}
	if sp.Phase == "" {
		sp.Phase = Aqueous
		if sp.IsWater() {
			sp.Phase = Liquid
		}
	}
	return sp.Key(), sp.Text()
}

// ReactionEnthalpy is the standard reaction enthalpy of r in kJ per mole of
// reaction as written: ΔH°rxn = Σν ΔHf°(products) − Σν ΔHf°(reactants).
// missing lists (sorted) the species without a row in h; when it is not
// empty the enthalpy is meaningless and must not be shown.
func ReactionEnthalpy(r *Reaction, h map[string]Enthalpy) (kJPerMol float64, missing []string) {
	return reactionEnthalpyBy(r, func(key, _ string) (float64, bool) {
		e, ok := h[key]
		return e.DeltaHf, ok
	})
}

// reactionEnthalpyBy is ReactionEnthalpy with ΔHf° looked up by
// dfh(Species.Key, text).
func reactionEnthalpyBy(r *Reaction, dfh func(key, text string) (float64, bool)) (kJPerMol float64, missing []string) {
	if r == nil {
		return 0, nil
	}
	seen := map[string]bool{}
	add := func(terms []EqTerm, sign float64) {
		for _, t := range terms {
			key, text := termKey(t)
			v, ok := dfh(key, text)
			if !ok {
				if !seen[text] {
					seen[text] = true
					missing = append(missing, text)
				}
				continue
			}
			kJPerMol += sign * float64(t.Coef) * v
		}
	}
	add(r.Products, 1)
	add(r.Reactants, -1)
	sort.Strings(missing)
	return kJPerMol, missing
}

// NeutralisationEnthalpy is ΔH° of H+ + OH- → H2O(l) from the table, kJ per
// mole of water formed (about −55.8 kJ/mol with the NBS 1982 values). It is
// NaN when the table lacks one of the three species.
func NeutralisationEnthalpy(h map[string]Enthalpy) float64 {
	w, ok1 := h[Species{Formula: "H2O", Phase: Liquid}.Key()]
	hp, ok2 := h[Species{Formula: "H", Charge: 1, Phase: Aqueous}.Key()]
	oh, ok3 := h[Species{Formula: "OH", Charge: -1, Phase: Aqueous}.Key()]
	if !ok1 || !ok2 || !ok3 {
		return math.NaN()
	}
	return w.DeltaHf - hp.DeltaHf - oh.DeltaHf
}

// GasVolumeL is the volume in litres of mol moles of ideal gas at
// temperatureK and pressureKPa (V = nRT/P). A pressure of zero or less means
// one standard atmosphere. A temperature of zero or less, or a negative or
// non-finite amount, gives 0.
func GasVolumeL(mol, temperatureK, pressureKPa float64) float64 {
	if !(mol > 0) || !(temperatureK > 0) || math.IsInf(mol, 0) || math.IsInf(temperatureK, 0) {
		return 0
	}
	if !(pressureKPa > 0) || math.IsInf(pressureKPa, 0) {
		pressureKPa = atmosphereKPa
	}
	// n·R·T in J is kPa·L, so dividing by kPa gives litres.
	return mol * MolarGasConstant() * temperatureK / pressureKPa
}

// GasReleaseOf builds the gas-release entry for mol moles of gas text at the
// mix's temperature and pressure (see GasVolumeL).
func GasReleaseOf(text string, mol, temperatureK, pressureKPa float64) GasRelease {
	v := GasVolumeL(mol, temperatureK, pressureKPa)
	if !(mol > 0) || math.IsInf(mol, 0) {
		mol = 0
	}
	return GasRelease{Text: text, Mol: mol, VolumeL: v, VolumeM3: v / 1000}
}

// TemperatureRise is the adiabatic temperature rise in K (= °C) of massKg of
// liquid taking up heatReleasedKJ, with the heat capacity of water (see
// HeatAssumption). Heat taken up (negative) gives a fall. A mass of zero or
// less, or non-finite input, gives 0.
func TemperatureRise(heatReleasedKJ, massKg float64) float64 {
	if !(massKg > 0) || math.IsInf(massKg, 0) || math.IsNaN(heatReleasedKJ) || math.IsInf(heatReleasedKJ, 0) {
		return 0
	}
	// kJ / (kg · J/(g·K)) = (1000 J) / (1000 g · J/(g·K)) = K.
	return heatReleasedKJ / (massKg * WaterHeatCapacity)
}

// ReactionExtent is a reaction with how far it runs, in moles of reaction as
// written.
type ReactionExtent struct {
	Reaction  *Reaction
	ExtentMol float64
}

// HeatInput is what the heat estimate of a whole mix needs.
type HeatInput struct {
	Reactions      []ReactionExtent // the headline first, then the follow-on steps that run
	NeutralisedMol float64          // moles of water formed by strong acid with strong base
	MassKg         float64          // mass of the whole mixed liquid
}

// EstimateHeat adds up the heat of the reactions and of neutralisation. The
// reaction enthalpy reported is that of the first reaction. When a species
// lacks formation-enthalpy data the heat released and the temperature rise
// are left out (nil) and Missing names the species; the neutralisation heat
// is still reported.
func EstimateHeat(in HeatInput, h map[string]Enthalpy) Heat {
	out := Heat{Assumption: HeatAssumption}
	total := 0.0
	missing := map[string]bool{}
	for i, re := range in.Reactions {
		if re.Reaction == nil {
			continue
		}
		dh, miss := ReactionEnthalpy(re.Reaction, h)
		for _, m := range miss {
			missing[m] = true
		}
		if len(miss) > 0 {
			continue
		}
		if i == 0 {
			v := dh
			out.DeltaHkJPerMol = &v
		}
		total += -dh * re.ExtentMol
	}
	if in.NeutralisedMol > 0 {
		dn := NeutralisationEnthalpy(h)
		if math.IsNaN(dn) {
			missing["H+"], missing["OH-"], missing["H2O(l)"] = true, true, true
		} else {
			out.NeutralisationkJ = -dn * in.NeutralisedMol
			total += out.NeutralisationkJ
		}
	}
	for m := range missing {
		out.Missing = append(out.Missing, m)
	}
	sort.Strings(out.Missing)
	if len(out.Missing) > 0 || math.IsNaN(total) || math.IsInf(total, 0) {
		return out
	}
	out.HeatReleasedkJ = &total
	if in.MassKg > 0 {
		rise := TemperatureRise(total, in.MassKg)
		out.TemperatureRiseC = &rise
	}
	return out
}
