package hazard

import (
	"math"
	"slices"
	"strings"

	"mixward/engine"
	"mixward/engine/chem"
	"mixward/engine/state"
)

// The rules below are reaction families that are fast and dangerous in a
// tank but are not species of the equilibrium state (their products have no
// reliable Gibbs energies, or they are runaways rather than equilibria).
// Each is judged from what the streams bring together, with its source.
var familyRules = []func(o *Outcome) (engine.Hazard, bool){
	chloroAmines, nitrateEsters, nitricOrganic, hydrazineNitric, hydroxylamineMetalSalts, hydroxylamineFreed, dampDithionite, hotDithionite, hotHypophosphite, ammoniumNitrite, permanganateSulfuric, volatileAcid,
	solidHypochlorite, magnesiumWater, cyanideOxidation, halideSulfuric, chlorateSulfuric, hotElectrolessNickel, nitricMetalFumes, aluminiumNitricSlow,
	chlorateSulfite, hydrazineOxidizer, chloricAcid, oleumMist,
	// organic, azide and solid-chlorinator families (organic.go)
	organicPeroxides, perchlorateEsters, peracidAlkali, peracids, oxidizerOrganic, unassessedFuel, dryOxidizerFuel, dryNitriteAmmonium, dryAmmoniumCaustic, nitrogenTriiodide, silverFulminate, cyanogenFromCopper, azideForming, azideLeft, dryChlorinatorAcid, dryAcidCarbonate, bisChloromethylEther,
	cannizzaro, hexamine, formaldehydeHypochlorite, haloform, heavyMetalAzide, mixedChlorinators,
	// silicate with acid (silica.go)
	silicaGel,
	// concentrated peroxide made alkaline (peroxide.go)
	alkalinePeroxide,
}

// organicN is the mol/L of organic nitrogen compounds with nitrogen at −3
// (amines, amides, urea) among the species before reaction.
func organicN(xs []Amount) float64 {
	t := 0.0
	for i := range xs {
		a := &xs[i]
		if a.Molar < TraceMolar {
			continue
		}
		at, err := chem.ParseFormula(a.Species.Formula)
		if err != nil || at["N"] == 0 || !(state.IsOrganic(at, a.key()) || a.Species.Formula == "CO(NH2)2") {
			continue
		}
		if strings.Contains(a.Species.Formula, "NO") || strings.Contains(a.Species.Formula, "CN") && !strings.Contains(a.Species.Formula, "NH") {
			continue // nitro compounds, nitriles and cyanide are not amines
		}
		if stabiliserCarrier[a.key()] {
			continue
		}
		t += a.Molar * float64(at["N"])
	}
	return t
}

// stabiliserCarrier are the carriers of stabilised chlorine: cyanuric acid
// (left by trichloroisocyanuric acid and dichloroisocyanurate, or dosed as
// stabiliser) and dimethylhydantoin (left by BCDMH). Their N-chloro forms
// are the chlorinating products themselves, in a fast reversible
// equilibrium with hypochlorous acid in water: meeting hypochlorite they
// form nothing new (White's Handbook of Chlorination, chlorinated
// isocyanurates, from memory).
var stabiliserCarrier = map[string]bool{"C3H3N3O3": true, "C3H2N3O3-": true, "C5H8N2O2": true}

// organicC is the mol/L of organic carbon among the species before reaction.
func organicC(xs []Amount) float64 {
	t := 0.0
	for i := range xs {
		a := &xs[i]
		if a.Molar < TraceMolar {
			continue
		}
		if at, err := chem.ParseFormula(a.Species.Formula); err == nil && state.IsOrganic(at, a.key()) {
			t += a.Molar * float64(at["C"])
		}
	}
	return t
}

// chloroAmines: hypochlorite chlorinates amines, amides and urea to
// N-chloro compounds (organic chloramines, chloroureas) within minutes; they
// are toxic and irritant, some unstable, and acid takes urea on to nitrogen
// trichloride. Ammonia and ammonium have their own rule (chloramines).
func chloroAmines(o *Outcome) (engine.Hazard, bool) {
	n := math.Min(activeChlorine(o), organicN(o.Before))
	if n < 1e-4 {
		return engine.Hazard{}, false
	}
	sev := engine.Warning
	if n >= 0.01 {
		sev = engine.Danger
	}
	return withCounts(mk("n-chloro-compounds", sev,
		"Hypochlorite chlorinates amines, amides and urea to N-chloro compounds ("+fmtNum(n, 2)+" mol/L can meet): toxic, irritant vapours, some unstable; with acid, urea goes on to explosive nitrogen trichloride.",
		"Do not combine. Keep chlorinated products and amine or urea products in separate lines, rinsed between uses.",
		"Bretherick's Handbook of Reactive Chemical Hazards, sodium hypochlorite with amines and urea (from memory); White's Handbook of Chlorination, organic chloramines (from memory); 0.01 mol/L danger threshold: common practice, no source"),
		engine.GasCount{Formula: "N-chloro compounds", Name: "N-chloro vapour", Mol: n * o.VolumeL, InLiquid: true, From: "hypochlorite with amines, amides or urea"}), true
}

// nitricOrganic: nitric acid of more than about 2 mol/L oxidizes organic
// matter with an induction period, then runs away with nitrogen dioxide.
func nitricOrganic(o *Outcome) (engine.Hazard, bool) {
	hno3, c, ok := nitricMeetsOrganic(o)
	if !ok {
		return engine.Hazard{}, false
	}
	sev := engine.Warning
	if hno3 >= 4 {
		sev = engine.Danger
	}
	rh := o.nitricOrganicHeat(hno3)
	return withHeat(mk("nitric-organic-runaway", sev,
		"Nitric acid at "+fmtNum(hno3, 2)+" mol/L with organic matter ("+fmtNum(c, 2)+" mol/L of carbon) oxidizes it after a delay, then runs away with heat and brown nitrogen dioxide fumes; closed containers burst.",
		"Do not combine. Keep organic products, solvents and rags away from nitric acid; never put them in the same waste drum.",
		"Bretherick's Handbook of Reactive Chemical Hazards, nitric acid with organic compounds (from memory); heat counted for alcohols, glycerol and the like as ethanol equivalents (4 electrons each), from data/familyheats.txt; 2 and 4 mol/L thresholds: common practice, no source"), rh), true
}

// nitricOwnRows are the organic reagents with a nitric-acid reaction of
// their own in data/familyheats.txt (code nitric-organic-runaway:NAME),
// with the electrons each formula unit gives up there; the rest of the
// organic matter counts as ethanol equivalents (4 electrons each).
var nitricOwnRows = []struct {
	name      string
	species   []string
	electrons float64
	equation  string // with nitric acid, for the gas's origin
}{
	{"formic", []string{"HCOOH", "HCOO-"}, 2, "HCOOH + 2 HNO3 → CO2 + 2 NO2 + 2 H2O"},
	{"methanol", []string{"CH3OH", "CH3OH(l)"}, 6, "CH3OH + 6 HNO3 → CO2 + 6 NO2 + 5 H2O"},
}

