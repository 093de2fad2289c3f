package hazard

import (
	"math"

	"mixward/engine"
)

// Heat thresholds (common practice, no source): skin scalds above about
// 60 °C; a rise of 10 °C is worth dosing slowly for; a stated temperature
// alone never raises a heat hazard (MinRiseC).
const (
	ScaldC    = 60.0
	NearBoilC = 80.0
	WarmRise  = 10.0
	MinRiseC  = 5.0
)

// judgeHeat judges the heat by the temperature the mix reaches.
func judgeHeat(o *Outcome) []engine.Hazard {
	h := o.Heat
	if !h.Known || h.RiseC < MinRiseC {
		return nil
	}
	hj := &engine.HeatJudged{ReleasedkJ: sig(h.ReleasedkJ), ReachedC: sig(h.ReachedC), Boils: h.Boils}
	const src = "adiabatic rise over the mixed mass with the heat capacity of water; boiling at 100 °C, scalding above 60 °C: common practice, no source"
	var z engine.Hazard
	switch {
	case h.Boils:
		msg, act := "The mix releases "+fmtNum(h.ReleasedkJ, 3)+" kJ and would reach about "+fmtNum(h.ReachedC, 3)+" °C: it boils and spits hot liquid and mist", heatAction(o, h)
		if h.SteamKg >= 0.1 {
			mol := h.SteamKg * 1000 / steamMolarMass
			msg += ", boiling off about " + fmtNum(h.SteamKg, 2) + " kg of water as steam (" + fmtNum(engine.GasVolumeL(mol, BoilingC+273.15, 101.325)/1000, 2) + " m³ at 100 °C)"
			hj.SteamKg = sig(h.SteamKg)
			if o.HeadspaceStated && o.HeadspaceL > 0 {
				bar := mol * engine.MolarGasConstant() * (BoilingC + 273.15) / (o.HeadspaceL / 1000) / 1e5
				hj.SteamRiseBar = sig(bar)
				msg += "; closed, the steam alone would raise the stated " + fmtNum(o.HeadspaceL, 3) + " L headspace by about " + fmtNum(bar, 2) + " bar"
				act = "Never mix this in a closed vessel: the steam bursts it. " + act
			}
		}
		z = mk("boils", engine.Danger, msg+".", act, src)
	case h.ReachedC >= NearBoilC && h.RiseC >= 2*WarmRise:
		// Where the streams meet the liquid runs well above the mean: a mix
		// whose mean reaches 80 °C boils and spits locally when poured in one
		// go (Bretherick's Handbook, acids with bases, from memory).
		sev, act := engine.Danger, heatAction(o, h)
		if dilutionHeat(o) {
			// Most of the heat is that of diluting or dissolving: run
			// slowly into the water with cooling and stirring, the tank
			// never reaches the mean of a mix made in one go. A routine
			// make-up (acid into four volumes of water), not a reason
			// to refuse; the pour judges the order (water into the
			// concentrate boils where it lands) and a mix whose mean
			// boils stays a danger (common practice, no source).
			sev, act = engine.Warning, dilutionAction(o, h)
		}
		z = mk("near-boiling", sev,
			"The mix releases "+fmtNum(h.ReleasedkJ, 3)+" kJ and reaches about "+fmtNum(h.ReachedC, 3)+" °C on average: where the streams meet it boils and spits.",
			act, src)
	case h.ReachedC >= ScaldC && !(max(o.HottestC, o.TemperatureC) >= ScaldC && dilutionHeat(o)):
		// Dissolving or diluting makes a hazard of scalding only where it
		// brings the liquid to scalding: water stated at 70 °C scalds
		// before it meets anything, and the operator handles it as hot
		// water; a few degrees more from dissolving soda ash in it are
		// judged as a warm-up (below), near-boiling and boiling as above.
		// A reaction's heat in a hot liquid still counts: it speeds up as
		// it warms (common practice, no source).
		z = mk("scalding-heat", engine.Warning,
			"The mix releases "+fmtNum(h.ReleasedkJ, 3)+" kJ and reaches about "+fmtNum(h.ReachedC, 3)+" °C: hot enough to scald.",
			"Dose slowly with cooling and stirring; wear a face shield and heat-resistant gloves.", src)
	case h.RiseC >= WarmRise:
		z = mk("warms", engine.Warning,
			"The mix warms by about "+fmtNum(h.RiseC, 2)+" °C, to about "+fmtNum(h.ReachedC, 3)+" °C.",
			"Dose slowly and watch the temperature.", src)
	default:
		return nil
	}
	z.Heat = hj
	return []engine.Hazard{z}
}

// dilutionHeat: the heat is mostly that of diluting concentrated reagents
// or dissolving solids, none of a reaction: at least half of it counted as
// such, or the mix is one chemical poured dry into water (caustic flakes:
// the state's own change of the solid to ions). A weak acid or ammonia
// meeting a base is counted in the state, not as dilution, and stays out.
func dilutionHeat(o *Outcome) bool {
	h := o.Heat
	if h.Reactions || !(h.ReleasedkJ > 0) {
		return false
	}
	return h.MixingkJ >= 0.5*h.ReleasedkJ || oneSolidIntoWater(o)
}

// oneSolidIntoWater: the streams are water and one chemical poured dry.
func oneSolidIntoWater(o *Outcome) bool {
	n := 0
	for _, c := range o.Chemicals {
		if c == "H2O" {
			continue
		}
		if n++; n > 1 || !o.SolidStream(c) {
			return false
		}
	}
	return n == 1
}

// catalysedAction is what to do where a catalyst breaks peroxide down.
const catalysedAction = "Do not combine: the catalyst (a metal salt, iodide, or the alkali) is not used up, so a small portion of it breaks down all the peroxide it reaches, with oxygen and heat; adding it slowly does not help. To destroy peroxide, dilute it well first and add the catalyst to the dilute liquor in an open, vented tank."

