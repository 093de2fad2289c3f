package engine

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"mixward/engine/chem"
	"mixward/engine/explain"
	"mixward/engine/state"
	"mixward/engine/thermo"
)

// gasesOut lists what leaves the liquid: the gas phase of the mix at
// equilibrium, and toxic gases that stay dissolved but fill the headspace
// of headspaceL litres (the stated one, else as large as the liquid) above
// 1 ppm.
func gasesOut(mx *state.Mix, formed func(*thermo.Species) bool, kPa, headspaceL float64) []GasRelease {
	if !(headspaceL > 0) {
		headspaceL = mx.VolumeL
	}
	out := []GasRelease{}
	f := mx.Final
	for i, sp := range mx.Species {
		if sp.Phase != Gas {
			continue
		}
		p := partialOf(mx, f, i) // bar
		if !(p > 0) {            // absent, or never formable (NaN)
			continue
		}
		g := GasReleaseOf(sp.Species.Text(), f.Amount[i], mx.TempK, kPa)
		g.Kind = "volatile"
		if formed(sp) {
			g.Kind = "formed"
		}
		g.PartialKPa = sigDigits(p*100, 4)
		g.HeadspacePPM = sigDigits(p/(kPa/100)*1e6, 4)
		if g.HeadspacePPM < 1 && f.Amount[i] < 1e-6*mx.VolumeL {
			continue // a trace: below 1 ppm in the headspace and 1 µmol per litre
		}
		if f.Amount[i] > 0 && f.Eq.GasMoles > 0 && f.Eq.GasMoles*MolarGasConstant()/100*mx.TempK/mx.Pressure < headspaceL {
			// A bubble that does not fill the headspace: the state holds
			// the gas phase at the ambient pressure, over a liquid
			// saturated at it, but the closed headspace is air and takes
			// more out of the liquid until the gas's partial pressure
			// there and in the liquid agree (see bubbleSplit).
			if gas, liquid, pSplit, ok := bubbleSplit(mx, f, i, p, headspaceL); ok {
				g.Mol, g.LiquidMol = gas, sigDigits(liquid, 6)
				g.PartialKPa = sigDigits(pSplit*100, 4)
				g.HeadspacePPM = sigDigits(pSplit/(kPa/100)*1e6, 4)
				g.VolumeL = GasVolumeL(g.Mol, mx.TempK, kPa)
				g.VolumeM3 = g.VolumeL / 1000
			}
		}
		if f.Amount[i] <= 0 {
			// Dissolved: what the closed headspace holds, taken out of
			// the liquid (see headspaceSplit).
			g.Kind = "headspace"
			gas, liquid, pSplit := headspaceSplit(mx, f, i, p, headspaceL)
			g.Mol, g.LiquidMol = gas, sigDigits(liquid, 6)
			g.PartialKPa = sigDigits(pSplit*100, 4)
			g.HeadspacePPM = sigDigits(pSplit/(kPa/100)*1e6, 4)
			g.VolumeL = GasVolumeL(g.Mol, mx.TempK, kPa)
			g.VolumeM3 = g.VolumeL / 1000
		}
		g.Mol, g.VolumeL, g.VolumeM3 = sigDigits(g.Mol, 6), sigDigits(g.VolumeL, 6), sigDigits(g.VolumeM3, 6)
		out = append(out, g)
	}
	return out
}

// headspaceSplit shares a dissolved gas between the liquid and a closed
// headspace of headspaceL litres so that the amount is conserved. The
// equilibrium state holds all of it in the liquid at partial pressure p
// (bar): the neutral molecule (the same formula in solution or with water:
// H2CO3, H2SO3), and for chlorine and bromine also the hypohalous acid with
// its halide (X2 + H2O ⇌ HOX + H+ + X-, fast), together N mol. Their
// solubility is kH = (N/VL)/p, and closed they part as
//
//	N = p'·(VL·kH + VG/(R·T))
//
// (Henry's law and the ideal gas; for CO2 kH is Sander 2015's 0.034
// mol/(L·atm), from memory). It returns the mol in the headspace, the mol
// left in the liquid and p' in bar. The acid–base forms (HCO3-, HS-, NH4+)
// are left where they are: they give up the molecule only with acid or base
// the mix has already spent. With nothing dissolved found, the state's own
// pressure fills the headspace, as before.
func headspaceSplit(mx *state.Mix, f *state.State, i int, p, headspaceL float64) (gas, liquid, pBar float64) {
	rt := MolarGasConstant() / 100 * mx.TempK // L·bar/mol
	n := dissolvedPool(mx, f, i)
	if r := neatPool(mx, f, i); r > 0 && p > 0 {
		// A pool of the neat liquid (bromine) keeps the headspace at its
		// vapour pressure as long as it lasts.
		if full := p * headspaceL / rt; full <= r+n {
			return full, r + n - full, p
		}
		n += r
	}
	if !(n > 0) || !(mx.VolumeL > 0) || !(p > 0) {
		return p * headspaceL / rt, 0, p
	}
	kH := n / mx.VolumeL / p
	pBar = n / (mx.VolumeL*kH + headspaceL/rt)
	gas = pBar * headspaceL / rt
	return gas, n - gas, pBar
}

