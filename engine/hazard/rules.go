package hazard

import (
	"math"

	"mixward/engine"
)

// presenceRules are hazards that follow from what is present together,
// each with its source beside it.
var presenceRules = []func(o *Outcome) (engine.Hazard, bool){
	chloramines, nitrogenTrichloride, silverAmmonia, hydrofluoric,
	alkaliMetalFire, dithioniteSelfHeating, ammoniaWithStrongAcid, cyanideAlkaline,
	chromiumVI, carbonateFizz, cyanideComplexed, flammableLiquid,
}

func mk(code string, sev engine.Severity, msg, action, source string) engine.Hazard {
	c := codeOf(code)
	return engine.Hazard{Code: code, Severity: sev, Title: c.Title, Message: msg + " " + action, Action: action, Source: source, Aliases: c.Aliases}
}

// hypochloriteAny is hypochlorite before or after the reactions.
func hypochloriteAny(o *Outcome) float64 {
	return math.Max(o.Molar("HOCl", "OCl-"), o.MolarBefore("HOCl", "OCl-"))
}

// activeChlorine is hypochlorite and the chlorine monochloramine carries
// (combined chlorine), before or after the reactions, in mol/L: the state
// takes hypochlorite onto ammonia as NH2Cl as soon as the two meet.
func activeChlorine(o *Outcome) float64 {
	return math.Max(o.Molar("HOCl", "OCl-", "NH2Cl"), o.MolarBefore("HOCl", "OCl-", "NH2Cl"))
}

// ammoniaAny is ammonia, ammonium and the ammonia carried as chloramine,
// before or after the reactions, in mol/L.
func ammoniaAny(o *Outcome) float64 {
	return math.Max(o.Molar("NH3", "NH4+", "NH2Cl"), o.MolarBefore("NH3", "NH4+", "NH2Cl"))
}

// chloramines: hypochlorite with ammonia or ammonium forms chloramines
// (mono- above about pH 7.5, di- between 4.5 and 7.5). The amount that can
// meet is the smaller of the two; the monochloramine the state holds is
// named beside it.
func chloramines(o *Outcome) (engine.Hazard, bool) {
	n := math.Min(activeChlorine(o), ammoniaAny(o))
	if n < 1e-4 || o.PH < 4.5 {
		return engine.Hazard{}, false
	}
	sev := engine.Warning
	if n >= 0.01 {
		sev = engine.Danger
	}
	formed := ""
	// The chloramines stay in the liquid and give off a volatile, choking
	// vapour the answer does not count in the headspace: NIOSH lists no
	// exposure limit for them (NIOSH Pocket Guide, from memory). The
	// amount in the liquid is counted, so the short answer names it.
	c := engine.GasCount{Formula: "chloramines", Name: "chloramine vapour", Mol: n * o.VolumeL, InLiquid: true, From: "hypochlorite with ammonia or ammonium"}
	if nh2cl := math.Max(o.Molar("NH2Cl"), o.MolarBefore("NH2Cl")); nh2cl >= 1e-4 {
		formed = " The mix holds " + fmtNum(nh2cl, 2) + " mol/L monochloramine (NH2Cl)."
		c.Formula, c.Mol = "NH2Cl", nh2cl*o.VolumeL
	}
	act := "Do not combine; rinse lines between chlorinated and ammoniated products. If it has happened, leave and ventilate."
	ratio := ClNWeightRatio(o)
	if sev == engine.Warning && ratio < MonochloramineRatio {
		// Chloramination: ammonia and chlorine dosed into the water
		// separately (either first, by the site's practice) below 5:1 by
		// weight give monochloramine on purpose.
		formed += " The Cl2:NH3-N weight ratio is " + fmtNum(ratio, 2) + ":1, in the monochloramine region (below 5:1)."
		act = "Dose each into the water at its own point, in the order of the site's chloramination practice (ammonia first, or chlorine first with the ammonia soon after), and keep the Cl2:N weight ratio below 5:1 (above it dichloramine and nitrogen trichloride form); never let the concentrates meet neat, and rinse lines between chlorinated and ammoniated products."
	}
	formed += beyondMonochloramine(o, ratio)
	return withCounts(mk("chloramine-release", sev,
		"Hypochlorite with ammonia or ammonium forms chloramines ("+fmtNum(n, 2)+" mol/L of each can meet): toxic, choking gases."+formed,
		act,
		"chloramine formation by pH and the 5:1 Cl2:N weight ratio of monochloramine: White's Handbook of Chlorination and Alternative Disinfectants, chloramination (from memory); breakpoint at about 7.6:1 by weight (1.5 hypochlorite per ammonia), beyond it nitrogen gas, dichloramine and nitrogen trichloride: White's Handbook of Chlorination, the breakpoint curve (from memory); nitrogen trichloride explosive and lachrymatory: Bretherick's Handbook of Reactive Chemical Hazards, nitrogen trichloride (from memory); 0.01 mol/L threshold for danger: common practice, no source; no exposure limit for chloramines: NIOSH Pocket Guide lists none (from memory)"), c), true
}

