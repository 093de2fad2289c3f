package hazard

import (
	"math"
	"slices"
	"strings"

	"mixward/engine"
	"mixward/engine/chem"
	"mixward/engine/state"
)

// Reaction families of organic matter with oxidizing agents, acids and
// bases that are fast and dangerous in a tank but that the equilibrium
// state does not hold (their products have no species data, or the
// organic-carbon lock keeps organic matter as it is). Each is judged from
// what the streams bring together, with a threshold that keeps routine
// pours (dilute CIP detergents with traces of organics, 200 ppm peracid, a
// dilute ethanol rinse) quiet, and its source beside it. Where formation
// enthalpies allow, the heat is estimated and says so.
//
// They are listed in familyRules (families.go).

// Thresholds of the organic families (mol/L in the mix), common practice,
// no source: below them the organic is a trace or a rinse, not a reagent.
const (
	// OrganicLiquidMolar is the organic liquid (alcohol, ketone, glycerol)
	// that makes a strong oxidizer's mix a fire hazard: about 3 % by volume
	// of ethanol. A dilute ethanol rinse (1 %, 0.17 mol/L) stays below it.
	OrganicLiquidMolar = 0.5
	// OrganicNeatMolar is the organic liquid from which the mix is mostly
	// organic (about 12 % by volume of ethanol and more): the oxidizer
	// meets it neat where it lands.
	OrganicNeatMolar = 2.0
	// FamilyTraceMolar is the least amount of each partner that an organic
	// family counts: about 0.05 % formaldehyde or 0.06 % acetone.
	FamilyTraceMolar = 0.01
)

// DangerRiseC is the estimated temperature rise from which a family's heat
// alone makes it a reason not to combine (common practice, no source: the
// mix then runs far above any safe handling temperature, and faster as it
// warms).
const DangerRiseC = 30.0

// heatEstimate turns an estimated reaction heat (kJ) into words and tells
// whether it alone is a danger (boils, or rises by DangerRiseC or more).
func heatEstimate(o *Outcome, kJ float64) (string, bool) {
	rise := engine.TemperatureRise(kJ, o.VolumeL) // about 1 kg per litre
	reached := o.TemperatureC + rise
	s := "heat estimate about " + fmtNum(kJ, 2) + " kJ"
	if kJ >= 1e4 {
		s = "heat estimate about " + fmtNum(kJ/1000, 2) + " MJ"
	}
	if reached >= BoilingC {
		return s + ", enough to boil the mix", true
	}
	return s + ", about +" + fmtNum(rise, 2) + " °C", rise >= DangerRiseC
}

// ketones are the ketones of the dictionary, as dissolved species.
var ketones = []string{"CH3COCH3"}

// organicLiquids are the organic liquids whose usual product with a strong
// oxidizing agent is known, with the electrons one molecule gives up to it
// (methanol to formic acid, ethanol to acetic acid, isopropanol to acetone,
// glycerol and ethylene glycol to carbon dioxide, propylene glycol to
// acetic acid and carbon dioxide: C3H8O2 + 2 H2O → CH3COOH + CO2 + 8 H+ +
// 8 e-).
var organicLiquids = map[string]float64{
	"CH3OH": 4, "C2H5OH": 4, "(CH3)2CHOH": 2, "C3H5(OH)3": 14,
	"HOCH2CH2OH": 10, "CH3CH(OH)CH2OH": 8,
}

// organicLiquid is the mol/L of organic fuel that a strong oxidizing agent
// meets (neutral organic molecules and organic cations: solvents, alcohols,
// glycols, ketones, amines, glycerol; not the anions of organic acids and
// chelants, which are salts in solution) and the mol/L of electrons they
// can give up: those of organicLiquids to their usual product, any other
// burnt right through to carbon dioxide, water and nitrogen (an upper
// bound). With any false it counts only organicLiquids: a strong oxidizer
// in solution meets acetone, formaldehyde and urea in their own families
// (haloform, formaldehyde oxidation, N-chloro compounds).
//
// Organic matter taken in as fuel without data (Outcome.Fuel) counts as
// any other organic molecule.
func organicLiquid(o *Outcome, any bool) (molar, electrons float64) {
	xs := o.Before
	if len(o.Fuel) > 0 {
		xs = append(append([]Amount{}, o.Before...), o.Fuel...)
	}
	for i := range xs {
		a := &xs[i]
		if a.Molar < TraceMolar || a.Species.Charge < 0 {
			continue
		}
		// The carriers of stabilised chlorine (cyanuric acid, dimethyl-
		// hydantoin) are not fuel: chlorine rides on them, and they are left
		// over when it is spent (White's Handbook of Chlorination,
		// chlorinated isocyanurates, from memory).
		if stabiliserCarrier[a.key()] {
			continue
		}
		e, ok := organicLiquids[a.key()]
		if !ok && !any {
			continue
		}
		if !ok {
			at, err := chem.ParseFormula(a.Species.Formula)
			if err != nil || !state.IsOrganic(at, a.key()) {
				continue
			}
			e = fuelElectrons(at, a.Species.Charge)
		}
		if e <= 0 {
			continue
		}
		molar += a.Molar
		electrons += a.Molar * e
	}
	return molar, electrons
}

// burntState is the oxidation state of each element once burnt right
// through: CO2, H2O, N2, sulfate, phosphate, halides, alkali ions.
var burntState = map[string]int{"C": 4, "H": 1, "O": -2, "N": 0, "S": 6, "P": 5, "Cl": -1, "Br": -1, "I": -1, "F": -1, "Na": 1, "K": 1}

// fuelElectrons is the electrons a species gives up burnt to CO2, H2O,
// N2, sulfate and halide: the sum of the final oxidation states of its
// atoms less its charge.
func fuelElectrons(at chem.Atoms, charge int) float64 {
	e := -charge
	for el, n := range at {
		f, ok := burntState[el]
		if !ok {
			return 0
		}
		e += f * n
	}
	return float64(e)
}

// organicPeroxides: ketones with hydrogen peroxide form cyclic ketone
// peroxides (acetone peroxide), primary explosives that crystallise out of
// the mix; acid catalyses it.
func organicPeroxides(o *Outcome) (engine.Hazard, bool) {
	k, p := o.MolarBefore(ketones...), o.MolarBefore("H2O2", "HO2-")
	if k < 5*FamilyTraceMolar || p < 0.1 {
		return engine.Hazard{}, false
	}
	why := ""
	if o.PH < 3 {
		why = " The acid in the mix speeds it up: crystals can form within hours."
	}
	return mk("organic-peroxides", engine.Danger,
		"A ketone ("+fmtNum(k, 2)+" mol/L) with hydrogen peroxide ("+fmtNum(p, 2)+" mol/L) forms ketone peroxides (acetone peroxide): primary explosives that crystallise out of the mix and go off on friction, shock or warming."+why,
		"Do not combine. Never add acid to a peroxide and ketone mix; keep solvents away from peroxide, and peroxide out of solvent waste.",
		"Bretherick's Handbook of Reactive Chemical Hazards, hydrogen peroxide with ketones and acetone with hydrogen peroxide (from memory); thresholds 0.05 mol/L ketone and 0.1 mol/L peroxide: common practice, no source"), true
}

// Peracid thresholds (mol/L in the mix before reaction): hydrogen peroxide
// from about 3 mol/L (10 %) with formic acid from 0.1 mol/L below pH 5,
// where the acid is mostly un-ionised, or with acetic or propionic acid
// from 0.5 mol/L and a mineral acid below pH 1 (common practice, no
// source).
const (
	peracidPeroxideMolar = 3.0
	performicMolar       = 0.1
	peracidAcidMolar     = 0.5
	peracidMaxPH         = 5.0
)

// peracids: concentrated hydrogen peroxide with a carboxylic acid forms the
// peracid, RCOOH + H2O2 ⇌ RCOOOH + H2O. Formic acid catalyses its own
// reaction and performic acid forms within the hour; it decomposes
// violently, with gas and heat, and has exploded. Acetic and propionic
// acid form their peracids over hours to days (peracidForming's note), in
// minutes with a mineral acid as catalyst: the way peracetic acid is made,
// under control, cooled and vented.
func peracids(o *Outcome) (engine.Hazard, bool) {
	p := o.MolarBefore("H2O2", "HO2-")
	if p < peracidPeroxideMolar || o.PH >= peracidMaxPH {
		return engine.Hazard{}, false
	}
	const src = "Bretherick's Handbook of Reactive Chemical Hazards, peroxyformic acid, and hydrogen peroxide with carboxylic acids (from memory); thresholds 3 mol/L peroxide, 0.1 mol/L formic and 0.5 mol/L acetic or propionic acid below pH 5: common practice, no source"
	if f := o.MolarBefore("HCOOH", "HCOO-"); f >= performicMolar {
		return mk("peracid-runaway", engine.Danger,
			"Formic acid ("+fmtNum(f, 2)+" mol/L in the mix) with concentrated hydrogen peroxide ("+fmtNum(p, 2)+" mol/L) forms performic acid within the hour; it decomposes violently, with gas and heat, and has exploded.",
			"Do not combine. Keep formic acid and formate-bearing waste out of peroxide tanks and drums; performic acid is made only in situ, cooled and in small amounts, under a written procedure.",
			src), true
	}
	a := o.MolarBefore("CH3COOH", "CH3CH2COOH")
	if a < peracidAcidMolar || o.PH >= 1 {
		return engine.Hazard{}, false // acetic acid alone: peracidForming's note
	}
	if o.MolarBefore("CH3CO3H", "CH3CO3-") >= 0.2*a {
		// The acetic acid and peroxide are those of an equilibrium
		// peracetic acid product (15 % grades hold about as much acetic
		// acid as peracid): a mineral acid only speeds the approach to an
		// equilibrium already reached, and its water shifts it back
		// (peracetic acid suppliers' technical data, from memory).
		return engine.Hazard{}, false
	}
	return mk("peracid-runaway", engine.Danger,
		"Acetic or propionic acid ("+fmtNum(a, 2)+" mol/L in the mix) with concentrated hydrogen peroxide ("+fmtNum(p, 2)+" mol/L) and a mineral acid (pH "+fmtNum(o.PH, 2)+") forms the peracid within minutes, with heat and oxygen: it fires organic matter and decomposes violently when it warms or meets metals.",
		"Do not combine. Peracid is made only under a written procedure: cooled, vented, stabilised, with the catalyst acid dosed as the procedure says.",
		src), true
}

