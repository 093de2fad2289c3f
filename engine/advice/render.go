package advice

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"mixward/engine"
	"mixward/engine/hazard"
)

// LevelText is the decision level as the first words of an answer.
func LevelText(l engine.Level) string {
	switch l {
	case engine.DoNotMix:
		return "DO NOT MIX"
	case engine.WithPrecautions:
		return "MIX ONLY WITH PRECAUTIONS"
	case engine.NoConcern:
		return "NO CONCERN"
	}
	return "NO DECISION"
}

// DecisionLine is the first line of every answer: the level and the main
// reason.
func DecisionLine(r *engine.Result) string {
	if r.Decision == nil {
		return engine.Headline(r)
	}
	return LevelText(r.Decision.Level) + ": " + r.Decision.Title
}

// shortCaution closes the short answer.
const shortCaution = "Advisory only, not a permit: follow the SDS, site procedures and local codes."

// RenderShort writes the short answer: the decision, what forms (gases
// with litres and headspace concentration against the limit, heat with the
// temperature reached), the net equation and the actions. About a dozen
// lines for two streams.
func RenderShort(r *engine.Result) string {
	var b strings.Builder
	w := func(format string, args ...any) { fmt.Fprintf(&b, format, args...) }
	w("%s\n", DecisionLine(r))
	for _, s := range r.Streams {
		if s.Tag != "" {
			w("  %s is %s\n", s.Tag, s.Text)
		}
	}
	for _, n := range r.ReadAs {
		w("  %s\n", n)
	}
	if line := NotAssessedLine(r); line != "" {
		w("%s\n", line)
	}
	w("%s\n", formsLine(r))
	w("%s\n", heatLine(r))
	w("%s\n", reactionLine(r))
	if d := r.Decision; d != nil {
		for i, a := range d.Actions {
			if i == 3 {
				w("  (%d more in the details)\n", len(d.Actions)-3)
				break
			}
			w("- %s\n", a)
		}
	}
	notes := 0
	for _, h := range r.Hazards {
		if h.Severity == engine.Info && notes < 2 {
			w("Note: %s\n", h.Message)
			notes++
		}
	}
	hs, stated := 0.0, false
	if r.Decision != nil {
		hs, stated = r.Decision.HeadspaceL, r.Decision.HeadspaceStated
	}
	if r.Conditions.VolumeL == 0 {
		w("Dry blend: judged as solids only. %s\n", shortCaution)
		return b.String()
	}
	w("Gas figures: %s, at equilibrium. %s\n", HeadspaceBasis(hs, stated), shortCaution)
	return b.String()
}

// HeadspaceBasis says which closed headspace the gas figures are for: the
// one stated in the request ("at headspace 2 m3"), or one equal to the
// liquid volume.
func HeadspaceBasis(litres float64, stated bool) string {
	if stated {
		return "the stated closed headspace (" + litresText(litres) + " L)"
	}
	return "a closed headspace equal to the liquid volume (" + litresText(litres) + " L; state another with \"at headspace 2 m3\")"
}

// litresText writes a volume with four significant digits and no exponent.
func litresText(x float64) string {
	s := trim(x)
	if strings.ContainsAny(s, "e") {
		s = fmt.Sprintf("%.0f", x)
	}
	return s
}

// NotAssessedLine names the chemicals the answer leaves out for want of
// thermodynamic data (empty when there are none).
func NotAssessedLine(r *engine.Result) string {
	if len(r.NotAssessed) == 0 {
		return ""
	}
	var names []string
	for _, n := range r.NotAssessed {
		names = append(names, n.Name)
	}
	return "Not assessed: " + strings.Join(names, ", ") + " (no thermodynamic data): the answer is for the rest of the mix; check its SDS"
}

// formsLine lists every gas the hazards count in numbers, one entry per
// gas: the gases judged in the headspace against their limits and the
// gases a hazard counts by amount (engine.GasCount: a reaction family the
// equilibrium state does not run, a volatile product in the liquid). None
// is left out: a gas a hazard counts, or one above its limit, is never
// hidden behind "no gas of concern". With none, the gases formed.
// surgeShare is the share of the liquid's volume from which a gas without a
// hazard of its own is named on the Forms line beside the gases of concern.
const surgeShare = 0.1

