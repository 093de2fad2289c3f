package hazard

import "mixward/engine"

// AlkalinePeroxideMolar is the hydrogen peroxide in the mix (mol/L) from
// which making it alkaline is a reason not to combine: about 10 % (2.9
// mol/L at 1.0 g/mL). Common practice, no source.
const AlkalinePeroxideMolar = 2.9

// alkalinePeroxide: concentrated hydrogen peroxide made alkaline by a
// strong base or ammonia (even a little, which takes away the acid that
// stabilises it, and meets it at high pH where it lands) decomposes to
// oxygen and water with heat, and the heat speeds it up. When the mixed
// state's lock still holds the decomposition back (the final pH below 9.5)
// its heat is counted here; when the state already runs it, the state's
// figure stands and this names the reason.
func alkalinePeroxide(o *Outcome) (engine.Hazard, bool) {
	p := o.MolarBefore("H2O2", "HO2-")
	if p < AlkalinePeroxideMolar || !(o.StrongBase || o.Named("NH3", "NH4OH")) || o.PH < 7 {
		return engine.Hazard{}, false
	}
	var rh *engine.ReactionHeat
	held := false
	for _, h := range o.HeldBack {
		if h.Lock == "peroxide-self-decomposition" {
			held = true
			rh = o.familyHeat("alkaline-peroxide", reagent{"H2O2", p * o.VolumeL, 2})
		}
	}
	o2 := p * o.VolumeL / 2
	l := o2 * litreBarPerMolK() * o.TemperatureK() / (o.PressureKPa / 100)
	// The oxygen is counted beyond the state when its lock holds the
	// breakdown back; otherwise the state gives it off already.
	c := beyondCount("O2", "oxygen", o2, "hydrogen peroxide breaking down")
	c.Beyond = held
	return withCounts(withHeat(mk("alkaline-peroxide", engine.Danger,
		"Concentrated hydrogen peroxide ("+fmtNum(p, 2)+" mol/L in the mix) made alkaline (pH "+fmtNum(o.PH, 2)+"; where the base lands far higher) loses the acid that stabilises it and decomposes to oxygen and water with heat, faster as it warms: up to "+fmtNum(o2, 3)+" mol oxygen ("+fmtNum(l/1000, 3)+" m³) and enough heat to boil the mix.",
		"Do not combine in bulk. If alkaline peroxide is needed, make it dilute (a few per cent), in an open, vented tank, and use it at once; keep peroxide at its supplied pH.",
		"Bretherick's Handbook of Reactive Chemical Hazards, hydrogen peroxide with bases (from memory); peroxide is stabilised at pH 2–4: common practice, no source; 10 % threshold: common practice, no source"), rh), c), true
}