// perchlorateEsters: concentrated perchloric acid with alcohols and other
// organic matter forms alkyl perchlorates, extremely shock-sensitive, and
// the mix can explode when warmed or left to concentrate.
func perchlorateEsters(o *Outcome) (engine.Hazard, bool) {
	hclo4 := o.MolarBefore("ClO4-", "HClO4")
	c := organicC(o.Before)
	if hclo4 < 1 || o.PH >= 0.5 || c < 5*FamilyTraceMolar {
		return engine.Hazard{}, false
	}
	sev, msg := engine.Warning, "Perchloric acid ("+fmtNum(hclo4, 2)+" mol/L in the mix) with organic matter ("+fmtNum(c, 2)+" mol/L of carbon): warmed or left to concentrate it forms explosive perchlorate esters and can explode."
	if hclo4 >= 3 {
		sev, msg = engine.Danger, "Concentrated perchloric acid ("+fmtNum(hclo4, 2)+" mol/L in the mix) with alcohols or other organic matter ("+fmtNum(c, 2)+" mol/L of carbon) forms alkyl perchlorates, which explode on shock, and the mix can explode on warming; it is also a strong oxidizer with fuel."
	}
	return mk("perchlorate-esters", sev, msg,
		"Do not combine. Keep alcohols, solvents and other organic matter away from perchloric acid; use it only in a perchloric-acid fume hood with wash-down.",
		"Bretherick's Handbook of Reactive Chemical Hazards, perchloric acid with alcohols (from memory); perchloric-acid fume hoods with no organics: common practice, no source; 3 mol/L (about 28 %) danger and 1 mol/L warning thresholds: common practice, no source"), true
}

// polyols are the dictionary's alcohols with two or more hydroxyl groups
// and the sugars: what mixed acid turns into nitrate esters (glyceryl
// trinitrate, glycol dinitrate, nitrosugars). Cellulose (rags, paper) and
// pentaerythritol nitrate the same way but are not chemicals of the
// dictionary.
var polyols = []string{"C3H5(OH)3", "HOCH2CH2OH", "CH3CH(OH)CH2OH", "C12H22O11"}

// Mixed-acid thresholds (mol/L in the mix before reaction), common
// practice, no source: nitration needs nitric acid of about 3 mol/L (about
// 20 %) and more in sulfuric acid of about 5 mol/L (about 40 %) and more,
// which takes up the water the esterification gives off. Dilute acid rinses
// are far below both.
const (
	NitratingNitricMolar    = 3.0
	NitratingSulfuricMolar  = 5.0
	NitratingPolyolMolar    = FamilyTraceMolar
	PeracidConcentrateMolar = 0.3 // about 2.3 % peracetic acid in the mix
	StrongAlkaliPH          = 13  // about 0.1 mol/L of free hydroxide
)

// nitrateEsters: concentrated nitric acid with concentrated sulfuric acid
// (mixed acid) esterifies polyols to nitrate esters, shock-sensitive
// explosives; cooling the mix is how they are made, so the answer must not
// suggest cooling and holding it.
func nitrateEsters(o *Outcome) (engine.Hazard, bool) {
	hno3 := o.MolarBefore("HNO3", "NO3-")
	h2so4 := sulfuric(o)
	p := o.MolarBefore(polyols...)
	if hno3 < NitratingNitricMolar || h2so4 < NitratingSulfuricMolar || p < NitratingPolyolMolar {
		return engine.Hazard{}, false
	}
	return mk("nitrate-esters", engine.Danger,
		"Nitrating acid (nitric acid "+fmtNum(hno3, 2)+" mol/L with sulfuric acid "+fmtNum(h2so4, 2)+" mol/L in the mix) with a polyol ("+fmtNum(p, 2)+" mol/L of glycerol, glycol or sugar) forms nitrate esters (glyceryl trinitrate, glycol dinitrate): shock-sensitive explosives that separate as an oil. Cooling does not make it safe: cooled and held, it is how they are made; warm, it runs away with nitrogen dioxide.",
		"Do not combine; never cool and hold such a mix. Keep glycols, glycerol, sugars and cellulose (rags, paper) away from mixed acid and its waste; if it has happened, leave the area and call specialists.",
		"Bretherick's Handbook of Reactive Chemical Hazards, glycerol: nitric acid, sulfuric acid (from memory); thresholds 3 mol/L nitric and 5 mol/L sulfuric acid: common practice, no source"), true
}

// peracidAlkali: a peracid concentrate (with the hydrogen peroxide the
// product carries) meeting strong caustic decomposes violently: the
// peracid and peroxide anions destroy each other, with oxygen and enough
// heat to boil the caustic.
func peracidAlkali(o *Outcome) (engine.Hazard, bool) {
	pa := o.MolarBefore("CH3CO3H", "CH3CO3-")
	if pa < PeracidConcentrateMolar || o.PH < StrongAlkaliPH {
		return engine.Hazard{}, false
	}
	h2o2 := o.MolarBefore("H2O2", "HO2-")
	return mk("peracid-alkali", engine.Danger,
		"Peracetic acid concentrate ("+fmtNum(pa, 2)+" mol/L in the mix, with "+fmtNum(h2o2, 2)+" mol/L of hydrogen peroxide) meets strong alkali (pH "+fmtNum(o.PH, 3)+"): it decomposes violently, with oxygen and enough heat to boil and spit the caustic.",
		"Do not combine. Rinse with water between caustic and peracid steps; dose peracid only into rinse water or a neutral line.",
		"Bretherick's Handbook of Reactive Chemical Hazards, peroxyacetic acid: bases (from memory); thresholds 0.3 mol/L peracid and pH 13: common practice, no source"), true
}

// strongOxidizer is a strong oxidizing agent that sets organic liquids
// alight or boiling: as a solid stream, or as a concentrated solution.
type strongOxidizer struct {
	name      string
	reagent   string   // what it is called when families share it
	species   []string // dissolved forms, one oxidizing atom each (dichromate counted twice below)
	solids    []string // chemicals that, poured as a solid, meet the liquid neat
	electrons float64  // taken up per oxidizing atom
	solution  float64  // mol/L in the mix from which the solution counts (0: only as a solid)
	acidPH    float64  // the solution counts only below this pH (0: any pH)
	organic   float64  // mol/L of organic liquid from which it counts
	// landsNeat: the concentrated solution is a danger with any organic
	// liquid above its threshold, whatever the heat of the whole mix: the
	// solvent poured in meets it neat where it lands (concentrated chromic
	// acid ignites alcohols: Bretherick's Handbook, chromium trioxide, from
	// memory).
	landsNeat bool
	// slow: the oxidizer does not attack the liquid at once in the cold,
	// but makes a mixture that burns fiercely or explodes once warmed,
	// dried out (a soaked rag, a crust on the drum) or lit.
	slow bool
	// warmRuns: a slow oxidizer whose solution oxidizes the liquid by
	// itself once warm (warmNote says from where), with runaway heat: the
	// heat if it runs is a danger when it would boil the mix.
	warmRuns bool
	warmNote string
}

// hypochloriteIndex is the place of the hypochlorite row in strongOxidizers.
const hypochloriteIndex = 2

