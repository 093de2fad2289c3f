package engine

import "mixward/engine/thermo"

// Tables is the content of the data/ tables. Load builds it and validates
// every row; New builds it with loadFast (parse only: the tests validate
// data/ through Load and CheckTables) and adds the tables owned by the
// prediction and hazard code and the species data.
type Tables struct {
	Atomic     map[string]float64 // standard atomic weights, g/mol
	Chemicals  []*Chemical
	Half       []*HalfReaction
	AcidBase   []*AcidBasePair
	Densities  map[string][]DensityPoint // by chemical formula, sorted by PercentWW
	Ceilings   map[string]Ceiling        // most concentrated solution, by chemical formula
	Solubility map[string]Solubility     // solids' solubility in water at 20 °C, by chemical formula
	Products   map[string][]Product      // commercial products by the formula they are named by, grades rising
	Hash       string                    // SHA-256 over every table file, hex

	Hazards    []*HazardRule
	Enthalpies map[string]Enthalpy // standard enthalpy of formation by Species.Key
	Dilution   *Dilution           // heats of concentrated solutions (data/dilution.txt)
	Thermo     *thermo.DB          // species data (data/species.txt), loaded by New

	families []family       // acid–base chains, built by New
	famOf    map[string]int // family index by Species.Ion

	// Lookup indexes, built by New: by exact formula, by name, and by
	// lower-case formula (nil where two formulas fold together).
	byFormula, byName, byFold map[string]*Chemical
	atoms                     map[string]Atoms // atom counts of the half-reaction formulas
	// standIn maps a metal hydroxide or oxide solid of a base couple
	// (Cr(OH)3(s)) to the ion that stands for it in a basic mix (Cr^3+).
	standIn map[string]string
}
