package hazard

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"mixward/engine"
)

// Loudness of a gas hazard, from the ratio of its equilibrium headspace
// concentration to its limit: at or above the limit it is a danger; from a
// tenth of the limit a warning; below that it raises nothing (the stated
// trace threshold for gases).
const (
	DangerRatio  = 1.0
	WarningRatio = 0.1
)

// gasCodes names the hazard of each gas of the table.
var gasCodes = map[string]string{
	"Cl2": "chlorine-release", "HCN": "hcn-release", "H2S": "h2s-release", "SO2": "so2-release",
	"ClO2": "clo2-release", "NH3": "ammonia-release", "CO2": "co2-release", "NO2": "no2-release",
	"NO": "no-release", "Br2": "bromine-release", "CNCl": "cyanogen-chloride-release",
	"H2": "hydrogen-release", "O2": "oxygen-release", "NOCl": "nocl-release",
	// organic and azide families
	"CO": "co-release", "HN3": "hn3-release",
	"HF": "hf-release", "HCl": "hcl-release",
}

// gasActions is what to do, by gas, for a danger and for a warning.
var gasActions = map[string][2]string{
	"Cl2":  {"Do not combine. If it has happened, leave upwind and return only with breathing apparatus.", "Add slowly with extraction running; keep the pH of anything holding hypochlorite above 7."},
	"HCN":  {"Do not combine. Keep cyanide liquors above pH 10.5 and acids away from them; if it has happened, leave at once and raise the alarm.", "Raise the pH above 10.5 with caustic first; work with extraction and an HCN detector."},
	"H2S":  {"Do not combine. Keep sulfide liquors alkaline (above pH 9); if it has happened, leave and return only with a detector and breathing apparatus.", "Keep the liquor above pH 9, ventilate and wear an H2S detector."},
	"SO2":  {"Do not combine in one go. Dose only into liquors that are not strongly acidic, slowly, with extraction; if it has happened, leave the area.", "Add slowly with extraction running and keep the tank covered."},
	"ClO2": {"Do not combine. Chlorine dioxide is toxic and explodes when concentrated in air; leave the area if it has happened.", "Keep it dilute, cool and covered, with extraction."},
	"NH3":  {"Do not combine in a closed space. Add slowly with extraction running, away from hypochlorite.", "Add slowly with extraction running, away from hypochlorite."},
	"CO2":  {"Ventilate low spaces (pits, sumps) before entry; add slowly to an open, vented tank.", "Add slowly to an open, vented tank; ventilate pits before entry."},
	"NO2":  {"Do not combine outside a fume extraction; anyone exposed sees a doctor (lung damage shows hours later).", "Work only with extraction."},
	"NO":   {"Do not combine outside a fume extraction (it turns to brown nitrogen dioxide in air).", "Work only with extraction."},
	"Br2":  {"Do not combine. Work only with extraction, goggles and gloves.", "Work only with extraction, goggles and gloves."},
	"HCl":  {"Do not combine outside a fume extraction; hydrochloric acid fumes burn eyes and lungs.", "Work with extraction running and the tank covered: the acid fumes."},
	"HF":   {"Do not combine outside a fume extraction; HF-rated gloves, face shield and calcium gluconate gel at hand; anyone exposed sees a doctor.", "Work only with extraction; HF-rated gloves and face shield, calcium gluconate gel at hand."},
	"NOCl": {"Do not combine outside a fume cupboard or extraction; mix only small amounts, use them fresh and never store the mix in a closed container (the gas bursts it).", "Work only with extraction; never close the container."},
	"CNCl": {"Do not combine below pH 10. For cyanide destruction raise the pH to 10.5 or more before any hypochlorite goes in.", "Raise the pH to 10.5 before dosing hypochlorite."},
	"H2":   {"Do not combine in a closed vessel. Vent the headspace, keep sparks and hot work away.", "Vent the headspace and keep sparks and hot work away."},
	"O2":   {"Keep oil, grease and flames away and vent the headspace.", "Vent the headspace; keep oil and grease away."},
	// organic and azide families
	"CO":  {"Do not combine. Carbon monoxide has no smell: if it has happened, leave the area, ventilate and return only with a CO detector.", "Work only with extraction and a CO detector."},
	"HN3": {"Do not combine. Never acidify azide: hydrazoic acid is very toxic and explosive; if it has happened, leave the area and ventilate.", "Keep azide solutions alkaline (above pH 9) and work only with extraction."},
}