var strongOxidizers = []strongOxidizer{
	{name: "Permanganate", reagent: "MnO4-", species: []string{"MnO4-", "HMnO4"}, solids: []string{"KMnO4", "NaMnO4"}, electrons: 3,
		solution: 0.2, organic: OrganicLiquidMolar},
	{name: "Chromic acid", reagent: "Cr(VI)", species: []string{"HCrO4-", "H2CrO4", "CrO4^2-", "Cr2O7^2-", "Cr2O7^2-"},
		solids: []string{"CrO3", "K2Cr2O7", "Na2Cr2O7", "Na2Cr2O7.2H2O"}, electrons: 3, solution: 1, acidPH: 1,
		organic: 5 * FamilyTraceMolar, landsNeat: true},
	{name: "Hypochlorite", reagent: "OCl-", species: []string{"OCl-", "HOCl"}, solids: []string{"Ca(OCl)2", "C3Cl3N3O3", "NaC3Cl2N3O3", "C5H6BrClN2O2", "LiOCl"},
		electrons: 2, solution: 0.5, organic: OrganicLiquidMolar},
	// Chlorates with organic matter are the classic incendiary mixtures;
	// a concentrated solution soaks into rags and organic residues that
	// dry to the same.
	{name: "Chlorate", reagent: "ClO3-", species: []string{"ClO3-", "HClO3"}, solids: []string{"NaClO3", "KClO3"},
		electrons: 6, solution: 1, organic: OrganicLiquidMolar, landsNeat: true, slow: true},
	// Sodium chlorite soaks into organic matter that burns fiercely once
	// dry, and with acid gives chlorine dioxide (Bretherick's Handbook,
	// sodium chlorite, from memory).
	{name: "Chlorite", reagent: "ClO2-", species: []string{"ClO2-", "HClO2"}, solids: []string{"NaClO2"},
		electrons: 4, solution: 1, organic: OrganicLiquidMolar, landsNeat: true, slow: true},
	{name: "Bromate", reagent: "BrO3-", species: []string{"BrO3-"}, solids: []string{"NaBrO3", "KBrO3"},
		electrons: 6, organic: OrganicLiquidMolar, slow: true},
	{name: "Perchlorate", reagent: "ClO4-", species: []string{"ClO4-"}, solids: []string{"NaClO4", "KClO4", "NH4ClO4"},
		electrons: 8, organic: OrganicLiquidMolar, slow: true},
	{name: "Nitrate", reagent: "NO3-", species: []string{"NO3-"}, solids: []string{"NaNO3", "KNO3", "NH4NO3", "Ca(NO3)2"},
		electrons: 5, organic: OrganicLiquidMolar, slow: true},
	// A persulfate solution oxidizes alcohols and glycols slowly in the
	// cold but with runaway heat once warm (about 50–60 °C, where it
	// breaks into sulfate radicals): Bretherick's Handbook, peroxodisulfates
	// with organic matter, from memory; 0.5 mol/L: common practice, no
	// source.
	{name: "Persulfate", reagent: "S2O8^2-", species: []string{"S2O8^2-"}, solids: []string{"Na2S2O8", "K2S2O8", "(NH4)2S2O8"},
		electrons: 2, solution: 0.5, organic: OrganicLiquidMolar, slow: true,
		warmRuns: true, warmNote: "about 50–60 °C, where it breaks into sulfate radicals"},
	{name: "Sodium peroxide", reagent: "O2^2-", species: []string{"HO2-"}, solids: []string{"Na2O2"},
		electrons: 2, organic: OrganicLiquidMolar},
}

// ThorntonKJPerElectron is the heat of oxidizing organic matter per
// electron taken up: about 418 kJ per mol of O2 consumed, whatever the
// compound (Thornton's rule; W. M. Thornton, Phil. Mag. 33, 196 (1917),
// from memory), a quarter per electron. Used with other oxidizing agents it
// is an estimate only.
const ThorntonKJPerElectron = 418.0 / 4

// oxidizerKJPerElectron is the heat of the oxidizing agent reagent
// oxidizing organic matter, kJ per mol of electrons: Thornton's rule holds
// for oxygen, and an oxidizing agent whose reduction gives off more (or
// less) heat than oxygen's adds the difference per electron (Hess's law):
// the organic side of the reaction is the same whichever agent takes its
// electrons. The reductions are rows oxidizer-organic-fire:REAGENT of
// data/familyheats.txt, computed from the species data; without them the
// rule alone. It also says how the figure was reached.
func (o *Outcome) oxidizerKJPerElectron(reagent string) (float64, string) {
	base := ThorntonKJPerElectron
	if f, ok := o.family("oxidizer-organic-fire"); ok {
		base = -f.dH
	}
	red, o2 := o.families["oxidizer-organic-fire:"+reagent], o.families["oxidizer-organic-fire:O2"]
	if red == nil || o2 == nil || red.Electrons <= 0 || o2.Electrons <= 0 || !red.FromSpecies || !o2.FromSpecies {
		return base, "Thornton's rule, about " + fmtNum(base, 4) + " kJ per mol of electrons"
	}
	extra := o2.DeltaH/float64(o2.Electrons) - red.DeltaH/float64(red.Electrons)
	// The rows are written in acid. An agent that takes up more H+ per
	// electron than oxygen (permanganate to manganese dioxide) finds them
	// as free acid only in an acid mix; short of it they come from water,
	// which costs the heat of neutralisation back (55.84 kJ per mol, NBS
	// Tables 1982 ΔfH° of water and hydroxide, from memory).
	if h := red.Protons/float64(red.Electrons) - o2.Protons/float64(o2.Electrons); h > 0 && o.PH >= AcidMixPH {
		extra -= h * neutralisationKJ
	}
	kJ := base + extra
	return kJ, "about " + fmtNum(kJ, 3) + " kJ per mol of electrons: Thornton's rule for oxygen, " + fmtNum(base, 4) + ", " + signed(extra) +
		" kJ for this agent's reduction against oxygen's"
}

// AcidMixPH is the pH below which a mix holds the free acid that an
// oxidizing agent's reduction takes up (common practice, no source).
const AcidMixPH = 2.0

// neutralisationKJ is the heat of H+ + OH- → H2O, kJ per mol: ΔfH° of
// water −285.83 less hydroxide −229.99 (NBS Tables 1982, from memory).
const neutralisationKJ = -dfHWater + dfHHydroxide

// signed writes x with its sign (+94, −12).
func signed(x float64) string {
	if x < 0 {
		return "−" + fmtNum(-x, 2)
	}
	return "+" + fmtNum(x, 2)
}

