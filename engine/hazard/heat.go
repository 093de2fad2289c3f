package hazard

import "mixward/engine"

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
		z = mk("boils", engine.Danger,
			"The mix releases "+fmtNum(h.ReleasedkJ, 3)+" kJ and would reach about "+fmtNum(h.ReachedC, 3)+" °C: it boils and spits hot liquid and mist.",
			"Do not mix in one go: use more water, run the concentrated liquid slowly into the water with cooling and stirring; wear a face shield.", src)
	case h.ReachedC >= NearBoilC && h.RiseC >= 2*WarmRise:
		// Where the streams meet the liquid runs well above the mean: a mix
		// whose mean reaches 80 °C boils and spits locally when poured in one
		// go (Bretherick's Handbook, acids with bases, from memory).
		z = mk("near-boiling", engine.Danger,
			"The mix releases "+fmtNum(h.ReleasedkJ, 3)+" kJ and reaches about "+fmtNum(h.ReachedC, 3)+" °C on average: where the streams meet it boils and spits.",
			"Do not mix in one go: use more water, run the concentrated liquid slowly into the water with cooling and stirring; wear a face shield.", src)
	case h.ReachedC >= ScaldC:
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