// alongPour is ", up to N mol along the pour (A into B, at P %)" when some
// point of the pour gives off at least twice the gas the final mix does
// and at least a mole: bleach run into acid gives chlorine from the first
// litre though the final mix ends near neutral.
func alongPour(r *engine.Result, f *gasFormed) string {
	if r.Addition == nil {
		return ""
	}
	final := 0.0
	if f.judged != nil {
		final = f.judged.Mol
	} else if f.count != nil {
		final = f.count.Mol
	}
	var best *engine.PourHazard
	var by engine.PourOrder
	for _, o := range r.Addition.Orders {
		for i := range o.Hazards {
			if h := &o.Hazards[i]; h.GasFormula == f.formula && (best == nil || h.GasMol > best.GasMol) {
				best, by = h, o
			}
		}
	}
	if best == nil || best.GasMol < 1 || best.GasMol < 2*final {
		return ""
	}
	return fmt.Sprintf("; up to %s mol (%s L) along the pour (%s into %s, at %s of it)",
		num(best.GasMol), num(best.GasMol*f.litresPerMol()), by.Added, by.Into, pctText(best.GasAtFraction))
}

// pourOnlyGases are the gases that a point of the pour gives off, a mole or
// more, but the final mix does not (hydrogen while borohydride in caustic
// runs into acid, though the final mix stays alkaline): "H2 none in the
// final mix; up to N mol (L) along the pour (A into B, at P % of it)", the
// largest per gas, in the order the pour meets them.
func pourOnlyGases(r *engine.Result, named map[string]bool) []string {
	if r.Addition == nil {
		return nil
	}
	type worst struct {
		h  *engine.PourHazard
		by engine.PourOrder
	}
	var order []string
	best := map[string]worst{}
	for _, o := range r.Addition.Orders {
		for i := range o.Hazards {
			h := &o.Hazards[i]
			if h.GasFormula == "" || named[h.GasFormula] || h.GasMol < 1 {
				continue
			}
			w, ok := best[h.GasFormula]
			if !ok {
				order = append(order, h.GasFormula)
			}
			if !ok || h.GasMol > w.h.GasMol {
				best[h.GasFormula] = worst{h, o}
			}
		}
	}
	var out []string
	for _, f := range order {
		w := best[f]
		l := engine.GasVolumeL(w.h.GasMol, r.Conditions.TemperatureK, 101.325)
		// The final mix may give off some of it too, below what makes it
		// a hazard there: its figure, not "none".
		final := "none in the final mix"
		for _, g := range r.Gases {
			if strings.TrimSuffix(g.Text, "(g)") == f && g.VolumeL >= traceGasShare*r.Conditions.VolumeL {
				final = fmt.Sprintf("%s mol (%s L) in the final mix, below its limit there", num(g.Mol), num(g.VolumeL))
			}
		}
		out = append(out, fmt.Sprintf("%s %s; up to %s mol (%s L) along the pour (%s into %s, at %s of it)",
			f, final, num(w.h.GasMol), num(l), w.by.Added, w.by.Into, pctText(w.h.GasAtFraction)))
	}
	return out
}

// traceGasShare is the volume of gas, as a share of the liquid's, below
// which a gas with no hazard is left off the Forms line.
const traceGasShare = 1e-3

