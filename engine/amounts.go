package engine

import (
	"fmt"
	"strconv"
	"strings"
)

// ReadAmounts is readAmounts, for callers that build further requests from
// a parsed one (the pour and the concentrate checks of package advice): the
// result reads the same again.
func ReadAmounts(req *Request, t *Tables) *Request { return readAmounts(req, t) }

// readAmounts returns req with every stream's amount as the engine reads it,
// and a note for the operator on each reading it made (the notes are added to
// the copy's Notes, so that the short answer shows them):
//
//   - a chemical named without a strength whose pure form is a liquid is the
//     liquid as sold (soldStrength): "10 L Br2" is 10 L of bromine, not of a
//     1 mol/L solution;
//   - a mass of a named solution ("152 kg NaOH 50 %") is that solution, its
//     volume taken through the solution's density (data/densities.txt), so
//     that it brings its water and is diluted, not dissolved as a solid;
//   - a solid poured into plain water counts only as far as the water
//     dissolves it (capSolids, data/solubility.txt).
//
// req itself is not changed; each stream keeps the label it was written with.
func readAmounts(req *Request, t *Tables) *Request {
	out := *req
	out.Notes = append([]string{}, req.Notes...)
	out.Streams = make([]Stream, len(req.Streams))
	note := func(format string, args ...any) {
		n := fmt.Sprintf(format, args...)
		for _, x := range out.Notes {
			if x == n {
				return
			}
		}
		out.Notes = append(out.Notes, n)
	}
	for i := range req.Streams {
		st := req.Streams[i]
		st.shown = req.Streams[i].Label()
		st.Components = append([]Component(nil), st.Components...)
		for ci := range st.Components {
			soldAsSalt(&st.Components[ci], t, note)
			readStrength(&st, &st.Components[ci], t, note)
			if st.MassKg > 0 && st.VolumeL == 0 {
				hydrateNote(&st.Components[ci], t, note)
			}
		}
		readSolutionMass(&st, t, note)
		if GasAsSold(&st, t) {
			for _, c := range st.Components {
				note("no strength given for %s: read as the anhydrous, liquefied gas as sold (no water comes with it); state the strength if it is a solution", c.Chemical.Formula)
			}
		}
		out.Streams[i] = st
	}
	capSolids(&out, t, note)
	return &out
}

// saltsSold are the salts a strong solution named after a sparingly
// soluble acid is sold as: a "40 % EDTA" or "40 % NTA" product is the
// sodium salt (suppliers' data sheets: common practice, no source); the
// free acids dissolve only about 0.05 % and 0.13 % (solubility.txt).
var saltsSold = map[string]string{
	"C10H16N2O8": "Na4C10H12N2O8", // EDTA → tetrasodium EDTA
	"C6H9NO6":    "Na3C6H6NO6",    // NTA → trisodium NTA
}

// soldAsSalt reads a component named after a sparingly soluble acid at a
// strength more than ten times what the acid dissolves as the salt it is
// sold as, and says so.
func soldAsSalt(c *Component, t *Tables, note func(string, ...any)) {
	salt, ok := saltsSold[c.Chemical.Formula]
	sol, known := t.Solubility[c.Chemical.Formula]
	if !ok || !known {
		return
	}
	var gPerL float64
	switch c.Unit {
	case PctWW, PctWV:
		gPerL = c.Value * 10
	case GPerL:
		gPerL = c.Value
	case Molar:
		gPerL = c.Value * c.Chemical.MolarMass
	default:
		return
	}
	if gPerL <= 10*sol.GPer100G*10 {
		return
	}
	for _, ch := range t.Chemicals {
		if ch.Formula == salt {
			note("%s %s cannot be the free acid %s (it dissolves only about %s g/L): read as %s %s, the salt such products are; name the salt to be explicit",
				c.Name, trimNum(c.Value)+" "+unitText(c.Unit), c.Chemical.Formula, trimNum(sol.GPer100G*10), salt, trimNum(c.Value)+" "+unitText(c.Unit))
			c.Chemical = ch
			return
		}
	}
}

// hydrateNote says which form of a salt poured as a solid was read, where
// the dictionary knows it both anhydrous and as a hydrate: the two dissolve
// with very different heats (anhydrous nickel sulfate gives off about
// 90 kJ/mol, the hexahydrate takes up about 5; NBS Tables 1982, from
// memory). A name of the trade that means the hydrate (nickel sulfate,
// bluestone) is read as the hydrate; a formula as written.
func hydrateNote(c *Component, t *Tables, note func(string, ...any)) {
	f := c.Chemical.Formula
	if base, _, ok := strings.Cut(f, "."); ok {
		if hydrateDots(strings.TrimSpace(c.Name)) != f {
			note("%s read as %s, the hydrate sold; write %s for the anhydrous form", c.Name, f, base)
		}
		return
	}
	for _, h := range t.Chemicals {
		if strings.HasPrefix(h.Formula, f+".") && strings.HasSuffix(h.Formula, "H2O") {
			what := c.Name + " read as the anhydrous form " + f
			if hydrateDots(strings.TrimSpace(c.Name)) == f {
				what = f + " read as the anhydrous form"
			}
			note("%s; if it is the hydrate, write %s: it dissolves with a different heat", what, h.Formula)
			return
		}
	}
}

