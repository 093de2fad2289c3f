package hazard

import (
	"math"
	"strconv"

	"mixward/engine"
)

// ChlorineHydrolysisK is the equilibrium constant of
// Cl2(aq) + H2O ⇌ HOCl + H+ + Cl- at 25 °C, in (mol/L)² (Connick and Chia,
// J. Am. Chem. Soc. 81, 1280 (1959), from memory; later work gives up to
// 5.1e-4, which lowers the chlorine estimated by a quarter).
const ChlorineHydrolysisK = 3.9e-4

// pool is what can become one gas: the amount (mol) of the gas and its
// dissolved forms, the share of the dissolved amount that is the neutral
// molecule, and where the amount comes from.
type pool struct {
	mol       float64
	molecular float64 // 0..1; 1 when the gas has no acid–base forms
	// beyond is the part of mol that a fast reaction gives off beyond what
	// the equilibrium state holds (aqua regia, whose activities the
	// state's Davies model cannot reach); when it exceeds the state's own
	// amount of the gas, the estimate is judged instead.
	beyond     float64
	outside    string  // the origin of the largest amount added beyond the state
	outsideMol float64 // and that amount
	origins    []string
	// equilibrium: the amount is the mixed state's own figure for the gas
	// at equilibrium (no reaction outside the state, no boil-off).
	equilibrium bool
	// dissolved is what stays dissolved of the gas in a liquid saturated
	// with it (the gas fills the headspace at the ambient pressure):
	// given with equilibrium pools only.
	dissolved float64
	// forerunner names what the gas is on its way to when the mixed state
	// takes the same atoms further (cyanogen chloride before cyanate):
	// its amount is a worst case, not a product beside the state's.
	forerunner string
	sources    []string
	// vapour: the headspace figure was read from the vapour table at the
	// liquid's strength (pct % w/w, tempC); lower: the liquid is stronger
	// than the table's last row, whose figure is a lower bound.
	vapour       bool
	pct, tempC   float64
	lower        bool
	vapourSource []string
}

// pools works out, for each gas of the table, what in the mix can become
// that gas.
func pools(o *Outcome, d *Data) map[string]*pool {
	ps := map[string]*pool{}
	for _, f := range d.order {
		g := d.Gases[f]
		p := &pool{molecular: 1}
		if len(g.Pool) > 0 {
			tot := o.Molar(g.Pool...)
			if tot > 0 && g.Dissolved != "" {
				p.mol = tot * o.VolumeL
				p.molecular = o.Molar(g.Dissolved) / tot
				p.origins = append(p.origins, "dissolved "+g.Formula+" and its acid–base forms")
			}
		}
		for _, a := range o.After {
			if a.Species.Formula == f && a.Species.Charge == 0 && a.Species.Phase == engine.Liquid && a.Mol > 0 {
				p.mol += a.Mol
				p.origins = append(p.origins, "liquid "+f+" formed")
			}
		}
		if n := o.GasMol(f); n > 0 {
			p.mol += n
			p.origins = append(p.origins, "formed by the reactions that run")
		}
		ps[f] = p
	}
	for _, add := range poolRules {
		add(o, ps)
	}
	return ps
}

// addTo adds an amount to a gas pool.
func addTo(ps map[string]*pool, gas string, mol, molecular float64, origin, source string) {
	p := ps[gas]
	if p == nil || !(mol > 0) || !finite(mol) {
		return
	}
	if p.mol == 0 {
		p.molecular = molecular
	} else {
		p.molecular = math.Max(p.molecular, molecular)
	}
	p.mol += mol
	p.origins = append(p.origins, origin)
	if source != "" {
		p.sources = append(p.sources, source)
	}
}

