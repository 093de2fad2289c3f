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

// landing is the pour.Local of a request: water, or a dilute aqueous
// stream (one that is not itself a concentrate), run into a tank that holds
// only concentrates. The heat is judged on the real pair where it lands:
// equal volumes of the added stream and each concentrate of the tank (for
// plain water that is the concentrate's own figure), so a second
// concentrated acid, which gives little heat with the first, is not taken
// for water.
func (a *Advisor) landing(req *engine.Request, conc map[string]float64) pour.Local {
	pairs := map[[2]string]float64{}
	return func(added engine.Stream, tank []engine.Stream) []engine.PourHazard {
		if added.VolumeL <= 0 || conc[streamKey(added)] >= concentrateRiseC || len(tank) == 0 {
			return nil
		}
		water := isWater(added)
		least := -1.0
		for _, t := range tank {
			r, ok := conc[streamKey(t)]
			if !ok || r < concentrateRiseC {
				return nil
			}
			if !water {
				k := [2]string{streamKey(added), streamKey(t)}
				p, seen := pairs[k]
				if !seen {
					p = a.pairRise(req, added, t, r)
					pairs[k] = p
				}
				if r = p; r < concentrateRiseC {
					return nil
				}
			}
			if least < 0 || r < least {
				least = r
			}
		}
		if allSolid(tank) {
			return solidLanding(added, tank, least)
		}
		return landingHazard(added, tank, least, water)
	}
}

// A liquid run onto a solid in the tank (water onto caustic flakes) heats
// the solution it makes where it lands, which the solid's solubility
// bounds (data/solubility.txt; the figure is that solution's): it boils
// and spits from solidBoilRiseC (about 100 °C from 25 °C). Below that a
// wetted heap warms but throws nothing out: it cannot throw out a
// concentrate floating under it, as water on a dense acid does, and the
// points of the pour judge how warm the tank gets (common practice, no
// source: dissolve solids by running them into the water).
const solidBoilRiseC = 75.0

// allSolid: every stream of the tank is a solid given by mass.
func allSolid(tank []engine.Stream) bool {
	for _, t := range tank {
		if t.VolumeL > 0 || t.MassKg <= 0 {
			return false
		}
	}
	return len(tank) > 0
}

func solidLanding(added engine.Stream, tank []engine.Stream, rise float64) []engine.PourHazard {
	if rise < solidBoilRiseC {
		return nil
	}
	code, sev, what := "boils", engine.Danger, "boils and spits"
	onto := pour.Name(&tank[0])
	return []engine.PourHazard{{
		Code: code, FromFraction: pour.Fractions()[0], ToFraction: 1, Worst: sev,
		Message: fmt.Sprintf("%s run onto solid %s %s where it lands (the solution it makes there warms by about %.0f °C): run the solid into the liquid, slowly, with stirring.",
			pour.Name(&added), onto, what, rise),
	}}
}

func landingHazard(added engine.Stream, tank []engine.Stream, least float64, water bool) []engine.PourHazard {
	code, sev, what := "scalding-heat", engine.Warning, "spits and fumes"
	if least >= concentrateDangerC {
		code, sev, what = "boils", engine.Danger, "boils and throws the concentrate out"
	}
	into := pour.Name(&tank[0])
	with := "water"
	if !water {
		with = pour.Name(&added)
	}
	return []engine.PourHazard{{
		Code: code, FromFraction: pour.Fractions()[0], ToFraction: 1, Worst: sev,
		Message: fmt.Sprintf("%s run into %s %s where it lands (equal volumes of %s and %s warm by about %.0f °C): always run the concentrate into the water, slowly, with stirring.",
			pour.Name(&added), into, what, into, with, least),
	}}
}

// isWater: a stream of water alone.
func isWater(s engine.Stream) bool {
	for _, c := range s.Components {
		if c.Chemical == nil || c.Chemical.Formula != "H2O" {
			return false
		}
	}
	return len(s.Components) > 0
}

// pairRise is the temperature rise of equal volumes of added and the
// concentrate t mixed alone; when the pair cannot be judged (no heat
// figure: a solid in too little water, a species without data) it is
// withWater, the concentrate's rise with water, so that no warning is lost
// for want of a figure.
func (a *Advisor) pairRise(req *engine.Request, added, t engine.Stream, withWater float64) float64 {
	amount := t.VolumeL + t.MassKg
	if amount <= 0 {
		amount = 1
	}
	x := added
	x.VolumeL, x.MassKg = amount, 0
	r := *req
	r.Streams = []engine.Stream{t, x}
	r.PH = nil
	res, err := a.Engine.PredictBrief(&r)
	if err != nil || res.Heat == nil || res.Heat.TemperatureRiseC == nil {
		return withWater
	}
	return *res.Heat.TemperatureRiseC
}
