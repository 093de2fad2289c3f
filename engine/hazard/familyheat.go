package hazard

import (
	"math"
	"sort"

	"mixward/engine"
)

// The reactions the families name are not run by the equilibrium state
// (organic carbon is locked), so their heat is not in the state's figure.
// Each family that names one carries it here: the reaction as written, its
// enthalpy per mole of reaction and the source, and the reagents it uses
// up; the heat is counted as far as the reagent that runs out first allows
// and added to the heat the decision judges.

// familyReaction is a reaction a family names, with its reaction enthalpy.
type familyReaction struct {
	code     string
	reaction string
	dH       float64 // kJ per mol of reaction as written
	source   string
}

// reagent is what one mol of a family reaction uses up: per mol of a
// reagent of which the mix holds mol (over its whole volume).
type reagent struct {
	name string
	mol  float64
	per  float64
}

// Hexamine's formation enthalpy (kJ/mol): the solid +124.9 (NIST Chemistry
// WebBook, hexamethylenetetramine, from memory, less firm) with its heat of
// solution about −20 (it dissolves with heat and less so when warm; from
// memory): about +105 dissolved. Ammonia dissolved −80.29 (NBS Tables 1982,
// from memory).
const (
	dfHHexamineAq = 105.0
	dfHAmmoniaAq  = -80.29
	dfHChloroform = -134.47 // CHCl3(l), NBS Tables 1982, from memory
	dfHAcetoneAq  = -258.0  // the liquid −248.4 with about −10 heat of solution, from memory
	dfHAcetate    = -486.01
	dfHEthanolAq  = -288.3
	dfHAceticAq   = -485.76
	dfHNitricAq   = -207.36 // H+ + NO3-, NBS Tables 1982, from memory
	dfHNO2Gas     = 33.18
)

var (
	cannizzaroReaction = familyReaction{"formaldehyde-caustic-heat", "2 HCHO + OH- → HCOO- + CH3OH",
		dfHFormate + dfHMethanolAq - 2*dfHFormaldehydeAq - dfHHydroxide,
		"ΔfH° of formate, methanol and hydroxide (NBS Tables 1982, from memory), dissolved formaldehyde about −150 kJ/mol (from memory)"}
	hexamineReaction = familyReaction{"formaldehyde-ammonia-heat", "6 HCHO + 4 NH3 → C6H12N4 + 6 H2O",
		dfHHexamineAq + 6*dfHWater - 6*dfHFormaldehydeAq - 4*dfHAmmoniaAq,
		"ΔfH° of ammonia and water (NBS Tables 1982, from memory), dissolved formaldehyde about −150 kJ/mol and dissolved hexamine about +105 kJ/mol (solid +124.9, NIST Chemistry WebBook, less heat of solution about −20; from memory, uncertain by about 30 kJ/mol)"}
	// Written with hydroxide: bleach carries caustic, and the acid the
	// H+ form would make meets the mix's alkalinity (without base the
	// reaction gives off −335.6 kJ/mol).
	formaldehydeOClReaction = familyReaction{"formaldehyde-oxidation", "HCHO + OCl- + OH- → HCOO- + Cl- + H2O",
		-formaldehydeOCl,
		"ΔfH° of formate, chloride, water, hypochlorite and hydroxide (NBS Tables 1982, from memory), dissolved formaldehyde about −150 kJ/mol (from memory)"}
	haloformReaction = familyReaction{"chloroform-formation", "CH3COCH3 + 3 OCl- → CHCl3 + CH3COO- + 2 OH-",
		dfHChloroform + dfHAcetate + 2*dfHHydroxide - dfHAcetoneAq - 3*dfHHypochlorite,
		"ΔfH° of chloroform (liquid), acetate, hydroxide and hypochlorite (NBS Tables 1982, from memory), dissolved acetone about −258 kJ/mol (from memory)"}
	// Ethanol to acetic acid with the nitrogen dioxide of concentrated
	// nitric acid; further oxidation (to carbon dioxide) and the nitration
	// side reactions of the runaway add more.
	nitricEthanolReaction = familyReaction{"nitric-organic-runaway", "C2H5OH + 4 HNO3 → CH3COOH + 4 NO2(g) + 3 H2O",
		dfHAceticAq + 4*dfHNO2Gas + 3*dfHWater - dfHEthanolAq - 4*dfHNitricAq,
		"ΔfH° of ethanol, acetic acid, nitric acid, nitrogen dioxide and water (NBS Tables 1982, from memory); first step only: oxidation on to carbon dioxide adds more"}
)