// nitricOrganicHeat is the heat of nitric acid (mol/L) oxidizing the
// organic matter of the mix: each reagent with a row of its own by that
// reaction, the rest as ethanol equivalents, the acid shared in that
// order.
func (o *Outcome) nitricOrganicHeat(hno3 float64) *engine.ReactionHeat {
	_, orgE := organicLiquid(o, true)
	acid := hno3 * o.VolumeL
	var parts []*engine.ReactionHeat
	for _, row := range nitricOwnRows {
		mol := o.MolarBefore(row.species...) * o.VolumeL
		if mol <= 0 {
			continue
		}
		rh := o.familyHeat("nitric-organic-runaway:"+row.name, reagent{"organic liquid", mol, 1}, reagent{"HNO3", acid, row.electrons})
		if rh == nil {
			continue // no row: the ethanol equivalents count it
		}
		orgE -= row.electrons * mol / o.VolumeL
		acid -= rh.ExtentMol * row.electrons
		parts = append(parts, rh)
	}
	if orgE > 1e-9 && acid > 0 {
		rh := o.familyHeat("nitric-organic-runaway", reagent{"organic liquid", orgE / 4 * o.VolumeL, 1}, reagent{"HNO3", acid, 4})
		if rh != nil && o.MolarBefore("C2H5OH") < orgE/4 {
			rh.Reaction = "nitric acid oxidizing the organic matter, counted as ethanol equivalents (C2H5OH + 4 H+ + 4 NO3- → CH3COOH + 4 NO2(g) + 3 H2O)"
		}
		if rh != nil {
			parts = append(parts, rh)
		}
	}
	return joinHeats(parts)
}

// joinHeats is one ReactionHeat for several reactions of one family run
// side by side: their heats add, the reactions are listed, and the extent
// counts each reaction as written.
func joinHeats(parts []*engine.ReactionHeat) *engine.ReactionHeat {
	if len(parts) == 0 {
		return nil
	}
	if len(parts) == 1 {
		return parts[0]
	}
	out := *parts[0]
	out.Reagents = append([]string(nil), out.Reagents...)
	for _, p := range parts[1:] {
		out.Reaction += "; " + p.Reaction
		out.ExtentMol = sig(out.ExtentMol + p.ExtentMol)
		out.ReleasedkJ = sig(out.ReleasedkJ + p.ReleasedkJ)
		out.Source += "; " + p.Source
		for _, r := range p.Reagents {
			if !slices.Contains(out.Reagents, r) {
				out.Reagents = append(out.Reagents, r)
			}
		}
	}
	out.DeltaHkJPerMol = sig(-out.ReleasedkJ / out.ExtentMol)
	return &out
}

// nitricMeetsOrganic is the nitric acid (mol/L) and organic carbon (mol/L)
// of a mix where nitric acid stronger than about 2 mol/L meets organic
// matter: the condition of the nitric-organic runaway and of its NO2.
func nitricMeetsOrganic(o *Outcome) (hno3, carbon float64, ok bool) {
	hno3, carbon = o.MolarBefore("HNO3", "NO3-"), organicC(o.Before)
	return hno3, carbon, hno3 >= 2 && o.PH < 1 && carbon >= 0.01
}

// chlorateMeetsSulfuric is the chlorate and sulfuric acid (mol/L) of a mix
// where concentrated sulfuric acid meets chlorate: the condition of the
// chlorine dioxide family and of its gas figure.
func chlorateMeetsSulfuric(o *Outcome) (clo3, h2so4 float64, ok bool) {
	clo3, h2so4 = o.MolarBefore("ClO3-", "HClO3"), sulfuric(o)
	return clo3, h2so4, h2so4 >= chlorateAcidMolar && clo3 >= 0.01
}

// hydrazineNitric: hydrazine meeting nitric acid stronger than about
// 2 mol/L is oxidized violently (the pair is hypergolic when concentrated),
// with nitrogen oxides and some hydrazoic acid; neutralised, it leaves
// hydrazinium nitrate, an explosive when the solution dries or is heated.
func hydrazineNitric(o *Outcome) (engine.Hazard, bool) {
	hz := o.MolarBefore("N2H4", "N2H5+", "N2H6^2+")
	no3 := o.MolarBefore("HNO3", "NO3-")
	strong := no3 >= 2 && o.PH < 1
	salt := math.Min(o.MolarBefore("N2H5+", "N2H6^2+"), no3)
	if hz < 0.05 || !strong && salt < 0.5 {
		return engine.Hazard{}, false
	}
	sev, msg := engine.Warning, "Hydrazine with nitric acid leaves hydrazinium nitrate ("+fmtNum(salt, 2)+" mol/L in the mix): stable in solution, but an explosive when the liquor dries out, crusts on a drum or is heated."
	if strong || salt >= 1 {
		sev = engine.Danger
	}
	if strong {
		msg = "Hydrazine (" + fmtNum(hz, 2) + " mol/L) meets nitric acid at " + fmtNum(no3, 2) + " mol/L: it is oxidized violently, with heat, nitrogen oxides and some hydrazoic acid (toxic, explosive); what is left is hydrazinium nitrate, an explosive when dry."
	}
	return mk("hydrazine-nitric", sev, msg,
		"Do not combine. Keep hydrazine and its solutions away from nitric acid and other oxidizing acids; never let hydrazine nitrate liquors dry out.",
		"Bretherick's Handbook of Reactive Chemical Hazards, hydrazine: nitric acid, and hydrazinium nitrate (from memory); thresholds 2 mol/L nitric acid, 0.5 and 1 mol/L hydrazinium nitrate: common practice, no source"), true
}

// hydroxylamineMetalSalts: iron and copper salts catalyse the decomposition
// of hydroxylamine; in concentrated solutions (the 50 % grade, its salts
// at a few mol/L) it runs away, violently and possibly explosively, with
// nitrogen, nitrous oxide, ammonia and heat. Thresholds: danger from 1 mol/L
// hydroxylamine in the mix (about 3 %), a warning from 0.1 mol/L; the metal
// from 1e-4 mol/L (a few ppm: traces catalyse).
func hydroxylamineMetalSalts(o *Outcome) (engine.Hazard, bool) {
	ha := o.MolarBefore("NH2OH", "NH3OH+")
	metal := metalSaltMolar(o.Before, o.VolumeL, "Fe", "Cu")
	if ha < 0.1 || metal < 1e-4 {
		return engine.Hazard{}, false
	}
	sev := engine.Warning
	if ha >= 1 {
		sev = engine.Danger
	}
	return mk("hydroxylamine-decomposition", sev,
		"Hydroxylamine ("+fmtNum(ha, 2)+" mol/L) with iron or copper salts ("+fmtNum(metal, 2)+" mol/L): the metal ions catalyse its decomposition, which in concentrated solution runs away violently, possibly explosively, with nitrogen, nitrous oxide, ammonia and heat.",
		"Do not combine. Keep hydroxylamine and its solutions free of iron and copper (no rusty or copper-alloy equipment, no metal-salt liquors), cool and vented.",
		"Bretherick's Handbook of Reactive Chemical Hazards, hydroxylamine: metal salts (from memory); thresholds 0.1 and 1 mol/L hydroxylamine, 1e-4 mol/L metal: common practice, no source"), true
}

