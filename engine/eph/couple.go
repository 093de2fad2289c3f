package eph

import (
	"strings"

	"mixward/engine"
)

// Protons is the number of hydrogen ions the reduction h consumes per
// reaction as written: H+ among the reactants count up, H+ among the
// products down, and for a couple written for base each OH- produced counts
// as one H+ consumed (OH- consumed, as one produced). It sets the slope of
// the couple's potential against pH.
func Protons(h *engine.HalfReaction) int {
	if h == nil {
		return 0
	}
	m := 0
	for _, t := range h.Reactants {
		switch {
		case t.IsProton():
			m += t.Coef
		case t.IsHydroxide():
			m -= t.Coef
		}
	}
	for _, t := range h.Products {
		switch {
		case t.IsProton():
			m -= t.Coef
		case t.IsHydroxide():
			m += t.Coef
		}
	}
	return m
}

// Label names the couple of h as "oxidized/reduced" (MnO4-/Mn^2+,
// O2(g)/H2O(l)), leaving out H+, OH- and water unless nothing else is there.
func Label(h *engine.HalfReaction) string {
	if h == nil {
		return ""
	}
	return mainTerm(h.Reactants) + "/" + mainTerm(h.Products)
}

func mainTerm(ts []engine.Term) string {
	var fallback []string
	for _, t := range ts {
		if t.IsProton() || t.IsHydroxide() || t.IsWater() || t.IsElectron() {
			fallback = append(fallback, t.Text())
			continue
		}
		return t.Text()
	}
	return strings.Join(fallback, " ")
}

// FromHalfReaction is the curve of couple h for a mix at mixPH and
// temperatureK, where eAtMix is the couple's Nernst potential under the mix's
// conditions. Away from the mix pH only the hydrogen-ion term changes: a
// couple whose species change form with pH (HOCl/OCl- near pH 7.5) is exact
// at the mix pH and approximate far from it.
func FromHalfReaction(h *engine.HalfReaction, eAtMix, mixPH, temperatureK float64) Curve {
	if h == nil {
		return Curve{}
	}
	return NernstLine(Label(h), eAtMix, mixPH, Protons(h), h.Electrons, temperatureK)
}