// Amount scaling of acid gases that a treatment step gives off in traces
// (sulfur dioxide from a bisulfite dose in acid): above its limit in the
// closed headspace, the gas is a reason not to combine only when the amount
// the headspace takes up at once could bring ReferenceAirL of air to the
// limit, or when the headspace stands at SevereRatio times the limit and
// more (a puff that strong is dangerous at the tank's surface whatever its
// amount). Below both it is a warning for an open tank with extraction.
// ReferenceAirL is a small plant room, about 3 × 3 × 2.8 m; both: common
// practice, no source.
const (
	ReferenceAirL = 25000.0
	SevereRatio   = 100.0
)

// AlkalineChlorinePH is the pH of the mix from which chlorine is judged by
// amount as well as concentration (amountScaled): half a unit above
// neutral, where hypochlorous acid is mostly hypochlorite (pKa 7.5, CRC
// Handbook, from memory). Common practice, no source.
const AlkalineChlorinePH = 7.5

// amountScaled reports whether gas g of the mix is judged by amount as
// well as concentration: sulfur dioxide always, and ammonia that a base
// frees from an ammonium salt when no stream brings ammonia itself (a
// little caustic in an ammonium chloride rinse, ammonium bicarbonate
// dissolved in water give off a few millilitres, which smell at the
// surface but do not trouble a room; common practice, no source). Ammonia
// solution keeps giving its vapour off an open tank, and is judged by
// concentration alone.
func amountScaled(o *Outcome, g *GasData) bool {
	switch g.Formula {
	case "SO2":
		return true
	case "Cl2":
		// Chlorine over a mix that stays alkaline (pH 7.5 or more, no
		// strong acid named) is the equilibrium trace over hypochlorite
		// (Cl2 + H2O ⇌ HOCl + H+ + Cl-, K about 4e-4: CRC Handbook, from
		// memory): millilitres at most, which stand above the limit in a
		// closed headspace over strong bleach but do not trouble a room.
		// Below that pH, or with an acid stream, acid drives it out in
		// amount and the concentration decides (common practice, no
		// source).
		return o.PH >= AlkalineChlorinePH && !o.StrongAcid && len(o.SolidAcids) == 0
	case "NH3":
		return !o.Named("NH3")
	}
	return false
}

// smallPuff reports whether an amount-scaled gas above its limit comes off
// in an amount too small to bring ReferenceAirL of air to the limit.
func smallPuff(o *Outcome, g *GasData, hs Headspace, ratio float64) bool {
	if !amountScaled(o, g) || ratio >= SevereRatio || !(o.HeadspaceL > 0) {
		return false
	}
	rt := litreBarPerMolK() * o.TemperatureK()
	amb := o.PressureKPa / 100
	puff := hs.PPM * 1e-6 * amb * o.HeadspaceL / rt
	limitMol := g.LimitPPM * 1e-6 * amb * ReferenceAirL / rt
	return puff < limitMol
}

// tinyPuff reports whether a gas comes off in so small an amount (given
// off and in the headspace together) that spread over ReferenceAirL it
// would not reach WarningRatio of its limit: a trace, below the threshold
// at which a rule may fire. A few millilitres of sulfur dioxide over an
// unbuffered mix that a trace of acid took to pH 3 are no warning. So is a
// toxic gas that a reaction forms (no stream brings its dissolved forms)
// in the first millilitres of a pour, in a tank whose headspace is many
// times the liquid (InTank): the trace of chlorine the equilibrium holds
// over a few millilitres of alkaline bleach on a heap of salt stands at a
// high concentration over so small a liquid, but all of it would not
// trouble a room. In a mix judged by itself the closed headspace equals
// the liquid and its concentration decides (a litre of bleach with a litre
// of citric acid gives a few millilitres of chlorine, at the surface far
// above the limit). A vapour a stream gives off by itself (hydrogen
// chloride over hot acid, ammonia, hydrogen fluoride) keeps coming off an
// open tank however little a closed headspace holds, and a flammable gas
// is judged where it gathers: neither is judged by amount.
func tinyPuff(o *Outcome, g *GasData, hs Headspace, p *pool) bool {
	formedTrace := o.HeadspaceL > 5*o.VolumeL && len(g.Pool) > 0 && o.MolarBefore(g.Pool...) < TraceMolar && g.LimitName != "LFL" && g.LimitName != "O2"
	if !amountScaled(o, g) && !formedTrace || !(o.HeadspaceL > 0) || p == nil {
		return false
	}
	rt := litreBarPerMolK() * o.TemperatureK()
	amb := o.PressureKPa / 100
	puff := math.Max(hs.PPM*1e-6*amb*o.HeadspaceL/rt, p.mol)
	if formedTrace && (!amountScaled(o, g) || g.Formula == "Cl2") {
		// (Chlorine over alkaline hypochlorite is judged by amount too,
		// amountScaled, and keeps this reading of the first millilitres.)
		// What the reaction gives off is all there is of it: a tank's
		// headspace over the first millilitres of a pour holds no more
		// than they can give, whatever concentration the equilibrium
		// stands at over so small a liquid.
		puff = p.mol
	}
	return puff < WarningRatio*g.LimitPPM*1e-6*amb*ReferenceAirL/rt
}