// bubbleSplit shares a gas the state gives off as a bubble at the ambient
// pressure (partial pressure p, bar) between the liquid and a closed
// headspace of headspaceL litres of air that the bubble does not fill.
// The state keeps the liquid saturated at p; the headspace instead holds
// the gas at its own partial pressure p' < p, and the liquid gives up its
// dissolved molecule until both agree. With N the bubble and the
// dissolved molecule together and kH = dissolved/(VL·p) (the state's own
// solubility),
//
//	N = p'·(VL·kH + VG/(R·T))
//
// (Henry's law and the ideal gas, as headspaceSplit). Sodium bicarbonate
// with a little acetic acid keeps most of its carbon dioxide dissolved as
// H2CO3 at 1 atm, yet into a headspace as large as the liquid about half
// of it comes off (kH(CO2) 0.034 mol/(L·atm), Sander 2015, from memory).
// It reports false when the liquid holds none of the gas dissolved.
func bubbleSplit(mx *state.Mix, f *state.State, i int, p, headspaceL float64) (gas, liquid, pBar float64, ok bool) {
	diss := dissolvedPool(mx, f, i)
	if !(diss > 0) || !(p > 0) || !(mx.VolumeL > 0) || !(headspaceL > 0) {
		return 0, 0, 0, false
	}
	rt := MolarGasConstant() / 100 * mx.TempK // L·bar/mol
	n := f.Amount[i] + diss
	kH := diss / mx.VolumeL / p
	pBar = n / (mx.VolumeL*kH + headspaceL/rt)
	gas = pBar * headspaceL / rt
	return gas, n - gas, pBar, true
}

// dissolvedPool is the mol the liquid holds of gas species i (see
// headspaceSplit): the neutral molecule, and for a halogen X2 the smaller
// of its hypohalous acid (HOX + OX-) and its halide.
func dissolvedPool(mx *state.Mix, f *state.State, i int) float64 {
	ga := mx.Species[i].Atoms
	n, hox, halide := 0.0, 0.0, 0.0
	x, halogen := halogenOf(ga)
	for j, sp := range mx.Species {
		if sp.Phase != Aqueous || j == i {
			continue
		}
		switch {
		case onlyHO(ga) && sp.Charge == 0 && sp.Atoms["O"] == ga["O"] && sp.Atoms["H"] == ga["H"]:
			n += f.Amount[j] // O2, H2: the dissolved molecule alone
		case !onlyHO(ga) && sp.Charge == 0 && sameWithWater(ga, sp.Atoms):
			n += f.Amount[j]
		case halogen && sp.Atoms[x] == 1 && sp.Atoms["O"] == 1 && len(sp.Atoms) <= 3:
			hox += f.Amount[j] // HOCl, OCl-
		case halogen && sp.Atoms[x] == 1 && len(sp.Atoms) == 1 && sp.Charge == -1:
			halide += f.Amount[j]
		}
	}
	return n + math.Min(hox, halide)
}

// neatPool is the mol of gas species i present as its own neat liquid
// (Br2(l) under a bromine solution).
func neatPool(mx *state.Mix, f *state.State, i int) float64 {
	ga := mx.Species[i].Atoms
	r := 0.0
	for j, sp := range mx.Species {
		if sp.Phase != Liquid || j == i || len(sp.Atoms) != len(ga) {
			continue
		}
		same := true
		for el, k := range ga {
			same = same && sp.Atoms[el] == k
		}
		if same && sp.Charge == 0 {
			r += f.Amount[j]
		}
	}
	return r
}

