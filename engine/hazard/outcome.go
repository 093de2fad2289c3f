// Package hazard judges a mix from what forms: the gases in numbers
// (amount, equilibrium headspace concentration against an exposure or
// flammability limit), the heat (temperature reached, boils), the species
// present; and derives the operator's decision from the hazards found.
//
// It reads a narrow view of the mix, Outcome. Today an Outcome is filled
// from the engine's Result (FromResult); when the equilibrium state lands it
// is filled from that state instead, and nothing below Outcome changes.
// The package performs no I/O and keeps no mutable globals.
package hazard

import (
	"math"
	"strings"

	"mixward/engine"
)

// ProceedMarginV is the cell potential a reaction must exceed before its
// products count: sources of the potential table differ by a few hundredths
// of a volt, and concentrations are rarely known better (CHEMISTRY notes,
// "Sources, and where they disagree"), so a pair at +0.001 V raises nothing.
const ProceedMarginV = 0.05

// TraceMolar is the concentration below which a species is a trace that no
// rule fires from (mol/L).
const TraceMolar = 1e-6

// Amount is a species with its amount in the mix and, for dissolved
// species, its concentration after mixing.
type Amount struct {
	Species engine.Species
	Mol     float64
	Molar   float64

	ion string // Species.Ion(), cached by FromResult
}

func (a *Amount) key() string {
	if a.ion == "" {
		a.ion = a.Species.Ion()
	}
	return a.ion
}

// Proceeding is a reaction that runs at the mix's conditions.
type Proceeding struct {
	Label     string // headline, alternative 2, step 3
	Text      string // the net equation
	ECell     float64
	Reactants []engine.Species
	Products  []engine.Species
}

// HeldBack is a reaction that is possible on paper but does not run, with
// the reason.
type HeldBack struct {
	Text   string
	Reason string
	Lock   string // the lock of data/locks.txt that held it, when one did
}

// Gas is a gas formed by a reaction that proceeds and given off.
type Gas struct {
	Formula string
	Mol     float64
}

// Heat is the heat the mix gives off, from reactions that proceed,
// neutralisation and dissolving.
type Heat struct {
	Known      bool    // false when formation enthalpies are missing
	ReleasedkJ float64 // heat released; negative when the mix cools
	RiseC      float64 // temperature change of the whole mix
	ReachedC   float64 // starting temperature plus the rise
	Boils      bool    // reached the boiling point of the liquid
	SteamKg    float64 // water boiled off as steam when Boils (0: not known)
	Reactions  bool    // the heat includes reactions (not only neutralisation and dissolving)
	MixingkJ   float64 // the part of ReleasedkJ from dissolving solids and diluting concentrated reagents
	// Families are the reactions judged as families whose heat is added to
	// ReleasedkJ; StatekJ is what the state gave before them.
	Families []engine.ReactionHeat
	StatekJ  float64
	// IfRuns are the runaways the hazards name that do not run as mixed,
	// with the temperature the mix would reach if each ran (not counted).
	IfRuns []engine.ReactionHeat
}

// Outcome is what forms when the streams are combined: the view the hazard
// rules read. Every number in a hazard comes from here.
type Outcome struct {
	VolumeL         float64 // liquid after mixing
	HeadspaceL      float64 // gas space above the liquid
	HeadspaceStated bool    // false: taken equal to the liquid volume
	TemperatureC    float64 // of the streams before they react
	// HottestC is the temperature of the hottest stream as stored, or the
	// one stated for the whole mix (0 when not set: judged from
	// TemperatureC alone). A liquid that hot before it meets anything
	// scalds by itself; see judgeHeat.
	HottestC       float64
	PressureKPa    float64
	PH             float64
	PHStated       bool
	Before         []Amount // species after mixing and acid–base speciation, before any redox reaction
	After          []Amount // species after the reactions that proceed
	Chemicals      []string // formulas named in the streams
	SolidChemicals []string // formulas of streams given as solids (a mass, no liquid)
	// SolidKg is the mass (kg) of each chemical poured as a solid stream
	// of that chemical alone.
	SolidKg map[string]float64
	// SolidAcids are the chemicals poured dry that are acids in water:
	// strong acids, weak acids of the first pKa below about 5, and
	// bisulfates (see solidAcid).
	SolidAcids []string
	StrongAcid bool // a stream holds a strong acid
	StrongBase bool // a stream holds a strong base
	Reactions  []Proceeding
	HeldBack   []HeldBack
	Gases      []Gas
	Heat       Heat
	// Measured holds, by gas formula, what the equilibrium state of the mix
	// says of a gas it can form: the amount given off or held by the
	// headspace and the headspace concentration. A measured gas is judged
	// on these numbers, not estimated from its dissolved pool.
	Measured map[string]MeasuredGas
	// Strength is, by gas of the vapour table (HCl, HF, NH3), the % w/w of
	// its free solute in the liquid after reaction.
	Strength map[string]float64
	// Fuel is organic matter the tables hold no data for, left out of the
	// state but taken in as fuel beside a strong oxidizing agent
	// (engine.RoleFuel), by amount and mol/L of the mix; FuelOxidizer
	// names that oxidizing agent.
	Fuel         []Amount
	FuelOxidizer string

	fromState bool // filled from the equilibrium state, whose kinetic locks are applied
	// families are the reaction enthalpies of the families (Data.Families),
	// set by Judge.
	families map[string]*FamilyHeat
}

