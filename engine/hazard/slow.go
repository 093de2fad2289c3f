package hazard

import (
	"math"
	"strings"

	"mixward/engine"
)

// Slow chemistry the operator must hear about: a change the equilibrium
// state holds back (data/locks.txt) that leaves a hazard in the tank, and
// slow changes the state cannot hold as species (peracid formed from
// peroxide and acetic acid, peracid breaking down in alkali). Each rule
// names its source.
var slowRules = []func(o *Outcome) (engine.Hazard, bool){
	chromiumVILeft, chlorateKept, peracidForming, warmHypochlorite, warmPersulfate, caroAcid, hotPeroxideConcentrate, peroxideOnCopper,
}

// standingCodes are hazards of the mix as it stands (it changes over hours:
// warm bleach, peracid forming) that do not depend on the order of
// addition; the pour does not judge by them.
var standingCodes = map[string]bool{"warm-bleach": true, "peracid-forming": true, "chromium-vi-not-reduced": true, "chlorate-reducer-acid": true}

// AlongPour drops from the hazards of one point of a pour those of the mix
// as it stands, which the final mix reports.
func AlongPour(hs []engine.Hazard) []engine.Hazard {
	return AlongPourAt(hs, nil, nil)
}

// AlongPourAt is AlongPour for a point judged as o (nil: not known) in a
// tank whose pH before the addition tankPH gives (called only when needed;
// nil or NaN: not known). A point of the pour outside the pH range where
// silica gels throughout the tank (SilicaGelLowPH to SilicaGelHighPH)
// keeps no silica-gel of its own unless the tank started on the other side
// of that range and so has passed through it: the gel where the acid lands
// is the final mix's, whichever the order, and the pour then shows which
// order keeps the tank on the side of its end point.
func AlongPourAt(hs []engine.Hazard, o *Outcome, tankPH func() float64) []engine.Hazard {
	out := hs[:0:0]
	for _, h := range hs {
		if standingCodes[h.Code] {
			continue
		}
		if h.Code == "silica-gel" && o != nil && !silicaGelsAt(o.PH) && !crossed(o.PH, tankPH) {
			continue
		}
		out = append(out, h)
	}
	return out
}

// heldBy reports whether the lock id held something back in the mix.
func heldBy(o *Outcome, id string) bool {
	for _, h := range o.HeldBack {
		if h.Lock == id {
			return true
		}
	}
	return false
}

// chromiumVILeft: sulfite and bisulfite reduce chromium(VI) fast only at pH
// 2–3; above about pH 4 the state keeps the chromium(VI) (lock
// chromium-vi-sulfite-slow), and the operator must not send it on as
// treated.
func chromiumVILeft(o *Outcome) (engine.Hazard, bool) {
	if !heldBy(o, "chromium-vi-sulfite-slow") {
		return engine.Hazard{}, false
	}
	cr := o.Molar("Cr2O7^2-", "CrO4^2-", "HCrO4-", "H2CrO4")
	return mk("chromium-vi-not-reduced", engine.Warning,
		"Sulfite reduces chromium(VI) only slowly and incompletely at pH "+fmtNum(o.PH, 3)+" (above about 4): "+fmtNum(cr*o.VolumeL, 3)+" mol chromium(VI) stays, not destroyed as mixed.",
		"Reduce at pH 2–3 under ORP control, then raise the pH to precipitate chromium(III) hydroxide; never send this mix to the clarifier as treated.",
		"common practice, no source; Pourbaix, Atlas of Electrochemical Equilibria (1974), chromium (from memory)"), true
}

// chlorateKept: chlorate with sulfite, bisulfite or iron(II) keeps in
// neutral and alkaline solution (lock chlorate-sluggish) but reacts fast in
// strong acid, with chlorine dioxide: a note, not a reason not to mix.
func chlorateKept(o *Outcome) (engine.Hazard, bool) {
	if !heldBy(o, "chlorate-sluggish") {
		return engine.Hazard{}, false
	}
	return mk("chlorate-reducer-acid", engine.Info,
		"Chlorate with a reducing agent keeps as mixed (pH "+fmtNum(o.PH, 3)+"), but in strong acid it reacts fast, with heat, chlorine dioxide and chlorine.",
		"Never acidify this mix; keep acids out of its tank and drain.",
		"common practice, no source; Vogel's Textbook of Macro and Semimicro Qualitative Inorganic Analysis, chlorates (from memory)"), true
}