// oxidizerOrganic: solid permanganate, chromic acid, calcium hypochlorite
// or a chloroisocyanurate on an organic liquid ignites, often after a short
// delay; concentrated chromic acid oxidizes alcohols fast, to the boil.
func oxidizerOrganic(o *Outcome) (engine.Hazard, bool) {
	for i, x := range strongOxidizers {
		ox := o.MolarBefore(x.species...)
		solid := o.SolidStream(x.solids...)
		acid := x.acidPH == 0 || o.PH < x.acidPH
		conc := x.solution > 0 && ox >= x.solution && acid
		org, orgE := organicLiquid(o, solid || x.slow)
		// Solvents (ketones, hydrocarbons) that a solution oxidizes only
		// slowly in the cold; hypochlorite meets acetone in its own family
		// (haloform).
		var solv, solvE float64
		if !solid && !x.slow && i != hypochloriteIndex {
			solv, solvE = solventFuel(o)
		}
		fastE := math.Min(ox*x.electrons, orgE)
		perE, basis := o.oxidizerKJPerElectron(x.reagent)
		// A weaker solution that still boils the mix with the organic
		// liquid in it (the oxidation's heat with the rest of the mix's:
		// dichromate and sulfuric acid with isopropanol) boils off
		// flammable vapour over a strong oxidizer.
		boiling := false
		if !solid && !conc && !x.slow && x.solution > 0 && acid && ox >= OxidizerReagentMolar && org >= OrganicLiquidMolar {
			reached := o.TemperatureC
			if o.Heat.Known {
				reached = o.Heat.ReachedC
			}
			if !o.runsOrganic() {
				reached += engine.TemperatureRise(fastE*o.VolumeL*perE, o.VolumeL)
			}
			boiling = reached >= BoilingC
		}
		// A dilute solution of a fast oxidizer (below the concentrated
		// threshold) that still oxidizes the organic liquid in the mix as
		// made: it reacts and warms, and leaves its reduced form (manganese
		// dioxide sludge from permanganate): not of no concern.
		mild := !solid && !conc && !boiling && !x.slow && x.solution > 0 && acid && ox >= MildOxidizerMolar &&
			org >= OrganicLiquidMolar && o.runsOrganic()
		if !(solid && org >= OrganicLiquidMolar) && !(conc && org+solv >= x.organic) && !boiling && !mild {
			continue
		}
		rh := o.oxidizerHeat(x, perE, basis, ox*x.electrons*o.VolumeL, orgE*o.VolumeL)
		heat, hot := heatEstimate(o, fastE*o.VolumeL*perE)
		var runaway *engine.ReactionHeat
		slowOnly := orgE <= 0 && solvE > 0
		switch {
		case x.slow:
			// Nothing burns until the mixture is lit or dries out: the
			// heat is what a fire would give, not what the mix does. A
			// solution that oxidizes the liquid once warm (persulfate)
			// shows it as the heat if it runs, not counted; if that heat
			// would boil the mix it is a runaway waiting for the first
			// warm spot.
			if !solid {
				runaway = rh
			}
			rh = nil
			heat = "if it burns, " + heat
			if x.warmRuns && !solid {
				heat = "if it runs, " + strings.TrimPrefix(heat, "if it burns, ")
			} else {
				hot = false
			}
		case solvE > 0:
			// The solvent's share: slow in the cold, shown as the heat if
			// it runs once the bath warms, never counted.
			runaway = o.oxidizerHeat(x, perE, basis, math.Max(ox*x.electrons-fastE, 0)*o.VolumeL, solvE*o.VolumeL)
			if slowOnly && runaway != nil {
				var runHot bool
				heat, runHot = heatEstimate(o, runaway.ReleasedkJ)
				heat, hot = "if it runs, "+heat, runHot
			}
		}
		sev := engine.Warning
		if solid || hot || boiling || !mild && org+solv >= OrganicNeatMolar || conc && x.landsNeat {
			sev = engine.Danger
		}
		how := "a concentrated solution"
		if solid {
			how = "the solid"
		} else if boiling {
			how = "the solution"
		}
		what := how + " oxidizes it violently and can set it alight, often after a short delay"
		switch {
		case boiling:
			what = how + " oxidizes it and the mix boils: flammable vapour comes off over a strong oxidizer, which can set it alight"
		case x.slow && x.warmRuns && !solid:
			what = how + " oxidizes it slowly in the cold, then with runaway heat once warm (" + x.warmNote + "), and makes with it a mixture that burns fiercely once dried out (a soaked rag, a crust on a drum) or lit"
		case x.slow:
			what = how + " makes with it a mixture that burns fiercely or explodes once warmed, dried out (a soaked rag, a crust on a drum) or lit"
		case slowOnly:
			what = how + " oxidizes ketones and solvents slowly in the cold, then fast and with heat once the bath warms, and can set them alight"
		}
		code := "oxidizer-organic-fire"
		act := "Do not combine. Keep strong oxidizers (permanganate, chromic acid, hypochlorite and chlorinating granules, chlorates, chlorites, bromates, perchlorates, nitrates, persulfates, peroxides) away from solvents, alcohols, ketones, amines and glycerol; never dose a solvent into an oxidizer bath; dispose of each separately."
		if mild && sev == engine.Warning {
			how = "the dilute solution"
			what = how + " oxidizes it as mixed, with heat" + mildLeaves(x.reagent) + "; stronger or hotter, it can set it alight"
			code = "oxidizer-organic-heat"
			act = "Dose the oxidizer slowly into the diluted organic liquid with stirring, in an open, vented tank, watching the temperature; never dose a solvent into a strong oxidizer bath, and keep rags and residues wet."
		}
		if sev == engine.Warning && !mild {
			// A dilute solution that stays short of scalding oxidizes the
			// liquid with heat; the title must not promise a fire.
			code = "oxidizer-organic-heat"
			what = how + " oxidizes it with heat; stronger or hotter, it can set it alight"
			if slowOnly {
				what = how + " oxidizes it slowly in the cold, with heat once warm; stronger or hotter, it can set it alight"
			}
		}
		h := withHeat(mk(code, sev,
			x.name+" with an organic liquid ("+fmtNum(org+solv, 2)+" mol/L of alcohol, solvent, glycol, amine or glycerol): "+what+" ("+heat+", from Thornton's rule and the agent's heat of reduction).",
			act,
			"Bretherick's Handbook of Reactive Chemical Hazards, potassium permanganate with glycerol, chromium trioxide with ethanol and with acetone, calcium hypochlorite with alcohols, sodium chlorate and sodium chlorite with organic matter, nitrates and perchlorates with organic materials, peroxodisulfates with organic matter, sodium peroxide with organic matter (from memory); heat by Thornton's rule, 418 kJ per mol O2 (from memory), with the difference between the agent's heat of reduction and oxygen's from ΔfH° of data/species.txt (NBS Tables 1982, from memory); thresholds: common practice, no source"), rh)
		h.RunawayHeat = runaway
		return h, true
	}
	return engine.Hazard{}, false
}

// MildOxidizerMolar is the least fast oxidizer in the mix (mol/L) whose
// dilute solution, oxidizing an organic liquid as mixed, is judged a
// warning: about 0.5 % permanganate after mixing (common practice, no
// source).
const MildOxidizerMolar = 0.03

// mildLeaves says what a dilute oxidizer leaves as it oxidizes organic
// matter, by its reagent: permanganate in neutral water stops at the brown
// manganese dioxide sludge (Vogel's Textbook of Macro and Semimicro
// Qualitative Inorganic Analysis, permanganate, from memory).
func mildLeaves(reagent string) string {
	switch reagent {
	case "MnO4-":
		return ", leaving brown manganese dioxide sludge outside strong acid"
	}
	return ""
}

// OxidizerReagentMolar is the least strong oxidizer in the mix (mol/L) that
// the boiling case of oxidizerOrganic counts: a reagent, not a trace
// (common practice, no source).
const OxidizerReagentMolar = 0.1

// oxidizerHeat is the heat of the oxidizer x taking up to oxE mol of
// electrons from fuelE mol of electrons' worth of organic matter, perE kJ
// per mol of electrons; nil when the data have no row for the family.
func (o *Outcome) oxidizerHeat(x strongOxidizer, perE float64, basis string, oxE, fuelE float64) *engine.ReactionHeat {
	rh := o.familyHeat("oxidizer-organic-fire", reagent{x.reagent, oxE, 1}, reagent{"organic liquid", fuelE, 1})
	if rh == nil {
		return nil
	}
	rh.Reaction = lowerFirst(x.name) + " oxidizing the organic liquid (" + basis + ")"
	rh.DeltaHkJPerMol = sig(-perE)
	rh.ReleasedkJ = sig(perE * rh.ExtentMol)
	if f, ok := o.family("oxidizer-organic-fire:" + x.reagent); ok {
		rh.Source += "; " + f.source
	}
	return rh
}

// solvents are the organic solvents that a strong oxidizer in solution
// oxidizes only slowly in the cold, and fast once the bath warms, with the
// electrons one molecule gives up (acetone to acetic acid and carbon
// dioxide, CH3COCH3 + 3 H2O → CH3COOH + CO2 + 8 H+ + 8 e-; 0: burnt right
// through, an upper bound): concentrated chromic acid with acetone is a
// listed violent reaction (Bretherick's Handbook of Reactive Chemical
// Hazards, chromium trioxide: acetone, from memory).
var solvents = map[string]float64{"CH3COCH3": 8, "C6H5CH3": 0, "C6H14": 0}

// solventFuel is the mol/L of solvents in the mix and the mol/L of
// electrons they can give up.
func solventFuel(o *Outcome) (molar, electrons float64) {
	for i := range o.Before {
		a := &o.Before[i]
		e, ok := solvents[a.key()]
		if !ok || a.Molar < TraceMolar {
			continue
		}
		if e == 0 {
			at, err := chem.ParseFormula(a.Species.Formula)
			if err != nil {
				continue
			}
			e = fuelElectrons(at, a.Species.Charge)
		}
		molar += a.Molar
		electrons += a.Molar * e
	}
	return molar, electrons
}

// unassessedFuel: organic matter whose data the tables lack, beside a
// strong oxidizing agent that oxidizerOrganic does not judge on its own
// terms (nitric acid; a solution below that rule's thresholds; solids with
// no liquid, such as chlorate with sugar). Without the
// data nothing shows the mix to be safe, and the class of strong oxidizers
// with organic matter is one of runaway and fire: refused.
func unassessedFuel(o *Outcome) (engine.Hazard, bool) {
	if len(o.Fuel) == 0 {
		return engine.Hazard{}, false
	}
	if _, ok := oxidizerOrganic(o); ok {
		return engine.Hazard{}, false
	}
	var names []string
	for _, f := range o.Fuel {
		amount := fmtNum(f.Molar, 2) + " mol/L in the mix"
		if !(f.Molar > 0) {
			amount = fmtNum(f.Mol, 3) + " mol, no liquid"
		}
		names = append(names, f.Species.Formula+" ("+amount+")")
	}
	return mk("oxidizer-organic-fire", engine.Danger,
		o.FuelOxidizer+" is a strong oxidizing agent and "+strings.Join(names, ", ")+" is organic matter the tables hold no thermodynamic data for: strong oxidizers with organic matter can run away or ignite, and without the data nothing shows this mix to be safe.",
		"Do not combine. Keep strong oxidizers away from solvents, glycols, sugars and other organic matter; ask a chemist before any such mix.",
		"Bretherick's Handbook of Reactive Chemical Hazards, nitric acid, chlorates, permanganates and peroxides with organic materials (from memory); refusal without data: common practice, no source"), true
}

func lowerFirst(s string) string {
	if s == "" {
		return s
	}
	return string(s[0]|0x20) + s[1:]
}

// bisChloromethylEther: formaldehyde with concentrated hydrochloric acid
// forms bis(chloromethyl) ether, a potent human carcinogen, in the liquid
// and the vapour above it.
func bisChloromethylEther(o *Outcome) (engine.Hazard, bool) {
	f, cl := o.MolarBefore("HCHO"), o.MolarBefore("Cl-", "HCl")
	if f < FamilyTraceMolar || cl < 1 || o.PH >= 0.5 {
		return engine.Hazard{}, false
	}
	return mk("bis-chloromethyl-ether", engine.Danger,
		"Formaldehyde ("+fmtNum(f, 2)+" mol/L) with concentrated hydrochloric acid ("+fmtNum(cl, 2)+" mol/L chloride, pH "+fmtNum(o.PH, 2)+") forms bis(chloromethyl) ether, a regulated human carcinogen, in the liquid and the vapour.",
		"Do not combine. Keep formaldehyde products and hydrochloric acid in separate lines and drains.",
		"NIOSH Pocket Guide, bis(chloromethyl) ether (from memory); OSHA 29 CFR 1910.1008 (from memory); 1 mol/L chloride below pH 0.5: common practice, no source"), true
}

