// Package data embeds the chemistry tables mixward reasons with: atomic
// weights (elements.txt), the chemical dictionary (chemicals.txt), standard
// reduction potentials (halfreactions.txt), acid–base pairs (acidbase.txt),
// solution densities (densities.txt) and the tables other parts of the engine
// read (kinetic allowances, hazard rules, formation enthalpies). Each file is
// plain text, one row per line with fields separated by " | ", and every row
// names its source. The package only embeds the files; engine.Load reads and
// validates them.
package data

import "embed"

// FS holds every *.txt table of this directory.
//
//go:embed *.txt
var FS embed.FS