// halogenOf reports the element of a diatomic chlorine or bromine molecule.
func halogenOf(a chem.Atoms) (string, bool) {
	for _, x := range []string{"Cl", "Br"} {
		if a[x] == 2 && len(a) == 1 {
			return x, true
		}
	}
	return "", false
}

// onlyHO reports whether a formula holds nothing but hydrogen and oxygen.
func onlyHO(a chem.Atoms) bool {
	for el := range a {
		if el != "H" && el != "O" {
			return false
		}
	}
	return true
}

// sameWithWater reports whether b is a with whole waters added (CO2 and
// H2CO3, SO2 and H2SO3, NH3 and NH3).
func sameWithWater(a, b chem.Atoms) bool {
	w := b["O"] - a["O"]
	if w < 0 || b["H"]-a["H"] != 2*w {
		return false
	}
	for el, k := range b {
		if el != "H" && el != "O" && a[el] != k {
			return false
		}
	}
	for el, k := range a {
		if el != "H" && el != "O" && b[el] != k {
			return false
		}
	}
	return true
}

// partialOf is a gas's partial pressure in bar at equilibrium: its share of
// the gas phase when one forms, else its equilibrium partial pressure.
func partialOf(mx *state.Mix, s *state.State, i int) float64 {
	if s.Eq.GasMoles > 0 && s.Amount[i] > 0 {
		return s.Amount[i] / s.Eq.GasMoles * mx.Pressure
	}
	return math.Exp(s.LnA[i])
}

// heatOut is ΔH from the streams' states to the mix at equilibrium, from ΔfH°
// of every species that changed, plus the heat of dissolving solids and
// near-pure reagents and the heat of concentrated solutions (dilution.txt);
// the temperature reached over the mixed mass, and boiling when it passes
// the boiling point. A species without ΔfH° that is made or used up on the
// whole (its skeleton, see unknownNetChange) is counted as its nearest form
// with ΔfH° plus hydroxide and water (see formEstimate); what that leaves
// out is bounded (LeftOutBoundkJ) and the species named (Missing). When no
// such form exists the sum would mislead, even in sign, and no figure is
// given.
func heatOut(mx *state.Mix, m *mixture, t *Tables) *Heat {
	dfh := enthalpies(mx)
	big := 0.0
	for i := range mx.Species {
		big = math.Max(big, math.Abs(mx.Final.Amount[i]-mx.Initial[i]))
	}
	// A change below a trace of the mix (missingFloor mol per litre) never
	// withholds the figure: when nothing else happens, a trace of a complex
	// is still most of the "largest change".
	floor := missingFloor * mx.VolumeL
	var missing []string
	for i, sp := range mx.Species {
		if d := math.Abs(mx.Final.Amount[i] - mx.Initial[i]); math.IsNaN(dfh[i]) && d > 1e-3*big && d > floor {
			missing = append(missing, sp.Species.Text())
		}
	}
	h := &Heat{Assumption: heatAssumption, Missing: missing}
	bound, standInKJ, standIn := estimateLeftOut(mx, dfh, math.Max(missingShare*big, floor))
	if bound > 0 {
		h.LeftOutBoundkJ = ptr(roundDec(bound, 0))
	}
	dh := 0.0
	for i := range mx.Species {
		if d := mx.Final.Amount[i] - mx.Initial[i]; !math.IsNaN(dfh[i]) {
			dh += d * dfh[i]
		}
	}
	if why := tooLittleWater(mx, m, t); why != "" {
		// The heat of dissolving has no figure, but a reaction whose own
		// heat would take the whole mass past boiling (borohydride in a
		// little acid) is not left without one: that much is certain
		// whatever the solids' heats of solution add.
		if len(standIn) == 0 && len(missing) == 0 && m.massKg > 0 {
			cp := heatCapacityOf(m.massKg, m.solutes, t)
			if boil := m.massKg * cp * (boilingPointC(m.pressureKPa) - (mx.TempK - 273.15)); -dh > boil && boil > 0 {
				why += fmt.Sprintf("; the reaction alone releases about %.0f kJ, enough to boil the mix", roundSig(-dh, 2))
			}
		}
		h.Withheld = why
		return h
	}
	released := -dh
	if len(standIn) > 0 {
		if standInKJ > 0.5*math.Abs(released) {
			// The stand-in could change the figure's sign or size
			// wholesale: no figure rather than a misleading one.
			h.LeftOutBoundkJ = nil
			return h
		}
		h.GibbsStandIn = standIn
		h.Assumption += "; no ΔfH° for " + strings.Join(standIn, ", ") + ": counted at its ΔfG° (its entropy of formation, within about " +
			strconv.Itoa(int(gibbsStandInKJ)) + " kJ/mol, not counted)"
	}
	q, leftOut := m.solutionHeat(t)
	if q != 0 {
		h.DissolutionkJ = q
		released += q
	}
	if len(leftOut) > 0 {
		h.NotDissolvedCounted = m.ionicOnly(leftOut)
		h.Assumption += "; no heat of dissolving counted for " + strings.Join(leftOut, ", ") + " (no formation enthalpy of the solid on record)"
	}
	if q := dilutionHeat(mx, m.solutes, t); q != 0 {
		h.DilutionkJ = roundDec(q, 1)
		h.DissolutionkJ += q
		released += q
	}
	h.DissolutionkJ = roundDec(h.DissolutionkJ, 1)
	h.HeatReleasedkJ = ptr(roundDec(released, 1))
	if m.massKg > 0 {
		cp := heatCapacityOf(m.massKg, m.solutes, t)
		rise := released / (m.massKg * cp)
		boilC := boilingPointC(m.pressureKPa)
		startC := mx.TempK - 273.15
		if startC+rise > boilC {
			h.Boils = true
			excess := released - m.massKg*cp*(boilC-startC)
			h.WaterFlashedKg = ptr(roundDec(math.Max(excess, 0)/vaporisationKJPerKg, 2))
			rise = boilC - startC
		}
		h.TemperatureRiseC = ptr(roundDec(rise, 2))
		h.TemperatureReachedC = ptr(roundDec(startC+rise, 1))
	}
	return h
}