// chromiumVIReduction reports whether sulfur dioxide comes from reducing
// chromium(VI) in acid: the reduction needs the acid (pH 2–3), so the
// action must not say to avoid it.
func chromiumVIReduction(o *Outcome) bool {
	return o.MolarBefore("Cr2O7^2-", "CrO4^2-", "HCrO4-", "H2CrO4") >= TraceMolar && o.MolarBefore("H2SO3", "HSO3-", "SO3^2-", "S2O5^2-") >= TraceMolar
}

// cyanideMakeUp reports whether hydrogen cyanide comes only from cyanide
// dissolving in water: a stream brings free cyanide, no reaction forms
// more, no stream brings an acid, and the mix stays at pH 10 or more (common practice, no source: cyanide bath make-up).
func cyanideMakeUp(o *Outcome) bool {
	return !o.StrongAcid && o.PH >= 10 && o.MolarBefore("CN-", "HCN") >= TraceMolar && !o.Formed("HCN", "CN-")
}

// chromeReductionActions are the warning and the danger action for sulfur
// dioxide from a chromium(VI) reduction (common practice, no source:
// chromate reduction in plating effluent).
var chromeReductionActions = [2]string{
	"Sulfur dioxide comes off if overdosed: dose the bisulfite under ORP control at pH 2–3, with extraction on.",
	"Do not dose in one go: bisulfite beyond what the chromium(VI) needs gives off sulfur dioxide in this acid. Dose under ORP control at pH 2–3, with extraction on; if it has happened, leave the area.",
}