// readStrength gives a component named without a strength the strength of
// the chemical as sold, where its pure form is a liquid.
func readStrength(st *Stream, c *Component, t *Tables, note func(string, ...any)) {
	ch := c.Chemical
	if c.Unit != NoConc || ch.Formula == "H2O" {
		return
	}
	pct, d, ok := soldStrength(ch, t)
	if !ok {
		return
	}
	c.Unit, c.Value = PctWW, pct
	molar := pct / 100 * d * 1000 / ch.MolarMass
	if pct >= 100 {
		note("no strength given for %s: read as the neat liquid (%.4g kg/L, %.3g mol/L); state the strength if it is a solution", ch.Formula, d, molar)
		return
	}
	note("no strength given for %s: read as %s %% w/w, the strongest grade in the density table (%.4g kg/L, %.3g mol/L); state the strength", ch.Formula, trimNum(pct), d, molar)
}

// soldStrength is the strength (% w/w) and density (kg/L) at which a chemical
// named without a strength is read: the top row of its density table
// (data/densities.txt) when that row is 100 % (a liquid sold neat: solvents,
// glycols, amines, bromine, hydrazine, nitric acid) or when its pure form is
// a liquid at 25 °C in the species data (a "(l)" row of data/species.txt:
// 98 % sulfuric acid, 70 % hydrogen peroxide, the strongest grades sold).
// ok is false for solids and gases, which keep the 1 mol/L of a solution, and
// for metals (mercury), which the request gives by mass.
func soldStrength(ch *Chemical, t *Tables) (pct, density float64, ok bool) {
	pts := t.Densities[ch.Formula]
	if len(pts) == 0 || ch.Class == Metal {
		return 0, 0, false
	}
	top := pts[len(pts)-1]
	if top.PercentWW >= 100 || pureIsLiquid(ch, t) {
		return top.PercentWW, top.GPerML, true
	}
	return 0, 0, false
}

// pureIsLiquid reports whether the species data hold the chemical's own
// formula as a liquid at 25 °C.
func pureIsLiquid(ch *Chemical, t *Tables) bool {
	if t.Thermo == nil {
		return false
	}
	_, ok := t.Thermo.Get(ch.Formula + "(l)")
	return ok
}

// readSolutionMass turns a mass of a named solution into its volume: a
// stream given in kg whose chemicals all carry a strength, one of them a
// % w/w with a density row at that strength. A mass of a solid, of a
// chemical without a density table ("20 kg FeSO4 10 %"), or of a solid blend
// whose shares leave no water ("NaOH 50 %, Na2CO3 50 %") is left as it is;
// a liquid sold neat ("10 kg Br2") is read by its volume.
func readSolutionMass(st *Stream, t *Tables, note func(string, ...any)) {
	if st.MassKg <= 0 || st.VolumeL > 0 {
		return
	}
	share := 0.0 // % w/w named
	for _, c := range st.Components {
		if c.Unit == NoConc && c.Chemical.Formula != "H2O" {
			return
		}
		if c.Unit == PctWW {
			share += c.Value
		}
	}
	if share >= pureLiquidPct && !(len(st.Components) == 1 && isSoldLiquid(st.Components[0].Chemical, t)) {
		return // shares of a solid blend ("NaOH 50 %, Na2CO3 50 %"), no water
	}
	d, ok := solutionDensity(st, t)
	if !ok {
		return
	}
	st.VolumeL, st.MassKg = st.MassKg/d, 0
	note("%s kg of %s read as %s L of it (%.4g kg/L)", trimNum(st.VolumeL*d), st.shown, trimNum(st.VolumeL), d)
}

// isSoldLiquid reports whether a chemical is read as a liquid as sold.
func isSoldLiquid(ch *Chemical, t *Tables) bool {
	_, _, ok := soldStrength(ch, t)
	return ok
}

// solutionDensity is the density of the first % w/w component that has a
// density row at its strength.
func solutionDensity(st *Stream, t *Tables) (float64, bool) {
	for _, c := range st.Components {
		if c.Unit != PctWW {
			continue
		}
		if d, ok := t.Density(c.Chemical.Formula, c.Value); ok {
			return d, true
		}
	}
	return 0, false
}

// trimNum writes an amount with four significant digits, whole numbers from
// 1000 up.
func trimNum(x float64) string {
	if x >= 1000 {
		return strconv.FormatFloat(x, 'f', 0, 64)
	}
	return strconv.FormatFloat(x, 'g', 4, 64)
}

// GasAsSold reports whether a stream holds nothing but chemicals that are
// gases at 25 °C and 1 atm as sold (liquefied chlorine, anhydrous ammonia,
// sulfur dioxide: a (g) row in the species data and no liquid or solid
// one), given by mass or without a strength: no water comes with it.
func GasAsSold(s *Stream, t *Tables) bool {
	if t.Thermo == nil || len(s.Components) == 0 || s.VolumeL > 0 {
		return false
	}
	for _, c := range s.Components {
		if c.Chemical == nil || c.Unit != NoConc {
			return false
		}
		f := c.Chemical.Formula
		_, gas := t.Thermo.Get(f + "(g)")
		_, liq := t.Thermo.Get(f + "(l)")
		_, sol := t.Thermo.Get(f + "(s)")
		if !gas || liq || sol {
			return false
		}
	}
	return true
}