// peracidForming: hydrogen peroxide with acetic acid forms peracetic acid
// over hours to days (acid-catalysed) and gives off gas on standing; the
// answer counts none formed (lock peracid-formation), the operator still
// needs the precautions. Thresholds 0.5 mol/L of each (about 2 % peroxide
// and 3 % acetic acid): common practice, no source.
func peracidForming(o *Outcome) (engine.Hazard, bool) {
	h2o2 := o.MolarBefore("H2O2", "HO2-")
	acid := o.MolarBefore("CH3COOH")
	if h2o2 < 0.5 || acid < 0.5 {
		return engine.Hazard{}, false
	}
	if _, fast := peracids(o); fast {
		return engine.Hazard{}, false // the runaway says it
	}
	return mk("peracid-forming", engine.Warning,
		"Hydrogen peroxide ("+fmtNum(h2o2, 2)+" mol/L) with acetic acid ("+fmtNum(acid, 2)+" mol/L) forms peracetic acid slowly, over hours to days (faster with a strong acid): not counted here, but the mix gives off oxygen as it stands and concentrated mixes can run away when heated or contaminated.",
		"Use vented containers only, keep the mix cool and free of metals and dirt, and do not store it in a closed drum.",
		"Bretherick's Handbook of Reactive Chemical Hazards, hydrogen peroxide with acetic acid (from memory); thresholds: common practice, no source"), true
}

// WarmBleachC is the temperature from which hypochlorite left in a mix
// loses strength and builds up chlorate fast enough to matter within a
// shift (common practice, no source; White's Handbook of Chlorination,
// hypochlorite stability, from memory: weeks at room temperature, hours to
// days at 50–60 °C).
const WarmBleachC = 40

// warmHypochlorite: hypochlorite left in a mix at 40 °C or more turns into
// chlorate and chloride (with some oxygen) over hours; the answer is for the
// mix as first made (lock chlorate-formation), the operator needs the note.
func warmHypochlorite(o *Outcome) (engine.Hazard, bool) {
	left := o.Molar("OCl-", "HOCl")
	t := o.TemperatureC
	if o.Heat.Known {
		t = math.Max(t, o.Heat.ReachedC)
	}
	if left < 0.01 || t < WarmBleachC {
		return engine.Hazard{}, false
	}
	return mk("warm-bleach", engine.Warning,
		"Hypochlorite ("+fmtNum(left, 2)+" mol/L) at about "+fmtNum(t, 3)+" °C loses available chlorine and builds up chlorate over hours (days at 50–60 °C, weeks at room temperature), with some oxygen and heat.",
		"Use a warm batch promptly and vent its tank; keep bleach stock below about 30 °C.",
		"White's Handbook of Chlorination, hypochlorite stability (from memory); 40 °C threshold: common practice, no source"), true
}

// WarmPersulfateC is the temperature from which persulfate left in a mix
// breaks down within a shift: its half-life is about a day at 60 °C and a
// few hours at 70–80 °C, shorter in strong acid (Kolthoff and Miller,
// J. Am. Chem. Soc. 1951, persulfate decomposition rates, from memory).
const WarmPersulfateC = 60

// warmPersulfate: persulfate kept warm gives off oxygen as it breaks down
// (S2O8^2- + H2O → 2 HSO4- + ½ O2), and in strong acid forms
// peroxymonosulfuric (Caro's) acid on the way, a strong oxidizer that fires
// organic matter. The answer is for the mix as first made (locks
// persulfate-no-oxygen, persulfate-no-peroxide); the operator needs the note,
// with the oxygen the batch gives off in all.
func warmPersulfate(o *Outcome) (engine.Hazard, bool) {
	left := o.Molar("S2O8^2-", "HS2O8-")
	t := o.TemperatureC
	if o.Heat.Known {
		t = math.Max(t, o.Heat.ReachedC)
	}
	if left < 0.01 || t < WarmPersulfateC || o.VolumeL <= 0 {
		return engine.Hazard{}, false
	}
	o2 := left * o.VolumeL / 2
	msg := "Persulfate (" + fmtNum(left, 2) + " mol/L) at about " + fmtNum(t, 3) + " °C breaks down over hours, giving off up to " + fmtNum(o2, 3) + " mol of oxygen (" + fmtNum(engine.GasVolumeL(o2, 298.15, 101.325), 3) + " L) as the batch stands"
	if o.PH < 1 {
		msg += ", and in this strong acid forms peroxymonosulfuric (Caro's) acid on the way, a strong oxidizer that fires organic matter"
	}
	return mk("warm-persulfate", engine.Warning, msg+".",
		"Vent the tank and use the batch promptly; keep organic matter, solvents and rags away from it; do not store it warm in a closed vessel.",
		"Kolthoff and Miller, J. Am. Chem. Soc. 1951, persulfate decomposition rates (from memory); Bretherick's Handbook of Reactive Chemical Hazards, peroxodisulfates and peroxomonosulfuric acid (from memory); 60 °C threshold: common practice, no source"), true
}

