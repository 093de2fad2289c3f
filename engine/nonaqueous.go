package engine

import "mixward/engine/state"

// leftFromOxidizer is what a solid oxidizing agent leaves once it has burnt
// an organic liquid dry, by the headline oxidizer's species: the products of
// a solid–organic ignition, not of an aqueous reaction (Bretherick's
// Handbook of Reactive Chemical Hazards, potassium permanganate: glycerol;
// chromium trioxide, chlorates, nitrates and persulfates with organic
// materials; from memory).
var leftFromOxidizer = map[string]string{
	"MnO4-":    "the alkali carbonate with manganese(III) and manganese(IV) oxides (Mn2O3, MnO2)",
	"MnO4^2-":  "the alkali carbonate with manganese(III) and manganese(IV) oxides (Mn2O3, MnO2)",
	"Cr2O7^2-": "chromium(III) oxide (Cr2O3), with the alkali carbonate or chromite",
	"CrO4^2-":  "chromium(III) oxide (Cr2O3), with the alkali carbonate or chromite",
	"HCrO4-":   "chromium(III) oxide (Cr2O3)",
	"H2CrO4":   "chromium(III) oxide (Cr2O3)",
	"ClO3-":    "the chloride, with the alkali carbonate",
	"HClO3":    "the chloride",
	"ClO4-":    "the chloride, with the alkali carbonate",
	"BrO3-":    "the bromide, with the alkali carbonate",
	"IO3-":     "the iodide, with the alkali carbonate",
	"NO3-":     "nitrite, nitrogen oxides and the carbonate",
	"S2O8^2-":  "the sulfate, with sulfur dioxide",
	"OCl-":     "the chloride, with chlorine and chlorinated organic fumes",
}

// organic reports whether a chemical of the dictionary is an organic
// compound (the convention of state.IsOrganic).
func (t *Tables) organic(formula string) bool {
	a, err := t.atomsOf(formula)
	if err != nil {
		return false
	}
	return state.IsOrganic(a, formula)
}

// outsideAqueous marks an answer whose mix has no water phase: a solid
// oxidizing agent poured into a neat organic liquid (permanganate into
// glycerol, chromic acid flake into a solvent, chlorate or nitrate with an
// oil). The equilibrium model is aqueous: its headline equation (aqueous
// Mn²⁺ and acetate in neat glycerol) is not what happens. What happens is
// the organic liquid burning on the solid, once it starts (often after a
// delay) with flame: carbon dioxide and water, and the oxidizer's lower
// oxide or salt. The heat of that combustion is not estimated here.
func (e *Engine) outsideAqueous(res *Result, m *mixture) {
	if m.water || !m.neatOrganic || !m.solidStream || res.Oxidizer == nil || res.Reaction == nil {
		return
	}
	left := leftFromOxidizer[res.Oxidizer.Species]
	if left == "" {
		left = "the oxidizing agent's lower oxide or salt"
	}
	res.OutsideAqueous = "no water phase: a solid–organic ignition outside the aqueous model, not the aqueous equation: the liquid burns, often after a delay, to carbon dioxide and water, leaving " + left
	res.Notes = append(res.Notes, "no water phase: the aqueous equation, composition and heat of this answer are the model's, not the tank's; a solid oxidizing agent ignites a neat organic liquid (Bretherick's Handbook of Reactive Chemical Hazards, from memory)")
	if res.Heat != nil && res.Heat.HeatReleasedkJ == nil {
		res.Heat.Withheld = "no figure from formation enthalpies for the liquid igniting on the solid: the species data lack the neat liquid and the solid products"
	}
}
