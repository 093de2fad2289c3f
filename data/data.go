// Package data embeds the chemistry tables mixward reasons with: atomic
// weights (elements.txt), the chemical dictionary (chemicals.txt), standard
// reduction potentials (halfreactions.txt), acid–base pairs (acidbase.txt),
// solution densities (densities.txt), the species data (species.txt: standard
// Gibbs energies and enthalpies of formation, entropies), the chemicals known
// by name whose data are withheld (withheld.txt) and the tables other parts of
// the engine read (kinetic locks, hazard rules, formation enthalpies, the
// solubility of solids in solubility.txt, the
// reaction enthalpies of the hazard families in familyheats.txt).
// Each file is plain text, one row per line with fields separated by " | "
// (hazard rules and enthalpies have their own layout), and every row names
// its source. The package only embeds the files; engine.New reads them,
// engine.CheckTables (run by the tests and `mixward table --check`) validates
// them.
package data

import "embed"

// FS holds every *.txt table of this directory.
//
//go:embed *.txt
var FS embed.FS