// hydroxylamineFreed: strong base frees hydroxylamine from its salts
// (NH3OH+, pKa 5.96), and the free base is far less stable than the salt:
// it breaks down on standing, faster warm, alkaline or with traces of iron
// or copper, with nitrogen, ammonia and heat, and concentrated or heated
// it can explode (Bretherick's Handbook of Reactive Chemical Hazards,
// hydroxylamine, from memory). A warning from HydroxylamineFreeMolar of
// free base made from a salt (common practice, no source).
func hydroxylamineFreed(o *Outcome) (engine.Hazard, bool) {
	free := o.Molar("NH2OH")
	if !o.StrongBase || !o.Named("(NH3OH)2SO4", "NH3OHCl") || free < HydroxylamineFreeMolar || o.Named("NH2OH") {
		return engine.Hazard{}, false
	}
	return mk("hydroxylamine-freed", engine.Warning,
		"The base frees hydroxylamine from its salt ("+fmtNum(free, 2)+" mol/L free base, "+fmtNum(free*o.VolumeL, 3)+" mol): free hydroxylamine is far less stable than its salts and breaks down on standing, faster warm, alkaline or with traces of iron or copper, giving nitrogen, ammonia and heat; concentrated or heated it can explode.",
		"Free it only as needed and use it at once: keep it cool and vented, out of iron and copper equipment, and never heat or concentrate the liquor.",
		"Bretherick's Handbook of Reactive Chemical Hazards, hydroxylamine (from memory); pKa 5.96: CRC Handbook, Dissociation Constants of Inorganic Acids and Bases (from memory); threshold: common practice, no source"), true
}

// hotHypophosphite: hypophosphite that boils, or is heated with strong
// caustic (about 80 °C and more), breaks down and gives off phosphine, a
// very toxic gas that can ignite in air (sodium hypophosphite safety data
// sheets; Greenwood & Earnshaw, Chemistry of the Elements, phosphorus
// oxoacids; from memory). Named whenever hypophosphite is there before the
// mix reacts and the mix boils or is hot and strongly alkaline: what is
// left of it at the boil is not known to the state (the reaction that
// heats it may take it all).
func hotHypophosphite(o *Outcome) (engine.Hazard, bool) {
	hp := o.MolarBefore("H2PO2-", "H3PO2")
	if hp < 0.1 || !(o.Heat.Known && o.Heat.Boils || o.StrongBase && math.Max(o.TemperatureC, o.Heat.ReachedC) >= 80) {
		return engine.Hazard{}, false
	}
	return mk("hypophosphite-phosphine", engine.Warning,
		"Hypophosphite ("+fmtNum(hp, 2)+" mol/L) in a mix that boils or is hot and strongly alkaline breaks down and can give off phosphine, a very toxic gas that can ignite in air.",
		"Keep hypophosphite liquors below boiling and away from hot strong caustic; work with extraction and no ignition sources.",
		"sodium hypophosphite safety data sheets (phosphine on heating), Greenwood & Earnshaw, Chemistry of the Elements, phosphorus oxoacids (from memory); 0.1 mol/L and 80 °C: common practice, no source"), true
}

// HydroxylamineFreeMolar is the free hydroxylamine (mol/L, about 1.6 %)
// from which freeing it is named (common practice, no source).
const HydroxylamineFreeMolar = 0.5

// hotDithionite: hot (about 60 °C and more) and not held strongly alkaline,
// dissolved dithionite breaks down within minutes to an hour (2 S2O4^2- +
// H2O → S2O3^2- + 2 HSO3-), turns the bath acid and speeds itself up, with
// sulfur dioxide and sulfur to follow (common practice, no source;
// Greenwood & Earnshaw, Chemistry of the Elements, dithionite, from
// memory). The state runs it (lock dithionite-keeps released): this names
// it and what to do.
func hotDithionite(o *Outcome) (engine.Hazard, bool) {
	before := o.MolarBefore("S2O4^2-", "HS2O4-")
	if before < TraceMolar || o.Molar("S2O4^2-", "HS2O4-") > 0.5*before || !o.Formed("S2O3^2-", "HS2O3-") || o.TemperatureC < 60 {
		return engine.Hazard{}, false
	}
	return mk("hot-dithionite", engine.Warning,
		"Hot ("+fmtNum(o.TemperatureC, 3)+" °C) and not held strongly alkaline, the dithionite breaks down into thiosulfate and bisulfite within minutes to an hour: it loses its reducing power, turns the bath acid (pH "+fmtNum(o.PH, 2)+" here), which speeds the breakdown, and sulfur dioxide and sulfur follow.",
		"Make hot dithionite baths up with caustic soda (to about pH 11 or more) and use them at once; vent the tank.",
		"hot dithionite baths held alkaline and used at once: common practice, no source; Greenwood & Earnshaw, Chemistry of the Elements, dithionite (from memory)"), true
}

// metalSaltMolar is the mol/L of the atoms of the elements els held in
// their ions, complexes and salts, solid hydroxides too (not as the bare
// metal), among xs in volL litres.
func metalSaltMolar(xs []Amount, volL float64, els ...string) float64 {
	t := 0.0
	for i := range xs {
		a := &xs[i]
		m := a.Molar
		if a.Species.Phase == engine.Solid && volL > 0 {
			m = a.Mol / volL
		}
		if m < TraceMolar {
			continue
		}
		atoms, err := chem.ParseFormula(a.Species.Formula)
		if err != nil || len(atoms) == 1 && a.Species.Charge == 0 {
			continue
		}
		for _, el := range els {
			t += m * float64(atoms[el])
		}
	}
	return t
}

// hydrazineOxidizer: concentrated hydrazine meeting a strong oxidizing
// agent (hypochlorite, peroxide, permanganate, chromic acid, chlorate) reacts
// violently, to the boil, and what is not yet oxidized comes off the hot
// liquid as hydrazine vapour (NIOSH: carcinogen, IDLH 50 ppm); hypochlorite
// also gives chloramines. Hydrazine is destroyed on purpose only dilute,
// the oxidizer dosed slowly. Judged on what the streams bring together,
// from hydrazineOxidizerMolar hydrazine and hydrazineOxidantMolar oxidizer.
func hydrazineOxidizer(o *Outcome) (engine.Hazard, bool) {
	hz := o.MolarBefore("N2H4", "N2H5+", "N2H6^2+")
	ox := o.MolarBefore("OCl-", "HOCl", "H2O2", "HO2-", "MnO4-", "HCrO4-", "CrO4^2-", "H2CrO4", "ClO3-")
	ox += 2 * o.MolarBefore("Cr2O7^2-")
	if hz < hydrazineOxidizerMolar || ox < hydrazineOxidantMolar {
		return engine.Hazard{}, false
	}
	return mk("hydrazine-oxidizer", engine.Danger,
		"Concentrated hydrazine ("+fmtNum(hz, 2)+" mol/L in the mix) meets a strong oxidizing agent ("+fmtNum(ox, 2)+" mol/L): the reaction is violent and boils where they meet, and the hot liquid gives off hydrazine vapour (a carcinogen, NIOSH IDLH 50 ppm) and, with hypochlorite, chloramines.",
		"Do not combine concentrates. Destroy hydrazine only dilute (below about 5 %, 1.5 mol/L), dosing the oxidizer slowly with cooling and extraction; keep hydrazine drums away from oxidizers.",
		"Bretherick's Handbook of Reactive Chemical Hazards, hydrazine: oxidants (from memory); NIOSH Pocket Guide, hydrazine, IDLH 50 ppm (from memory); thresholds 1 mol/L hydrazine and 0.3 mol/L oxidizer: common practice, no source"), true
}