// missingShare: when species without ΔfH° are made or used up, net, by
// more than this share of the largest change, the heat has no figure.
const missingShare = 0.01

// missingFloor (mol/L) is a trace: a species without ΔfH° changed by less
// withholds nothing (its heat is below a joule per litre at 10 kJ/mol).
const missingFloor = 1e-4

// leftOutFloorKJ is the least bound per mole put on the heat an estimated
// species leaves out: heats of forming a hydroxo complex from the ion and
// hydroxide, or of dissolving a hydroxide in caustic, are tens of kJ/mol
// (Baes & Mesmer, The Hydrolysis of Cations, 1976, hydrolysis enthalpies;
// from memory).
const leftOutFloorKJ = 60.0

// estimateLeftOut fills dfh for each species without ΔfH° whose skeleton
// changes, net, by more than limit (mol), from formEstimate, and returns
// the bound (kJ) on what the estimates leave out: per mole the larger of
// leftOutFloorKJ and the Gibbs energy of forming the species from that
// form, whose enthalpy is the part not counted. A species with no such
// form (an organic anion an oxidation makes: glycolate from glycerol) is
// counted at its ΔfG° and named in standIn, with gibbsStandInKJ per mole
// in the bound: its entropy of formation is what that leaves out.
func estimateLeftOut(mx *state.Mix, dfh []float64, limit float64) (boundKJ, standInKJ float64, standIn []string) {
	net := skeletonChanges(mx, dfh)
	for i, sp := range mx.Species {
		d := math.Abs(mx.Final.Amount[i] - mx.Initial[i])
		if !math.IsNaN(dfh[i]) || math.Abs(net[skeletonOf(sp)]) <= limit || d <= 1e-3*limit {
			continue // a species of the skeleton that hardly changes adds nothing
		}
		est, dG, found := formEstimate(mx, sp)
		if !found {
			dfh[i] = sp.DfG
			standInKJ += d * gibbsStandInKJ
			standIn = append(standIn, sp.Text)
			continue
		}
		dfh[i] = est
		boundKJ += d * math.Max(leftOutFloorKJ, math.Abs(dG))
	}
	return boundKJ + standInKJ, standInKJ, standIn
}

