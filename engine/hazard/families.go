package hazard

import (
	"math"
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
	chloroAmines, nitricOrganic, ammoniumNitrite, permanganateSulfuric, volatileAcid,
	solidHypochlorite, peracidOxidant, magnesiumWater, cyanideOxidation, nitricMetalFumes,
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
		t += a.Molar * float64(at["N"])
	}
	return t
}

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
	return mk("n-chloro-compounds", sev,
		"Hypochlorite chlorinates amines, amides and urea to N-chloro compounds ("+fmtNum(n, 2)+" mol/L can meet): toxic, irritant vapours, some unstable; with acid, urea goes on to explosive nitrogen trichloride.",
		"Do not combine. Keep chlorinated products and amine or urea products in separate lines, rinsed between uses.",
		"Bretherick's Handbook of Reactive Chemical Hazards, sodium hypochlorite with amines and urea (from memory); White's Handbook of Chlorination, organic chloramines (from memory); 0.01 mol/L danger threshold: common practice, no source"), true
}

// nitricOrganic: nitric acid of more than about 2 mol/L oxidizes organic
// matter with an induction period, then runs away with nitrogen dioxide.
func nitricOrganic(o *Outcome) (engine.Hazard, bool) {
	hno3 := o.MolarBefore("HNO3", "NO3-")
	c := organicC(o.Before)
	if hno3 < 2 || o.PH >= 1 || c < 0.01 {
		return engine.Hazard{}, false
	}
	sev := engine.Warning
	if hno3 >= 4 {
		sev = engine.Danger
	}
	return mk("nitric-organic-runaway", sev,
		"Nitric acid at "+fmtNum(hno3, 2)+" mol/L with organic matter ("+fmtNum(c, 2)+" mol/L of carbon) oxidizes it after a delay, then runs away with heat and brown nitrogen dioxide fumes; closed containers burst.",
		"Do not combine. Keep organic products, solvents and rags away from nitric acid; never put them in the same waste drum.",
		"Bretherick's Handbook of Reactive Chemical Hazards, nitric acid with organic compounds (from memory); 2 and 4 mol/L thresholds: common practice, no source"), true
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
	return mk("ammonium-nitrite-runaway", sev,
		"Ammonium with nitrite ("+fmtNum(n, 2)+" mol/L of each) decomposes to nitrogen and water, giving off up to "+fmtNum(kJ, 3)+" kJ; warm or acidic it speeds itself up and can run away with a surge of gas.",
		"Do not combine, or only dilute and cold with venting; never heat or acidify such a mix.",
		"Bretherick's Handbook of Reactive Chemical Hazards, ammonium nitrite (from memory); ΔH from NBS Tables 1982 ΔfH° of NH4+, NO2- and H2O(l); thresholds: common practice, no source"), true
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
	return o.MolarBefore("H2SO4", "HSO4-", "SO4^2-")
}

// volatileAcid: concentrated sulfuric acid takes up the water of the other
// stream and drives out hydrogen chloride, nitric acid vapour or hydrogen
// fluoride from their acids and salts.
func volatileAcid(o *Outcome) (engine.Hazard, bool) {
	h2so4 := sulfuric(o)
	if h2so4 < 8 {
		return engine.Hazard{}, false
	}
	var names []string
	n := 0.0
	for _, v := range []struct {
		name    string
		species []string
	}{
		{"hydrogen chloride", []string{"Cl-", "HCl"}},
		{"nitric acid vapour and nitrogen oxides", []string{"NO3-", "HNO3"}},
		{"hydrogen fluoride", []string{"F-", "HF"}},
	} {
		if m := o.MolarBefore(v.species...); m >= 0.1 {
			names, n = append(names, v.name), n+m
		}
	}
	if len(names) == 0 {
		return engine.Hazard{}, false
	}
	return mk("acid-fumes", engine.Danger,
		"Concentrated sulfuric acid ("+fmtNum(h2so4, 2)+" mol/L in the mix) drives "+strings.Join(names, " and ")+" out of the solution ("+fmtNum(n*o.VolumeL, 3)+" mol can come off) with heat: dense, corrosive fumes.",
		"Do not combine. If both must go to one drain, dilute each into plenty of water first, separately.",
		"Vogel's Textbook of Macro and Semimicro Qualitative Inorganic Analysis, chlorides and nitrates with concentrated sulfuric acid (from memory); NIOSH Pocket Guide, hydrogen chloride IDLH 50 ppm (from memory); 8 mol/L threshold: common practice, no source"), true
}

