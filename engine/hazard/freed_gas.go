package hazard

import (
	"mixward/engine"
)

// sulfideFreedByAcid: where a sulfide liquor meets an acid stream that
// also holds an oxidizing agent (acid ferric chloride, acid permanganate),
// the acid frees hydrogen sulfide at once, while the oxidizing agent takes
// it to sulfur only as fast as it reacts: the mixed state, run to the end,
// shows no gas, but the mix as combined, before any redox reaction, does.
// A proton transfer is instantaneous; the oxidation of hydrogen sulfide by
// iron(III) in acid takes seconds to minutes (acid ferric H2S scrubbers
// need contact time: common practice, no source). Judged by the amount the
// acid frees, spread over a small plant room against the gas table's limit
// (data/gases.txt, with its source); a warning: it comes and goes where the
// streams meet.
func sulfideFreedByAcid(o *Outcome, d *Data, out []engine.Hazard) (engine.Hazard, bool) {
	g := d.Gases["H2S"]
	if g == nil {
		return engine.Hazard{}, false
	}
	for _, h := range out {
		if h.Code == "h2s-release" {
			return engine.Hazard{}, false // judged from the state already
		}
	}
	freed := (o.MolarBefore("H2S(g)") + o.MolarBefore("H2S")) * o.VolumeL
	if !(freed > 0) || roomPPM(o, freed) < g.LimitPPM || o.Molar("H2S", "H2S(g)", "HS-") >= 0.5*freed/o.VolumeL {
		return engine.Hazard{}, false
	}
	litres := engine.GasVolumeL(freed, o.TemperatureK(), o.PressureKPa)
	return mk("h2s-release", engine.Warning,
		"Hydrogen sulfide: the acid frees up to "+fmtNum(freed, 3)+" mol ("+fmtNum(litres, 3)+" L as gas) of it where the streams meet (the mix as combined, before any redox reaction); the oxidizing agent takes it to sulfur only as fast as it reacts, so some comes off before it does.",
		"Dose the sulfide liquor dilute, slowly and below the surface, with extraction running and an H2S monitor; never tip it into the acid stream in one go.",
		g.LimitSource+"; acid-base transfer faster than the oxidation of hydrogen sulfide by iron(III): common practice, no source"), true
}