// gibbsStandInKJ bounds, per mole, the error of counting a species at its
// ΔfG° for want of ΔfH°: T·ΔfS° of small organic and oxo anions formed from
// the elements is mostly within 150 kJ/mol at 298 K (S° of the elements
// and of such ions, NBS Tables 1982, from memory).
const gibbsStandInKJ = 150.0

// formEstimate is ΔfH° of sp taken as a form of the same element in the
// same oxidation state that has ΔfH° (an ion, or a hydroxide, oxide or
// cyanide solid), plus hydroxide, water and, for a cyanide complex, free
// cyanide: zincate Zn(OH)4^2- as Zn(OH)2(s) + 2 OH-, stannate Sn(OH)6^2-
// as SnO2(s) + 2 OH- + 2 H2O, Cu(CN)3^2- as CuCN(s) + 2 CN-. Of the forms
// that fit, the one closest in Gibbs energy is taken; dG is the Gibbs
// energy of forming sp from it, kJ/mol. A protonated form is taken as its
// conjugate base plus H+ (oxalic acid as HC2O4- + H+).
func formEstimate(mx *state.Mix, sp *thermo.Species) (est, dG float64, ok bool) {
	el := metalOf(sp)
	oh, water, cn := speciesByText(mx, "OH-"), speciesByText(mx, "H2O"), speciesByText(mx, "CN-")
	if el == "" || oh == nil || water == nil || !oh.HasDfH || !water.HasDfH {
		return 0, 0, false
	}
	best := math.Inf(1)
	for _, b := range mx.Species {
		if b == sp || !b.HasDfH || b.Minor || b.Atoms[el] == 0 || metalOf(b) != el || math.Abs(b.Ox[el]-sp.Ox[el]) > 0.01 || (b.Phase != Aqueous && b.Phase != Solid) {
			continue
		}
		x := float64(sp.Atoms[el]) / float64(b.Atoms[el])
		k := float64(sp.Atoms["C"]) - x*float64(b.Atoms["C"]) // free cyanide taken up
		if k < -1e-9 || (k > 1e-9 && (cn == nil || !cn.HasDfH)) {
			continue
		}
		hl := float64(sp.Atoms["H"]) - x*float64(b.Atoms["H"])
		o := float64(sp.Atoms["O"]) - x*float64(b.Atoms["O"])
		z := float64(sp.Charge) - x*float64(b.Charge) + k
		nOH, nW := -z, o+z // a OH- + b H2O: O a+b, H a+2b, charge -a
		if math.Abs(hl-(nOH+2*nW)) > 1e-9 {
			continue // oxygen not all at −II, or not a hydroxo form
		}
		g := sp.DfG - (x*b.DfG + nOH*oh.DfG + nW*water.DfG)
		h := x*b.DfH + nOH*oh.DfH + nW*water.DfH
		if nOH < 0 {
			// A protonated form: H+ (zero by convention) rather than
			// water less hydroxide, which would count a neutralisation.
			nH := -nOH
			g = sp.DfG - x*b.DfG - (nW-nH)*water.DfG
			h = x*b.DfH + (nW-nH)*water.DfH
		}
		if k > 1e-9 {
			g -= k * cn.DfG
			h += k * cn.DfH
		}
		if math.Abs(g) < math.Abs(best) {
			best, est = g, h
		}
	}
	if math.IsInf(best, 1) {
		return 0, 0, false
	}
	return est, best, true
}

// metalOf is the one element of sp other than H and O, or for a cyanide
// complex (as many C as N) the one element other than H, O, C and N; ""
// when there is none or more than one.
func metalOf(sp *thermo.Species) string {
	cyanide := sp.Atoms["C"] > 0 && sp.Atoms["C"] == sp.Atoms["N"]
	el := ""
	for e := range sp.Atoms {
		if e == "H" || e == "O" || (cyanide && (e == "C" || e == "N")) {
			continue
		}
		if el != "" {
			return ""
		}
		el = e
	}
	return el
}

func speciesByText(mx *state.Mix, text string) *thermo.Species {
	for _, sp := range mx.Species {
		if sp.Text == text {
			return sp
		}
	}
	return nil
}

// skeletonOf is a species' atoms other than H and O.
func skeletonOf(sp *thermo.Species) string {
	skel := chem.Atoms{}
	for el, n := range sp.Atoms {
		if el != "H" && el != "O" {
			skel[el] = n
		}
	}
	return skel.String()
}