// Formation enthalpies for the formaldehyde estimates (kJ/mol, 298 K):
// NBS Tables 1982 (from memory), except dissolved formaldehyde, which the
// species data lacks: the gas (−108.57) with its heat of solution to the
// hydrate, about −150 in all (from memory, less firm).
const (
	dfHFormaldehydeAq = -150.0
	dfHFormate        = -425.55
	dfHMethanolAq     = -245.931
	dfHHydroxide      = -229.994
	dfHHypochlorite   = -107.1
	dfHChloride       = -167.159
	dfHWater          = -285.83
)

// cannizzaroKJ is the heat of 2 HCHO + OH- → HCOO- + CH3OH per mol of
// formaldehyde (−70.7 kJ).
var cannizzaroKJ = -(dfHFormate + dfHMethanolAq - 2*dfHFormaldehydeAq - dfHHydroxide) / 2

// cannizzaro: formaldehyde in strong caustic disproportionates to formate
// and methanol, fast and strongly exothermic.
func cannizzaro(o *Outcome) (engine.Hazard, bool) {
	f, oh := o.MolarBefore("HCHO"), o.MolarBefore("OH-")
	if f < 5*FamilyTraceMolar || oh < 0.1 {
		return engine.Hazard{}, false
	}
	kJ := math.Min(f, 2*oh) * o.VolumeL * cannizzaroKJ
	heat, hot := heatEstimate(o, kJ)
	rh := o.familyHeat("formaldehyde-caustic-heat", reagent{"HCHO", f * o.VolumeL, 2}, reagent{"OH-", oh * o.VolumeL, 1})
	sev := engine.Warning
	if hot || f >= 1 {
		sev = engine.Danger
	}
	return withHeat(mk("formaldehyde-caustic-heat", sev,
		"Formaldehyde ("+fmtNum(f, 2)+" mol/L) in strong caustic ("+fmtNum(oh, 2)+" mol/L hydroxide) turns into formate and methanol (2 HCHO + OH- → HCOO- + CH3OH) quickly, with heat that speeds it up ("+heat+").",
		"Do not combine. If formaldehyde must be neutralised, do it dilute, cold and slowly, with cooling and venting.",
		"Bretherick's Handbook of Reactive Chemical Hazards, formaldehyde with alkalis (from memory); heat estimate from ΔfH° of formate, methanol and hydroxide (NBS Tables 1982, from memory) and dissolved formaldehyde about −150 kJ/mol (from memory); thresholds: common practice, no source"), rh), true
}

// hexamine: formaldehyde with ammonia gives hexamethylenetetramine
// (6 HCHO + 4 NH3 → C6H12N4 + 6 H2O), fast and strongly exothermic; the heat
// drives ammonia out of the mix.
func hexamine(o *Outcome) (engine.Hazard, bool) {
	f, n := o.MolarBefore("HCHO"), o.MolarBefore("NH3", "NH4+")
	if f < 5*FamilyTraceMolar || n < 5*FamilyTraceMolar || o.PH < 7 {
		return engine.Hazard{}, false
	}
	rh := o.familyHeat("formaldehyde-ammonia-heat", reagent{"HCHO", f * o.VolumeL, 6}, reagent{"NH3", n * o.VolumeL, 4})
	heat, hot := "", false
	if rh != nil {
		heat, hot = heatEstimate(o, rh.ReleasedkJ)
		heat = "; " + heat
	}
	sev := engine.Warning
	if hot || f >= 1 && n >= 1 {
		sev = engine.Danger
	}
	return withHeat(mk("formaldehyde-ammonia-heat", sev,
		"Formaldehyde ("+fmtNum(f, 2)+" mol/L) with ammonia ("+fmtNum(n, 2)+" mol/L) forms hexamine (6 HCHO + 4 NH3 → C6H12N4 + 6 H2O) quickly and with strong heat, which boils ammonia out of the mix"+heat+".",
		"Do not combine in one go. If it must be done, run one dilute stream slowly into the other with cooling and extraction.",
		"Bretherick's Handbook of Reactive Chemical Hazards, formaldehyde with ammonia (from memory); Vogel's Textbook of Practical Organic Chemistry, hexamine (from memory); heat: data/familyheats.txt; thresholds: common practice, no source"), rh), true
}

// formaldehydeOCl is the heat of HCHO + OCl- + OH- → HCOO- + Cl- + H2O per
// mol (−391 kJ).
var formaldehydeOCl = -(dfHFormate + dfHChloride + dfHWater - dfHFormaldehydeAq - dfHHypochlorite - dfHHydroxide)

// formaldehydeHypochlorite: hypochlorite oxidizes formaldehyde to formate
// quickly and with much heat.
func formaldehydeHypochlorite(o *Outcome) (engine.Hazard, bool) {
	n := math.Min(o.MolarBefore("HCHO"), hypochloriteAny(o))
	if n < FamilyTraceMolar {
		return engine.Hazard{}, false
	}
	heat, hot := heatEstimate(o, n*o.VolumeL*formaldehydeOCl)
	rh := o.familyHeat("formaldehyde-oxidation", reagent{"HCHO", o.MolarBefore("HCHO") * o.VolumeL, 1}, reagent{"OCl-", hypochloriteAny(o) * o.VolumeL, 1})
	sev := engine.Warning
	if hot || n >= 0.5 {
		sev = engine.Danger
	}
	return withHeat(mk("formaldehyde-oxidation", sev,
		"Hypochlorite oxidizes formaldehyde ("+fmtNum(n, 2)+" mol/L of each can meet) to formate quickly (HCHO + OCl- + OH- → HCOO- + Cl- + H2O), "+heat+".",
		"Do not combine. Keep formaldehyde products and hypochlorite in separate lines, rinsed between uses.",
		"Bretherick's Handbook of Reactive Chemical Hazards, sodium hypochlorite with formaldehyde (from memory); heat estimate from ΔfH° (NBS Tables 1982, from memory; dissolved formaldehyde about −150 kJ/mol, from memory); thresholds: common practice, no source"), rh), true
}

// haloformKJ is the heat of CH3COCH3 + 3 OCl- → CHCl3 + CH3COO- + 2 OH- per
// mol of hypochlorite: ΔfH° acetone(aq) about −258 (the liquid −248.4 with
// about −10 heat of solution), CHCl3 −134.5, acetate −486.0, OH- −230.0,
// OCl- −107.1 (NBS Tables 1982, from memory) give about −167 kJ.
const haloformKJ = 167.0

// haloform: hypochlorite chlorinates methyl ketones to chloroform and
// acetate (the haloform reaction), with heat.
func haloform(o *Outcome) (engine.Hazard, bool) {
	k, ocl := o.MolarBefore(ketones...), hypochloriteAny(o)
	if k < FamilyTraceMolar || ocl < FamilyTraceMolar {
		return engine.Hazard{}, false
	}
	n := math.Min(ocl, 3*k) // hypochlorite used
	heat, hot := heatEstimate(o, n*o.VolumeL*haloformKJ)
	rh := o.familyHeat("chloroform-formation", reagent{"CH3COCH3", k * o.VolumeL, 1}, reagent{"OCl-", ocl * o.VolumeL, 3})
	sev := engine.Warning
	if hot || n/3 >= 0.05 {
		sev = engine.Danger
	}
	// Chloroform stays in the liquid as a dense oil or in solution, and
	// its vapour (boiling point 61 °C) comes off the warm mix: counted in
	// the liquid against its IDLH so the short answer names it.
	vapour := engine.GasCount{Formula: "CHCl3", Name: "chloroform vapour", Mol: n / 3 * o.VolumeL, InLiquid: true,
		From: "the haloform reaction", LimitName: "IDLH", LimitPPM: 500, LimitSource: "NIOSH Pocket Guide, chloroform, IDLH 500 ppm (1994), from memory"}
	boilsOff := ""
	if hot {
		boilsOff = " Chloroform boils at 61 °C (CRC Handbook, from memory): a mix this hot gives much of it off as vapour."
	}
	return withCounts(withHeat(mk("chloroform-formation", sev,
		"Hypochlorite with a ketone ("+fmtNum(k, 2)+" mol/L acetone) runs the haloform reaction (CH3COCH3 + 3 OCl- → CHCl3 + CH3COO- + 2 OH-): up to "+fmtNum(n/3*o.VolumeL, 2)+" mol chloroform, toxic and a suspected carcinogen, in the liquid and the vapour; "+heat+"."+boilsOff,
		"Do not combine. Keep solvents out of bleach and bleach out of solvent waste.",
		"Bretherick's Handbook of Reactive Chemical Hazards, sodium hypochlorite with acetone (from memory); Vogel's Textbook of Practical Organic Chemistry, haloform reaction (from memory); heat estimate from ΔfH° (NBS Tables 1982, from memory); thresholds: common practice, no source"), rh), vapour), true
}