func formsLine(r *engine.Result) string {
	var parts []string
	named := map[string]bool{}
	for _, f := range gasesFormed(r.Hazards) {
		parts = append(parts, f.text()+alongPour(r, f))
		named[f.formula] = true
	}
	pourOnly := pourOnlyGases(r, named)
	parts = append(parts, pourOnly...)
	if len(parts) > 0 && r.Decision != nil {
		// A gas with no hazard of its own (nitrogen, carbon dioxide below
		// its limit) still swells the headspace: name it when it comes to
		// a sizeable share of the liquid's volume.
		for _, g := range r.Decision.Gases {
			f := strings.TrimSuffix(g.Text, "(g)")
			if !named[f] && g.VolumeL >= surgeShare*r.Conditions.VolumeL && g.VolumeL >= 1 {
				parts = append(parts, fmt.Sprintf("%s %s mol (%s L), a gas surge to vent", f, num(g.Mol), num(g.VolumeL)))
			}
		}
	}
	if len(parts) == 0 && r.Decision != nil {
		for _, g := range r.Decision.Gases {
			if g.VolumeL < traceGasShare*r.Conditions.VolumeL {
				continue // a trace of gas (0.1 mL of CO2 from a 250 L mix) is no news
			}
			if len(parts) < 3 {
				parts = append(parts, fmt.Sprintf("%s %s L", g.Text, num(g.VolumeL)))
			}
		}
		if len(parts) > 0 {
			return "Forms: " + strings.Join(parts, "; ") + " (no gas of concern in the headspace)"
		}
		if slices.ContainsFunc(r.Hazards, func(h engine.Hazard) bool { return h.Code == "slow-hydrogen" }) {
			return "Forms: hydrogen, slowly over hours (not counted: no amount at once)"
		}
		if slices.ContainsFunc(r.Hazards, func(h engine.Hazard) bool { return h.Code == "nitric-slow-attack" }) {
			return "Forms: nitrogen oxides, slowly while the metal corrodes (not counted: no amount at once)"
		}
		return "Forms: no gas of concern"
	}
	if bar := closedRise(r.Hazards); bar > 0 {
		parts = append(parts, fmt.Sprintf("closed in, all of it would raise the headspace by about %s bar: vent it", num(bar)))
	}
	return "Forms: " + strings.Join(parts, "; ")
}

// closedRise is the pressure rise (bar) the gas-pressure hazard gives the
// closed headspace, 0 without it.
func closedRise(hs []engine.Hazard) float64 {
	bar := 0.0
	for _, h := range hs {
		if h.Code != "gas-pressure" {
			continue
		}
		for _, c := range h.Counts {
			bar = max(bar, c.ClosedRiseBar)
		}
	}
	return bar
}

// gasFormed is one gas of the Forms line: its judged figure (a gas hazard),
// what reactions beyond the equilibrium state add to it (summed over what
// gives it; the larger figure where two hazards count the same source),
// and the counts that only tell it again or hold it in the liquid.
type gasFormed struct {
	formula string
	judged  *engine.GasJudged
	beyond  map[string]float64
	from    []string // keys of beyond, in order
	count   *engine.GasCount
	liquid  *engine.GasCount
}

// gasesFormed gathers the gases of the hazards: the judged gases first, in
// the hazards' order (danger first, worse ratio first), then the gases
// only counted.
func gasesFormed(hs []engine.Hazard) []*gasFormed {
	var out []*gasFormed
	by := map[string]*gasFormed{}
	get := func(f string) *gasFormed {
		if g, ok := by[f]; ok {
			return g
		}
		g := &gasFormed{formula: f, beyond: map[string]float64{}}
		by[f] = g
		out = append(out, g)
		return g
	}
	for i := range hs {
		if h := &hs[i]; h.Gas != nil && get(h.Gas.Formula).judged == nil {
			by[h.Gas.Formula].judged = h.Gas
		}
	}
	for i := range hs {
		h := &hs[i]
		for j := range h.Counts {
			c := &h.Counts[j]
			g := get(c.Formula)
			switch {
			case c.InLiquid:
				if g.liquid == nil || c.Mol > g.liquid.Mol {
					g.liquid = c
				}
			case c.Beyond:
				if _, ok := g.beyond[c.From]; !ok {
					g.from = append(g.from, c.From)
				}
				g.beyond[c.From] = max(g.beyond[c.From], c.Mol)
				if g.count == nil || g.count.HeadspacePPM == 0 && c.HeadspacePPM > 0 {
					g.count = c
				}
			case g.count == nil:
				g.count = c
			}
		}
	}
	return out
}