// poolRules add the gases that today's engine does not form by itself:
// each is a reaction known to run fast at plant temperature.
var poolRules = []func(o *Outcome, ps map[string]*pool){
	chlorineFromHypochlorite, aquaRegia, chlorateWithHydrochloric, bromateWithAcid,
	cyanogenChloride, hydrazoicFromHydrazine, borohydrideInAcid, dithioniteInAcid, alkaliMetalInWater,
	halideWithSulfuric, sulfideBeforeNitric, nitricWithOrganic, chlorateWithSulfuric,
	// organic families (organic.go)
	carbonMonoxideFromAcids,
}

// hypochloriteMolar is HOCl + OCl- after the reactions that run.
func hypochloriteMolar(o *Outcome) float64 { return o.Molar("HOCl", "OCl-") }

// chlorideMolar is the chloride of the mix. Hypochlorite bleach is made
// from chlorine and caustic and carries about one chloride per
// hypochlorite (common practice, no source): when a stream names
// hypochlorite and the mix lists less chloride, that much is assumed.
func chlorideMolar(o *Outcome) float64 {
	cl := o.Molar("Cl-")
	if o.Named("NaOCl", "Ca(OCl)2", "KOCl", "LiOCl") {
		cl = math.Max(cl, hypochloriteMolar(o))
	}
	return cl
}

func hPlus(o *Outcome) float64 { return math.Pow(10, -o.PH) }

// chlorineFromHypochlorite: HOCl + H+ + Cl- ⇌ Cl2(aq) + H2O. The chlorine
// share follows the pH, not a strong-acid rule: bleach with acetic or
// citric acid gives chlorine too.
func chlorineFromHypochlorite(o *Outcome, ps map[string]*pool) {
	ocl, cl := hypochloriteMolar(o), chlorideMolar(o)
	if ocl < TraceMolar || cl < TraceMolar {
		return
	}
	hocl := o.Molar("HOCl")
	cl2 := hocl * hPlus(o) * cl / ChlorineHydrolysisK
	molecular := math.Min(1, cl2/math.Min(ocl, cl))
	if !(molecular > 0) {
		return
	}
	addTo(ps, "Cl2", math.Min(ocl, cl)*o.VolumeL, molecular,
		"hypochlorite with chloride at pH "+strconv.FormatFloat(o.PH, 'f', 1, 64)+" (Cl2 ⇌ HOCl + H+ + Cl-)",
		"chlorine hydrolysis constant 3.9e-4 (mol/L)² at 25 °C, Connick and Chia 1959, from memory")
}

// aquaRegia: HNO3 + 3 HCl → NOCl + Cl2 + 2 H2O in concentrated acid. The
// mix gives both gases off for as long as it stands (it loses strength
// within hours), so the whole amount the smaller of nitrate and a third of
// the chloride allows is counted. The equilibrium state holds only traces:
// in acid this strong the activities of H+ and Cl- are many times their
// molalities (mean activity coefficient of HCl about 10 at 10 mol/kg, CRC
// Handbook, from memory), which the Davies model cannot reach.
func aquaRegia(o *Outcome, ps map[string]*pool) {
	no3, cl := o.Molar("NO3-"), o.Molar("Cl-")
	if no3 < 1 || cl < 3 || o.PH > 0 {
		return
	}
	const (
		origin = "concentrated nitric and hydrochloric acid (aqua regia: 3 HCl + HNO3 → NOCl + Cl2 + 2 H2O, given off as long as it stands)"
		src    = "aqua regia gives nitrosyl chloride and chlorine: Vogel's Textbook of Macro and Semimicro Qualitative Inorganic Analysis and Bretherick's Handbook of Reactive Chemical Hazards, from memory"
	)
	n := math.Min(no3, cl/3) * o.VolumeL
	addBeyond(ps, "Cl2", n, origin, src)
	addBeyond(ps, "NOCl", n, origin, src)
}