// heavyMetals are the metals whose azides are primary explosives.
var heavyMetals = []string{"Cu", "Pb", "Ag", "Hg", "Zn", "Cd"}

// heavyMetalAzide: azide with copper, lead, silver, mercury, zinc or
// cadmium (ions or the metal: brass and copper drains) forms their azides,
// primary explosives that go off on friction or shock.
func heavyMetalAzide(o *Outcome) (engine.Hazard, bool) {
	az := math.Max(o.MolarBefore("N3-", "HN3"), o.Molar("N3-", "HN3"))
	if az < 1e-4 {
		return engine.Hazard{}, false
	}
	metal := ""
	for i := range o.Before {
		a := &o.Before[i]
		solidMetal := a.Species.Phase == engine.Solid && a.Mol > 0
		if a.Molar < 1e-5 && !solidMetal {
			continue
		}
		at, err := chem.ParseFormula(a.Species.Formula)
		if err != nil {
			continue
		}
		for _, m := range heavyMetals {
			if at[m] > 0 {
				metal = m
			}
		}
		if metal != "" {
			break
		}
	}
	if metal == "" {
		return engine.Hazard{}, false
	}
	return mk("heavy-metal-azide", engine.Danger,
		"Azide ("+fmtNum(az, 2)+" mol/L) with "+metal+" forms the heavy-metal azide: a primary explosive that settles out and goes off on friction, shock or drying; this is why azide never goes down copper, brass or lead drains.",
		"Do not combine. Keep azide solutions away from copper, lead, brass, silver, mercury and zinc and their salts; destroy azide by the site's procedure before it reaches a drain.",
		"Bretherick's Handbook of Reactive Chemical Hazards, sodium azide with heavy metals (from memory); NIOSH Pocket Guide, sodium azide (from memory); 1e-4 mol/L azide threshold: common practice, no source"), true
}

// chlorinatorFamilies are the kinds of chlorinating product: different
// kinds must never meet, dry or wet (calcium hypochlorite with
// trichloroisocyanuric acid is the classic fire and nitrogen trichloride
// explosion).
var chlorinatorFamilies = []struct {
	name      string
	chemicals []string
}{
	{"hypochlorite", []string{"Ca(OCl)2", "NaOCl", "LiOCl", "KOCl"}},
	{"chloroisocyanurate", []string{"C3Cl3N3O3", "NaC3Cl2N3O3"}},
	{"halogenated hydantoin", []string{"C5H6BrClN2O2"}},
}

// mixedChlorinators: two different kinds of chlorinating product, at least
// one of them poured as a solid.
func mixedChlorinators(o *Outcome) (engine.Hazard, bool) {
	var kinds []string
	solid := false
	for _, f := range chlorinatorFamilies {
		if o.Named(f.chemicals...) {
			kinds = append(kinds, f.name)
			solid = solid || o.SolidStream(f.chemicals...)
		}
	}
	if len(kinds) < 2 || !solid {
		return engine.Hazard{}, false
	}
	return mk("mixed-chlorinators", engine.Danger,
		"Two different chlorinating products ("+kinds[0]+" and "+kinds[1]+") react with each other, dry or damp: heat, chlorine and explosive nitrogen trichloride, and the heap can catch fire.",
		"Never combine different chlorinating products, dry or wet: store, scoop and dose each separately, with its own feeder and clean, dry tools.",
		"Bretherick's Handbook of Reactive Chemical Hazards, calcium hypochlorite with trichloroisocyanuric acid (from memory); pool-chemical storage rules: common practice, no source"), true
}

// chlorinatorSolubility is how much of a solid chlorinating product
// dissolves in water at about 20 °C (g/L) and its molar mass (g/mol).
var chlorinatorSolubility = map[string]struct {
	name   string
	gPerL  float64
	source string
}{
	"C3Cl3N3O3":    {"trichloroisocyanuric acid", 12, "trichloroisocyanuric acid about 12 g/L at 25 °C (from memory)"},
	"C5H6BrClN2O2": {"BCDMH", 1.5, "BCDMH about 1.5 g/L at 25 °C (from memory)"},
}

// undissolved says how much of a slowly soluble chlorinator stays solid
// in the mix, or "" when it all dissolves. The state caps the dissolved
// part by the solid's own row in species.txt (derived from the same
// solubility), so the amounts and pH of the answer are those of the
// saturated solution over the rest.
func undissolved(o *Outcome) (string, string) {
	for f, kg := range o.SolidKg {
		s, ok := chlorinatorSolubility[f]
		if !ok || o.VolumeL <= 0 {
			continue
		}
		dis := s.gPerL * o.VolumeL / 1000
		if dis >= kg {
			continue
		}
		return " Only about " + fmtNum(dis, 2) + " kg of the " + fmtNum(kg, 3) + " kg of " + s.name + " dissolves in " + fmtNum(o.VolumeL, 3) +
			" L (solubility about " + fmtNum(s.gPerL, 2) + " g/L); the rest stays as solid" + solidLeft(o, f) + ", and the figures of this answer count only what dissolves.", s.source
	}
	return "", ""
}

// solidLeft is " (N mol in the mixed state)" for the solid f the mixed state
// still holds, or "".
func solidLeft(o *Outcome, f string) string {
	for _, a := range o.After {
		if a.Species.Text() == f+"(s)" && a.Mol > 0 {
			return " (" + fmtNum(a.Mol, 3) + " mol in the mixed state)"
		}
	}
	return ""
}

// SulfuricDehydratingMolar is the sulfuric acid in the mix (mol/L, about
// 60 %) from which it dehydrates formic and oxalic acid to carbon monoxide
// (common practice, no source; the laboratory preparation uses the
// concentrated acid).
const SulfuricDehydratingMolar = 8

// carbonMonoxideFromAcids: concentrated sulfuric acid takes the water out
// of formic acid (HCOOH → CO + H2O) and oxalic acid (H2C2O4 → CO + CO2 +
// H2O): the laboratory way of making carbon monoxide. All the formic and
// oxalic acid is counted (an upper bound).
func carbonMonoxideFromAcids(o *Outcome, ps map[string]*pool) {
	if sulfuric(o) < SulfuricDehydratingMolar {
		return
	}
	formic := o.MolarBefore("HCOOH", "HCOO-")
	oxalic := o.MolarBefore("H2C2O4", "HC2O4-", "C2O4^2-")
	if formic+oxalic < FamilyTraceMolar {
		return
	}
	addTo(ps, "CO", (formic+oxalic)*o.VolumeL, 1,
		"formic or oxalic acid dehydrated by concentrated sulfuric acid (HCOOH → CO + H2O)",
		"Vogel's Textbook of Practical Organic Chemistry and Vogel's Qualitative Inorganic Analysis, carbon monoxide from formic or oxalic acid and concentrated sulfuric acid (from memory)")
}

// dryOxidizerFuel: a solid strong oxidizer blended dry with a solid fuel —
// sugar, other organic solids, sulfur, carbon, metal powder, sulfides,
// sulfites and thiosulfate, hypophosphite, hydrides, ammonium salts,
// cyanides — makes a mixture that burns fiercely or explodes from
// friction, impact, heat or a spark (chlorate with sugar or sulfur,
// permanganate with sulfur or glycerol, nitrate with aluminium powder).
// Solids alone do not react in a tank, but the blend itself is the hazard:
// a drum, a hopper or a spill of the two.
func dryOxidizerFuel(o *Outcome) (engine.Hazard, bool) {
	if o.VolumeL > 0 {
		return engine.Hazard{}, false
	}
	var oxName string
	for _, x := range strongOxidizers {
		if o.SolidStream(x.solids...) {
			oxName = x.name
			break
		}
	}
	if oxName == "" {
		return engine.Hazard{}, false
	}
	for _, c := range o.SolidChemicals {
		if isStrongOxidizerSolid(c) {
			continue
		}
		if what, ok := solidFuel(c); ok {
			more := ""
			if oxName == "Hypochlorite" && (ammoniumLike(c) || strings.HasPrefix(what, "an ammonium")) {
				more = " Damp, the chlorinator and the ammonium give chloramines and explosive nitrogen trichloride."
			}
			return mk("oxidizer-fuel-blend", engine.Danger,
				oxName+" blended dry with "+c+" ("+what+"): the blend burns fiercely or explodes from friction, impact, heat or a spark; it needs no liquid to react."+more,
				"Do not blend. Keep the oxidizer and the fuel apart in storage, scoops, hoppers and waste drums; sweep up a spill of either at once with clean tools and keep it wet until disposed of.",
				"Bretherick's Handbook of Reactive Chemical Hazards, sodium and potassium chlorate with sugar, sulfur and phosphorus, potassium permanganate with sulfur, nitrates with aluminium powder, peroxides and persulfates with organic matter (from memory)"), true
		}
	}
	return engine.Hazard{}, false
}