// catalysedPeroxide reports whether the mix breaks peroxide down on a
// catalyst or by its own alkali, not by a partner it uses up: peroxide is
// there, oxygen forms, and no pair of agents gives it (OCl- + H2O2 → O2 is
// dosed in portions) unless a fast catalyst breaks down the rest
// (chromium(VI), permanganate, manganese dioxide, carbon).
func catalysedPeroxide(o *Outcome) bool {
	if o == nil || o.VolumeL <= 0 {
		return false
	}
	before := o.MolarBefore("H2O2", "HO2-") * o.VolumeL
	o2 := math.Max(o.GasMol("O2"), o.Measured["O2"].Mol)
	if before < TraceMolar*o.VolumeL || !(o2 > 0) {
		return false
	}
	// Most of the peroxide that goes must go to oxygen (two per O2): a
	// reducing agent that takes it up (sulfite, hypophosphite, iron(II)
	// alone) is dosed slowly, whatever boils off at the end.
	used := before - o.Molar("H2O2", "HO2-")*o.VolumeL
	if used <= 0 || 2*o2 < 0.5*used {
		return false
	}
	if pairGivesOxygen(o) && !fastPeroxideCatalyst(o) {
		return false // hypochlorite with peroxide: each takes the other
	}
	// A catalyst that is not used up: iron, copper, silver or platinum
	// salts, the fast catalysts (chromium(VI), permanganate, manganese
	// dioxide, carbon, iodide), cobalt or nickel once neutral or alkaline,
	// or concentrated peroxide made alkaline (the lock
	// peroxide-self-decomposition names the same).
	return fastPeroxideCatalyst(o) ||
		metalSaltMolar(o.Before, o.VolumeL, "Fe", "Cu", "Ag", "Pt") >= 1e-4 ||
		o.PH >= 7 && metalSaltMolar(o.Before, o.VolumeL, "Co", "Ni") >= 1e-4 ||
		o.PH >= 9.5 && o.MolarBefore("H2O2", "HO2-") >= 2.9
}

// heatAction is what to do about a mix that boils or nearly boils: more
// water and the concentrate run slowly into it when the heat is mostly
// that of diluting or dissolving; small portions into an open, vented tank
// with cooling when a reaction gives most of it (aluminium in caustic:
// more water does not take the reaction's heat away, only spreads it).
func heatAction(o *Outcome, h Heat) string {
	if catalysedPeroxide(o) {
		return catalysedAction
	}
	if h.Reactions && h.MixingkJ < 0.5*h.ReleasedkJ {
		return "Do not mix in one go: add the reacting stream in small portions with cooling and stirring, into an open, vented tank, letting each portion finish before the next; wear a face shield."
	}
	if piranha(o) {
		return piranhaAction
	}
	if solidIntoWater(o) {
		return "Do not mix in one go: use more water, add the solid a little at a time into the water with cooling and stirring, never the water onto the solid; wear a face shield."
	}
	return "Do not mix in one go: use more water, run the concentrated liquid slowly into the water with cooling and stirring; wear a face shield."
}

// piranhaAction is what to do about the heat of a peroxide–sulfuric acid
// bath, which is meant to hold no more water than its two liquids bring:
// "use more water" would spoil it. The peroxide goes slowly into the acid,
// a small batch at a time, in an open glass or PTFE vessel, left to cool
// before use or disposal, with organic matter kept away (common practice,
// no source).
const piranhaAction = "Do not mix in one go: add the peroxide slowly to the acid, never the reverse, a small batch at a time, in an open glass or PTFE vessel; let it cool before use or disposal; keep solvents and other organic matter away; wear a face shield."

// piranha: concentrated peroxide with strong sulfuric acid, in the
// strengths of Caro's acid (caroAcid), the mix a cleaning bath is made of.
func piranha(o *Outcome) bool {
	return o.MolarBefore("H2O2", "HO2-") >= CaroPeroxideMolar && o.MolarBefore("H2SO4", "HSO4-", "SO4^2-") >= CaroSulfuricMolar && o.PH < 0.5
}

// solidIntoWater: the concentrate whose heat the mix releases is a solid
// poured dry (quicklime, caustic flakes), so the advice speaks of a
// solid added into the water, not of a liquid run into it.
func solidIntoWater(o *Outcome) bool {
	n := 0
	for _, c := range o.Chemicals {
		if c == "H2O" {
			continue
		}
		if !o.SolidStream(c) {
			return false
		}
		n++
	}
	return n > 0
}

// dilutionAction is what to do about a mix that nearly boils from the
// heat of diluting or dissolving: the concentrate run (or, a solid, added a
// little at a time) into the water, with cooling. When the mix made as
// written already reaches NearBoilC on average, slow dosing alone cannot
// keep the tank below it: more water or cooling is needed, and the advice
// says so rather than promising a temperature the prediction exceeds
// (common practice, no source).
func dilutionAction(o *Outcome, h Heat) string {
	what := "run the concentrated liquid slowly into the water, never the reverse"
	if solidIntoWater(o) {
		what = "add the solid a little at a time into the water, never the water onto the solid"
	}
	if piranha(o) {
		return piranhaAction
	}
	if h.ReachedC >= NearBoilC {
		return "Never mix in one go: " + what + ", with stirring; made as written the whole tank reaches about " + fmtNum(h.ReachedC, 3) +
			" °C, so use more water or cooling to keep it below " + fmtNum(NearBoilC, 2) + " °C; wear a face shield."
	}
	return "Never mix in one go: " + what + ", with cooling and stirring, so that the tank stays well below " + fmtNum(NearBoilC, 2) + " °C; wear a face shield."
}