// halideWithSulfuric: concentrated sulfuric acid (molecular H2SO4, in the
// mix at 8 mol/L or more, as the halogen-fumes family judges it) oxidizes
// the hydrogen bromide and iodide it drives out of their salts:
// 2 HBr + H2SO4 → Br2 + SO2 + 2 H2O, and iodide further, to hydrogen
// sulfide (8 HI + H2SO4 → 4 I2 + H2S + 4 H2O, with sulfur and sulfur
// dioxide beside it). Dilute acid does neither. The equilibrium state
// cannot run it: with water at activity 1 and the aqueous ΔfG° of
// species.txt both changes are uphill (2 Br- + 2 H+ + H2SO4(l) → Br2(l) +
// SO2(g) + 2 H2O(l): ΔrG° about +124 kJ, NBS Tables 1982 values); what
// drives them is the acid's low water activity and the gases leaving, which
// the state's model does not hold. So the whole amount the halide allows is
// counted, beyond the state, as for aqua regia. Chloride gives hydrogen
// chloride only (no chlorine): the volatile-acid family says so.
func halideWithSulfuric(o *Outcome, ps map[string]*pool) {
	if sulfuric(o) < 8 {
		return
	}
	const src = "bromide and iodide with concentrated sulfuric acid: Vogel's Textbook of Macro and Semimicro Qualitative Inorganic Analysis, bromides and iodides, from memory; 8 mol/L threshold: common practice, no source"
	if br := o.MolarBefore("Br-", "HBr") * o.VolumeL; br >= TraceMolar*o.VolumeL {
		const origin = "bromide with concentrated sulfuric acid (2 HBr + H2SO4 → Br2 + SO2 + 2 H2O)"
		addBeyond(ps, "Br2", br/2, origin, src)
		addBeyond(ps, "SO2", br/2, origin, src)
	}
	if io := o.MolarBefore("I-", "HI") * o.VolumeL; io >= TraceMolar*o.VolumeL {
		addBeyond(ps, "H2S", io/8, "iodide with concentrated sulfuric acid (8 HI + H2SO4 → 4 I2 + H2S + 4 H2O; sulfur and sulfur dioxide beside it)", src)
	}
}

// nitricWithOrganic: nitric acid above about 2 mol/L takes organic matter
// (as ethanol equivalents: C2H5OH + 4 H+ + 4 NO3- → CH3COOH + 4 NO2 +
// 3 H2O) to nitrogen dioxide, one NO2 per electron, as far as the organic
// or the acid goes: the gas of the nitric-organic runaway (families.go).
func nitricWithOrganic(o *Outcome, ps map[string]*pool) {
	hno3, _, ok := nitricMeetsOrganic(o)
	if !ok {
		return
	}
	_, orgE := organicLiquid(o, true)
	// The one-carbon reagents with a reaction of their own go on to carbon
	// dioxide, one per formula unit, and give the nitrogen dioxide of
	// their own equation (six per methanol), as far as the acid goes; the
	// rest of the organic matter gives one NO2 per electron it counts for
	// (organicLiquid) with the acid left. When one of them is all the
	// organic matter, the gas's origin is its own equation.
	origin := "nitric acid oxidizing the organic matter (as ethanol: C2H5OH + 4 H+ + 4 NO3- → CH3COOH + 4 NO2 + 3 H2O)"
	acid := hno3 * o.VolumeL
	n, ownE := 0.0, 0.0
	for _, row := range nitricOwnRows {
		all := o.MolarBefore(row.species...)
		mol := math.Min(all*o.VolumeL, acid/row.electrons)
		if !(mol > 0) {
			continue
		}
		addBeyond(ps, "CO2", mol, "nitric acid taking "+row.species[0]+" to carbon dioxide ("+row.equation+")",
			"Bretherick's Handbook of Reactive Chemical Hazards, nitric acid with organic compounds (from memory)")
		acid -= mol * row.electrons
		n += mol * row.electrons
		ownE += all * o.VolumeL * ownBaseElectrons(row.species[0], row.electrons)
		if all*ownBaseElectrons(row.species[0], row.electrons) >= orgE*(1-1e-9) {
			origin = "nitric acid oxidizing " + row.species[0] + " (" + row.equation + ")"
		}
	}
	n += math.Min(math.Max(orgE*o.VolumeL-ownE, 0), math.Max(acid, 0))
	addBeyond(ps, "NO2", n, origin,
		"Bretherick's Handbook of Reactive Chemical Hazards, nitric acid with organic compounds (from memory); one NO2 per electron taken from the organic: common practice, no source")
}