// skeletonChanges is the net change (mol) of each skeleton among species
// without ΔfH°.
func skeletonChanges(mx *state.Mix, dfh []float64) map[string]float64 {
	net := map[string]float64{}
	for i, sp := range mx.Species {
		if math.IsNaN(dfh[i]) {
			net[skeletonOf(sp)] += mx.Final.Amount[i] - mx.Initial[i]
		}
	}
	return net
}

// unknownNetChange is the largest net change (mol) among species without
// ΔfH° that share a skeleton (their atoms other than H and O). Acid–base
// forms of one organic ion only trade protons among themselves (net zero,
// a small heat); a skeleton made or used up on the whole, such as Cr(III)
// formed from Cr(VI), would leave a sum that misleads even in sign.
func unknownNetChange(mx *state.Mix, dfh []float64) float64 {
	worst := 0.0
	for _, d := range skeletonChanges(mx, dfh) {
		worst = math.Max(worst, math.Abs(d))
	}
	return worst
}

// enthalpies is ΔfH° of each species of the mix: its own; for a molecule
// without one, that of the same compound in another phase; or for a minor
// species without one (a complex, an ion pair, a hydrolysis form) the sum over the
// main species of the same oxidation states it is made of, as if forming it
// from them took no heat (complexation enthalpies are tens of kJ/mol at
// most); NaN when neither is known.
func enthalpies(mx *state.Mix) []float64 {
	out := make([]float64, len(mx.Species))
	var water, proton *thermo.Species
	for _, sp := range mx.Species {
		switch sp.Text {
		case "H2O":
			water = sp
		case "H+":
			proton = sp
		}
	}
	byFormula := map[string]*thermo.Species{}
	for _, sp := range mx.Species {
		if sp.HasDfH && sp.Charge == 0 {
			byFormula[sp.Formula] = sp
		}
	}
	for i, sp := range mx.Species {
		other, samePhaseless := byFormula[sp.Formula]
		switch {
		case sp.HasDfH:
			out[i] = sp.DfH
		case samePhaseless && sp.Charge == 0:
			// The same compound in another phase: its heat of solution
			// (tens of kJ/mol at most) is left out.
			out[i] = other.DfH
		case water == nil || proton == nil || !sp.Minor:
			// Only complexes, ion pairs and hydrolysis forms (minor
			// species) are estimated from their main species.
			out[i] = math.NaN()
		default:
			out[i] = estimateDfH(mx, sp, water, proton)
		}
	}
	return out
}

func estimateDfH(mx *state.Mix, sp, water, proton *thermo.Species) float64 {
	h, o, z := float64(sp.Atoms["H"]), float64(sp.Atoms["O"]), float64(sp.Charge)
	sum := 0.0
	for el, n := range sp.Atoms {
		if el == "H" || el == "O" {
			continue
		}
		b := basisSpecies(mx, el, sp.Ox[el], sp.Atoms["H"])
		if b == nil {
			return math.NaN()
		}
		x := float64(n) / float64(b.Atoms[el])
		sum += x * b.DfH
		h -= x * float64(b.Atoms["H"])
		o -= x * float64(b.Atoms["O"])
		z -= x * float64(b.Charge)
	}
	// The rest is water and H+: o H2O, then H+ for the hydrogen left.
	hPlus := h - 2*o
	if math.Abs(z-hPlus) > 1e-9 {
		return math.NaN() // oxygen not all at −II (a peroxo species): no estimate
	}
	return sum + o*water.DfH + hPlus*proton.DfH
}

// basisSpecies is the main species with ΔfH° that holds el in state ox and
// nothing else but H and O (Fe^3+ for iron(III), SO4^2- for sulfur(VI)).
func basisSpecies(mx *state.Mix, el string, ox float64, maxH int) *thermo.Species {
	var best *thermo.Species
	for _, sp := range mx.Species {
		if !sp.HasDfH || sp.Minor || sp.Atoms[el] == 0 || math.Abs(sp.Ox[el]-ox) > 0.01 || len(sp.Atoms) > 3 {
			continue
		}
		only := true
		for e := range sp.Atoms {
			if e != el && e != "H" && e != "O" {
				only = false
			}
		}
		if only && sp.Phase == Aqueous && betterBasis(sp, best, maxH) {
			best = sp
		}
	}
	return best
}

