package hazard

import (
	"math"

	"mixward/engine"
)

// SurgeMolPerL is the intensity of a fast oxygen release, in mol of O2 per
// litre of the mix, from which the streams must not be combined in one go,
// whichever oxidants give it. 0.5 mol/L is about 12 L of gas per litre of
// liquid at 25 °C: a liquid that gives off a dozen times its own volume of
// gas within minutes foams over any tank's headroom, carries the liquid
// with it and bursts a closed vessel, and the heat of these reactions
// (about 100–160 kJ per mol O2) comes with it. Below it the surge is a
// precaution (vent, dose slowly). Threshold: common practice, no source;
// chosen below the 1 mol/L first proposed so that the equal surges of
// hypochlorite with 35 % peroxide and with 15 % peracetic acid (about
// 1 mol/L each) are judged alike even after dilution by a third stream.
const SurgeMolPerL = 0.5

// o2Source is one way a mix gives off oxygen quickly, with its amount.
type o2Source struct {
	mol    float64
	what   string // what gives it, in a few words
	source string
	state  bool // counted by the equilibrium state (the oxygen-release gas hazard already reports it)
	// fast: two oxidizing agents reduce each other (peroxide or peracid
	// with hypochlorite or permanganate), which takes seconds; a catalysed
	// breakdown of one agent runs at the pace of its catalyst.
	fast bool
	act  string // what to do when it is a precaution
}

// oxygenSources lists the fast oxygen releases of a mix: what the state
// gives off (a redox change such as hypochlorite with peroxide, or a
// catalysed peroxide breakdown), and the reaction families the state does
// not hold (peracid with hypochlorite or permanganate, hypochlorite with
// metal catalysts, peracid in alkali).
func oxygenSources(o *Outcome) []o2Source {
	var out []o2Source
	if n := math.Max(o.Measured["O2"].Mol, o.GasMol("O2")); n > 0 {
		out = append(out, o2Source{mol: n, what: "the reactions that run in the mix", state: true, fast: pairGivesOxygen(o) || fastPeroxideCatalyst(o),
			source: "oxygen from the mix at equilibrium; Bretherick's Handbook of Reactive Chemical Hazards, hydrogen peroxide with sodium hypochlorite (from memory)"})
	}
	pa := o.MolarBefore("CH3CO3H", "CH3CO3-")
	ox := math.Max(hypochloriteAny(o), o.MolarBefore("MnO4-"))
	if n := math.Min(pa, ox); n >= 1e-3 {
		out = append(out, o2Source{mol: n * o.VolumeL, what: "peracetic acid with hypochlorite or permanganate", fast: true,
			act:    "Do not combine in a closed vessel; keep the two sanitisers in separate lines, rinsed between uses.",
			source: "Bretherick's Handbook of Reactive Chemical Hazards, peroxyacetic acid (from memory)"})
	}
	if n := hypochloriteAny(o); n >= 1e-3 && catalysed(o) {
		out = append(out, o2Source{mol: n / 2 * o.VolumeL, what: "hypochlorite decomposing on copper, nickel, cobalt or manganese",
			act:    "Do not combine in a closed vessel; add the metal liquor slowly to a vented tank, away from oil and grease.",
			source: "Bretherick's Handbook of Reactive Chemical Hazards, sodium hypochlorite with metal salts (from memory)"})
	}
	if pa >= 1e-3 && o.PH >= 7 && ox < 1e-3 {
		// 2 CH3CO3H → 2 CH3COOH + O2: the peracid and its anion destroy
		// each other, fastest near its pKa of 8.2.
		out = append(out, o2Source{mol: pa / 2 * o.VolumeL, what: "peracetic acid breaking down at pH " + fmtNum(o.PH, 3),
			act:    "Vent the tank and keep oil and grease away; rinse with water between caustic and peracid steps (the peracid breaks down fastest near pH 8).",
			source: "Bretherick's Handbook of Reactive Chemical Hazards, peroxyacids (from memory); pKa 8.2: suppliers' data, from memory"})
	}
	return out
}

// fastPeroxideCatalyst reports whether peroxide meets a catalyst that
// breaks it down within seconds to minutes, not hours: chromium(VI)
// (through the blue peroxochromium species), permanganate and manganese
// dioxide, activated carbon (Bretherick's Handbook of Reactive Chemical
// Hazards, hydrogen peroxide with chromates, permanganates and carbon;
// from memory).
func fastPeroxideCatalyst(o *Outcome) bool {
	if o.MolarBefore("H2O2", "HO2-") < TraceMolar {
		return false
	}
	if o.MolarBefore("I-") >= TraceMolar && o.PH >= 5 {
		return true // iodide, neutral or alkaline: the foaming breakdown (Greenwood & Earnshaw, hydrogen peroxide, from memory)
	}
	return o.MolarBefore("Cr2O7^2-", "CrO4^2-", "HCrO4-", "H2CrO4", "MnO4-") >= TraceMolar || o.Named("MnO2", "C")
}