// ownBaseElectrons is what organicLiquid counts for one formula unit of a
// reagent with a nitric-acid reaction of its own: its usual product's
// electrons (organicLiquids), or those of that reaction.
func ownBaseElectrons(formula string, own float64) float64 {
	if e, ok := organicLiquids[formula]; ok {
		return e
	}
	return own
}

// chlorateWithSulfuric: concentrated sulfuric acid turns chlorate into
// chloric acid, which breaks down to chlorine dioxide (3 HClO3 → 2 ClO2 +
// HClO4 + H2O): the gas of the clo2-release family (families.go).
func chlorateWithSulfuric(o *Outcome, ps map[string]*pool) {
	clo3, _, ok := chlorateMeetsSulfuric(o)
	if !ok {
		return
	}
	addBeyond(ps, "ClO2", clo3*2/3*o.VolumeL, "chlorate with concentrated sulfuric acid (3 HClO3 → 2 ClO2 + HClO4 + H2O)",
		"Bretherick's Handbook of Reactive Chemical Hazards, sodium chlorate: sulfuric acid (from memory)")
}

// addBeyond adds a gas that a fast reaction gives off beyond the
// equilibrium state (see pool.beyond), all of it as the molecule.
func addBeyond(ps map[string]*pool, gas string, mol float64, origin, source string) {
	p := ps[gas]
	if p == nil || !(mol > 0) || !finite(mol) {
		return
	}
	addTo(ps, gas, mol, 1, origin, source)
	p.beyond += mol
	if mol > p.outsideMol {
		p.outside, p.outsideMol = origin, mol
	}
}

// chlorateWithHydrochloric: 2 ClO3- + 4 H+ + 2 Cl- → 2 ClO2 + Cl2 + 2 H2O.
func chlorateWithHydrochloric(o *Outcome, ps map[string]*pool) {
	clo3, cl := o.Molar("ClO3-", "HClO3"), o.Molar("Cl-")
	if clo3 < TraceMolar || cl < TraceMolar || o.PH > 1 {
		return
	}
	// The acid is counted once: the mixed state has already spent what
	// went to chlorine (ClO3- + 6 H+ + 5 Cl- → 3 Cl2 + 3 H2O), so chlorine
	// dioxide comes only from the free acid left beside the chlorate and
	// chloride, two protons and one chloride per ClO2.
	n := min(clo3, cl, o.Molar("H+")/2) * o.VolumeL
	const src = "chlorate with hydrochloric acid gives chlorine dioxide (explosive above about 10 % in air): Bretherick's Handbook of Reactive Chemical Hazards, sodium chlorate, from memory"
	addTo(ps, "ClO2", n, 1, "chlorate with hydrochloric acid", src)
	addTo(ps, "Cl2", n/2, 1, "chlorate with hydrochloric acid", src)
}

// bromateWithAcid: BrO3- + 5 Br- + 6 H+ → 3 Br2 + 3 H2O; in strong
// hydrochloric acid bromate gives bromine and chlorine.
func bromateWithAcid(o *Outcome, ps map[string]*pool) {
	bro3, br, cl := o.Molar("BrO3-"), o.Molar("Br-"), o.Molar("Cl-")
	if bro3 < TraceMolar || o.PH > 3 {
		return
	}
	const src = "bromate with acid and bromide or chloride gives bromine: Bretherick's Handbook of Reactive Chemical Hazards, potassium bromate, from memory"
	if br >= TraceMolar {
		addTo(ps, "Br2", math.Min(3*bro3, 0.6*br)*o.VolumeL, 1, "bromate with bromide in acid", src)
	}
	if cl >= TraceMolar && o.PH <= 1 {
		addTo(ps, "Br2", bro3/2*o.VolumeL, 1, "bromate in hydrochloric acid", src)
	}
}

