package engine

// Enthalpy is one row of the formation-enthalpy table (data/enthalpies.txt).
type Enthalpy struct {
	Species Species
	DeltaHf float64 // kJ/mol at 298.15 K
	Source  string
}