// judgeGas turns each gas pool into a hazard when its headspace
// concentration reaches a tenth of its limit.
func judgeGas(o *Outcome, d *Data) []engine.Hazard {
	ps := pools(o, d)
	type judged struct {
		p    *pool
		hs   Headspace
		cold float64 // headspace ppm before the mix's own heat moved it
	}
	js := map[string]judged{}
	total := 0.0
	for _, f := range d.order {
		g, p := d.Gases[f], ps[f]
		var hs Headspace
		cold := 0.0
		if m, ok := o.Measured[f]; ok && !(p.beyond > m.Mol) {
			// The mixed state has this gas: its numbers, not an estimate.
			p = &pool{mol: m.Mol, molecular: 1, origins: []string{"the mix at equilibrium"}, equilibrium: true}
			hs = Headspace{PPM: math.Min(m.PPM, 1e6), Vents: m.PPM >= 1e6}
			if m.PPM >= NearSaturatedPPM {
				p.dissolved = m.Dissolved
			}
			if boilsOff(o) && g.LimitName != "LFL" && g.LimitName != "O2" && m.Dissolved > 1e-3*m.Mol {
				// A mix its own heat takes to the boil drives the
				// dissolved gas out with the steam: the equilibrium
				// figure at the starting temperature is no bound. All
				// of it, given off and dissolved, goes into the
				// headspace (filling it and venting when it is more).
				p = &pool{mol: m.Mol + m.Dissolved, molecular: 1, origins: []string{"the mix, driven off as its own heat takes it to the boil"}}
				ppm := p.mol * litreBarPerMolK() * o.TemperatureK() / (o.PressureKPa / 100) / o.HeadspaceL * 1e6
				hs = Headspace{PPM: math.Min(ppm, 1e6), Vents: !(ppm < 1e6)}
			} else if w, ok := warmedOff(o, g, m); ok {
				if o.Heat.ReachedC < NearBoilC {
					// Warmed below near-boiling, the mix dosed slowly
					// with cooling and the temperature watched (the
					// action of its heat hazard) stays near the streams'
					// own: the cold figure is what it then holds. A mix
					// that nearly boils drives the gas out in earnest
					// (common practice, no source).
					cold = hs.PPM
				}
				p, hs = w.pool, w.hs
			}
		} else {
			hs = Share(p.mol, p.molecular, g.KH, o.VolumeL, o.HeadspaceL, o.TemperatureK(), o.PressureKPa)
		}
		if !(hs.Vents && hs.PPM >= 1e6) {
			p, hs = fromVapourTable(o, d, f, p, hs)
		}
		js[f] = judged{p, hs, cold}
		total += hs.PPM
	}
	var out []engine.Hazard
	for _, f := range d.order {
		g, p, hs := d.Gases[f], js[f].p, js[f].hs
		if total > 1e6 {
			// Two gases that each fill the headspace share it: each at
			// its part of the whole, not each at 100 %.
			hs.PPM *= 1e6 / total
		}
		if p.mol <= 0 && hs.PPM <= 0 || f == "Cl2" && diluteHypochlorite(o) {
			continue
		}
		ratio := hs.PPM / g.LimitPPM
		if f == "CO2" {
			// An asphyxiant, not toxic at low level: judged also by the
			// amount, spread over a small plant room.
			ratio = math.Min(ratio, roomPPM(o, p.mol)/g.LimitPPM)
			if o.PH >= BicarbonatePH {
				continue
			}
		}
		if !(ratio >= WarningRatio) || tinyPuff(o, g, hs, p) {
			continue
		}
		h := gasHazard(o, g, p, hs, ratio)
		if c := js[f].cold; c > 0 && h.Gas != nil {
			h.Gas.ColdPPM = sig(c)
		}
		out = append(out, h)
	}
	return out
}

// ventsOff is what the message adds for a gas that fills the headspace
// and vents: what stays dissolved in the saturated liquid, and with a
// stated headspace the pressure rise of this gas alone if the vessel were
// really closed, returned in bar for the numbers (the words and the action
// are the gas-pressure hazard's).
func ventsOff(o *Outcome, p *pool, act string) (msg, action string, closedBar float64) {
	msg = " It fills the headspace and the rest vents."
	if p.dissolved >= SaturatedShare*p.mol {
		msg += fmt.Sprintf(" Another %s mol stays dissolved in the saturated liquid and keeps coming off an open tank.", fmtNum(p.dissolved, 3))
	}
	bar, _, ok := closedRise(o, p)
	if !ok {
		return msg, act, 0
	}
	// The pressure line and the action never to close the vessel are the
	// gas-pressure hazard's (gasPressure), which counts every gas the mix
	// gives off: the figure of this gas alone is kept in the numbers.
	return msg, act, bar
}

// SaturatedShare is the part of the amount given off from which what
// stays dissolved in a liquid saturated with the gas is named beside it:
// such a liquid keeps giving the gas off an open tank (chlorine dioxide
// from acidified chlorite is mostly in solution at ambient pressure).
const SaturatedShare = 0.5

// NearSaturatedPPM is the headspace share of a gas from which the liquid
// under it counts as (nearly) saturated with the gas: at half an
// atmosphere and more, what stays dissolved keeps coming off an open tank
// and is named beside what the closed headspace holds (Henry's law:
// common practice, no source).
const NearSaturatedPPM = 5e5

// fromVapourTable replaces the headspace figure of a gas of the vapour
// table (HCl, HF, NH3) by the partial pressure over a solution of the
// liquid's strength when that strength is inside the table's range: the
// mixed state's Davies activities, or Henry's law, read far too low over
// strong acid or ammonia. The pool's amount is at least what the headspace
// then holds. A pool that reaches past the state (a fast reaction outside
// it) keeps its own figure.
func fromVapourTable(o *Outcome, d *Data, gas string, p *pool, hs Headspace) (*pool, Headspace) {
	vh, src, lower, ok := vapourFigure(o, d, gas)
	if !ok || p == nil || p.beyond > 0 {
		return p, hs
	}
	q := *p
	q.vapour, q.pct, q.tempC, q.lower, q.vapourSource = true, o.Strength[gas], o.vapourTemperatureC(), lower, src
	q.mol = math.Max(q.mol, vh.GasMol)
	return &q, vh
}