// cyanogenChloride: CN- + HOCl → CNCl + OH-; below pH 10 cyanogen chloride
// is not hydrolysed to cyanate fast enough and escapes. In acid (the mix
// as combined below pH 7) an answer from the equilibrium state counts it
// there: the cyanide-chlorination-acid lock of data/locks.txt stops
// cyanide at cyanogen chloride, so the same hypochlorite is never spent
// twice. Between pH 7 and 10 the state takes cyanide on to cyanate, carbon
// dioxide and nitrogen, and the cyanogen chloride counted here is their
// forerunner on the same path (CN- → CNCl → OCN- → CO2 + N2), not a second
// one: at most the cyanide the state oxidizes escapes as it.
func cyanogenChloride(o *Outcome, ps map[string]*pool) {
	cn, ocl := o.MolarBefore("CN-", "HCN"), o.MolarBefore("OCl-", "HOCl")
	if cn < TraceMolar || ocl < TraceMolar || o.PH >= 10 || o.fromState && o.PH < 7 {
		return
	}
	mol := math.Min(cn, ocl) * o.VolumeL
	if o.fromState {
		mol = math.Min(mol, cyanideOxidizedMol(o))
	}
	addTo(ps, "CNCl", mol, 1, "cyanide with hypochlorite below pH 10, on its way to cyanate",
		"alkaline chlorination of cyanide is run at pH 10 or above so that cyanogen chloride hydrolyses to cyanate: common practice, no source")
	if p := ps["CNCl"]; p != nil && o.fromState && p.mol > 0 {
		p.forerunner = "cyanate"
	}
}

// cyanideOxidizedMol is the carbon the mixed state takes from cyanide to
// cyanate and carbon dioxide (mol).
func cyanideOxidizedMol(o *Outcome) float64 {
	forms := []string{"OCN-", "HOCN", "HCO3-", "CO3^2-", "H2CO3"}
	return (o.Molar(forms...)-o.MolarBefore(forms...))*o.VolumeL + o.GasMol("CO2")
}

// borohydrideInAcid: BH4- + H+ + 3 H2O → B(OH)3 + 4 H2, fast below about
// pH 10; borohydride is kept in caustic above pH 12.
func borohydrideInAcid(o *Outcome, ps map[string]*pool) {
	bh4 := o.MolarBefore("BH4-")
	if bh4 < TraceMolar || o.PH >= 10 {
		return
	}
	addTo(ps, "H2", 4*bh4*o.VolumeL, 1, "borohydride below pH 10",
		"borohydride hydrolyses to hydrogen in acid and neutral water: Bretherick's Handbook of Reactive Chemical Hazards, sodium tetrahydroborate, from memory")
}

// dithioniteInAcid: 2 S2O4^2- + 4 H+ → 3 SO2 + S + 2 H2O.
func dithioniteInAcid(o *Outcome, ps map[string]*pool) {
	s2o4 := o.MolarBefore("S2O4^2-", "HS2O4-", "H2S2O4")
	if s2o4 < TraceMolar || o.PH >= 5 {
		return
	}
	addTo(ps, "SO2", 1.5*s2o4*o.VolumeL, 1, "dithionite in acid (sulfur dioxide and sulfur)",
		"dithionite decomposes in acid to sulfur dioxide and sulfur, with heat: Bretherick's Handbook of Reactive Chemical Hazards, sodium dithionite, from memory")
}