// betterBasis reports whether sp is a better main species than best for a
// complex holding maxH hydrogens: the most protonated form that does not
// hold more hydrogen than the complex (NaSO4- is Na+ + SO4^2-, not
// Na+ + HSO4- less H+, which would count the heat of taking a proton off
// HSO4-, about 22 kJ/mol, as the heat of forming the ion pair), ties broken
// by formula so that the choice does not depend on the species order.
func betterBasis(sp, best *thermo.Species, maxH int) bool {
	if best == nil {
		return true
	}
	h, bh := sp.Atoms["H"], best.Atoms["H"]
	switch {
	case (h <= maxH) != (bh <= maxH):
		return h <= maxH
	case h != bh && h <= maxH:
		return h > bh
	case h != bh:
		return h < bh
	}
	return sp.Atoms.String() < best.Atoms.String()
}

// heatAssumption is stated with every heat estimate.
const heatAssumption = "ΔH from ΔfH° (data/species.txt) of every species that changes between the streams and the mixed state, at infinite dilution (complexes and ion pairs without a value counted as their main species), plus the heat of dissolving solids and near-pure reagents and, for concentrated acids and bases, their heat of dilution from each stream's strength to the mix's (data/dilution.txt; several such solutes in one mix counted at their common water ratio); adiabatic, over the mixed mass with the heat capacity of water (4.18 J/(g·K)), less for the mass of concentrated acids and bases (data/dilution.txt)"

// heatCapacity is kJ/(kg·K) of water at 25 °C (CRC Handbook, Properties of
// water; from memory), used for the whole mix.
const heatCapacity = 4.18

// vaporisationKJPerKg is the enthalpy of vaporisation of water at 100 °C,
// 40.65 kJ/mol = 2257 kJ/kg (CRC Handbook, Enthalpy of vaporization; from memory).
const vaporisationKJPerKg = 2257

// boilingPointC is water's boiling point at a pressure, by Clausius–Clapeyron
// from 100 °C at 101.325 kPa with ΔvapH 40.65 kJ/mol.
func boilingPointC(kPa float64) float64 {
	const tb, dH = 373.15, 40650.0
	inv := 1/tb - MolarGasConstant()*math.Log(kPa/101.325)/dH
	return 1/inv - 273.15
}

// formedBy reports whether a species holds an element in a state that a
// redox step produced.
func formedBy(steps []explain.Step) func(*thermo.Species) bool {
	type key struct {
		el string
		ox float64
	}
	made := map[key]bool{}
	for _, st := range steps {
		for _, c := range []explain.Couple{st.Oxidizer, st.Reducer} {
			made[key{c.Element, c.To}] = true
		}
	}
	return func(sp *thermo.Species) bool {
		for el := range sp.Atoms {
			if made[key{el, math.Round(sp.Ox[el]*100) / 100}] {
				return true
			}
		}
		return false
	}
}

// minWaterPerSolid is the least water, mol per mol of solid dissolved, for
// which the heat of solution at infinite dilution is used: about 6 mol/kg,
// near saturation for most salts. Beyond it (a kilogram of permanganate in a
// litre of 98 % sulfuric acid) the solids do not dissolve as written and the
// figure would mislead, even in sign.
const minWaterPerSolid = 9

// tooLittleWater says why the heat of dissolving the mix's solids cannot be
// estimated, or "" when it can. Solids with their own heats of concentrated
// solution (data/dilution.txt: sodium and potassium hydroxide) are exempt, and
// so are near-pure liquids: they mix with water in any ratio (ethanol,
// glycols, peroxide), so no saturation limits them.
func tooLittleWater(mx *state.Mix, m *mixture, t *Tables) string {
	solids := 0.0
	for _, d := range m.dissolved {
		if d.phase == Liquid || t.Dilution != nil && len(t.Dilution.Points[d.chem.Formula]) > 0 {
			continue
		}
		solids += d.mol
	}
	if solids <= 0 {
		return ""
	}
	water := 0.0
	for i, sp := range mx.Species {
		if sp.Text == "H2O" {
			water += mx.Final.Amount[i]
		}
	}
	if water >= minWaterPerSolid*solids {
		return ""
	}
	return fmt.Sprintf("too little water to dissolve the solids as written: %.2g mol water per mol of solid, below %d", water/solids, minWaterPerSolid)
}