// text writes one gas for the Forms line.
func (g *gasFormed) text() string {
	beyond := 0.0
	for _, f := range g.from {
		beyond += g.beyond[f]
	}
	j, c := g.judged, g.count
	switch {
	case j != nil && beyond > 0:
		mol := j.Mol + beyond
		return fmt.Sprintf("%s up to %s mol (%s L); at equilibrium headspace %s ppm = %s× %s %s ppm",
			g.formula, num(mol), num(mol*g.litresPerMol()), num(j.HeadspacePPM), num(j.Ratio), j.LimitName, num(j.LimitPPM))
	case j != nil && j.RoomPPM > 0:
		return fmt.Sprintf("%s %s mol (%s L), headspace %s ppm; over a %s m³ room %s ppm = %s× %s %s ppm",
			j.Formula, num(j.Mol), num(j.VolumeL), num(j.HeadspacePPM), num(hazard.RoomM3), num(j.RoomPPM), num(j.Ratio), j.LimitName, num(j.LimitPPM))
	case j != nil && j.Forerunner != "":
		return fmt.Sprintf("%s up to %s mol (%s L), an intermediate before %s (the same atoms, not extra), headspace %s ppm = %s× %s %s ppm",
			j.Formula, num(j.Mol), num(j.VolumeL), j.Forerunner, num(j.HeadspacePPM), num(j.Ratio), j.LimitName, num(j.LimitPPM))
	case j != nil:
		s := fmt.Sprintf("%s %s mol (%s L)", j.Formula, num(j.Mol), num(j.VolumeL))
		if j.Outside != "" {
			// A fast reaction outside the equilibrium gives it (hydrazoic
			// acid from hydrazine and nitrous acid): a worst case.
			s = fmt.Sprintf("%s up to %s mol (%s L)", j.Formula, num(j.Mol), num(j.VolumeL))
		}
		if j.DissolvedMol > 0 {
			s += fmt.Sprintf(" and %s mol more dissolved, still coming off", num(j.DissolvedMol))
		}
		return s + fmt.Sprintf(", headspace %s ppm = %s× %s %s ppm", num(j.HeadspacePPM), num(j.Ratio), j.LimitName, num(j.LimitPPM))
	case c != nil:
		s := fmt.Sprintf("%s %s mol (%s L)", g.formula, num(c.Mol), num(c.VolumeL))
		if beyond > 0 {
			s = fmt.Sprintf("%s up to %s mol (%s L)", g.formula, num(beyond), num(beyond*g.litresPerMol()))
		}
		if c.ClosedRiseBar > 0 && c.LimitName == "" && beyond == 0 {
			// A gas without a limit of its own counted by the
			// gas-pressure hazard: its volume is the news (the pressure
			// closes the line).
			return s + ", a gas surge to vent"
		}
		switch {
		case c.HeadspacePPM > 0 && c.Ratio > 0:
			s += fmt.Sprintf("; at equilibrium headspace %s ppm = %s× %s %s ppm", num(c.HeadspacePPM), num(c.Ratio), c.LimitName, num(c.LimitPPM))
		case c.HeadspacePPM > 0:
			s += fmt.Sprintf("; at equilibrium headspace %s ppm", num(c.HeadspacePPM))
		}
		return s
	}
	l := g.liquid
	limit := "no exposure limit listed"
	if l.LimitName != "" {
		limit = fmt.Sprintf("%s %s ppm", l.LimitName, num(l.LimitPPM))
	}
	return fmt.Sprintf("%s (%s mol %s in the liquid, %s)", l.Name, num(l.Mol), l.Formula, limit)
}

// litresPerMol is the volume of a mol of the gas at the mix's conditions,
// from whichever figure gives it.
func (g *gasFormed) litresPerMol() float64 {
	if j := g.judged; j != nil && j.Mol > 0 {
		return j.VolumeL / j.Mol
	}
	if c := g.count; c != nil && c.Mol > 0 {
		return c.VolumeL / c.Mol
	}
	return 0
}