// beyondMonochloramine names what hypochlorite beyond one per ammonia goes
// on to form, which the state cannot hold (no species data for NHCl2 and
// NCl3, data/species.txt): between 5:1 and the breakpoint (about 7.6:1 Cl2:N
// by weight, 1.5 hypochlorite per ammonia) dichloramine beside the
// monochloramine; past the breakpoint the excess takes the chloramines to
// nitrogen gas, and with hypochlorite left over and the pH lower (below
// about 7.5, as acid is added or the bleach's caustic is spent) to
// dichloramine and nitrogen trichloride (White's Handbook of Chlorination,
// the breakpoint curve, from memory; Bretherick's Handbook, nitrogen
// trichloride, from memory). Empty below 5:1.
func beyondMonochloramine(o *Outcome, ratio float64) string {
	if ratio < MonochloramineRatio || math.IsInf(ratio, 1) {
		return ""
	}
	molar := ratio * 14.007 / 70.90
	at := " The Cl2:NH3-N weight ratio is " + fmtNum(ratio, 2) + ":1 (" + fmtNum(molar, 2) + " hypochlorite per ammonia)"
	if ratio < BreakpointRatio {
		return at + ", above the monochloramine region (5:1) and short of breakpoint (about 7.6:1): dichloramine (NHCl2) forms beside the monochloramine, more so as the pH falls."
	}
	slow := ""
	if o.PH >= 10 {
		slow = " At pH " + fmtNum(o.PH, 3) + " the mix first holds monochloramine and the excess hypochlorite; the breakdown runs as it stands and as the pH falls."
	}
	return at + ", past breakpoint (about 7.6:1, 1.5 hypochlorite per ammonia): the excess hypochlorite takes the chloramine on to nitrogen gas, and where hypochlorite is left over at a lower pH (below about 7.5: acid added, or the bleach's caustic spent) to dichloramine (NHCl2) and nitrogen trichloride (NCl3), an explosive oil and a tear-gas vapour." + slow
}

// BreakpointRatio is the Cl2:NH3-N weight ratio of breakpoint chlorination,
// about 7.6:1 (1.5 hypochlorite per ammonia), beyond which free chlorine
// remains and the chloramines are destroyed to nitrogen (White's Handbook of
// Chlorination, the breakpoint curve, from memory).
const BreakpointRatio = 7.6

// MonochloramineRatio is the Cl2:NH3-N weight ratio below which chlorine
// dosed into ammoniated water forms monochloramine (White's Handbook of
// Chlorination, chloramination and the breakpoint curve, from memory).
const MonochloramineRatio = 5.0

// ClNWeightRatio is the weight ratio of active chlorine (as Cl2, 70.90
// g/mol) to ammonia nitrogen (14.007 g/mol) that can meet in the mix
// (IUPAC CIAAW atomic weights); +Inf without ammonia.
func ClNWeightRatio(o *Outcome) float64 {
	n := ammoniaAny(o)
	if n <= 0 {
		return math.Inf(1)
	}
	return activeChlorine(o) * 70.90 / (n * 14.007)
}

// nitrogenTrichloride: hypochlorite with ammonium or urea below about pH 4.5
// forms nitrogen trichloride, an explosive oil and toxic vapour.
func nitrogenTrichloride(o *Outcome) (engine.Hazard, bool) {
	n := math.Min(activeChlorine(o), math.Max(o.MolarBefore("NH3", "NH4+", "NH2Cl", "CO(NH2)2"), o.Molar("NH3", "NH4+", "NH2Cl", "CO(NH2)2")))
	if n < TraceMolar || o.PH >= 4.5 {
		return engine.Hazard{}, false
	}
	return mk("nitrogen-trichloride", engine.Danger,
		"Hypochlorite with ammonium or urea at pH "+fmtNum(o.PH, 2)+" forms nitrogen trichloride: a toxic vapour and an oil that explodes on shock or warming.",
		"Do not combine. Never let acid, hypochlorite and ammonium or urea meet.",
		"Bretherick's Handbook of Reactive Chemical Hazards, nitrogen trichloride (from memory); pH 4.5 boundary: White's Handbook of Chlorination (from memory)"), true
}