// hydrazineOxidizerMolar and hydrazineOxidantMolar: hydrazine (about 3 %) and the
// oxidizing agent, mol/L in the mix, from which hydrazineOxidizer counts; a
// boiler-water dose (hundreds of ppm) stays far below.
const (
	hydrazineOxidizerMolar = 1.0
	hydrazineOxidantMolar  = 0.3
)

// DithioniteSolubility is the solubility of sodium dithionite, about
// 182 g per litre of water at 20 °C (CRC Handbook, Physical Constants of
// Inorganic Compounds, from memory).
const DithioniteSolubility = 182.0

// dampDithionite: solid sodium dithionite that water wets but cannot
// dissolve heats itself (2 Na2S2O4 + H2O → Na2S2O3 + 2 NaHSO3, with the
// heat speeding it up) and gives off sulfur dioxide; a damp heap can
// smoulder or ignite. Poured slowly into enough water it dissolves.
func dampDithionite(o *Outcome) (engine.Hazard, bool) {
	kg := o.SolidKg["Na2S2O4"]
	if kg <= 0 {
		return engine.Hazard{}, false
	}
	dissolves := DithioniteSolubility * o.VolumeL / 1000
	if kg <= dissolves {
		return engine.Hazard{}, false
	}
	return mk("damp-dithionite", engine.Danger,
		"Only about "+fmtNum(dissolves, 2)+" kg of the "+fmtNum(kg, 3)+" kg of sodium dithionite dissolves in "+fmtNum(o.VolumeL, 3)+" L (about "+fmtNum(DithioniteSolubility, 3)+" g/L): the rest stays as a wet solid, which heats itself, gives off sulfur dioxide and can smoulder or ignite.",
		"Do not combine in these amounts: use at least "+fmtNum(kg/DithioniteSolubility*1000*1.5, 2)+" L of water and sprinkle the dithionite into it slowly, stirring; never add a little water to a heap or a drum of dithionite.",
		"Bretherick's Handbook of Reactive Chemical Hazards, sodium dithionite (self-heating when damp), from memory; solubility CRC Handbook, from memory; 1.5× margin: common practice, no source"), true
}

// ammoniumNitrite: ammonium with nitrite decomposes to nitrogen and water,
// NH4+ + NO2- → N2 + 2 H2O, ΔH° = 2(−285.83) − (−132.51) − (−104.6)
// = −334.6 kJ/mol (NBS Tables 1982); fast when warm or acidic.
func ammoniumNitrite(o *Outcome) (engine.Hazard, bool) {
	n := math.Min(o.MolarBefore("NH4+", "NH3"), o.MolarBefore("NO2-", "HNO2"))
	if n < 0.1 || o.PH >= 9 {
		return engine.Hazard{}, false
	}
	kJ := n * o.VolumeL * 334.6
	sev := engine.Warning
	if o.TemperatureC >= 40 || o.PH < 5 || n >= 1 {
		sev = engine.Danger
	}
	h := mk("ammonium-nitrite-runaway", sev,
		"Ammonium with nitrite ("+fmtNum(n, 2)+" mol/L of each) decomposes to nitrogen and water, giving off up to "+fmtNum(kJ, 3)+" kJ; warm or acidic it speeds itself up and can run away with a surge of gas.",
		"Do not combine, or only dilute and cold with venting; never heat or acidify such a mix.",
		"Bretherick's Handbook of Reactive Chemical Hazards, ammonium nitrite (from memory); ΔH from NBS Tables 1982 ΔfH° of NH4+, NO2- and H2O(l); thresholds: common practice, no source")
	if o.Molar("N2", "N2(g)") < o.MolarBefore("N2", "N2(g)")+n/2 && o.GasMol("N2") < n*o.VolumeL/2 {
		// The state does not run it (cold, not acid): its heat is shown
		// as the heat if it runs, not counted.
		h.RunawayHeat = o.familyHeat("ammonium-nitrite-runaway",
			reagent{"NH4+", o.MolarBefore("NH4+", "NH3") * o.VolumeL, 1}, reagent{"NO2-", o.MolarBefore("NO2-", "HNO2") * o.VolumeL, 1})
	}
	return h, true
}

// permanganateSulfuric: permanganate with concentrated sulfuric acid forms
// manganese heptoxide, an oil that explodes on warming and ignites organic
// matter on contact.
func permanganateSulfuric(o *Outcome) (engine.Hazard, bool) {
	if o.MolarBefore("MnO4-", "HMnO4") < TraceMolar || sulfuric(o) < 9 {
		return engine.Hazard{}, false
	}
	return mk("manganese-heptoxide", engine.Danger,
		"Permanganate with concentrated sulfuric acid forms manganese heptoxide: an oil that explodes on warming or shock and sets organic matter alight on contact.",
		"Do not combine. Keep permanganate away from concentrated acids and organic matter.",
		"Bretherick's Handbook of Reactive Chemical Hazards, potassium permanganate with sulfuric acid (from memory); 9 mol/L (about 60 %): common practice, no source"), true
}

// sulfuric is the mol/L of sulfuric acid (all forms) when the mix is
// strongly acidic.
func sulfuric(o *Outcome) float64 {
	if o.PH >= 0.5 {
		return 0
	}
	return o.MolarBefore(sulfateForms...)
}

// sulfateForms are the dissolved forms of sulfuric acid and sulfate the
// species data hold, ion pairs included: warm strong acid with much sodium
// holds a quarter of its sulfate as NaSO4-, which is still the acid's.
var sulfateForms = []string{"H2SO4", "HSO4-", "SO4^2-", "NaSO4-", "KSO4-", "MgSO4", "CaSO4", "ZnSO4", "CuSO4", "FeSO4+", "Fe(SO4)2-"}