// closedRise is the pressure (bar above the ambient) the gas of p would
// add to a stated headspace it overfills if the vessel were really closed:
// ideal gas at the mix's temperature after its own heat, all of the amount
// as gas (what dissolves is not taken off: the upper figure). Only for a
// stated headspace and a gas the reactions give off, not the vapour of the
// liquid itself, which closing caps at its vapour pressure.
func closedRise(o *Outcome, p *pool) (bar, tempC float64, ok bool) {
	if !o.HeadspaceStated || p == nil || p.vapour || !(o.HeadspaceL > 0) || !(p.mol > 0) {
		return 0, 0, false
	}
	tempC = o.vapourTemperatureC()
	bar = p.mol * litreBarPerMolK() * (tempC + 273.15) / o.HeadspaceL
	return bar, tempC, bar > o.PressureKPa/100
}

// RespiratorRatio is the multiple of the limit from which the acid's own
// fumes over an open tank call for respiratory protection, not only
// extraction (common practice, no source).
const RespiratorRatio = 10.0

// strongFumeActions are the warnings for the acid's own fumes at
// RespiratorRatio times the limit and more.
var strongFumeActions = map[string]string{
	"HCl": "Keep the tank covered with extraction running; near an open tank wear respiratory protection (full-face mask with acid-gas cartridge; breathing apparatus in a confined space): the fumes stand at ten times the limit or more.",
	"HF":  "Keep the tank covered with extraction running; near an open tank wear respiratory protection (full-face mask with acid-gas cartridge; breathing apparatus in a confined space), HF-rated gloves and face shield, calcium gluconate gel at hand: the fumes stand at ten times the limit or more.",
}

// DiluteHypochloriteMolar is the hypochlorite (all forms, mol/L of the mix
// before reaction) at or below which a mix that holds no acid gives no
// chlorine of concern: the only acid is what the hypochlorite's own
// reactions make (dechlorination with thiosulfate or sulfite gives at most
// half a proton per hypochlorite), so hypochlorous acid, acid and chloride
// are each a few mmol/L at most and chlorine (Cl2 hydrolysis constant
// 3.9e-4 mol²/L², Connick and Chia 1959, from memory) at most a few µmol/L,
// under 0.1 mL of gas per litre of liquid; bleach stabilised with caustic
// and real dilution water hold it nearer neutral still (White's Handbook of
// Chlorination, dechlorination, from memory). 3 mmol/L is about 200 mg/L of
// available chlorine. Threshold: common practice, no source.
const DiluteHypochloriteMolar = 0.003

// diluteHypochlorite reports whether the mix holds hypochlorite at or below
// DiluteHypochloriteMolar with no acid: no strong acid named and the mix as
// combined not acid.
func diluteHypochlorite(o *Outcome) bool {
	h := o.MolarBefore("HOCl", "OCl-", "Cl2")
	return h > 0 && h <= DiluteHypochloriteMolar && !o.StrongAcid && o.PH >= 7
}

// RoomM3 is the room a gas released by the mix is spread over when its
// amount, not only the headspace concentration, decides the warning: a
// small plant room or pit, about 3 × 3.3 × 2.5 m (common practice, no
// source). Carbon dioxide is judged by the smaller of its headspace ratio
// and the concentration it would make in that room, both against its
// NIOSH IDLH (40,000 ppm, NIOSH Pocket Guide): dissolving baking soda
// (about 2 mol, 0.05 m³) stays quiet, acid on soda ash (about 100 mol,
// 2.5 m³) does not.
const RoomM3 = 25.0

// BicarbonatePH is the pH from which carbon dioxide is not judged: a mix
// that stays as alkaline as bicarbonate itself (pH about 8.3) holds its
// carbon as bicarbonate and carbonate, and no acid drives the gas out; what
// its equilibrium pressure gives off is the slow degassing of dissolving
// baking soda or soda ash, not a release (common practice, no source).
const BicarbonatePH = 8.0