func heatLine(r *engine.Result) string {
	line := heatFigure(r)
	if h := r.Heat; h != nil && h.LeftOutBoundkJ != nil && r.Decision != nil && r.Decision.Heat != nil {
		how := "estimated from a related form"
		if len(h.GibbsStandIn) > 0 && !slices.ContainsFunc(h.Missing, func(m string) bool { return !slices.Contains(h.GibbsStandIn, m) }) {
			how = "counted at its ΔfG° for want of ΔfH°"
		} else if len(h.GibbsStandIn) > 0 {
			how = "estimated from related forms or ΔfG°"
		}
		line += fmt.Sprintf(" (%s %s; within ±%s kJ)", strings.Join(h.Missing, ", "), how, num(*h.LeftOutBoundkJ))
	}
	if h := r.Heat; h != nil && len(h.NotDissolvedCounted) > 0 {
		line += fmt.Sprintf(" (heat of dissolving %s not counted: no data)", strings.Join(h.NotDissolvedCounted, ", "))
	}
	if slices.ContainsFunc(r.Hazards, func(h engine.Hazard) bool { return h.Code == "n-chloro-compounds" }) {
		// The N-chloro compounds of amines and urea have no species
		// data: the state does not form them, so their heat is missing.
		line += " (heat of forming the N-chloro compounds not counted: no data, so the mix gets warmer than this)"
	}
	if r.Decision != nil && r.Decision.Heat != nil {
		for _, x := range r.Decision.Heat.Reactions {
			line += fmt.Sprintf("; %s kJ of it from %s", num(x.ReleasedkJ), x.Reaction)
		}
		for _, x := range r.Decision.Heat.IfRuns {
			line += "; " + ifRunsText(x)
		}
	}
	return line
}

// ifRunsText is the heat of a held-back runaway: "if it runs: 84000 kJ
// more (NH4+ + NO2- -> N2(g) + 2 H2O), would boil".
func ifRunsText(x engine.ReactionHeat) string {
	s := fmt.Sprintf("if it runs: %s kJ more (%s)", num(x.ReleasedkJ), x.Reaction)
	switch {
	case x.Boils:
		s += ", would boil"
	case x.ReachedC != nil:
		s += fmt.Sprintf(", to about %s °C", num(*x.ReachedC))
	}
	return s
}

func heatFigure(r *engine.Result) string {
	if r.Decision == nil || r.Decision.Heat == nil {
		if r.Heat != nil && r.Heat.Withheld != "" {
			return "Heat: no estimate (" + r.Heat.Withheld + ")"
		}
		if r.Conditions.VolumeL == 0 {
			return "Heat: not estimated for solids blended dry (no liquid); the hazards say what the blend does"
		}
		return "Heat: no estimate (formation enthalpies missing)"
	}
	h := r.Decision.Heat
	switch {
	case h.Boils && h.SteamKg >= 0.1:
		return fmt.Sprintf("Heat: %s kJ, would reach about %s °C: boils, about %s kg of steam", num(h.ReleasedkJ), num(h.ReachedC), num(h.SteamKg))
	case h.Boils:
		return fmt.Sprintf("Heat: %s kJ, would reach about %s °C: boils", num(h.ReleasedkJ), num(h.ReachedC))
	case h.ReleasedkJ == 0:
		return "Heat: none to speak of"
	case h.ReleasedkJ < 0:
		return fmt.Sprintf("Heat: %s kJ taken up, cools to about %s °C", num(-h.ReleasedkJ), num(h.ReachedC))
	}
	return fmt.Sprintf("Heat: %s kJ, to about %s °C", num(h.ReleasedkJ), num(h.ReachedC))
}