// dryChlorinatorAcid: a solid chlorinating agent (calcium or lithium
// hypochlorite, chlorinated isocyanurates, BCDMH) blended dry with a solid
// acid (sodium bisulfate, sulfamic, citric or oxalic acid) gives chlorine
// as soon as the blend takes up moisture from the air, and heats until it
// smoulders or ignites: such blends have caused fires and chlorine releases
// in pool-chemical stores.
func dryChlorinatorAcid(o *Outcome) (engine.Hazard, bool) {
	if o.VolumeL > 0 || len(o.SolidAcids) == 0 {
		return engine.Hazard{}, false
	}
	var chlor string
	for _, c := range o.SolidChemicals {
		if slices.Contains(strongOxidizers[hypochloriteIndex].solids, c) {
			chlor = c
			break
		}
	}
	if chlor == "" {
		if slices.Contains(o.SolidChemicals, "NaClO2") {
			// Sodium chlorite blended dry with a solid acid gives off
			// chlorine dioxide as the blend takes up moisture, and the
			// dry oxidizer with the blend's organic acids can ignite
			// (Bretherick's Handbook of Reactive Chemical Hazards, sodium
			// chlorite: acids, from memory; the two-part chlorine dioxide
			// tablets are kept apart until use: common practice, no source).
			return mk("clo2-release", engine.Danger,
				"Sodium chlorite blended dry with the acid "+o.SolidAcids[0]+": the blend gives off chlorine dioxide, toxic and explosive when concentrated, as soon as it takes up moisture (humid air, a wet scoop), and the dry oxidizer can set organic matter alight.",
				"Do not blend. Store, scoop and dose the chlorite and the acid apart, each with its own clean, dry tools; make chlorine dioxide only in a generator or by adding each to plenty of water at the point of use.",
				"Bretherick's Handbook of Reactive Chemical Hazards, sodium chlorite with acids (from memory); common practice, no source"), true
		}
		return engine.Hazard{}, false
	}
	return mk("dry-blend-chlorine", engine.Danger,
		"Chlorinating agent "+chlor+" blended dry with the acid "+o.SolidAcids[0]+": the blend gives off chlorine as soon as it takes up moisture (humid air, a wet scoop), and heats until it smoulders or ignites; it needs no liquid to start.",
		"Do not blend. Store, scoop and dose the chlorinator and the acid apart, each with its own clean, dry tools; dissolve each separately into plenty of water and add them to the pool or tank at different points.",
		"Bretherick's Handbook of Reactive Chemical Hazards, calcium hypochlorite: acids, and chlorinated isocyanurates (from memory); common practice, no source (pool-chemical store fires)"), true
}

// dryCarbonates are the carbonates and bicarbonates that give off carbon
// dioxide with an acid.
var dryCarbonates = []string{"Na2CO3", "Na2CO3.10H2O", "NaHCO3", "K2CO3", "KHCO3", "CaCO3", "MgCO3"}

// dryAcidCarbonate: a solid acid blended dry with a carbonate keeps while
// dry but fizzes once wet (the effervescent blend): carbon dioxide and
// foam in a closed drum or a damp store. A note, not a reason not to blend.
func dryAcidCarbonate(o *Outcome) (engine.Hazard, bool) {
	if o.VolumeL > 0 || len(o.SolidAcids) == 0 {
		return engine.Hazard{}, false
	}
	for _, c := range o.SolidChemicals {
		if slices.Contains(dryCarbonates, c) {
			return mk("dry-blend-gas-when-wet", engine.Info,
				"The acid "+o.SolidAcids[0]+" blended dry with "+c+" keeps while dry, but gives off carbon dioxide and foams as soon as it takes up water (humid air, a wet scoop, a wash-down).",
				"Keep the blend dry, in a vented or loosely closed container; never wash it down into a closed sump.",
				"common practice, no source (effervescent blends of citric acid and bicarbonate)"), true
		}
	}
	return engine.Hazard{}, false
}

// isStrongOxidizerSolid reports whether the formula is one of the solids of
// strongOxidizers.
func isStrongOxidizerSolid(formula string) bool {
	for _, x := range strongOxidizers {
		if slices.Contains(x.solids, formula) {
			return true
		}
	}
	return false
}

// fuelMetals are the elements that burn as a powder with an oxidizer.
var fuelMetals = map[string]bool{"Al": true, "Mg": true, "Zn": true, "Fe": true, "Ti": true, "Si": true,
	"Mn": true, "Cu": true, "Ca": true, "Na": true, "K": true, "Li": true, "S": true, "C": true, "P": true, "Sn": true, "Ni": true}

// solidFuel reports whether a solid chemical is a fuel for a strong
// oxidizer, by its atoms: an element (a metal, sulfur, carbon,
// phosphorus); carbon below carbonate (organic matter, cyanide,
// thiocyanate); sulfur below sulfate (sulfide, sulfur, thiosulfate,
// sulfite, dithionite); phosphorus below phosphate (hypophosphite,
// phosphite); hydride or borohydride; nitrogen with hydrogen and no oxygen
// beyond sulfamate (ammonium, hydrazine and hydroxylamine salts). It names
// the kind.
func solidFuel(formula string) (string, bool) {
	// Water of crystallisation (FeSO4.7H2O) is no oxygen of the fuel.
	a, err := engine.ParseFormula(strings.SplitN(formula, ".", 2)[0])
	if err != nil || len(a) == 0 {
		return "", false
	}
	if len(a) == 1 {
		for el := range a {
			return "a fuel element", fuelMetals[el]
		}
	}
	c, h, o, n, s, p, b := a["C"], a["H"], a["O"], a["N"], a["S"], a["P"], a["B"]
	switch {
	case c > 0 && h > 0 && o < 3*c:
		return "organic matter", true
	case c > 0 && n > 0 && o == 0:
		return "a cyanide", true
	case s > 0 && o < 4*s:
		return "a sulfur reducing agent", true
	case p > 0 && o < 4*p:
		return "a phosphorus reducing agent", true
	case b > 0 && h > 0 && o == 0:
		return "a borohydride", true
	case n > 0 && h >= 3*n && o == 0:
		return "an ammonium salt or hydrazine", true
	case ammoniumLike(formula):
		// The oxygen of an oxoanion ((NH4)2SO4, NH4H2PO4) feeds nothing:
		// the ammonium is the fuel (and with hypochlorite it gives
		// nitrogen trichloride).
		return "an ammonium, hydrazinium or hydroxylammonium salt", true
	case h > 0 && o == 0 && c == 0 && n == 0 && s == 0 && p == 0 && b == 0 && noHalogen(a):
		return "a hydride", true
	}
	return "", false
}

// ammoniumLike reports whether a formula carries ammonium, hydrazine or
// hydroxylamine as written ((NH4)2SO4, N2H6SO4, (NH3OH)2SO4).
func ammoniumLike(formula string) bool {
	for _, g := range []string{"NH4", "N2H4", "N2H5", "N2H6", "NH3OH", "NH2OH"} {
		if strings.Contains(formula, g) {
			return true
		}
	}
	return false
}

// dryNitrites are the solid nitrites of the dictionary.
var dryNitrites = []string{"NaNO2", "KNO2", "Ca(NO2)2"}

// dryNitriteAmmonium: a solid nitrite blended dry with a solid ammonium
// salt makes ammonium nitrite in the first moisture it takes up (NH4+ +
// NO2- → N2 + 2 H2O, −334.6 kJ/mol, NBS Tables 1982 ΔfH°), which
// decomposes by itself, faster as it warms: a damp blend can heat up and
// burst its container. With ammonium nitrate the blend is an oxidizer–fuel
// mixture as well.
func dryNitriteAmmonium(o *Outcome) (engine.Hazard, bool) {
	if o.VolumeL > 0 {
		return engine.Hazard{}, false
	}
	var nitrite, ammonium string
	for _, c := range o.SolidChemicals {
		switch {
		case slices.Contains(dryNitrites, c):
			nitrite = c
		case ammoniumLike(c):
			ammonium = c
		}
	}
	if nitrite == "" || ammonium == "" {
		return engine.Hazard{}, false
	}
	return mk("ammonium-nitrite-runaway", engine.Danger,
		"The nitrite "+nitrite+" blended dry with the ammonium salt "+ammonium+" forms ammonium nitrite in the first moisture it takes up (humid air, a wet scoop), which decomposes to nitrogen with heat and speeds itself up as it warms: a damp blend can heat, gas and burst its container.",
		"Do not blend, store or bag together; keep nitrites apart from ammonium salts and acids, and dissolve each separately into plenty of water.",
		"Bretherick's Handbook of Reactive Chemical Hazards, ammonium nitrite and sodium nitrite with ammonium salts (from memory); sodium nitrite safety data sheets, incompatible with ammonium salts (common practice, no source)"), true
}

// dryBases are the solid strong bases of the dictionary.
var dryBases = []string{"NaOH", "KOH", "LiOH", "Ca(OH)2", "CaO"}