// Hot peroxide concentrate (common practice, no source, unless said):
// hydrogen peroxide of about 30 % (9 mol/L) and peracetic acid of about
// 15 % (2 mol/L) are the strengths from which a batch heated past about
// 50 °C can self-accelerate: concentrated peracids and peroxides decompose
// faster as they warm, with oxygen and more heat (Bretherick's Handbook of
// Reactive Chemical Hazards, peroxyacetic acid and hydrogen peroxide, from
// memory; peracetic acid suppliers' SADT about 50–60 °C, from memory). A
// mix of both counts each against its own strength (a 15 % peracetic acid
// grade carries about 23 % peroxide). The heat must be the mix's own: the
// rule is about a reaction or dilution that heats the concentrate, not a
// stated warm tank.
const (
	HotPeroxideMolar = 9.0
	HotPeracidMolar  = 2.0
	HotPeroxideC     = 50.0
	// HotPeroxideRiseC is the least rise by the mix's own heat the rule
	// counts.
	HotPeroxideRiseC = 5.0
	// CoolPeroxideC is the temperature a dosing of such a concentrate is
	// kept below.
	CoolPeroxideC = 40.0
)

// hotPeroxideConcentrate: concentrated peroxide or peracid left in excess
// by a reaction (or a dilution) that heats it past about 50 °C can
// self-accelerate: it decomposes faster as it warms, giving off oxygen and
// more heat, and may boil over or burst its tank. Cooling after the fact is
// too late: the concentrate is diluted first, then dosed with cooling.
func hotPeroxideConcentrate(o *Outcome) (engine.Hazard, bool) {
	if !o.Heat.Known || o.Heat.ReachedC < HotPeroxideC || o.Heat.RiseC < HotPeroxideRiseC || o.VolumeL <= 0 {
		return engine.Hazard{}, false
	}
	h2o2, pa := o.Molar("H2O2", "HO2-"), o.Molar("CH3CO3H", "CH3CO3-")
	if h2o2/HotPeroxideMolar+pa/HotPeracidMolar < 1 {
		return engine.Hazard{}, false
	}
	var what []string
	if pa >= 0.01 {
		what = append(what, "peracetic acid "+fmtNum(pa, 2)+" mol/L")
	}
	if h2o2 >= 0.01 {
		what = append(what, "hydrogen peroxide "+fmtNum(h2o2, 2)+" mol/L")
	}
	return mk("hot-peroxide-concentrate", engine.Danger,
		"The mix heats concentrated peroxide ("+strings.Join(what, ", ")+" left after the reaction) to about "+fmtNum(o.Heat.ReachedC, 3)+" °C: above about 50 °C concentrated peracids and peroxides decompose faster as they warm, with oxygen and more heat, and the batch can run away, boil over or burst a closed tank.",
		"Do not combine as written: dilute the concentrate with water first (below about 15 % peracid or 30 % peroxide), then dose the other stream slowly with cooling, keeping the tank below about "+fmtNum(CoolPeroxideC, 2)+" °C; vent the tank.",
		"Bretherick's Handbook of Reactive Chemical Hazards, peroxyacetic acid and hydrogen peroxide (from memory); peracetic acid suppliers' SADT about 50–60 °C (from memory); thresholds 9 mol/L peroxide, 2 mol/L peracid, 50 °C and 40 °C: common practice, no source"), true
}

// Caro's acid thresholds (mol/L in the mix before reaction; common
// practice, no source): peroxide of about 5 % and sulfuric acid of about
// 40 % and more, where peroxymonosulfuric acid forms in a share that
// matters (the cleaning "piranha" mixes are 3–4 parts of 96 % acid to one
// of 30 % peroxide: about 2.4 mol/L peroxide in 13 mol/L acid).
const (
	CaroPeroxideMolar = 1.5
	CaroSulfuricMolar = 5.0
)