// MeasuredGas is a gas as the mixed state has it.
type MeasuredGas struct {
	Mol       float64 // given off, or held by the headspace when none is given off
	PPM       float64 // equilibrium headspace concentration by volume
	Dissolved float64 // mol of the molecule left dissolved in the liquid
	// SolHkJ is the enthalpy of dissolving the gas (kJ/mol, negative),
	// from the species data, when HasSolH: it moves the Henry constant
	// to the temperature the mix's own heat takes it to.
	SolHkJ  float64
	HasSolH bool
}

// InTank is the outcome judged with the gas space of the tank it happens
// in: a point of a pour holds less liquid than the final mix, but its gas
// goes into the headspace of the tank sized for the whole (headspaceL). A
// gas cannot fill that space beyond what the liquid holds of it, given off
// and dissolved: a few drops of water on a heap of solid give off no
// headspace-filling gas however high their equilibrium pressure. Only a
// point with less than a fifth of the tank's headspace in liquid is so
// bounded: a larger liquid resupplies the gas from its other forms
// (hypochlorous acid behind chlorine), which the bound does not count.
func (o *Outcome) InTank(headspaceL float64) {
	if !(headspaceL > 5*o.VolumeL) {
		return
	}
	o.HeadspaceL = headspaceL
	o.boundByHeadspace()
}

// boundByHeadspace keeps each measured gas to what its amount, given off
// and dissolved, makes in the headspace: a gas phase of 746 L of hydrogen
// in a stated headspace of 5 m³ is about 15 %, not the pure gas the state
// holds over the liquid.
func (o *Outcome) boundByHeadspace() {
	headspaceL := o.HeadspaceL
	if !(headspaceL > 0) {
		return
	}
	for f, m := range o.Measured {
		l := (m.Mol + m.Dissolved) * litreBarPerMolK() * o.TemperatureK() / (o.PressureKPa / 100)
		if ppm := l / headspaceL * 1e6; ppm < m.PPM {
			m.PPM = ppm
			o.Measured[f] = m
		}
	}
}

// TemperatureK is the mix temperature in kelvin before it reacts.
func (o *Outcome) TemperatureK() float64 { return o.TemperatureC + 273.15 }

// Molar is the summed concentration (mol/L) of the species named
// ("CN-", "HCN"), after the reactions that proceed. Traces count as zero.
func (o *Outcome) Molar(species ...string) float64 { return sumMolar(o.After, species) }

// MolarBefore is Molar before any redox reaction.
func (o *Outcome) MolarBefore(species ...string) float64 { return sumMolar(o.Before, species) }

// Present reports whether any of the species is present above a trace,
// before or after the reactions.
func (o *Outcome) Present(species ...string) bool {
	return o.Molar(species...) >= TraceMolar || o.MolarBefore(species...) >= TraceMolar
}

// Named reports whether a stream names one of the chemicals (formulas).
func (o *Outcome) Named(formulas ...string) bool {
	for _, c := range o.Chemicals {
		for _, f := range formulas {
			if c == f {
				return true
			}
		}
	}
	return false
}

// SolidStream reports whether a stream given as a solid names one of the
// chemicals (formulas).
func (o *Outcome) SolidStream(formulas ...string) bool {
	for _, c := range o.SolidChemicals {
		for _, f := range formulas {
			if c == f {
				return true
			}
		}
	}
	return false
}

// Formed reports whether a reaction that proceeds forms one of the species.
func (o *Outcome) Formed(species ...string) bool {
	for _, r := range o.Reactions {
		for _, p := range r.Products {
			for _, s := range species {
				if speciesIs(p, s) {
					return true
				}
			}
		}
	}
	return false
}

// GasMol is the amount of a gas given off by the reactions that proceed.
func (o *Outcome) GasMol(formula string) float64 {
	n := 0.0
	for _, g := range o.Gases {
		if g.Formula == formula {
			n += g.Mol
		}
	}
	return n
}

func sumMolar(xs []Amount, species []string) float64 {
	t := 0.0
	for i := range xs {
		a := &xs[i]
		if a.Molar < TraceMolar {
			continue
		}
		k := a.key()
		for _, s := range species {
			if k == s || (hasPhase(s) && a.Species.Text() == s) {
				t += a.Molar
			}
		}
	}
	return t
}

// hasPhase reports whether a species text ends in a phase suffix: (s),
// (l), (g) or (aq).
func hasPhase(text string) bool {
	for _, suf := range []string{"(s)", "(l)", "(g)", "(aq)"} {
		if strings.HasSuffix(text, suf) {
			return true
		}
	}
	return false
}

// speciesIs matches a species written as in the tables ("CN-", "Fe^3+",
// "Na(s)"); without a phase suffix any phase matches.
func speciesIs(s engine.Species, text string) bool {
	if hasPhase(text) {
		if s.Phase == "" {
			s.Phase = engine.Aqueous
		}
		return s.Text() == text || (s.Phase == engine.Aqueous && s.Ion()+"(aq)" == text)
	}
	return s.Ion() == text
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
