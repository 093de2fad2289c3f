package engine

// Class says how a chemical behaves when it meets water.
type Class string

// The behaviours a chemical can have in water.
const (
	StrongAcid  Class = "strong-acid"
	WeakAcid    Class = "weak-acid"
	StrongBase  Class = "strong-base"
	WeakBase    Class = "weak-base"
	SolubleSalt Class = "soluble-salt"
	SparingSalt Class = "sparingly-soluble-salt"
	Metal       Class = "metal"
	Molecular   Class = "molecular"
	GasClass    Class = "gas"
)

// Chemical is one entry of the chemical dictionary (data/chemicals.txt).
type Chemical struct {
	Formula   string   // as usually written: Fe2(SO4)3, NaOCl, Cu
	Names     []string // English names and synonyms, lower case
	Class     Class
	Gives     []Term  // what one formula unit gives in water (or stays as)
	MolarMass float64 // g/mol, from IUPAC standard atomic weights
	Source    string
}

// Medium is the solution medium a half-reaction is written for.
type Medium string

// Media of half-reactions. Any means the couple involves neither H+ nor OH-.
const (
	Acid Medium = "acid"
	Base Medium = "base"
	Any  Medium = "any"
)

// HalfReaction is one reduction of the half-reaction table
// (data/halfreactions.txt), written as a reduction: oxidized form + n e- →
// reduced form. Electrons do not appear among the terms.
type HalfReaction struct {
	ID        string
	Reactants []Term
	Products  []Term
	Electrons int
	E0        float64 // standard reduction potential at 25 °C, volts vs SHE
	Medium    Medium
	Source    string

	// Filled by New: the mixture keys of the oxidized-side and
	// reduced-side species other than water, H+ and OH-.
	oxKeys, redKeys []string
	textRed, textOx string // HalfText as a reduction and reversed
	canon           string // the couple OX/RED with each species replaced by its acid–base family's first member
}

// AcidBasePair is one conjugate acid–base pair (data/acidbase.txt).
type AcidBasePair struct {
	Acid   Species
	Base   Species
	PKa    float64 // at 25 °C
	Source string
}

// DensityPoint is one row of a density-vs-concentration table
// (data/densities.txt): a solution of PercentWW % w/w has density GPerML.
type DensityPoint struct {
	PercentWW float64
	GPerML    float64
}