// volatileAcid: concentrated sulfuric acid takes up the water of the other
// stream and drives out hydrogen chloride, nitric acid vapour or hydrogen
// fluoride from their acids and salts. Each acid gas it drives out is
// counted (engine.GasCount) up to the acid and salt the mix holds, with its
// exposure limit: these gases are not judged in the headspace of every mix
// (gases.txt), only here, where the concentrated acid drives them out.
func volatileAcid(o *Outcome) (engine.Hazard, bool) {
	h2so4 := sulfuric(o)
	if h2so4 < 8 {
		return engine.Hazard{}, false
	}
	var names []string
	var counts []engine.GasCount
	n := 0.0
	mixedAcid := false
	for _, v := range volatileAcids {
		m := o.MolarBefore(v.species...)
		if m < 0.1 {
			continue
		}
		if v.formula == "HNO3" && !nitrateSalt(o) {
			// Nitric acid itself with strong sulfuric acid is mixed acid,
			// made up routinely for nitrating and bright dipping: the
			// sulfuric acid into the nitric, slowly, cooled, under
			// extraction. It fumes more as it warms, but nothing drives
			// the nitric acid out of it as from a nitrate salt (common
			// practice, no source).
			mixedAcid = true
			continue
		}
		names, n = append(names, v.name), n+m
		if v.formula != "" {
			c := beyondCount(v.formula, v.name, m*o.VolumeL, "concentrated sulfuric acid driving it out")
			c.LimitName, c.LimitPPM, c.LimitSource = "IDLH", v.idlhPPM, v.limitSource
			counts = append(counts, c)
		}
	}
	if len(names) == 0 {
		if mixedAcid {
			return mk("acid-fumes", engine.Warning,
				"Concentrated sulfuric acid ("+fmtNum(h2so4, 2)+" mol/L in the mix) with nitric acid is mixed acid: it heats as it is made and gives off nitric acid vapour and nitrogen oxides, the more the warmer it gets.",
				"Make it up in an acid-resistant vessel under extraction: run the sulfuric acid slowly into the nitric with cooling and stirring, keep it below about 40 °C and away from organic matter; wear acid-resistant gloves and a face shield.",
				"mixed acid make-up: common practice, no source; Bretherick's Handbook of Reactive Chemical Hazards, nitric acid with sulfuric acid and organic matter (from memory)"), true
		}
		return engine.Hazard{}, false
	}
	return withCounts(mk("acid-fumes", engine.Danger,
		"Concentrated sulfuric acid ("+fmtNum(h2so4, 2)+" mol/L in the mix) drives "+strings.Join(names, " and ")+" out of the solution ("+fmtNum(n*o.VolumeL, 3)+" mol can come off) with heat: dense, corrosive fumes.",
		"Do not combine. If both must go to one drain, dilute each into plenty of water first, separately.",
		"Vogel's Textbook of Macro and Semimicro Qualitative Inorganic Analysis, chlorides and nitrates with concentrated sulfuric acid (from memory); NIOSH Pocket Guide, hydrogen chloride IDLH 50 ppm (from memory); 8 mol/L threshold: common practice, no source"), counts...), true
}

// nitrateSalt reports whether a stream brings a nitrate other than nitric
// acid itself (sodium, potassium, ammonium, calcium nitrate …).
func nitrateSalt(o *Outcome) bool {
	for _, f := range o.Chemicals {
		if f != "HNO3" && strings.Contains(f, "NO3") {
			return true
		}
	}
	return false
}

// volatileAcids are the acids concentrated sulfuric acid drives out of a
// mix, by the dissolved forms they come from. formula is the gas counted
// for the short answer, with its NIOSH IDLH; hydrogen fluoride is left to
// the hydrofluoric acid rules and counted here only in the message.
var volatileAcids = []struct {
	name        string
	species     []string
	formula     string
	idlhPPM     float64
	limitSource string
}{
	{"hydrogen chloride", []string{"Cl-", "HCl"}, "HCl", 50, "NIOSH Pocket Guide, hydrogen chloride, IDLH 50 ppm (1994), from memory"},
	{"nitric acid vapour and nitrogen oxides", []string{"NO3-", "HNO3"}, "HNO3", 25, "NIOSH Pocket Guide, nitric acid, IDLH 25 ppm (1994), from memory"},
	{"hydrogen fluoride", []string{"F-", "HF"}, "", 0, ""},
}

// solidHypochlorite: calcium hypochlorite and the chloroisocyanurates as
// solids heat up with a little water or organic matter and can ignite or
// give off chlorine; they go into plenty of water, never water onto them.
func solidHypochlorite(o *Outcome) (engine.Hazard, bool) {
	if !o.SolidStream("Ca(OCl)2", "C3Cl3N3O3", "NaC3Cl2N3O3", "C5H6BrClN2O2") {
		return engine.Hazard{}, false
	}
	note, noteSrc := undissolved(o)
	src := "Bretherick's Handbook of Reactive Chemical Hazards, calcium hypochlorite and trichloroisocyanuric acid (from memory); White's Handbook of Chlorination, handling of calcium hypochlorite (from memory); erosion feeders: common practice, no source"
	if noteSrc != "" {
		src += "; solubility: " + noteSrc
	}
	return mk("solid-oxidizer-heating", engine.Warning,
		"Solid calcium hypochlorite, chloroisocyanurate or halogenated hydantoin: a little water, acid or organic matter on the solid heats it and can set it alight or release chlorine (with little water, nitrogen trichloride)."+note,
		"Add the solid a little at a time to plenty of water, or dose it through a feeder, never water onto the solid; use clean, dry scoops; keep acids, ammonia and amines, oils and other chlorinating products away.",
		src), true
}

// magnesiumWater: magnesium corrodes in water and neutral salt solutions
// with a slow, steady release of hydrogen (faster warm or with chloride);
// nickel, cobalt, tin and lead dissolve only slowly in dilute
// non-oxidizing acids (the state holds their hydrogen back, lock
// hydrogen-slow-metals): the same slow hydrogen, over hours to days.
func magnesiumWater(o *Outcome) (engine.Hazard, bool) {
	if o.VolumeL <= 0 || o.GasMol("H2") > 0 || o.Measured["H2"].Mol > 0 {
		return engine.Hazard{}, false
	}
	if heldBy(o, "hydrogen-slow-metals") {
		if names := slowMetalNames(o); names != "" {
			return mk("slow-hydrogen", engine.Warning,
				strings.ToUpper(names[:1])+names[1:]+" dissolves only slowly in this acid (pH "+fmtNum(o.PH, 3)+"): hydrogen comes off slowly but steadily, over hours to days, as long as metal and acid last; hot acid or fine powder dissolves faster.",
				"Do not hold it in a closed vessel: vent the headspace and keep sparks and hot work away.",
				"Vogel's Textbook of Macro and Semimicro Qualitative Inorganic Analysis, nickel, cobalt, tin and lead with dilute acids (from memory); common practice, no source (nickel strike baths)"), true
		}
	}
	if o.PH < 4 {
		return engine.Hazard{}, false
	}
	for _, a := range o.Before {
		if s := a.Species; s.Charge == 0 && s.Phase == engine.Solid && s.Formula == "Mg" {
			return mk("slow-hydrogen", engine.Warning,
				"Magnesium corrodes in water with a slow, steady release of hydrogen (faster when warm or salty); fine turnings and powder react faster and can ignite.",
				"Do not hold it in a closed vessel: vent the headspace and keep sparks and hot work away.",
				"Bretherick's Handbook of Reactive Chemical Hazards, magnesium with water (from memory)"), true
		}
	}
	return engine.Hazard{}, false
}

// slowMetals names the metals of lock hydrogen-slow-metals.
var slowMetals = []struct{ formula, name string }{{"Ni", "nickel"}, {"Co", "cobalt"}, {"Sn", "tin"}, {"Pb", "lead"}}

// slowMetalNames names the slow metals brought as metal ("nickel", "tin
// and lead"); empty when there are none. Lead in sulfate is left out: its
// lead sulfate film stops it (lead-lined tanks carry sulfuric acid;
// Vogel's Textbook, lead with dilute sulfuric acid, from memory; common
// practice, no source).
func slowMetalNames(o *Outcome) string {
	var names []string
	sulfate := o.MolarBefore(sulfateForms...) >= TraceMolar
	for _, m := range slowMetals {
		if m.formula == "Pb" && sulfate {
			continue // held by its sulfate film: lead linings carry sulfuric acid
		}
		for _, a := range o.Before {
			if s := a.Species; s.Charge == 0 && s.Phase == engine.Solid && s.Formula == m.formula && a.Mol > 0 {
				names = append(names, m.name)
				break
			}
		}
	}
	switch len(names) {
	case 0:
		return ""
	case 1:
		return names[0]
	}
	return strings.Join(names[:len(names)-1], ", ") + " and " + names[len(names)-1]
}

