package hazard

import (
	"math"
	"sort"

	"mixward/engine"
	"mixward/engine/chem"
	"mixward/engine/state"
)

// The reactions the families name are not run by the equilibrium state
// (organic carbon is locked), so their heat is not in the state's figure.
// Each family that names one carries it here: the reaction as written, its
// enthalpy per mole of reaction and the source (data/familyheats.txt, from
// the species data where they have every ΔfH°), and the reagents it uses
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

// withHeat attaches a family's reaction heat to its hazard.
func withHeat(h engine.Hazard, rh *engine.ReactionHeat) engine.Hazard {
	h.ReactionHeat = rh
	return h
}

// familyHeat is the ReactionHeat of the family code over the reagents, nil
// when the data give no enthalpy for it.
func (o *Outcome) familyHeat(code string, rs ...reagent) *engine.ReactionHeat {
	f, ok := o.family(code)
	if !ok {
		return nil
	}
	return f.heat(rs...)
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
	if o.runsOrganic() {
		// The state already oxidizes the organic matter (permanganate
		// lifts the organic-carbon lock): its heat is in the state's figure.
		for n := range organicReagents {
			used[n] = true
		}
	}
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
	if len(o.Heat.Families) == 0 {
		return
	}
	h := &o.Heat
	h.StatekJ = h.ReleasedkJ
	h.ReleasedkJ += sum
	h.RiseC += engine.TemperatureRise(sum, o.VolumeL) // about 1 kg per litre
	h.ReachedC = o.TemperatureC + h.RiseC
	h.Boils = h.RiseC > 0 && h.ReachedC >= BoilingC
	if h.Boils {
		// Above the boiling point the heat boils water off instead
		// (about 1 kg per litre of mix).
		past := h.ReleasedkJ - o.VolumeL*waterCpKJ*(BoilingC-o.TemperatureC)
		h.SteamKg = max(h.SteamKg, past/steamKJPerKg)
		h.RiseC, h.ReachedC = BoilingC-o.TemperatureC, BoilingC
	}
	h.Reactions = true
}

// organicReagents are the reagent names of the families that stand for
// organic matter.
var organicReagents = map[string]bool{"organic liquid": true, "HCHO": true, "CH3COCH3": true}

// runsOrganic reports whether a reaction that proceeds in the mixed state
// uses up an organic compound.
func (o *Outcome) runsOrganic() bool {
	for _, r := range o.Reactions {
		for _, x := range r.Reactants {
			if at, err := chem.ParseFormula(x.Formula); err == nil && state.IsOrganic(at, x.Ion()) {
				return true
			}
		}
	}
	return false
}

// addRunawayHeat lists the heat of each runaway a hazard names but the mix
// as made does not run, with the temperature it would take the mix to (from
// the heat as judged, about 1 kg per litre): shown, never counted.
func addRunawayHeat(o *Outcome, hs []engine.Hazard) {
	for i := range hs {
		r := hs[i].RunawayHeat
		if r == nil || !(r.ReleasedkJ > 0) {
			continue
		}
		x := *r
		startC := o.TemperatureC
		if o.Heat.Known {
			startC = o.Heat.ReachedC
		}
		reached := startC + engine.TemperatureRise(x.ReleasedkJ, o.VolumeL)
		if x.Boils = reached >= BoilingC; x.Boils {
			reached = BoilingC
		}
		x.ReachedC = &reached
		o.Heat.IfRuns = append(o.Heat.IfRuns, x)
	}
}