// alkaliMetalInWater: 2 M + 2 H2O → 2 MOH + H2.
func alkaliMetalInWater(o *Outcome, ps map[string]*pool) {
	if o.VolumeL <= 0 || o.GasMol("H2") > 0 {
		return
	}
	n := 0.0
	for _, a := range o.Before {
		if a.Species.Charge == 0 && a.Species.Phase == "s" && (a.Species.Formula == "Na" || a.Species.Formula == "K" || a.Species.Formula == "Li") {
			n += a.Mol
		}
	}
	addTo(ps, "H2", n/2, 1, "alkali metal with water",
		"alkali metals react with water to hydrogen, which the heat ignites: Bretherick's Handbook of Reactive Chemical Hazards, sodium, from memory")
}

// fastSulfideOxidizers are the oxidizing agents that take hydrogen sulfide
// as fast as acid frees it (hypochlorite, bromine, peroxide, permanganate,
// dichromate, iron(III)): with them no hydrogen sulfide is counted ahead of
// the oxidation.
var fastSulfideOxidizers = []string{"OCl-", "HOCl", "Cl2", "Br2", "HOBr", "OBr-", "H2O2", "HO2-", "MnO4-", "Cr2O7^2-", "HCrO4-", "CrO4^2-", "Fe^3+"}

// sulfideBeforeNitric: sulfide meeting nitric acid is acidified at once,
// while nitric acid takes hydrogen sulfide to sulfur (and nitric oxide)
// over minutes: the hydrogen sulfide the mix as combined gives off comes
// off first, though the mixed state holds none of it.
func sulfideBeforeNitric(o *Outcome, ps map[string]*pool) {
	if o.MolarBefore("NO3-", "HNO3") < TraceMolar || o.MolarBefore(fastSulfideOxidizers...) >= TraceMolar {
		return
	}
	var dissolved, molecular, gas float64
	for _, a := range o.Before {
		switch a.Species.Text() {
		case "H2S(g)":
			gas += a.Mol
		case "H2S", "H2S(aq)":
			molecular += a.Mol
			dissolved += a.Mol
		case "HS-", "S^2-":
			dissolved += a.Mol
		}
	}
	if gas+molecular < TraceMolar*o.VolumeL || o.Molar("H2S", "HS-", "S^2-") >= TraceMolar {
		return // no hydrogen sulfide as combined, or the mixed state has its own
	}
	share := 1.0
	if dissolved > 0 {
		share = math.Max(molecular/dissolved, 0)
	}
	addBeyond(ps, "H2S", gas+dissolved, "sulfide acidified by the nitric acid at once, before the slower oxidation to sulfur",
		"dilute nitric acid takes hydrogen sulfide to sulfur more slowly than acid frees it: Vogel's Textbook of Macro and Semimicro Qualitative Inorganic Analysis, sulfides with dilute nitric acid, from memory")
	ps["H2S"].molecular = math.Max(share, 1e-9)
}

// hydrazoicFromHydrazine: nitrous acid takes hydrazine to hydrazoic acid,
// N2H5+ + HNO2 → HN3 + H+ + 2 H2O, the way azide is made (Bretherick's
// Handbook of Reactive Chemical Hazards, hydrazine with nitrous acid, from
// memory). The equilibrium state goes on to nitrogen, which HN3 is far
// above in Gibbs energy; the fast step stops at HN3 in acid. Counted up to
// the smaller of hydrazine and nitrite when the mix is acid (below pH 7).
func hydrazoicFromHydrazine(o *Outcome, ps map[string]*pool) {
	hyd, nit := o.MolarBefore("N2H4", "N2H5+"), o.MolarBefore("NO2-", "HNO2")
	if hyd < TraceMolar || nit < TraceMolar || o.PH >= 7 {
		return
	}
	// Beyond the state, which takes it on to nitrogen; all as the
	// molecule (an upper bound between pH 4.65 and 7).
	addBeyond(ps, "HN3", math.Min(hyd, nit)*o.VolumeL, "hydrazine with nitrous acid (N2H5+ + HNO2 → HN3 + H+ + 2 H2O)",
		"Bretherick's Handbook of Reactive Chemical Hazards, hydrazine with nitrous acid (from memory)")
}
