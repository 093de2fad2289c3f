package hazard

import (
	"math"
	"sort"

	"mixward/engine"
)

// flashPoint is one row of a flash-point table: the closed-cup flash point
// (°C) of a water solution of an alcohol at pct % w/w.
type flashPoint struct{ pct, c float64 }

// alcoholFlash holds, by species, the molar mass, the density of the neat
// liquid (g/mL at 20 °C) and the closed-cup flash points of its water
// solutions, rising in %. Values: published ethanol–water, isopropanol–water
// and methanol–water flash-point tables (supplier safety data sheets and the
// NFPA Fire Protection Guide to Hazardous Materials, neat liquids), from
// memory, ±3 °C (±5 °C at the weak end, below about 20 %). Below the first
// row the solution is not counted as flammable here.
var alcoholFlash = map[string]struct {
	name    string
	molarG  float64
	density float64
	rows    []flashPoint
}{
	"C2H5OH":     {"ethanol", 46.07, 0.789, []flashPoint{{5, 62}, {10, 49}, {20, 36}, {30, 29}, {40, 26}, {50, 24}, {60, 22}, {70, 21}, {80, 20}, {90, 17}, {100, 13}}},
	"(CH3)2CHOH": {"isopropanol", 60.10, 0.786, []flashPoint{{10, 41}, {20, 32}, {30, 28}, {40, 26}, {50, 24}, {60, 22}, {70, 21}, {80, 19}, {90, 17}, {100, 12}}},
	"CH3OH":      {"methanol", 32.04, 0.792, []flashPoint{{10, 60}, {20, 46}, {30, 37}, {40, 31}, {50, 27}, {60, 24}, {70, 21}, {80, 18}, {90, 15}, {100, 11}}},
}

// FlammableLimitC is the flash point at or below which a liquid is a
// flammable liquid (GHS category 3 reaches 60 °C; UN Recommendations on the
// Transport of Dangerous Goods, class 3, 60 °C closed cup).
const FlammableLimitC = 60.0

// flashAt is the flash point of a water solution at pct % w/w by its table,
// linear between rows; false below the first row.
func flashAt(rows []flashPoint, pct float64) (float64, bool) {
	if pct < rows[0].pct {
		return 0, false
	}
	i := sort.Search(len(rows), func(i int) bool { return rows[i].pct >= pct })
	if i == len(rows) {
		return rows[len(rows)-1].c, true
	}
	if i == 0 || rows[i].pct == pct {
		return rows[i].c, true
	}
	a, b := rows[i-1], rows[i]
	return a.c + (pct-a.pct)/(b.pct-a.pct)*(b.c-a.c), true
}

// flammableLiquid: a mix that holds enough alcohol to be a flammable
// liquid. Its strength is read by weight from the alcohols' mol/L, with the
// rest of the liquid counted as water (1 kg/L) and the alcohols by their
// neat volumes; several alcohols are counted together on the table that
// gives the lowest flash point. At or below the temperature of the mix (or
// the temperature its own heat takes it to) its vapour can be lit over the
// liquid: a warning. Below 60 °C but above that temperature it is a
// flammable liquid to store and handle as one: a note. Diluting does not
// make a flammable liquid safe until the flash point passes 60 °C.
func flammableLiquid(o *Outcome) (engine.Hazard, bool) {
	if o.VolumeL <= 0 {
		return engine.Hazard{}, false
	}
	var massKg, volL float64
	var names []string
	var keys []string
	for i := range o.Before {
		a := &o.Before[i]
		f, ok := alcoholFlash[a.key()]
		if !ok || a.Molar < TraceMolar {
			continue
		}
		kg := a.Molar * o.VolumeL * f.molarG / 1000
		massKg += kg
		volL += kg / f.density
		names = append(names, f.name)
		keys = append(keys, a.key())
	}
	if massKg <= 0 {
		return engine.Hazard{}, false
	}
	water := math.Max(o.VolumeL-volL, 0)
	pct := 100 * massKg / (massKg + water)
	flash, found := math.Inf(1), false
	for _, k := range keys {
		if c, ok := flashAt(alcoholFlash[k].rows, pct); ok && c < flash {
			flash, found = c, true
		}
	}
	if !found || flash > FlammableLimitC {
		return engine.Hazard{}, false
	}
	t := o.TemperatureC
	if o.Heat.Known && o.Heat.ReachedC > t {
		t = o.Heat.ReachedC
	}
	what := joinNames(names)
	msg := "The mix holds about " + fmtNum(pct, 2) + " % " + what + " by weight: flash point about " + fmtNum(math.Round(flash), 2) + " °C (closed cup)"
	src := "flash points of ethanol, isopropanol and methanol in water: published flash-point tables (supplier safety data sheets; NFPA Fire Protection Guide to Hazardous Materials for the neat liquids), from memory, ±3 °C; 60 °C limit of a flammable liquid: GHS and the UN Recommendations on the Transport of Dangerous Goods, class 3 (from memory); strength by weight estimated from the neat volumes: common practice, no source"
	if flash <= t {
		return mk("flammable-liquid", engine.Warning,
			msg+", at or below the mix's "+fmtNum(t, 3)+" °C: it gives off vapour that a spark or flame can light over the liquid.",
			"Keep sparks, flames and hot work away; bond and earth the tanks and lines, ventilate, and use equipment rated for flammable vapour.", src), true
	}
	return mk("flammable-liquid", engine.Info,
		msg+", below 60 °C: the mix is a flammable liquid, though not at its "+fmtNum(t, 3)+" °C.",
		"Store and label it as a flammable liquid; keep it below its flash point and away from ignition sources.", src), true
}

// joinNames joins names with commas and "and".
func joinNames(xs []string) string {
	switch len(xs) {
	case 0:
		return ""
	case 1:
		return xs[0]
	}
	s := xs[0]
	for _, x := range xs[1 : len(xs)-1] {
		s += ", " + x
	}
	return s + " and " + xs[len(xs)-1]
}