func reactionLine(r *engine.Result) string {
	if r.OutsideAqueous != "" {
		return "Redox: " + r.OutsideAqueous
	}
	if r.Reaction == nil && r.Conditions.VolumeL == 0 && dryBlendFire(r) {
		// Solids blended dry have no water phase, so no aqueous pair: the
		// hazard is the blend itself, not the absence of a reaction.
		return "Redox: an oxidizer–fuel dry blend, outside the aqueous model (no solution equation): it burns or explodes once lit by friction, impact, heat or a spark"
	}
	if x := outsideReaction(r); x != "" && (r.Reaction == nil || r.Verdict != engine.Spontaneous) {
		// The gas of concern comes from a fast reaction the equilibrium
		// does not hold: name it rather than a pair held back on paper.
		return "Redox: " + x + ", fast in the concentrated mix (outside the equilibrium model; the gas it gives is counted above)"
	}
	if x := familyReaction(r); x != "" && (r.Reaction != nil || len(r.HeldBack) > 0) &&
		(r.Reaction == nil || r.Verdict != engine.Spontaneous || r.Decision != nil && held(r.Decision.Held, r.Reaction.Text)) {
		// The hazard counts a reaction family the equilibrium holds back
		// (an oxidizer burning an organic liquid): the line must not say
		// it does not run while the Heat line counts it.
		return "Redox: " + x + ": runs, judged as a reaction family (its heat is counted above; the equation the equilibrium holds back is in the details)"
	}
	if hb := pairHeld(r); hb != nil && (r.Reaction == nil || agents(r.Reaction) < 2) {
		// The streams meeting is what the operator asks about: a pair held
		// back heads the line before one agent's own change held back.
		reason, _, _ := strings.Cut(hb.Reason, ":")
		return "Redox: " + hb.Reaction.Text + " possible on paper, held back: " + reason
	}
	switch {
	case r.Reaction == nil && len(r.HeldBack) > 0 && r.HeldBack[0].Reaction != nil && givesGas(r.HeldBack[0].Reaction):
		// One agent's own change held back is worth the short line only
		// when it would give off a gas (peroxide to oxygen): an oxide
		// shuffled between solids (ferrous hydroxide to iron and
		// magnetite) reads as a reaction that happens.
		hb := r.HeldBack[0]
		reason, _, _ := strings.Cut(hb.Reason, ":")
		return "Redox: " + hb.Reaction.Text + " possible on paper, held back: " + reason
	case r.Reaction == nil && len(r.HeldBack) > 0:
		return "Redox: no redox reaction runs at these conditions (what is held back is in the details)"
	case r.Reaction == nil:
		return "Redox: no oxidizing and reducing agent pair"
	case r.Verdict == engine.Spontaneous && r.Decision != nil && held(r.Decision.Held, r.Reaction.Text) && formsGas(r) && r.ECell != nil:
		// The change runs and its gas is counted; a lock only stops it
		// part of the way (the metal left once the acid is spent).
		return fmt.Sprintf("Redox: %s (spontaneous, E cell %+.2f V; runs until a kinetic limit stops it, see the details)", r.Reaction.Text, *r.ECell)
	case r.Verdict == engine.Spontaneous && r.Decision != nil && held(r.Decision.Held, r.Reaction.Text):
		return "Redox: " + r.Reaction.Text + " possible on paper, held back (not counted; see the details)"
	case r.Verdict == engine.Spontaneous && r.ECell != nil:
		s := fmt.Sprintf("Redox: %s (spontaneous, E cell %+.2f V", r.Reaction.Text, *r.ECell)
		if r.Hindered {
			s += ", kinetically slow"
		}
		return s + ")"
	}
	if formsGas(r) {
		// The mixed state still gives off a product of the pair, below the
		// share that counts as a reaction: say so rather than "does not run".
		return "Redox: " + r.Reaction.Text + " runs only to a trace at the final ratio (the gas it gives is counted above)"
	}
	// The strongest pair on paper that does not run is for the details:
	// in the short answer it read as a reaction that happens.
	return "Redox: no redox reaction runs at these conditions (the pairs are in the details)"
}

// familyReaction names the first reaction family whose heat the decision
// counts ("chromic acid oxidizing the organic liquid"), or "". The Redox
// line names it only where the mix has a redox pair on paper: a family
// without one (formaldehyde with ammonia) is no redox change.
func familyReaction(r *engine.Result) string {
	if r.Decision == nil || r.Decision.Heat == nil || len(r.Decision.Heat.Reactions) == 0 {
		return ""
	}
	x := r.Decision.Heat.Reactions[0].Reaction
	x, _, _ = strings.Cut(x, " (")
	return strings.ToUpper(x[:1]) + x[1:]
}

// givesGas: a product of x is a gas.
func givesGas(x *engine.Reaction) bool {
	for _, p := range x.Products {
		if p.Phase == engine.Gas {
			return true
		}
	}
	return false
}

// outsideReaction is the fast reaction that gives a gas of concern beyond
// the equilibrium state, when one does.
func outsideReaction(r *engine.Result) string {
	for _, h := range r.Hazards {
		if h.Gas != nil && h.Gas.Outside != "" {
			return h.Gas.Outside
		}
	}
	return ""
}

// agents counts the distinct reactants of a reaction other than water, H+
// and OH-.
func agents(x *engine.Reaction) int {
	seen := map[string]bool{}
	for _, t := range x.Reactants {
		if t.Formula == "H2O" || t.Formula == "H" && t.Charge == 1 || t.Formula == "OH" && t.Charge == -1 {
			continue
		}
		seen[t.Formula+strconv.Itoa(t.Charge)] = true
	}
	return len(seen)
}