// silverAmmonia: ammoniacal silver solutions deposit silver nitride
// ("fulminating silver") on standing, which explodes when touched.
func silverAmmonia(o *Outcome) (engine.Hazard, bool) {
	// In the mix the silver is mostly the ammine complex.
	ag := math.Max(o.MolarBefore("Ag+", "Ag2O", "Ag(NH3)2+", "AgNH3+"), o.Molar("Ag+", "Ag(NH3)2+", "AgNH3+"))
	if ag < TraceMolar || o.Molar("NH3") < TraceMolar && o.MolarBefore("NH3") < TraceMolar {
		return engine.Hazard{}, false
	}
	return mk("explosive-residue", engine.Danger,
		"Silver with ammonia leaves explosive silver nitride on standing (hours to days): dried residues go off when touched.",
		"Do not combine in plant. If it has happened, do not store it: acidify at once with dilute nitric acid and rinse out.",
		"Bretherick's Handbook of Reactive Chemical Hazards, silver nitrate with ammonia (from memory)"), true
}

// hydrofluoric: HF burns penetrate and poison through the skin; the vapour
// is immediately dangerous at 30 ppm.
func hydrofluoric(o *Outcome) (engine.Hazard, bool) {
	hf := math.Max(o.MolarBefore("HF"), o.Molar("HF"))
	msg := "Hydrofluoric acid (" + fmtNum(hf, 2) + " mol/L HF): burns show up late and fluoride poisons through the skin; concentrated acid fumes (IDLH 30 ppm)."
	if hf < hfBurnMolar {
		// Below burn strength (fluoride salts in water: a fluoridation
		// make-up of sodium fluoride and silicofluoride holds a few mmol/L
		// HF at pH 3–4) no HF rule fires from the trace. The mix takes a
		// named acid up (caustic, lime), but the operator still handles
		// the hydrofluoric acid on its way in.
		switch {
		case o.Named("HF", "NH4HF2"):
			msg = "Hydrofluoric acid is handled on its way into the mix, which takes it up: splashes and fumes burn late and fluoride poisons through the skin (IDLH 30 ppm)."
		case o.Named("H2SiF6"):
			// The trade acid (20–25 %) is a strong acid whose fumes carry
			// hydrogen fluoride; its data sheets treat splashes as HF
			// burns (suppliers' safety data sheets, calcium gluconate
			// first aid, from memory).
			msg = "Fluorosilicic acid is handled on its way into the mix: a strong acid whose fumes carry hydrogen fluoride, splashes treated as hydrofluoric acid burns (IDLH 30 ppm)."
		default:
			return engine.Hazard{}, false
		}
	}
	// The acid's own hazard is a warning with its precautions: diluting
	// 40 % acid to 20 % for a pickle is routine work. Concentrated acid
	// that the mix heats fumes heavily, and that is a reason not to mix.
	sev := engine.Warning
	if hf >= 10 && o.Heat.Known && (o.Heat.Boils || o.Heat.ReachedC >= hfHotC) {
		sev = engine.Danger
		msg += " The mix heats it to about " + fmtNum(o.Heat.ReachedC, 2) + " °C, where it fumes heavily."
	}
	act := "Wear HF-rated gloves and face shield, keep calcium gluconate gel at hand, work with extraction."
	if hf >= hfStrongMolar {
		// Strong acid meets water in this mix: the order and the closed
		// transfer matter. A dilute acid neutralised with a dry dose (lime
		// into 5 % acid) has no water to run it into.
		act = "Wear HF-rated gloves and face shield, keep calcium gluconate gel at hand, work with extraction; add the acid into the water, never the reverse; transfer concentrated or anhydrous HF closed, or below the liquid surface."
	}
	return mk("hf-burns", sev, msg, act,
		"NIOSH Pocket Guide, hydrogen fluoride, IDLH 30 ppm (from memory); calcium gluconate first aid and closed transfer: common practice, no source; danger from 10 mol/L heated to 60 °C: common practice, no source; burn strength from 0.05 mol/L (about 0.1 %): EU CLP Annex VI specific concentration limits for hydrofluoric acid, skin irritant from 0.1 % (from memory)"), true
}

