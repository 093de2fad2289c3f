package engine

import "mixward/engine/chem"

// Phase is the physical state of a species: aqueous, solid, liquid or gas.
// It is chem.Phase; the alias keeps every caller and the JSON contract as
// they were before the notation moved to package chem.
type Phase = chem.Phase

// The phases a species can be in. Their string values are part of the JSON
// contract of `mixward ask --format json`.
const (
	Aqueous = chem.Aqueous
	Solid   = chem.Solid
	Liquid  = chem.Liquid
	Gas     = chem.Gas
)

// Species is one chemical entity in one phase (chem.Species).
type Species = chem.Species

// Atoms counts the atoms of each element in a formula (chem.Atoms).
type Atoms = chem.Atoms

// ParseSpecies reads a species in the notation of the data tables; see
// chem.ParseSpecies.
func ParseSpecies(text string) (Species, error) { return chem.ParseSpecies(text) }

// ParseFormula counts the atoms in a formula; see chem.ParseFormula.
func ParseFormula(f string) (Atoms, error) { return chem.ParseFormula(f) }

// chargeText is chem.ChargeText.
func chargeText(z int) string { return chem.ChargeText(z) }

// Term is a species with its stoichiometric coefficient in an equation.
type Term struct {
	Species
	Coef int

	// Filled by New for the half-reaction table and carried into the
	// equations built from it, so the hot path neither concatenates nor
	// allocates: the mixture key and the text of the species.
	key, text string
}

// mixKey is mixKey(t.Species), cached when the term came from the tables.
func (t *Term) mixKey() string {
	if t.key != "" {
		return t.key
	}
	return mixKey(t.Species)
}

// textOf is t.Species.Text(), cached when the term came from the tables.
func (t *Term) textOf() string {
	if t.text != "" {
		return t.text
	}
	return t.Species.Text()
}
