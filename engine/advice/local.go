package advice

import (
	"fmt"

	"mixward/engine"
	"mixward/engine/pour"
)

// Water run onto a concentrated acid or caustic boils where it lands and
// throws the concentrate out, although the tank on average stays cool: the
// heat is set free in the thin layer where the two meet, and water, the
// lighter liquid, stays on top (common practice, no source; Bretherick's
// Handbook of Reactive Chemical Hazards, sulfuric acid, from memory). A
// stream counts as such a concentrate when equal volumes of it and water
// warm by concentrateRiseC or more; from concentrateDangerC the landing
// point boils.
const (
	concentrateRiseC   = 12.0
	concentrateDangerC = 30.0
)

// concentrates judges each stream of the request by how much equal
// volumes of it and water warm (by streamKey; absent when it cannot be
// judged).
func (a *Advisor) concentrates(req *engine.Request) map[string]float64 {
	out := map[string]float64{}
	if a.water == nil {
		return out
	}
	for _, s := range req.Streams {
		amount := s.VolumeL + s.MassKg
		if amount <= 0 {
			amount = 1
		}
		w := *a.water
		w.VolumeL = amount
		r := *req
		r.Streams = []engine.Stream{s, w}
		r.PH = nil
		res, err := a.Engine.PredictBrief(&r)
		if err != nil || res.Heat == nil || res.Heat.TemperatureRiseC == nil {
			continue
		}
		out[streamKey(s)] = *res.Heat.TemperatureRiseC
	}
	return out
}

// landing is the pour.Local of a request: water-bearing streams run into a
// tank that holds only concentrates.
func landing(conc map[string]float64) pour.Local {
	return func(added engine.Stream, tank []engine.Stream) []engine.PourHazard {
		if added.VolumeL <= 0 || conc[streamKey(added)] >= concentrateRiseC || len(tank) == 0 {
			return nil
		}
		least := -1.0
		for _, t := range tank {
			r, ok := conc[streamKey(t)]
			if !ok || r < concentrateRiseC {
				return nil
			}
			if least < 0 || r < least {
				least = r
			}
		}
		code, sev, what := "scalding-heat", engine.Warning, "spits and fumes"
		if least >= concentrateDangerC {
			code, sev, what = "boils", engine.Danger, "boils and throws the concentrate out"
		}
		into := pour.Name(&tank[0])
		return []engine.PourHazard{{
			Code: code, FromFraction: pour.Fractions()[0], ToFraction: 1, Worst: sev,
			Message: fmt.Sprintf("%s run into %s %s where it lands (equal volumes of %s and water warm by about %.0f °C): always run the concentrate into the water, slowly, with stirring.",
				pour.Name(&added), into, what, into, least),
		}}
	}
}
