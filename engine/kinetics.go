package engine

// KineticRule is one kinetic allowance (data/kinetics.txt): a couple that the
// potential table ranks higher than plants observe, and how much its
// potential is moved against it when the headline pair is ranked.
type KineticRule struct {
	ID      string
	Side    Role     // the role it slows: oxidizer or reducer
	Couples []string // couple signatures OX/RED the rule applies to, or nil

	Species  []string // species (Species.Ion) the rule applies to, or nil
	Reducers []string // for a pair rule: the reducing species; Species are the oxidizing ones
	Volts    float64  // allowance in volts when ranking
	When     string   // "always", or conditions on ph, t (°C) and conc (mol/L)
	Reason   string
	Source   string

	when func(ph, tC, conc float64) bool // compiled When
}

// PairRole marks a kinetic allowance on one oxidizer–reducer pair (a
// species with itself, or nitrate with ammonium): the pair's effective cell
// potential is lowered, not either couple's.
const PairRole Role = "pair"