// pairGivesOxygen reports whether a reaction that proceeds gives off oxygen
// from two different agents (OCl- + H2O2 → Cl- + H2O + O2), not from one
// falling apart (2 H2O2 → 2 H2O + O2).
func pairGivesOxygen(o *Outcome) bool {
	for _, r := range o.Reactions {
		o2 := false
		for _, p := range r.Products {
			o2 = o2 || p.Formula == "O2"
		}
		agents := map[string]bool{}
		for _, s := range r.Reactants {
			if !s.IsWater() && !s.IsProton() && !s.IsHydroxide() {
				agents[s.Ion()] = true
			}
		}
		if o2 && len(agents) >= 2 {
			return true
		}
	}
	return false
}

// catalysed reports whether copper, nickel, cobalt or manganese (oxidized
// to manganese dioxide at once) is there to make hypochlorite decompose.
func catalysed(o *Outcome) bool {
	cat := o.MolarBefore("Cu^2+", "Ni^2+", "Co^2+", "Mn^2+") + o.MolarBefore("Cu(OH)2", "Ni(OH)2", "Co(OH)2", "CuO", "NiO", "MnO2", "Mn(OH)2")
	return cat >= TraceMolar || o.Named("CuSO4", "CuSO4.5H2O", "CuCl2", "NiSO4", "NiSO4.6H2O", "NiCl2", "CoCl2", "CoSO4", "MnSO4", "MnCl2", "MnO2")
}

// oxygenSurge is the one rule for an oxygen surge, whatever pair of
// oxidizing agents gives it: a fast surge from SurgeMolPerL mol O2 per
// litre of the mix is a danger (do not mix in one go); below it, or from a
// catalysed breakdown, a warning for the reaction families the state does
// not count (the state's own oxygen is reported by the oxygen-release gas
// hazard).
func oxygenSurge(o *Outcome) (engine.Hazard, bool) {
	if !(o.VolumeL > 0) {
		return engine.Hazard{}, false
	}
	var best, fast *o2Source
	srcs := oxygenSources(o)
	for i := range srcs {
		if best == nil || srcs[i].mol > best.mol {
			best = &srcs[i]
		}
		if srcs[i].fast && (fast == nil || srcs[i].mol > fast.mol) {
			fast = &srcs[i]
		}
	}
	if fast != nil && fast.mol/o.VolumeL >= SurgeMolPerL {
		best = fast
	}
	if best == nil {
		return engine.Hazard{}, false
	}
	per := best.mol / o.VolumeL
	l := best.mol * litreBarPerMolK() * o.TemperatureK() / (o.PressureKPa / 100)
	amount := fmtNum(best.mol, 3) + " mol, " + fmtNum(l, 3) + " L, " + fmtNum(l/o.VolumeL, 2) + "× the liquid volume"
	src := best.source + "; " + fmtNum(SurgeMolPerL, 2) + " mol O2 per litre of mix for do-not-mix-in-one-go: common practice, no source"
	// A family's oxygen adds to the state's only when the state gives off
	// none: where it does, the state may already run the same breakdown
	// (hypochlorite on copper), and its figure stands.
	c := beyondCount("O2", "oxygen", best.mol, best.what)
	c.Beyond = !best.state && !(o.Measured["O2"].Mol > 0 || o.GasMol("O2") > 0)
	if best.fast && per >= SurgeMolPerL {
		act := "Do not mix in one go: dose one into the other slowly, diluted, into an open, vented tank with headroom; keep oil, grease and flames away."
		if catalysedPeroxide(o) {
			act = catalysedAction
		}
		return withCounts(mk("oxygen-surge", engine.Danger,
			"Oxygen comes off fast from "+best.what+" ("+amount+"; "+fmtNum(per, 2)+" mol per litre of mix), with heat: the liquid foams over and a closed vessel bursts.",
			act, src), c), true
	}
	if best.state {
		return engine.Hazard{}, false
	}
	return withCounts(mk("oxygen-surge", engine.Warning,
		"Oxygen comes off quickly from "+best.what+" (up to "+amount+"), with heat.",
		best.act, src), c), true
}