// roomPPM is the concentration (ppm by volume) mol of gas makes when it
// all leaves into a room of RoomM3.
func roomPPM(o *Outcome, mol float64) float64 {
	l := mol * litreBarPerMolK() * o.TemperatureK() / (o.PressureKPa / 100)
	return l / (RoomM3 * 1000) * 1e6
}

// boilOffC is the temperature, reached by the mix's own heat, from which a
// dissolved toxic gas is taken as driven off with the steam: near the
// boiling point of the liquid (common practice, no source: strong ammonia
// neutralised with strong acid fumes ammonia as it boils).
const boilOffC = 95.0

// WarmedRiseC is the rise, by the mix's own heat, from which a dissolved
// gas is shared with the headspace at the temperature reached rather than
// the starting one (common practice, no source: the state is solved at the
// starting temperature; a 10 K rise already halves the Henry constant of
// sulfur dioxide).
const WarmedRiseC = 10.0

type warmed struct {
	pool *pool
	hs   Headspace
}

// warmedOff shares a measured gas between the liquid and the headspace at
// the temperature the mix's own heat takes it to, below boilOffC: the
// Henry constant (Sander 2015, at 25 °C) moved by van 't Hoff with the
// enthalpy of dissolving from the species data (assumed constant over the
// range), the gas given off and dissolved shared anew. False when the mix
// does not warm by WarmedRiseC, the gas is not a toxic one held in the
// liquid, or the warm share gives off no more than the state.
func warmedOff(o *Outcome, g *GasData, m MeasuredGas) (warmed, bool) {
	if !o.Heat.Known || o.Heat.RiseC < WarmedRiseC || boilsOff(o) || !m.HasSolH || !(m.Dissolved > 0) ||
		g.LimitName == "LFL" || g.LimitName == "O2" || !(g.KH > 0) {
		return warmed{}, false
	}
	const tRef = 298.15
	tK := o.Heat.ReachedC + 273.15
	kH := g.KH * math.Exp(-m.SolHkJ*1000/engine.MolarGasConstant()*(1/tK-1/tRef))
	total := m.Mol + m.Dissolved
	// The dissolved pool may hold more than the molecule: chlorine's holds
	// its hypochlorous acid and chloride (Cl2 + H2O ⇌ HOCl + H+ + Cl-),
	// which turn into chlorine only as far as the mix's acid and chloride
	// let them. Its share as the molecule is what the state's own pressure
	// over it says (Henry's law: molecule = kH·p); warming moves the Henry
	// constant, not that share.
	molecular := 1.0
	if pBar := m.PPM * 1e-6 * o.PressureKPa / 100; pBar > 0 && o.VolumeL > 0 {
		if apparent := m.Dissolved / (o.VolumeL * pBar); apparent > g.KH {
			molecular = g.KH / apparent
		}
	}
	hs := Share(total, molecular, kH, o.VolumeL, o.HeadspaceL, tK, o.PressureKPa)
	off := hs.GasMol
	if hs.Vents {
		off = math.Max(off, total-kH/molecular*o.VolumeL*o.PressureKPa/100)
	}
	if !(off > 1.5*m.Mol) {
		return warmed{}, false
	}
	origin := "the mix, warmed to " + fmtNum(o.Heat.ReachedC, 2) + " °C by its own heat (Henry constant moved by van 't Hoff)"
	return warmed{&pool{mol: off, molecular: 1, origins: []string{origin}}, hs}, true
}

// boilsOff: the mix's own heat takes it to boilOffC or the boil.
func boilsOff(o *Outcome) bool {
	return o.Heat.Known && o.Heat.RiseC > 0 && (o.Heat.Boils || o.Heat.ReachedC >= boilOffC)
}