// solidHypochlorite: calcium hypochlorite and the chloroisocyanurates as
// solids heat up with a little water or organic matter and can ignite or
// give off chlorine; they go into plenty of water, never water onto them.
func solidHypochlorite(o *Outcome) (engine.Hazard, bool) {
	if !o.SolidStream("Ca(OCl)2", "C3Cl3N3O3", "NaC3Cl2N3O3") {
		return engine.Hazard{}, false
	}
	return mk("solid-oxidizer-heating", engine.Warning,
		"Solid calcium hypochlorite or chloroisocyanurate: a little water, acid or organic matter on the solid heats it and can set it alight or release chlorine.",
		"Add the solid a little at a time to plenty of water, never water onto the solid; use clean, dry scoops; keep acids, oils and other chlorinating products away.",
		"Bretherick's Handbook of Reactive Chemical Hazards, calcium hypochlorite (from memory); White's Handbook of Chlorination, handling of calcium hypochlorite (from memory)"), true
}

// peracidOxidant: peracids, like hydrogen peroxide, reduce hypochlorite and
// permanganate with a surge of oxygen and heat.
func peracidOxidant(o *Outcome) (engine.Hazard, bool) {
	pa := o.MolarBefore("CH3CO3H", "CH3CO3-")
	ox := math.Max(hypochloriteAny(o), o.MolarBefore("MnO4-"))
	n := math.Min(pa, ox)
	if n < 1e-3 {
		return engine.Hazard{}, false
	}
	mol := n * o.VolumeL
	l := mol * litreBarPerMolK() * o.TemperatureK() / (o.PressureKPa / 100)
	return mk("oxygen-surge", engine.Warning,
		"Peracetic acid with hypochlorite or permanganate gives off oxygen quickly ("+fmtNum(mol, 3)+" mol, "+fmtNum(l, 3)+" L), with heat.",
		"Do not combine in a closed vessel; keep the two sanitisers in separate lines, rinsed between uses.",
		"Bretherick's Handbook of Reactive Chemical Hazards, peroxyacetic acid (from memory)"), true
}

// magnesiumWater: magnesium corrodes in water and neutral salt solutions
// with a slow, steady release of hydrogen (faster warm or with chloride).
func magnesiumWater(o *Outcome) (engine.Hazard, bool) {
	if o.VolumeL <= 0 || o.PH < 4 || o.GasMol("H2") > 0 || o.Measured["H2"].Mol > 0 {
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

// cyanideOxidation: cyanide destruction by hypochlorite or peroxide is a
// routine treatment step only under control: pH kept at 10.5 or more, dosing
// slow, the tank vented (excess peroxide gives off oxygen, a falling pH gives
// off hydrogen cyanide or cyanogen chloride).
func cyanideOxidation(o *Outcome) (engine.Hazard, bool) {
	cn := o.MolarBefore("CN-", "HCN")
	ox := math.Max(hypochloriteAny(o), o.MolarBefore("H2O2", "HO2-", "S2O8^2-", "HSO5-", "SO5^2-", "O3", "MnO4-"))
	if cn < TraceMolar || ox < TraceMolar {
		return engine.Hazard{}, false
	}
	return mk("cyanide-oxidation", engine.Warning,
		"This is a cyanide oxidation ("+fmtNum(cn, 2)+" mol/L cyanide): it is safe only as a controlled treatment step.",
		"Hold the pH at 10.5 or more before and during dosing, dose the oxidant slowly with ORP control and stirring, vent the tank and check for hydrogen cyanide.",
		"alkaline cyanide treatment, pH 10.5 and ORP control: common practice, no source"), true
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