// caroAcid: concentrated peroxide with strong sulfuric acid forms
// peroxymonosulfuric (Caro's) acid, H2O2 + H2SO4 ⇌ H2SO5 + H2O, which
// fires organic matter (solvents, rags, gloves, residues) and gives off
// oxygen as it stands, faster warm: such mixes are kept open and free of
// organics (Bretherick's Handbook of Reactive Chemical Hazards, hydrogen
// peroxide with sulfuric acid, peroxomonosulfuric acid; from memory). The
// state holds its share back as within the table's uncertainty; the rule
// names it. With organic liquid in the mix it is a danger.
func caroAcid(o *Outcome) (engine.Hazard, bool) {
	h2o2 := o.MolarBefore("H2O2", "HO2-")
	acid := o.MolarBefore(sulfateForms...)
	if h2o2 < CaroPeroxideMolar || acid < CaroSulfuricMolar || o.PH >= 0.5 {
		return engine.Hazard{}, false
	}
	sev, act := engine.Warning, "Keep the mix in an open, vented vessel, never closed; keep solvents, oils, rags, gloves and other organic matter away; make only what is needed and let it cool before disposal."
	if org, _ := organicLiquid(o, true); org >= OrganicLiquidMolar {
		sev, act = engine.Danger, "Do not combine with organic matter: peroxymonosulfuric acid reacts violently, possibly explosively, with solvents and other organics."
	}
	return mk("caro-acid-forming", sev,
		"Peroxide ("+fmtNum(h2o2, 2)+" mol/L) with strong sulfuric acid ("+fmtNum(acid, 2)+" mol/L) forms peroxymonosulfuric (Caro's) acid: a strong oxidizer that fires organic matter and gives off oxygen as it stands, faster warm.",
		act,
		"Bretherick's Handbook of Reactive Chemical Hazards, hydrogen peroxide with sulfuric acid and peroxomonosulfuric acid (from memory); thresholds 1.5 mol/L peroxide and 5 mol/L sulfuric acid: common practice, no source"), true
}

// crossed reports whether a tank that started at the pH tankPH gives has
// passed through the silica gel range to reach ph.
func crossed(ph float64, tankPH func() float64) bool {
	if tankPH == nil {
		return false
	}
	t := tankPH()
	return (t <= SilicaGelLowPH && ph >= SilicaGelHighPH) || (t >= SilicaGelHighPH && ph <= SilicaGelLowPH)
}

// peroxideOnCopper: peroxide kept beside dissolved copper in acid (a
// sulfuric–peroxide etch or microetch after the copper is taken up). In
// acid copper(II) is a weak catalyst, so the peroxide is not lost at once
// (the lock peroxide-self-decomposition holds it below pH 4), but it is
// lost over hours, faster warm, as oxygen: the bath is vented and topped up,
// never closed (common practice in printed-circuit and metal-finishing
// etching, no source; Greenwood & Earnshaw, Chemistry of the Elements,
// hydrogen peroxide, catalysed decomposition, from memory). The oxygen
// figure is all the peroxide left, ½ O2 per H2O2.
func peroxideOnCopper(o *Outcome) (engine.Hazard, bool) {
	h2o2 := o.Molar("H2O2", "HO2-")
	cu := o.Molar("Cu^2+", "CuSO4", "CuOH+", "Cu2(OH)2^2+", "CuCl+", "CuCl2")
	if h2o2 < PeroxideOnCopperMolar || cu < TraceMolar || o.PH >= 4 || o.VolumeL <= 0 {
		return engine.Hazard{}, false
	}
	o2 := h2o2 * o.VolumeL / 2
	return mk("peroxide-slow-oxygen", engine.Warning,
		"The mix keeps "+fmtNum(h2o2, 2)+" mol/L hydrogen peroxide beside "+fmtNum(cu, 2)+" mol/L dissolved copper: in acid the copper breaks the peroxide down slowly, over hours (faster when warm), giving off oxygen, up to "+fmtNum(o2, 3)+" mol O2 ("+fmtNum(o2*24.47, 3)+" L at 25 °C) if all of it goes.",
		"Keep the tank vented, never closed; keep it below about 50 °C with cooling, add the copper in portions, and top the peroxide up as it is spent.",
		"Greenwood & Earnshaw, Chemistry of the Elements, hydrogen peroxide (catalysed decomposition), from memory; sulfuric–peroxide etches run vented at 30–50 °C: common practice, no source; 0.1 mol/L threshold: common practice, no source"), true
}

// PeroxideOnCopperMolar is the least peroxide (mol/L) left beside dissolved
// copper that peroxideOnCopper counts (about 0.3 %; common practice, no
// source).
const PeroxideOnCopperMolar = 0.1