// dryAmmoniumCaustic: an ammonium salt blended dry with a solid strong
// base gives off ammonia with heat as soon as the blend takes up moisture
// (caustic soda draws it from the air): NH4+ + OH- → NH3 + H2O, about one
// ammonia for each hydroxide, in a drum, a hopper or a damp store
// (common practice, no source; Bretherick's Handbook of Reactive Chemical
// Hazards, ammonium salts with bases, from memory). With ammonium nitrate
// the caustic also lowers its decomposition temperature.
func dryAmmoniumCaustic(o *Outcome) (engine.Hazard, bool) {
	if o.VolumeL > 0 {
		return engine.Hazard{}, false
	}
	var ammonium, base string
	for _, c := range o.SolidChemicals {
		switch {
		case slices.Contains(dryBases, c):
			base = c
		case strings.Contains(c, "NH4"):
			ammonium = c
		}
	}
	if ammonium == "" || base == "" {
		return engine.Hazard{}, false
	}
	kg := math.Min(o.SolidKg[ammonium], o.SolidKg[base])
	return mk("dry-blend-ammonia", engine.Danger,
		"The ammonium salt "+ammonium+" blended dry with "+base+" gives off ammonia with heat as soon as the blend takes up moisture ("+base+" draws it from humid air): up to one ammonia for each hydroxide, several cubic metres of gas from tens of kilograms ("+fmtNum(kg, 3)+" kg of the smaller of the two here), in a drum, a hopper or a closed store.",
		"Do not blend, store or bag together; keep ammonium salts apart from caustic soda, potash and lime, and dissolve each separately into plenty of water with ventilation.",
		"Bretherick's Handbook of Reactive Chemical Hazards, ammonium salts with bases (from memory); caustic soda hygroscopic, ammonia from ammonium salts and alkali: common practice, no source"), true
}

// nitrogenTriiodide: iodine with concentrated ammonia (about 1 mol/L of
// free ammonia and more, with the mix alkaline) throws down nitrogen
// triiodide–ammonia (NI3·NH3), a black solid that detonates at a touch
// once dry; dilute ammonia and iodide-rich iodine solutions (I3-) give
// less, but the solid is the hazard wherever iodine meets strong ammonia
// (Bretherick's Handbook of Reactive Chemical Hazards, iodine with
// ammonia, from memory; 1 mol/L threshold: common practice, no source).
func nitrogenTriiodide(o *Outcome) (engine.Hazard, bool) {
	iodine := o.MolarBefore("I2", "I3-")
	if iodine < FamilyTraceMolar && !o.Named("I2") || o.MolarBefore("NH3") < 1 || o.PH < 9 {
		return engine.Hazard{}, false
	}
	return mk("nitrogen-triiodide", engine.Danger,
		"Iodine with concentrated ammonia ("+fmtNum(o.MolarBefore("NH3"), 2)+" mol/L) throws down nitrogen triiodide, a black solid that detonates at a touch, a vibration or a fly once dry; wet sludge on a tank wall or in a drain dries to it.",
		"Do not combine. Keep iodine and iodine solutions away from ammonia; if it has happened, keep the solid wet and ask for its destruction (sodium thiosulfate solution) by trained staff.",
		"Bretherick's Handbook of Reactive Chemical Hazards, iodine with ammonia (nitrogen triiodide), from memory; destruction with thiosulfate: common practice, no source"), true
}

// silverFulminate: silver ions with nitric acid and ethanol form silver
// fulminate, AgCNO, a primary explosive that detonates dry, on friction or
// on shock (the fulminate preparation; mercury behaves the same way):
// Bretherick's Handbook of Reactive Chemical Hazards, silver nitrate with
// ethanol and silver fulminate, from memory. Thresholds: 1 mol/L nitric
// acid, a trace of silver and of ethanol (common practice, no source).
func silverFulminate(o *Outcome) (engine.Hazard, bool) {
	ag := metalSaltMolar(o.Before, o.VolumeL, "Ag", "Hg")
	if ag < FamilyTraceMolar || o.MolarBefore("NO3-", "HNO3") < 1 || o.PH >= 1 || o.MolarBefore("C2H5OH") < FamilyTraceMolar {
		return engine.Hazard{}, false
	}
	return mk("silver-fulminate", engine.Danger,
		"Silver (or mercury) salt ("+fmtNum(ag, 2)+" mol/L) with nitric acid and ethanol forms the fulminate, a primary explosive: up to "+fmtNum(ag*o.VolumeL, 3)+" mol, crystals that detonate dry, on friction or on shock.",
		"Do not combine. If it has happened, keep the residue wet, do not scrape, filter or dry it, and call specialists to destroy it.",
		"Bretherick's Handbook of Reactive Chemical Hazards, silver nitrate with ethanol, silver and mercury fulminates (from memory); thresholds and aftermath: common practice, no source"), true
}

// cyanogenRELppm is the NIOSH REL of cyanogen, 10 ppm (NIOSH Pocket Guide,
// from memory; no IDLH is listed).
const cyanogenRELppm = 10.0

// cyanogenFromCopper: copper(II) oxidizes cyanide, 2 Cu2+ + 4 CN- → 2
// CuCN + (CN)2: cyanogen, a very toxic gas, comes off where a copper(II)
// salt meets free cyanide, up to half the copper (Greenwood & Earnshaw,
// Chemistry of the Elements, cyanogen, from memory; NIOSH Pocket Guide,
// cyanogen, REL 10 ppm, from memory). Copper(I) cyanide dissolved in
// cyanide (the plating bath) gives none.
func cyanogenFromCopper(o *Outcome) (engine.Hazard, bool) {
	cu := o.MolarBefore("Cu^2+", "CuOH+", "Cu2(OH)2^2+", "CuSO4", "CuCl+")
	if o.Named("Cu(OH)2", "CuO") {
		cu = math.Max(cu, FamilyTraceMolar)
	}
	cn := o.MolarBefore("CN-", "HCN")
	if cu < FamilyTraceMolar || cn < FamilyTraceMolar {
		return engine.Hazard{}, false
	}
	// The amount counts all the copper(II): much of it goes down as
	// hydroxide where cyanide, a base, meets it, and fresh copper
	// hydroxide takes cyanide to cyanogen as well.
	mol := math.Min(math.Max(cu, copperIIAll(o))/2, cn/4) * o.VolumeL
	if o.PH >= 10 && cn >= 4*cu {
		// A trace of copper in an alkaline cyanide liquor with the cyanide
		// in excess (the copper catalyst of peroxide cyanide destruction,
		// 10–50 mg/L): the copper sits as cyano-cuprate(I), and what
		// cyanogen its reduction makes is taken up by the alkali at once,
		// (CN)2 + 2 OH- → CN- + OCN- + H2O, as a halogen is (Greenwood &
		// Earnshaw, Chemistry of the Elements, cyanogen, from memory;
		// copper-catalysed peroxide treatment: common practice, no source).
		return mk("cyanogen-release", engine.Warning,
			"Copper(II) ("+fmtNum(cu, 2)+" mol/L) meets a cyanide liquor that holds the cyanide in excess and stays alkaline (pH "+fmtNum(o.PH, 3)+"): the copper goes to cyano-cuprate(I) and the little cyanogen that makes (up to "+fmtNum(mol, 3)+" mol) is taken up by the alkali, to cyanate and cyanide.",
			"Dose the copper salt as a dilute solution into the cyanide liquor held above pH 10.5, never the cyanide into a copper bath; vent the tank.",
			"Greenwood & Earnshaw, Chemistry of the Elements, cyanogen from copper(II) and cyanide, and in alkali (from memory); copper-catalysed peroxide cyanide treatment: common practice, no source"), true
	}
	sev := engine.Danger
	if roomPPM(o, mol) < cyanogenRELppm {
		// So little that spread over a small plant room it stays below
		// the exposure limit (a crystal of copper salt landing in a
		// cyanide liquor): named, not a reason to refuse.
		sev = engine.Warning
	}
	// Counted as a gas a reaction outside the state gives off, so the
	// short answer's Forms line carries its amount against the limit.
	c := beyondCount("C2N2", "cyanogen", mol, "copper(II) oxidizing cyanide")
	c.LimitName, c.LimitPPM, c.LimitSource = "REL", cyanogenRELppm, "NIOSH Pocket Guide, cyanogen, REL 10 ppm (no IDLH listed), from memory"
	return withCounts(mk("cyanogen-release", sev,
		"Copper(II) oxidizes cyanide to cyanogen, (CN)2, a very toxic gas (NIOSH REL 10 ppm), with copper(I) cyanide: up to "+fmtNum(mol, 3)+" mol ("+fmtNum(engine.GasVolumeL(mol, 298.15, 101.325), 3)+" L) where the copper salt meets free cyanide.",
		"Do not combine. Never add copper(II) salts to cyanide liquors or cyanide to copper baths; if it has happened, leave the area, ventilate and raise the alarm.",
		"Greenwood & Earnshaw, Chemistry of the Elements, cyanogen from copper(II) and cyanide (from memory); NIOSH Pocket Guide, cyanogen, REL 10 ppm (from memory)"), c), true
}

// copperIIAll is the mol/L of copper(II) the mixed state holds, dissolved
// or as hydroxide.
func copperIIAll(o *Outcome) float64 {
	n := o.Molar("Cu^2+", "CuOH+", "CuSO4", "CuCl+") + 2*o.Molar("Cu2(OH)2^2+")
	for i := range o.After {
		if a := &o.After[i]; a.Species.Text() == "Cu(OH)2(s)" && o.VolumeL > 0 {
			n += a.Mol / o.VolumeL
		}
	}
	return n
}

// noHalogen reports whether the atoms hold no halogen (HCl, HF are acids,
// not hydrides).
func noHalogen(a engine.Atoms) bool {
	return a["F"] == 0 && a["Cl"] == 0 && a["Br"] == 0 && a["I"] == 0
}