// cyanideOxidation: cyanide destruction by hypochlorite or peroxide is a
// routine treatment step only under control: pH kept at 10.5 or more, dosing
// slow, the tank vented (excess peroxide gives off oxygen, a falling pH gives
// off hydrogen cyanide or cyanogen chloride).
func cyanideOxidation(o *Outcome) (engine.Hazard, bool) {
	cn := o.MolarBefore("CN-", "HCN") + labileCyanideMolar(o)
	ox := math.Max(hypochloriteAny(o), o.MolarBefore("H2O2", "HO2-", "S2O8^2-", "HSO5-", "SO5^2-", "O3", "MnO4-"))
	if cn < TraceMolar || ox < TraceMolar {
		return engine.Hazard{}, false
	}
	msg, check := "This is a cyanide oxidation ("+fmtNum(cn, 2)+" mol/L cyanide): it is safe only as a controlled treatment step.", "hydrogen cyanide"
	if hypochloriteAny(o) >= TraceMolar {
		msg += " Below about pH 10 hypochlorite stops at cyanogen chloride, a toxic gas (ACGIH ceiling 0.3 ppm)."
		check = "hydrogen cyanide and cyanogen chloride"
	}
	return mk("cyanide-oxidation", engine.Warning, msg,
		"Hold the pH at 10.5 or more before and during dosing, dose the oxidant slowly with ORP control and stirring, vent the tank and check for "+check+".",
		"alkaline cyanide treatment, pH 10.5 and ORP control: common practice, no source; White's Handbook of Chlorination, cyanogen chloride below pH 10 (from memory)"), true
}

// labileCyanideMolar is the mol/L of cyanide held in the complexes that
// hypochlorite oxidizes as it does free cyanide (silver, copper, zinc,
// cadmium, nickel; see state.IsOrganic), before reaction.
func labileCyanideMolar(o *Outcome) float64 {
	return 2*o.MolarBefore("Ag(CN)2-", "Cu(CN)2-") + 3*o.MolarBefore("Cu(CN)3^2-") +
		4*o.MolarBefore("Cu(CN)4^3-", "Zn(CN)4^2-", "Cd(CN)4^2-", "Ni(CN)4^2-")
}

// halideSulfuric: concentrated sulfuric acid drives hydrogen bromide or
// iodide out of their salts and oxidizes it: 2 HBr + H2SO4 → Br2 + SO2 +
// 2 H2O; iodide goes further, to iodine with sulfur dioxide and hydrogen
// sulfide (8 HI + H2SO4 → 4 I2 + H2S + 4 H2O). The equilibrium state keeps
// sulfate from being reduced (the sulfate-inert lock, right for dilute
// acid), so this is judged as a family.
func halideSulfuric(o *Outcome) (engine.Hazard, bool) {
	h2so4 := sulfuric(o)
	if h2so4 < 8 {
		return engine.Hazard{}, false
	}
	br, io := o.MolarBefore("Br-", "HBr"), o.MolarBefore("I-", "HI")
	if br < 0.1 && io < 0.1 {
		return engine.Hazard{}, false
	}
	var what []string
	if br >= 0.1 {
		what = append(what, "hydrogen bromide fumes, bromine and sulfur dioxide (2 HBr + H2SO4 → Br2 + SO2 + 2 H2O: up to "+fmtNum(br/2*o.VolumeL, 3)+" mol Br2 and as much SO2)")
	}
	if io >= 0.1 {
		what = append(what, "iodine, sulfur dioxide and hydrogen sulfide (8 HI + H2SO4 → 4 I2 + H2S + 4 H2O: up to "+fmtNum(io/2*o.VolumeL, 3)+" mol I2)")
	}
	return mk("halogen-fumes", engine.Danger,
		"Concentrated sulfuric acid ("+fmtNum(h2so4, 2)+" mol/L in the mix) oxidizes bromide and iodide: it gives off "+strings.Join(what, "; ")+", with heat.",
		"Do not combine. Keep bromide and iodide salts and brines away from concentrated sulfuric acid; if it has happened, leave the area and return only with breathing apparatus.",
		"Vogel's Textbook of Macro and Semimicro Qualitative Inorganic Analysis, bromides and iodides with concentrated sulfuric acid (from memory); NIOSH Pocket Guide, bromine IDLH 3 ppm, sulfur dioxide IDLH 100 ppm (from memory); 8 mol/L threshold: common practice, no source"), true
}

// chlorateSulfuric: chlorate in concentrated sulfuric acid becomes chloric
// acid, which breaks down to chlorine dioxide (3 HClO3 → 2 ClO2 + HClO4 +
// H2O); a reducing agent (methanol, peroxide, sulfur dioxide) runs the same
// change at lower acid, as in a chlorine dioxide generator. Chlorine dioxide
// explodes above about 10 % in air. The equilibrium state keeps chlorate
// (the chlorate-sluggish lock holds above pH 3 only, but chloric acid's own
// breakdown has no couple in the tables), so this is judged as a family.
func chlorateSulfuric(o *Outcome) (engine.Hazard, bool) {
	clo3, h2so4, ok := chlorateMeetsSulfuric(o)
	if !ok {
		return engine.Hazard{}, false
	}
	return mk("clo2-release", engine.Danger,
		"Concentrated sulfuric acid ("+fmtNum(h2so4, 2)+" mol/L in the mix) turns chlorate into chloric acid, which breaks down to chlorine dioxide (3 HClO3 → 2 ClO2 + HClO4 + H2O: up to "+
			fmtNum(clo3*2/3*o.VolumeL, 3)+" mol ClO2); chlorine dioxide is toxic (NIOSH IDLH 5 ppm) and explodes above about 10 % in air, and the acid's heat speeds it up.",
		"Do not combine, at any rate of addition: keep chlorate away from strong acids; if it has happened, leave the area and keep sources of ignition away.",
		"Bretherick's Handbook of Reactive Chemical Hazards, sodium chlorate: sulfuric acid (from memory); White's Handbook of Chlorination, chlorine dioxide generation (from memory); NIOSH Pocket Guide, chlorine dioxide IDLH 5 ppm (from memory); 6 mol/L threshold: common practice, no source"), true
}