func gasHazard(o *Outcome, g *GasData, p *pool, hs Headspace, ratio float64) engine.Hazard {
	sev, act := engine.Warning, gasActions[g.Formula][1]
	// Oxygen enrichment is a fire precaution, never a reason on its own
	// not to combine (OSHA 1910.146 treats it as a hazardous atmosphere to
	// ventilate).
	// Carbon dioxide from neutralising carbonate is a foaming and
	// confined-space hazard to ventilate, not a reason never to neutralise
	// (common practice, no source): a warning at most, like oxygen.
	// Hydrogen chloride and hydrogen fluoride over a mix of their acids
	// at equilibrium are the acid's own fumes (warm or strong acid smokes):
	// extraction, not a refusal. When a reaction drives them out (strong
	// sulfuric acid on chloride, acid on fluoride) the acid-fumes and
	// hydrofluoric families judge it, by amount.
	acidFume := (g.Formula == "HCl" || g.Formula == "HF") && p != nil && p.equilibrium
	if ratio >= DangerRatio && g.LimitName != "O2" && g.Formula != "CO2" && !acidFume && !smallPuff(o, g, hs, ratio) {
		sev, act = engine.Danger, gasActions[g.Formula][0]
	}
	if acidFume && sev == engine.Warning && ratio >= RespiratorRatio && strongFumeActions[g.Formula] != "" {
		act = strongFumeActions[g.Formula]
	}
	if g.Formula == "HCN" && sev == engine.Danger && cyanideMakeUp(o) {
		// Cyanide dissolving in plain water hydrolyses (CN- + H2O ⇌ HCN +
		// OH-, pKa 9.2) and smells of HCN over the tank: the routine
		// make-up dissolves it in water made alkaline first.
		sev, act = engine.Warning, "Make the water alkaline first (caustic to pH 12 or more), then dissolve the cyanide in it; work with extraction and an HCN detector."
	}
	if g.Formula == "SO2" && sev == engine.Danger && !o.StrongAcid && o.MolarBefore("S2O3^2-") >= TraceMolar {
		// No stream brings the acid: the reaction makes it (a halogen or
		// hypochlorite killed with thiosulfate: 4 Br2 + S2O3^2- + 5 H2O →
		// 8 Br- + 2 HSO4- + 8 H+), and the acid turns the rest of the
		// thiosulfate to sulfur dioxide. Kill liquors are made alkaline
		// first (common practice, no source).
		act = "Make the thiosulfate alkaline first (soda ash or bicarbonate, enough for the acid the reaction makes), then dose slowly with extraction: as written the reaction makes its own acid, which drives off sulfur dioxide."
	}
	if g.Formula == "SO2" && chromiumVIReduction(o) {
		act = chromeReductionActions[0]
		if sev == engine.Danger {
			act = chromeReductionActions[1]
		}
	}
	code := gasCodes[g.Formula]
	litres := p.mol * litreBarPerMolK() * o.TemperatureK() / (o.PressureKPa / 100)
	hsWhy := "headspace taken equal to the liquid volume"
	if o.HeadspaceStated {
		hsWhy = "headspace as stated"
	}
	limit := g.LimitName + " " + fmtNum(g.LimitPPM, 3) + " ppm"
	if g.LimitName == "LFL" {
		limit = "the lower flammable limit (" + fmtNum(g.LimitPPM/1e4, 2) + " %)"
	}
	if g.LimitName == "O2" {
		limit = "the added oxygen that makes air oxygen-enriched (23.5 % O2)"
	}
	msg := fmt.Sprintf("%s: %s mol (%s L as gas) can leave the liquid (%s). At equilibrium the headspace (%s, %s L) holds %s ppm, %s× %s.",
		upperFirst(g.Name), fmtNum(p.mol, 3), fmtNum(litres, 3), strings.Join(p.origins, "; "), hsWhy, fmtNum(o.HeadspaceL, 4), fmtNum(hs.PPM, 3), fmtNum(ratio, 2), limit)
	closedBar := 0.0
	if hs.Vents {
		var more string
		more, act, closedBar = ventsOff(o, p, act)
		msg += more
	} else if p.dissolved > 0 && p.dissolved >= SaturatedShare*p.mol {
		msg += fmt.Sprintf(" Another %s mol stays dissolved in the nearly saturated liquid and keeps coming off an open tank.", fmtNum(p.dissolved, 3))
	}
	msg += figureNote(p, g)
	if g.Formula == "CO2" {
		msg += " Spread over a " + fmtNum(RoomM3, 2) + " m³ room it would make " + fmtNum(roomPPM(o, p.mol), 3) + " ppm (judged by the smaller of the two; an asphyxiant, not toxic at low level)."
	}
	src := []string{g.LimitSource, g.HenrySource}
	src = append(src, p.sources...)
	h := engine.Hazard{
		Code: code, Severity: sev, Title: codeOf(code).Title, Message: msg + " " + act, Action: act,
		Source: strings.Join(src, "; "), Aliases: codeOf(code).Aliases,
		Gas: &engine.GasJudged{
			Formula: g.Formula, Mol: sig(p.mol), VolumeL: sig(litres), HeadspaceL: o.HeadspaceL,
			HeadspacePPM: sig(hs.PPM), LimitName: g.LimitName, LimitPPM: g.LimitPPM, Ratio: sig(ratio),
			LimitSource: g.LimitSource, HenrySource: g.HenrySource,
		},
	}
	if p.beyond > 0 {
		h.Gas.Outside = p.outside
	}
	h.Gas.Forerunner = p.forerunner
	if p.dissolved > 0 && p.dissolved >= SaturatedShare*p.mol {
		h.Gas.DissolvedMol = sig(p.dissolved)
	}
	if closedBar > 0 {
		h.Gas.ClosedRiseBar = sigN(closedBar, 3)
	}
	if freeSolute[g.Formula] != nil {
		h.Gas.Method = MethodState
	}
	if p.vapour {
		h.Gas.Method, h.Gas.StrengthPct, h.Gas.LowerBound = MethodVapour, sigN(p.pct, 3), p.lower
		h.Gas.VapourSource = strings.Join(p.vapourSource, "; ")
	}
	if g.Formula == "CO2" {
		if room := roomPPM(o, p.mol); room/g.LimitPPM < hs.PPM/g.LimitPPM {
			h.Gas.RoomPPM = sig(room)
		}
	}
	return h
}