// hfBurnMolar is the HF (molecular, in the mix as combined or after) from
// which the hydrofluoric-acid rule fires: about 0.1 % w/w, where the EU CLP
// Annex VI specific concentration limits for hydrofluoric acid begin (skin
// irritant 0.1–1 %, corrosive from 1 %; from memory). Sodium silicofluoride
// in water (about pH 3.5) holds a few mmol/L and causes no HF burns (AWWA
// fluoridation practice, from memory).
const hfBurnMolar = 0.05

// hfStrongMolar is the HF from which the action names the order of
// addition and the closed transfer of concentrated acid: about 10 % w/w
// (common practice, no source).
const hfStrongMolar = 5.0

// hfHotC is the temperature from which concentrated hydrofluoric acid in a
// mix fumes heavily (its vapour pressure about quadruples from 25 to
// 60 °C: data/vapour.txt slope; common practice, no source).
const hfHotC = 60

// alkaliMetalFire: sodium, potassium and lithium with water.
func alkaliMetalFire(o *Outcome) (engine.Hazard, bool) {
	if o.VolumeL <= 0 {
		return engine.Hazard{}, false
	}
	for _, a := range o.Before {
		if s := a.Species; s.Charge == 0 && s.Phase == engine.Solid && (s.Formula == "Na" || s.Formula == "K" || s.Formula == "Li") {
			return mk("alkali-metal-fire", engine.Danger,
				"Alkali metal ("+s.Formula+") with water reacts violently: the hydrogen it gives off ignites.",
				"Do not combine. Keep the metal dry under oil; use a class D extinguisher, never water.",
				"Bretherick's Handbook of Reactive Chemical Hazards, sodium and potassium (from memory)"), true
		}
	}
	return engine.Hazard{}, false
}

// dithioniteSelfHeating: dithionite decomposes exothermically in acid and
// when damp; the heat can set the solid alight.
func dithioniteSelfHeating(o *Outcome) (engine.Hazard, bool) {
	if o.MolarBefore("S2O4^2-", "HS2O4-", "H2S2O4") < TraceMolar || o.PH >= 5 {
		return engine.Hazard{}, false
	}
	return mk("self-heating", engine.Warning,
		"Dithionite in acid decomposes with heat, to sulfur dioxide and sulfur; damp solid can heat itself to ignition.",
		"Dose dithionite only into neutral or alkaline liquor; keep the solid dry and closed.",
		"Bretherick's Handbook of Reactive Chemical Hazards, sodium dithionite (from memory)"), true
}

// ammoniaWithStrongAcid: concentrated ammonia and a strong acid meet in a
// cloud of ammonium salt and heat.
func ammoniaWithStrongAcid(o *Outcome) (engine.Hazard, bool) {
	if !o.Named("NH3") || !o.StrongAcid || o.MolarBefore("NH3", "NH4+") < 1 {
		return engine.Hazard{}, false
	}
	return mk("ammonium-salt-fumes", engine.Warning,
		"Concentrated ammonia with a strong acid gives white fumes of ammonium salt and heat where they meet.",
		"Add slowly, below the surface, with extraction and cooling.",
		"common practice, no source"), true
}

// cyanideAlkaline: cyanide kept alkaline is a note, not an alarm.
func cyanideAlkaline(o *Outcome) (engine.Hazard, bool) {
	if o.Molar("CN-") < TraceMolar || o.PH < 10.5 {
		return engine.Hazard{}, false
	}
	return mk("cyanide-kept-alkaline", engine.Info,
		"Cyanide is present at pH "+fmtNum(o.PH, 3)+".", "Keep it above pH 10.5 and keep acids away.",
		"pH 10.5 for cyanide liquors: common practice, no source"), true
}

// cyanideComplexed: free cyanide poured together with iron(II) or iron(III)
// is bound as hexacyanoferrate (ferrocyanide, log β6 about 35): the free
// hydrogen cyanide falls, but the liquor stays a cyanide waste. With excess
// iron it throws down Prussian-blue-type solids, and in acid, light or heat
// the complexes give hydrogen cyanide off again slowly. In acid below pH 4
// the acidification is the hazard: cyanide-complex-acid (cyanide_acid.go)
// judges it, for every metal cyanide complex alike.
func cyanideComplexed(o *Outcome) (engine.Hazard, bool) {
	fe := math.Max(o.Molar("Fe(CN)6^4-", "Fe(CN)6^3-"), o.MolarBefore("Fe(CN)6^4-", "Fe(CN)6^3-"))
	if fe < TraceMolar || o.PH < 4 || !o.Named("NaCN", "KCN", "HCN", "CuCN", "Zn(CN)2", "AgCN") {
		return engine.Hazard{}, false
	}
	return mk("cyanide-complexed", engine.Warning,
		"Iron holds cyanide as hexacyanoferrate ("+fmtNum(fe, 2)+" mol/L): free hydrogen cyanide stays low in the cold, but the liquor and any blue sludge (Prussian-blue-type solids with excess iron) are still cyanide waste, and acid with warmth or light gives hydrogen cyanide off again slowly.",
		"Treat as cyanide waste: keep it alkaline, covered and out of sunlight, and send it to cyanide treatment, not to the drain.",
		"Vogel's Textbook of Macro and Semimicro Qualitative Inorganic Analysis, cyanide with iron(II) and iron(III) (from memory); ferrocyanide log β6 35, Smith & Martell Critical Stability Constants (from memory); release of cyanide from iron complexes in light and acid: common practice, no source"), true
}