// chloricAcid: chlorate in strong acid (below pH 0, about 1 mol/L of free
// acid) at 1 mol/L or more, without chloride to reduce it, is chloric acid:
// a strong oxidizer that breaks down to chlorine dioxide when it warms or
// concentrates, and sets organic matter alight. Concentrated sulfuric acid
// (chlorateSulfuric) and hydrochloric acid (the chlorate with chloride
// pools) have their own rules; dilute bromic acid keeps (Vogel's Textbook,
// bromates, from memory) and is left out.
func chloricAcid(o *Outcome) (engine.Hazard, bool) {
	ox := o.MolarBefore("ClO3-", "HClO3")
	if ox < 1 || o.PH >= 0 || o.MolarBefore("Cl-", "Br-", "I-") >= 0.1 {
		return engine.Hazard{}, false
	}
	if _, _, ok := chlorateMeetsSulfuric(o); ok {
		return engine.Hazard{}, false
	}
	sev, warm := engine.Warning, ""
	if o.Heat.Known && o.Heat.ReachedC >= ScaldC {
		sev, warm = engine.Danger, " The mix's own heat takes it to about "+fmtNum(o.Heat.ReachedC, 2)+" °C, where the breakdown runs."
	}
	return mk("chloric-acid", sev,
		"Chlorate ("+fmtNum(ox, 2)+" mol/L) in strong acid (pH "+fmtNum(o.PH, 2)+") is chloric acid: a strong oxidizer that breaks down to chlorine dioxide when it warms or concentrates, and sets organic matter, rags and wood alight."+warm,
		"Keep the mix cool and dilute; keep organic matter, solvents, rags and wood away; never let it dry out or evaporate; work with extraction.",
		"Bretherick's Handbook of Reactive Chemical Hazards, chloric acid and chlorates with acids (from memory); pH 0 and 1 mol/L thresholds: common practice, no source"), true
}

// chlorateSulfite: concentrated chlorate or bromate beside concentrated
// bisulfite or metabisulfite (or dithionite) in a mix below pH 7. Above about pH 3 the pair
// hardly reacts at first (the chlorate-sluggish lock holds it back), but the
// reaction makes its own acid (ClO3- + 3 HSO3- → Cl- + 3 SO4^2- + 3 H+) and
// the acid speeds it up: after a quiet spell the tank can take off, boil and
// give off chlorine dioxide, chlorine and sulfur dioxide. Judged while both
// are still there after the equilibrium (held back); where the state already
// runs the reaction, its heat and gases are judged as they form. Sulfite in
// alkali (ClO3- + 3 SO3^2- → Cl- + 3 SO4^2-) makes no acid and stays slow:
// not refused (its lock's "never acidify" stands).
func chlorateSulfite(o *Outcome) (engine.Hazard, bool) {
	ox := o.Molar("ClO3-", "HClO3", "BrO3-", "HBrO3")
	red := o.Molar("HSO3-", "H2SO3", "S2O5^2-", "HS2O4-")
	if ox < chlorateSulfiteMolar || red < chlorateSulfiteMolar || o.PH >= 7 {
		return engine.Hazard{}, false
	}
	what := "Chlorate"
	if o.Molar("BrO3-", "HBrO3") > o.Molar("ClO3-", "HClO3") {
		what = "Bromate"
	}
	return mk("chlorate-sulfite", engine.Danger,
		what+" ("+fmtNum(ox, 2)+" mol/L in the mix) beside sulfite or bisulfite ("+fmtNum(red, 2)+" mol/L) reacts slowly at first, but the reaction makes its own acid (ClO3- + 3 HSO3- → Cl- + 3 SO4^2- + 3 H+) and the acid speeds it up: after a quiet spell the tank can take off, boil and give off chlorine dioxide, chlorine and sulfur dioxide (about 900 kJ per mol of chlorate).",
		"Do not combine, at any rate of addition: store and dose chlorate and sulfite or bisulfite apart, in separate lines and bunds; if it has happened, do not add acid, dilute with plenty of water and leave the area.",
		"Bretherick's Handbook of Reactive Chemical Hazards, chlorates: reducing agents (from memory); the chlorate–sulfite reaction is autocatalytic in acid (a known clock reaction, from memory); reaction heat from NBS Tables 1982 ΔfH° (from memory); 0.3 mol/L threshold: common practice, no source"), true
}

// chlorateSulfiteMolar: the chlorate and the sulfite, mol/L in the mix each,
// from which the pair is refused (the chlorate of aged bleach, about
// 0.05 mol/L, and a dechlorination dose stay below it).
const chlorateSulfiteMolar = 0.3

// chlorateAcidMolar is the sulfuric acid, mol/L in the mix, from which
// chlorate alone gives chlorine dioxide (generators run at about 4.5–5 mol/L
// with a reducing agent; without one, stronger acid is needed): common
// practice, no source.
const chlorateAcidMolar = 6

// hotElectrolessNickel: nickel(II) with hypophosphite at 60 °C and more is
// an electroless-nickel bath at work. It is run that way on purpose, but a
// bath that is overheated, over-adjusted with caustic or seeded with
// particles "crashes": nickel plates out as black powder throughout the tank
// with a surge of hydrogen. Cold, the same solution keeps (the
// hypophosphite-cold lock holds the plating back).
func hotElectrolessNickel(o *Outcome) (engine.Hazard, bool) {
	if o.TemperatureC < 60 || o.MolarBefore("H2PO2-", "H3PO2") < TraceMolar {
		return engine.Hazard{}, false
	}
	ni := 0.0
	for _, a := range o.Before {
		if at, err := chem.ParseFormula(a.Species.Formula); err == nil && at["Ni"] > 0 {
			ni += a.Mol * float64(at["Ni"]) // nickel(II), or nickel a hot stream has already plated
		}
	}
	if o.VolumeL > 0 {
		ni /= o.VolumeL
	}
	if ni < TraceMolar {
		return engine.Hazard{}, false
	}
	return mk("hot-electroless-bath", engine.Warning,
		"A hot nickel–hypophosphite bath ("+fmtNum(ni, 2)+" mol/L nickel) plates wherever it finds a catalytic surface; overheated, adjusted with strong caustic or seeded with particles it crashes: black nickel throughout the tank and a surge of hydrogen.",
		"Adjust pH with dilute caustic or ammonia, slowly and with stirring, below the operating temperature; vent the tank, keep sparks away and filter out particles.",
		"electroless nickel operation (about 85–90 °C, catalytic surface; bath decomposition with hydrogen): common practice, no source"), true
}

// nitricMetalFumes: active metals take very dilute nitric acid mainly to
// ammonium nitrate, which the state shows; some nitrous oxide and nitric
// oxide still come off beside it, which it does not count.
func nitricMetalFumes(o *Outcome) (engine.Hazard, bool) {
	if o.VolumeL <= 0 || o.MolarBefore("NO3-", "HNO3") < TraceMolar || o.Molar("NH4+", "NH3") < o.MolarBefore("NH4+", "NH3")+TraceMolar {
		return engine.Hazard{}, false
	}
	if o.Measured["NO"].Mol > 0 || o.GasMol("NO") > 0 {
		return engine.Hazard{}, false // the nitric oxide is counted as a gas
	}
	for _, a := range o.Before {
		if s := a.Species; s.Charge == 0 && s.Phase == engine.Solid && strings.Contains(" Zn Mg Al Fe Sn Mn Cd ", " "+s.Formula+" ") {
			return mk("nitrous-fumes", engine.Warning,
				"Very dilute nitric acid with "+s.Formula+" gives mainly ammonium nitrate (for zinc 4 Zn + 10 H+ + NO3- → 4 Zn2+ + NH4+ + 3 H2O), but some nitrous oxide and nitric oxide come off beside it (not counted here).",
				"Work with extraction and add the metal slowly.",
				"Vogel's Textbook of Macro and Semimicro Qualitative Inorganic Analysis, nitric acid with zinc (from memory)"), true
		}
	}
	return engine.Hazard{}, false
}

