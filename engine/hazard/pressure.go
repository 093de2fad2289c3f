package hazard

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"mixward/engine"
)

// ClosedRiseMinBar is the pressure rise (bar) a closed headspace would take
// from the gas the mix gives off from which the mix gets the pressure line
// and a vent action, whatever the gas: toxic or not, nitrogen, nitrous
// oxide, oxygen, carbon dioxide, hydrogen. Half a bar over a tank's
// headspace is past what an atmospheric tank, its lid or a drum takes
// (atmospheric storage tanks are built for a few kPa, a tight drum bulges
// and bursts at a bar or so): common practice, no source.
const ClosedRiseMinBar = 0.5

// gasNames names the gases that have no row in the gas table (no
// exposure limit) for the pressure line.
var gasNames = map[string]string{
	"N2": "nitrogen", "N2O": "nitrous oxide", "O2": "oxygen", "H2": "hydrogen", "CO2": "carbon dioxide",
	"CH4": "methane", "C2H2": "acetylene", "NH3": "ammonia", "Cl2": "chlorine", "SO2": "sulfur dioxide",
}

// gasNotes is what a gas without a limit of its own adds to the pressure
// line.
var gasNotes = map[string]string{
	// Nitrous oxide supports combustion, like oxygen, once warm (CRC
	// Handbook, physical constants of inorganic compounds, from memory).
	"N2O": " Nitrous oxide also feeds a fire: keep oil, grease and flames away from the vent.",
	// Nitrogen and carbon dioxide displace the air of a pit or sump
	// (common practice, no source).
	"N2": " Nitrogen displaces air: ventilate pits and low spaces before entry.",
}

// closedAmount is one gas the mix gives off, in mol, for the pressure it
// would give a closed headspace.
type closedAmount struct {
	formula string
	mol     float64
}

// closedAmounts gathers every gas the mix gives off, the largest figure
// of each: what the mixed state puts in the headspace (Measured), the
// gases of the reactions that proceed, a gas hazard's judged amount (the
// mix boiled dry of it, a fast reaction outside the state), and what the
// reaction families give off beyond the state. The acid's own fumes read
// from the vapour table are left out: closing the vessel caps them at their
// vapour pressure.
func closedAmounts(o *Outcome, hs []engine.Hazard) []closedAmount {
	by := map[string]float64{}
	var order []string
	add := func(f string, mol float64) {
		if !(mol > 0) || f == "" || f == "H2O" {
			return
		}
		if _, ok := by[f]; !ok {
			order = append(order, f)
		}
		by[f] = math.Max(by[f], mol)
	}
	vapour := map[string]bool{}
	for i := range hs {
		if g := hs[i].Gas; g != nil && g.Method == MethodVapour {
			vapour[g.Formula] = true
		}
	}
	fs := make([]string, 0, len(o.Measured))
	for f := range o.Measured {
		fs = append(fs, f)
	}
	sort.Strings(fs)
	for _, f := range fs {
		if !vapour[f] {
			add(f, o.Measured[f].Mol)
		}
	}
	for _, g := range o.Gases {
		if !vapour[g.Formula] {
			add(g.Formula, g.Mol)
		}
	}
	for i := range hs {
		if g := hs[i].Gas; g != nil && !vapour[g.Formula] {
			add(g.Formula, g.Mol)
		}
		beyond := map[string]float64{}
		for _, c := range hs[i].Counts {
			if c.Beyond && !c.InLiquid {
				beyond[c.Formula] = math.Max(beyond[c.Formula], c.Mol)
			}
		}
		for f, m := range beyond {
			add(f, m+o.Measured[f].Mol)
		}
	}
	out := make([]closedAmount, 0, len(order))
	for _, f := range order {
		out = append(out, closedAmount{f, by[f]})
	}
	sort.SliceStable(out, func(i, j int) bool { return out[i].mol > out[j].mol })
	return out
}

// ClosedRiseBar is the pressure (bar above the ambient) mol of gas would
// give the closed headspace of the outcome: ideal gas at the temperature
// the mix's own heat takes it to, all of it as gas (what would stay
// dissolved at the higher pressure is not taken off: the upper figure).
func ClosedRiseBar(o *Outcome, mol float64) float64 {
	if !(o.HeadspaceL > 0) || !(mol > 0) {
		return 0
	}
	return mol * litreBarPerMolK() * (o.vapourTemperatureC() + 273.15) / o.HeadspaceL
}

// gasPressure is the one rule for the pressure of the gas a mix gives
// off: when all of it together would raise the closed headspace (the
// stated one, else as large as the liquid) by ClosedRiseMinBar or more,
// the mix gets the pressure figure and the action never to close the
// vessel, to use an open, vented tank and to dose slowly. A gas that would
// burst a closed tank is at least a warning (mix only with precautions),
// whether or not it is toxic.
func gasPressure(o *Outcome, hs []engine.Hazard) (engine.Hazard, bool) {
	gs := closedAmounts(o, hs)
	total := 0.0
	for _, g := range gs {
		total += g.mol
	}
	bar := ClosedRiseBar(o, total)
	if !(bar >= ClosedRiseMinBar) {
		return engine.Hazard{}, false
	}
	tC := o.vapourTemperatureC()
	// The volume as the other gas figures give it: at the streams'
	// temperature and the ambient pressure.
	litres := total * litreBarPerMolK() * o.TemperatureK() / (o.PressureKPa / 100)
	var parts []string
	var counts []engine.GasCount
	note := ""
	for _, g := range gs {
		if g.mol < 0.01*total {
			continue // a trace beside the bulk of the gas
		}
		name := gasNames[g.formula]
		if name == "" {
			name = g.formula
		}
		parts = append(parts, fmt.Sprintf("%s %s mol", g.formula, fmtNum(g.mol, 3)))
		counts = append(counts, engine.GasCount{Formula: g.formula, Name: name, Mol: g.mol, From: "the gas the mix gives off, in a closed headspace", ClosedRiseBar: sigN(bar, 3)})
		note += gasNotes[g.formula]
	}
	hsWhy := "taken equal to the liquid volume"
	if o.HeadspaceStated {
		hsWhy = "as stated"
	}
	msg := fmt.Sprintf("The mix gives off %s of gas (%s, %s L as gas). Closed in, it would raise the headspace (%s, %s L) by about %s bar (ideal gas at the mix's %s °C, all of it as gas): more than a tank, its lid or a drum holds.%s",
		pluralMol(total), strings.Join(parts, ", "), fmtNum(litres, 3), hsWhy, fmtNum(o.HeadspaceL, 4), fmtNum(bar, 2), fmtNum(tC, 3), note)
	act := fmt.Sprintf("Never close this vessel: the gas would raise it by about %s bar. Use an open, vented tank with headroom and dose slowly, so the gas comes off as it forms.", fmtNum(bar, 2))
	h := mk("gas-pressure", engine.Warning, msg, act,
		"ideal gas, V = nRT/P (CODATA 2018 R); "+fmtNum(ClosedRiseMinBar, 2)+" bar threshold: common practice, no source")
	return withCounts(h, counts...), true
}

// pluralMol writes an amount of gas in mol.
func pluralMol(mol float64) string {
	return fmtNum(mol, 3) + " mol"
}