// Judge lists the hazards of an outcome, danger first, then warning, then
// info; within a severity the worse gas ratio first, then table order.
func Judge(o *Outcome, d *Data) []engine.Hazard {
	o.families = d.Families
	out := judgeGas(o, d)
	rules := append(presenceRules[:len(presenceRules):len(presenceRules)], familyRules...)
	rules = append(append(rules, slowRules...), oxygenSurge)
	for _, r := range rules {
		if h, ok := r(o); ok {
			out = append(out, h)
		}
	}
	if h, ok := sulfideFreedByAcid(o, d, out); ok {
		out = append(out, h)
	}
	if h, ok := cyanideFreedByAcid(o, d, out); ok {
		out = append(out, h)
	}
	if h, ok := gasPressure(o, out); ok {
		out = append(out, h)
	}
	addFamilyHeat(o, out)
	addRunawayHeat(o, out)
	fillCounts(o, d, out)
	out = append(out, judgeHeat(o)...)
	sort.SliceStable(out, func(i, j int) bool {
		ri, rj := rank(out[i].Severity), rank(out[j].Severity)
		if ri != rj {
			return ri > rj
		}
		return ratioOf(out[i]) > ratioOf(out[j])
	})
	if out == nil {
		out = []engine.Hazard{}
	}
	return out
}

func ratioOf(h engine.Hazard) float64 {
	if h.Gas != nil {
		return h.Gas.Ratio
	}
	return 0
}

func rank(s engine.Severity) int { return s.Rank() }

// fmtNum writes a number for an operator: d significant digits, no
// exponent, thousands as plain digits.
func fmtNum(x float64, d int) string {
	if x == 0 || !finite(x) {
		return strconv.FormatFloat(x, 'f', 0, 64)
	}
	x = sigN(x, d)
	dec := d - 1 - int(math.Floor(math.Log10(math.Abs(x))))
	if dec < 0 {
		dec = 0
	}
	out := strconv.FormatFloat(x, 'f', dec, 64)
	if strings.Contains(out, ".") {
		out = strings.TrimRight(strings.TrimRight(out, "0"), ".")
	}
	return out
}

func sigN(x float64, d int) float64 {
	if x == 0 || !finite(x) {
		return x
	}
	p := math.Pow(10, float64(d-1)-math.Floor(math.Log10(math.Abs(x))))
	return math.Round(x*p) / p
}

func sig(x float64) float64 { return sigN(x, 4) }

func upperFirst(s string) string {
	if s == "" {
		return s
	}
	return strings.ToUpper(s[:1]) + s[1:]
}