// nitricProofMolar (mol/L of nitrate as combined) is about 80 % nitric acid
// (1.45 g/mL, 18.4 mol/L: CRC Handbook, concentrative properties, from
// memory): aluminium stands up to nitric acid above it; at 60–80 % the
// film holds (lock nitric-passivation-aluminium) but the metal is still
// attacked slowly.
const nitricProofMolar = 18.0

// aluminiumNitricSlow: aluminium held passive by concentrated nitric acid
// (lock nitric-passivation-aluminium) below about 80 % still corrodes
// slowly with brown fumes; powder and turnings go faster, and diluting the
// acid with the metal in it makes the attack quick. Iron and carbon steel
// (lock nitric-passivation-iron) are no nitric-acid material at any
// strength: the film breaks on dilution, scratching or a trace of chloride
// and the attack then runs fast with nitrogen oxides. Chromium, the metal
// that makes stainless steel resist nitric acid, stays quiet.
func aluminiumNitricSlow(o *Outcome) (engine.Hazard, bool) {
	nitrate := o.MolarBefore("NO3-", "HNO3")
	var metal, material string
	switch {
	case heldBy(o, "nitric-passivation-iron"):
		metal, material = "Iron and carbon steel are", "carbon steel is no material for nitric acid at any strength (stainless steel is)"
	case heldBy(o, "nitric-passivation-aluminium") && nitrate < nitricProofMolar:
		metal, material = "Aluminium is", "aluminium stands up only to nitric acid above about 80 %"
	default:
		return engine.Hazard{}, false
	}
	return mk("nitric-slow-attack", engine.Warning,
		metal+" passivated by nitric acid of this strength ("+fmtNum(nitrate, 3)+" mol/L nitrate), but the film does not stop it altogether: the metal corrodes slowly with brown nitrogen oxides (not counted here), powder and turnings faster, and diluting the acid with the metal in it, a scratch or a trace of chloride makes the attack fast; "+material+".",
		"Keep metal powder and turnings out; do not dilute or rinse with the metal in the acid; work with extraction and keep the vessel vented.",
		"Perry's Chemical Engineers' Handbook, corrosion of aluminium and steels by nitric acid (from memory); Pourbaix, Atlas of Electrochemical Equilibria (1974), iron: passivation (from memory); aluminium tanks for strong (above about 80 %) nitric acid: common practice, no source"), true
}

// sodiumAzideGPerMol is the molar mass of NaN3 (IUPAC standard atomic
// weights; from memory).
const sodiumAzideGPerMol = 65.01

// azideLeft: an azide destruction (nitrite with acid, which gives nitrogen
// and nitrous oxide) ran and stopped with azide left, because the acid or
// the nitrite ran short: the batch is not yet fit to release.
func azideLeft(o *Outcome) (engine.Hazard, bool) {
	before, left := o.MolarBefore("N3-", "HN3"), o.Molar("N3-", "HN3")
	if left < TraceMolar || before-left < 0.01*before || !o.Formed("N2O", "N2O(g)", "N2", "N2(g)") {
		return engine.Hazard{}, false
	}
	short := "the acid ran short"
	if o.Molar("NO2-", "HNO2") < TraceMolar {
		short = "the nitrite ran short"
	}
	mol := left * o.VolumeL
	return mk("azide-left", engine.Warning,
		"Not all the azide is destroyed: "+fmtNum(mol, 3)+" mol of azide ("+fmtNum(mol*sodiumAzideGPerMol/1000, 3)+" kg as sodium azide) stays in the mix ("+short+"). Azide is very toxic, gives hydrazoic acid in any acid and forms explosive salts with copper and lead.",
		"Do not release it as treated: add nitrite, then acid slowly, until nitrous acid stays in excess (starch-iodide paper turns blue) and a ferric chloride test shows no red azide colour; keep it out of copper, lead and brass drains.",
		"azide destruction with nitrite and acid and its end-point tests: common practice (laboratory waste handling), no source; red colour of iron(III) azide: Vogel's Textbook of Macro and Semimicro Qualitative Inorganic Analysis, azides (from memory)"), true
}

// azideForming: hydrazine with nitrite keeps while alkaline, but nitrous
// acid turns hydrazine into hydrazoic acid (N2H5+ + HNO2 → HN3 + H+ +
// 2 H2O), toxic and explosive: a waste that holds both must never be
// acidified, and its metal salts (lead, copper azide) are detonators
// (Bretherick's Handbook of Reactive Chemical Hazards, hydrazine and
// hydrazoic acid, from memory). In acid the gas itself is judged
// (hydrazoicFromHydrazine).
func azideForming(o *Outcome) (engine.Hazard, bool) {
	hyd, nit := o.MolarBefore("N2H4", "N2H5+"), o.MolarBefore("NO2-", "HNO2")
	if hyd < TraceMolar || nit < TraceMolar {
		return engine.Hazard{}, false
	}
	sev, act := engine.Warning, "Do not store or collect hydrazine and nitrite together; never acidify such a mix; keep it away from copper, lead and brass fittings."
	// A stream of strong acid beside them is the acidification itself,
	// even where the hydrazine buffers the final mix above pH 7: where the
	// acid runs in, nitrous acid meets hydrazinium first.
	if o.PH < 7 || o.StrongAcid {
		sev, act = engine.Danger, "Do not combine: in acid the hydrazine turns into hydrazoic acid, a toxic, explosive gas. If it has happened, leave the area and ventilate."
	}
	return mk("azide-forming", sev,
		"Hydrazine ("+fmtNum(hyd, 2)+" mol/L) with nitrite ("+fmtNum(nit, 2)+" mol/L): nitrous acid turns hydrazine into hydrazoic acid (HN3), very toxic, volatile and explosive, and its heavy-metal salts are detonators; alkaline it keeps, once acid it forms.",
		act,
		"Bretherick's Handbook of Reactive Chemical Hazards, hydrazine with nitrous acid and hydrazoic acid (from memory)"), true
}

// oleumMist: oleum (free SO3 in sulfuric acid) meeting water or an aqueous
// stream gives a dense, white sulfuric acid mist besides its heat: the SO3
// that leaves the liquid takes up water vapour in the air as droplets too
// fine for a water scrubber, and oleum fumes by itself. Oleum is let down
// into 96–98 % sulfuric acid, whose little water takes the SO3 inside the
// liquid, never straight into water (Perry's Chemical Engineers'
// Handbook, oleum, from memory; common practice, no source).
func oleumMist(o *Outcome) (engine.Hazard, bool) {
	if !o.Named("SO3") {
		return engine.Hazard{}, false
	}
	other := false
	for _, c := range o.Chemicals {
		if c != "SO3" && c != "H2SO4" {
			other = true
		}
	}
	if !other {
		return engine.Hazard{}, false
	}
	return mk("oleum-mist", engine.Warning,
		"Oleum brings free sulfur trioxide: where it meets water it gives a dense, white sulfuric acid mist as well as its heat, and the mist passes through a water scrubber.",
		"Let oleum down into 96–98 % sulfuric acid first, closed or under extraction with a mist eliminator, never straight into water or a dilute stream; wear acid-resistant clothing and a face shield.",
		"Perry's Chemical Engineers' Handbook, sulfuric acid and oleum (from memory); common practice, no source"), true
}