// pairHeld is the first change held back between two agents, when the
// answer's own reaction does not run.
func pairHeld(r *engine.Result) *engine.HeldBack {
	if r.Reaction != nil && r.Verdict == engine.Spontaneous && !r.Hindered && (r.Decision == nil || !held(r.Decision.Held, r.Reaction.Text)) {
		return nil
	}
	if r.Reaction != nil && r.Verdict == engine.Spontaneous && !r.Hindered && formsGas(r) {
		// The answer's own change runs and gives off its gas; a lock only
		// stops it part of the way (chlorite to chlorine dioxide as far as
		// the acid reaches). A change held back beside it (the chlorine
		// dioxide it made taken on to perchlorate) is not what the
		// streams do when they meet.
		return nil
	}
	for i := range r.HeldBack {
		if hb := &r.HeldBack[i]; hb.Reaction != nil && agents(hb.Reaction) >= 2 {
			return hb
		}
	}
	return nil
}

// formsGas reports whether a gas of the answer's gas list is a product of
// its equation.
func formsGas(r *engine.Result) bool {
	for _, g := range r.Gases {
		f := strings.TrimSuffix(g.Text, "(g)")
		for _, p := range r.Reaction.Products {
			if p.Formula == f && g.HeadspacePPM >= 1 {
				return true
			}
		}
	}
	return false
}

func num(x float64) string { return hazardNum(x) }

// hazardNum writes 3 significant digits without exponent.
func hazardNum(x float64) string {
	s := fmt.Sprintf("%.3g", x)
	if strings.ContainsAny(s, "e") {
		s = fmt.Sprintf("%.0f", x)
		if a := math.Abs(x); a > 0 && a < 1 {
			// A trace keeps three significant digits: 0.0000125, not 0.
			s = fmt.Sprintf("%.*f", 2-int(math.Floor(math.Log10(a))), x)
		}
	}
	return s
}

// RenderDetails writes the full answer: the decision with every reason
// and action, the engine's full text, and the pour.
func RenderDetails(r *engine.Result) string {
	var b strings.Builder
	w := func(format string, args ...any) { fmt.Fprintf(&b, format, args...) }
	w("Decision: %s\n", DecisionLine(r))
	if d := r.Decision; d != nil {
		for _, x := range d.Reasons {
			w("  because: %s\n", x)
		}
		for _, x := range d.Actions {
			w("  do: %s\n", x)
		}
		for _, x := range d.Held {
			w("  not counted: %s\n", x)
		}
	}
	w("\n%s", engine.RenderText(r))
	if a := r.Addition; a != nil {
		w("\nAlong the pour (%d mixes evaluated):\n", a.Points)
		for _, o := range a.Orders {
			w("  %s into %s:", o.Added, o.Into)
			if len(o.Hazards) == 0 {
				w(" nothing of concern\n")
				continue
			}
			w("\n")
			for _, h := range o.Hazards {
				w("    [%s] %s from %s to %s of the addition\n", strings.ToUpper(string(h.Worst)), h.Code, pctText(h.FromFraction), pctText(h.ToFraction))
			}
		}
		w("  %s\n", a.Advice)
	}
	return b.String()
}

func pctText(f float64) string { return strings.TrimSuffix(fmt.Sprintf("%.1f", f*100), ".0") + " %" }

// Reasons is hazard.Reason, for front ends that list the hazards briefly.
func Reasons(r *engine.Result) []string {
	var out []string
	for _, h := range r.Hazards {
		out = append(out, hazard.Reason(h))
	}
	return out
}

func held(hs []string, text string) bool {
	for _, h := range hs {
		if strings.HasPrefix(h, text+": ") {
			return true
		}
	}
	return false
}

// dryBlendFire reports whether the hazards judge the mix an oxidizer blended
// dry with a fuel.
func dryBlendFire(r *engine.Result) bool {
	for _, h := range r.Hazards {
		if h.Code == "oxidizer-fuel-blend" {
			return true
		}
	}
	return false
}