// chromiumGPerMol is the standard atomic weight of chromium (IUPAC 2013,
// 51.9961; from memory).
const chromiumGPerMol = 51.9961

// chromiumVI: hexavalent chromium is a human carcinogen.
func chromiumVI(o *Outcome) (engine.Hazard, bool) {
	if math.Max(o.MolarBefore("Cr2O7^2-", "CrO4^2-", "HCrO4-", "H2CrO4"), o.Molar("Cr2O7^2-", "CrO4^2-", "HCrO4-")) < TraceMolar {
		return engine.Hazard{}, false
	}
	msg := "Hexavalent chromium causes cancer; the workplace limit is 5 µg/m³ (OSHA)."
	act := "Work inside the site's chromium(VI) controls: closed transfer, extraction, gloves and eye protection; collect every drop for treatment."
	// Chromium atoms, not formula units: dichromate holds two.
	if left := 2*o.Molar("Cr2O7^2-") + o.Molar("CrO4^2-", "HCrO4-", "H2CrO4"); left >= TraceMolar && o.Formed("Cr^3+", "CrOH^2+", "Cr(OH)3(s)", "Cr(OH)4-", "Cr2O3(s)") && !heldBy(o, "chromium-vi-sulfite-slow") {
		// A reduction ran and stopped with chromium(VI) left: the
		// reducing agent ran short (a treatment underdosed).
		msg += " Not all of it is reduced: " + fmtNum(left*o.VolumeL, 3) + " mol of chromium as chromium(VI) (" + fmtNum(left*o.VolumeL*chromiumGPerMol/1000, 3) + " kg Cr) stays in the mix (the reducing agent ran short)."
		act = "Chromium(VI) is not all reduced (" + fmtNum(left*o.VolumeL, 3) + " mol Cr left): dose more reducing agent under ORP control before the mix goes on as treated. " + act
	} else if o.Formed("Cr^3+", "CrOH^2+", "Cr(OH)3(s)") && o.MolarBefore("H2SO3", "HSO3-", "SO3^2-", "S2O5^2-") >= TraceMolar {
		// A sulfite reduction of chromium(VI): it runs at pH 2–3, fast
		// and complete, and slows to a stop above about pH 4 (common
		// practice, no source: chromium waste treatment).
		act = "Reduce at pH 2–3 (add acid first if the liquor is not that acid), dosing the bisulfite under ORP control; raise the pH to settle chromium(III) hydroxide only once no chromium(VI) is left. " + act
	}
	return mk("chromium-vi-exposure", engine.Warning,
		msg,
		act,
		"IARC Monographs volume 100C, 2012, Group 1 (from memory); OSHA 29 CFR 1910.1026, PEL 5 µg/m³ (from memory)"), true
}

// carbonateFizz: carbon dioxide more than a tenth of the liquid's volume
// foams and builds pressure.
func carbonateFizz(o *Outcome) (engine.Hazard, bool) {
	n := o.GasMol("CO2")
	l := n * litreBarPerMolK() * o.TemperatureK() / (o.PressureKPa / 100)
	if o.VolumeL <= 0 || l < 0.1*o.VolumeL {
		return engine.Hazard{}, false
	}
	return withCounts(mk("fizzing-pressure", engine.Warning,
		"Carbon dioxide comes off ("+fmtNum(l, 3)+" L, "+fmtNum(l/o.VolumeL, 2)+"× the liquid volume): the tank can foam over and a closed vessel builds pressure.",
		"Add slowly to an open, vented tank with headroom.",
		"common practice, no source"), engine.GasCount{Formula: "CO2", Name: "carbon dioxide", Mol: n, From: "the reactions that run in the mix"}), true
}