// thorntonReaction is an oxidizer with organic liquid, per mol of
// electrons the organic gives up (see ThorntonKJPerElectron).
var thorntonReaction = familyReaction{"oxidizer-organic-fire", "organic liquid oxidized, per mol of electrons taken up (Thornton's rule)",
	-ThorntonKJPerElectron, "Thornton's rule, 418 kJ per mol O2 consumed (W. M. Thornton, Phil. Mag. 33, 196 (1917), from memory); with Cr(VI) the ΔfH° route (4 HCrO4- + 3 C2H5OH + 4 H+ → 4 Cr(OH)3(s) + 3 CH3COOH + H2O, data/species.txt) gives about 446 kJ per ethanol against 418 here"}

// withHeat attaches a family's reaction heat to its hazard.
func withHeat(h engine.Hazard, rh *engine.ReactionHeat) engine.Hazard {
	h.ReactionHeat = rh
	return h
}

// heat is the ReactionHeat of f over the reagents: the extent is the least
// mol/per among them.
func (f familyReaction) heat(rs ...reagent) *engine.ReactionHeat {
	ext, lim := math.Inf(1), ""
	var names []string
	for _, r := range rs {
		names = append(names, r.name)
		if x := r.mol / r.per; x < ext {
			ext, lim = x, r.name
		}
	}
	if !(ext > 0) || math.IsInf(ext, 0) {
		return nil
	}
	return &engine.ReactionHeat{Code: f.code, Reaction: f.reaction, DeltaHkJPerMol: sig(f.dH), ExtentMol: sig(ext),
		Limiting: lim, ReleasedkJ: sig(-f.dH * ext), Reagents: names, Source: f.source}
}

// addFamilyHeat adds to the outcome's heat the reactions the hazards name.
// Families that share a reagent compete for it: only the one giving off
// more heat is counted. Without a heat figure for the state nothing is
// added (the answer says the heat has no estimate).
func addFamilyHeat(o *Outcome, hs []engine.Hazard) {
	var rh []*engine.ReactionHeat
	for i := range hs {
		if hs[i].ReactionHeat != nil {
			rh = append(rh, hs[i].ReactionHeat)
		}
	}
	if len(rh) == 0 || !o.Heat.Known {
		return
	}
	sort.SliceStable(rh, func(i, j int) bool { return rh[i].ReleasedkJ > rh[j].ReleasedkJ })
	used := map[string]bool{}
	sum := 0.0
	for _, r := range rh {
		shared := false
		for _, n := range r.Reagents {
			shared = shared || used[n]
		}
		if shared {
			continue
		}
		for _, n := range r.Reagents {
			used[n] = true
		}
		r.Counted = true
		sum += r.ReleasedkJ
		o.Heat.Families = append(o.Heat.Families, *r)
	}
	h := &o.Heat
	h.StatekJ = h.ReleasedkJ
	h.ReleasedkJ += sum
	h.RiseC += engine.TemperatureRise(sum, o.VolumeL) // about 1 kg per litre
	h.ReachedC = o.TemperatureC + h.RiseC
	h.Boils = h.RiseC > 0 && h.ReachedC >= BoilingC
	if h.Boils {
		// Above the boiling point the heat boils water off instead.
		h.RiseC, h.ReachedC = BoilingC-o.TemperatureC, BoilingC
	}
	h.Reactions = true
}
