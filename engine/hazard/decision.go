package hazard

import (
	"slices"
	"strings"

	"mixward/engine"
	"mixward/engine/pour"
)

// NoConcernTitle is the decision's title when nothing of concern forms.
const NoConcernTitle = "no redox or acid–base reaction of concern"

// noteCodes are info hazards whose action the decision still carries: a
// mix that is of no concern as made but turns dangerous by one wrong step
// (chlorate with a reducing agent, acidified).
var noteCodes = map[string]bool{"chlorate-reducer-acid": true, "flammable-liquid": true}

// Decide derives the operator's decision from the hazards of the final mix
// and of the pour. The final mix counts as it is; of the orders of
// addition the better one counts, since the operator can choose it. The
// redox verdict plays no part.
//
// The actions of the info notes (noteCodes) come last, after the order of
// addition, so that a note never pushes the pour's advice out of the short
// answer.
func Decide(final []engine.Hazard, add *engine.Addition) engine.Decision {
	d := decide(final, add)
	d.Actions = withoutSlowDosing(d.Actions)
	for _, h := range final {
		if h.Severity == engine.Info && noteCodes[h.Code] {
			d.Actions = appendNew(d.Actions, h.Action)
		}
	}
	return d
}

func decide(final []engine.Hazard, add *engine.Addition) engine.Decision {
	d := engine.Decision{Level: engine.NoConcern, Title: NoConcernTitle, Reasons: []string{}, Actions: []string{}}
	finalW := worstOf(final)
	for _, h := range final {
		if h.Severity != engine.Info {
			d.Reasons = append(d.Reasons, Reason(h))
			d.Actions = appendNew(d.Actions, h.Action)
		}
	}
	if finalW >= 2 {
		d.Title = titleOf(final)
	}
	if add != nil && len(add.Sequences) > 0 {
		return decideSequence(d, finalW, final, add)
	}
	best, bestOrder, allW, choice := pourLevels(add)
	level := max(finalW, best)
	switch {
	case best > finalW && bestOrder != nil && len(bestOrder.Hazards) > 0:
		d.Title = pourTitle(add, bestOrder)
		for _, ph := range bestOrder.Hazards {
			d.Reasons = append(d.Reasons, "while "+bestOrder.Added+" runs into "+bestOrder.Into+": "+codeTitle(ph.Code)+
				" from "+pct(ph.FromFraction)+" to "+pct(ph.ToFraction)+" of the addition")
		}
	case allW > best && choice != nil:
		level = max(level, 2)
		if finalW < 2 {
			d.Title = worseOrderTitle(add, choice)
		}
		if choice.Dosed {
			d.Title += "; order of addition matters: dose " + choice.Added + " into " + choice.Into + " under control"
		} else {
			d.Title += "; order of addition matters: add " + choice.Added + " into " + choice.Into
		}
		if w := add.Written; w != nil && w.Worse && w.Added == choice.Into && !choice.Dosed {
			// The request wrote the worse order: say so first.
			d.Title = "not in the order written: " + strings.TrimSuffix(worseOrderTitle(add, choice), " if poured the other way") +
				" while " + w.Added + " runs into " + w.Into + "; add " + choice.Added + " into " + choice.Into + " instead"
		}
	}
	if add != nil && add.Advice != "" && allW >= 2 {
		d.Actions = appendNew(d.Actions, add.Advice)
	}
	return withLevel(d, level, final)
}

func withLevel(d engine.Decision, level int, final []engine.Hazard) engine.Decision {
	switch {
	case level >= 3:
		d.Level = engine.DoNotMix
		if anyRate(final) {
			d.Actions = withoutRateActions(d.Actions, final)
		}
	case level == 2:
		d.Level = engine.WithPrecautions
	}
	if level < 3 {
		d.Actions = softened(d.Actions)
	}
	return d
}

// anyRate reports whether a danger of the final mix forbids combining the
// streams at any rate or order of addition: its action begins "Do not
// combine." or "Do not combine, at any rate" (not "in one go", "in a
// closed space" or "below pH 10", which name a way that is safe).
func anyRate(final []engine.Hazard) bool {
	for _, h := range final {
		if h.Severity == engine.Danger && (strings.HasPrefix(h.Action, "Do not combine.") || strings.HasPrefix(h.Action, "Do not combine, at any rate")) {
			return true
		}
	}
	return false
}

// withoutSlowDosing takes "add slowly" out of the other actions when one
// says that adding slowly does not help (a catalyst that is not used up):
// the two must not stand side by side. The rest of such an action (work
// with extraction running) stays.
func withoutSlowDosing(actions []string) []string {
	if !slices.ContainsFunc(actions, func(a string) bool { return strings.Contains(a, "slowly does not help") }) {
		return actions
	}
	out := actions[:0:0]
	for _, a := range actions {
		if !strings.Contains(a, "slowly does not help") {
			a = strings.ReplaceAll(a, "Add slowly with ", "Work with ")
			a = strings.ReplaceAll(a, "add slowly with ", "work with ")
		}
		out = append(out, a)
	}
	return out
}

// withoutRateActions drops the actions that suggest a safe way of making
// the mix (the heat hazards' "run it in slowly with cooling", an order of
// addition, any "do not combine in one go ... dose slowly") when a reason not to combine holds at every rate and order.
func withoutRateActions(actions []string, final []engine.Hazard) []string {
	drop := map[string]bool{}
	for _, h := range final {
		if h.Heat != nil {
			drop[h.Action] = true
		}
	}
	out := actions[:0:0]
	for _, a := range actions {
		if drop[a] || strings.HasPrefix(a, "Add ") || strings.HasPrefix(a, "In sequence:") || strings.HasPrefix(a, "Do not combine in one go") {
			continue
		}
		out = append(out, a)
	}
	return out
}

// softened rewrites, for a mix that may be combined with precautions or is
// of no concern, an action that opens with "Do not combine" or "Do not mix":
// that belongs to a do-not-mix decision only. A qualified clause ("in a
// closed vessel", "in one go") becomes "Never combine in …"; an unqualified
// one is dropped and the rest (rinse lines, keep apart, what to do if it has
// happened) kept; an action with nothing else is dropped.
func softened(actions []string) []string {
	out := actions[:0:0]
	for _, a := range actions {
		if !strings.HasPrefix(a, "Do not combine") && !strings.HasPrefix(a, "Do not mix") {
			out = append(out, a)
			continue
		}
		if verb, rest, _ := strings.Cut(strings.TrimPrefix(a, "Do not "), " "); strings.HasPrefix(rest, "in ") || strings.HasPrefix(rest, "outside ") || strings.HasPrefix(rest, "below ") {
			// A qualified clause names the way that is unsafe: keep it.
			out = append(out, "Never "+verb+" "+rest)
			continue
		}
		i := strings.IndexAny(a, ".;:")
		if i < 0 {
			continue
		}
		rest := strings.TrimSpace(a[i+1:])
		if rest == "" {
			continue
		}
		out = append(out, strings.ToUpper(rest[:1])+rest[1:])
	}
	return out
}

// decideSequence decides a mix of three or four streams by its best
// sequence of addition: the streams run one after another into one tank, in
// the order the operator can choose. A pair that is unsafe on its own (bleach
// and acid) may never meet neat in a good sequence (acid into caustic first).
func decideSequence(d engine.Decision, finalW int, final []engine.Hazard, add *engine.Addition) engine.Decision {
	best := &add.Sequences[0]
	bestW, allW := pour.SequenceRank(best), 0
	for i := range add.Sequences {
		s := &add.Sequences[i]
		if w := pour.SequenceRank(s); w < bestW || (w == bestW && rank(s.Worst) < rank(best.Worst)) {
			best, bestW = s, w
		}
	}
	natural := false
	for i := range add.Sequences {
		s := &add.Sequences[i]
		allW = max(allW, pour.SequenceRank(s))
		// Without water, the bulk liquid first (the others dosed into
		// it) is as natural as water first: a danger only in an order
		// that starts elsewhere does not lift the decision (the advice
		// still names the pairs never to meet neat; common practice, no
		// source).
		natural = natural || ((s.WaterFirst || s.BulkFirst) && pour.SequenceRank(s) == bestW)
	}
	// liftW is the worst rank of the other sequences that lifts the
	// decision: all of it, unless a natural sequence (water first) is
	// among the best; then only the dangers pour.LiftRank counts, and the
	// rest stays in the advice (an action line).
	liftW := allW
	if natural {
		liftW = bestW
		for i := range add.Sequences {
			liftW = max(liftW, pour.LiftRank(&add.Sequences[i]))
		}
	}
	level := max(finalW, bestW)
	seqText := strings.Join(best.Streams, ", then ")
	dil, rest := pour.DilutedRank(best)
	switch {
	case dil && bestW > finalW && rest <= finalW:
		// The best sequence meets its hazards only where a stream lands
		// in the tank's diluted water, which dosing at a separate point
		// avoids: the level is that of a precaution, and the title names
		// the sequence.
		t := "order of addition matters: " + seqText + ", dosing into the diluted water at a separate point"
		if finalW >= 2 && d.Title != NoConcernTitle {
			t = d.Title + "; " + t
		}
		d.Title = t
		for _, st := range best.Steps {
			for _, ph := range st.Hazards {
				if ph.Code != "warms" {
					d.Reasons = append(d.Reasons, "while "+st.Added+" runs into "+st.Into+": "+codeTitle(ph.Code)+" where it lands, if dosed where the others went in")
				}
			}
		}
	case dil && bestW == finalW && allW > bestW:
		// The final mix sets the level; the sequence still decides where
		// the acid may go in.
		d.Title += "; order of addition matters: " + seqText + ", dosing into the diluted water at a separate point"
	case bestW > finalW:
		for _, st := range best.Steps {
			for _, ph := range st.Hazards {
				if ph.Code == "warms" {
					continue // no hazard of the pour (orderRank)
				}
				if rank(ph.Worst) == bestW && !strings.Contains(d.Title, "in every sequence") {
					// The level comes from the pour: its reason leads the
					// title, before the final mix's own.
					t := codeTitle(ph.Code) + " in every sequence of addition"
					if d.Title != NoConcernTitle && finalW >= 2 {
						t += "; " + d.Title
					}
					d.Title = t
				}
				d.Reasons = append(d.Reasons, "while "+st.Added+" runs into "+st.Into+": "+codeTitle(ph.Code)+
					" from "+pct(ph.FromFraction)+" to "+pct(ph.ToFraction)+" of the addition")
			}
		}
	case liftW > bestW:
		level = max(level, 2)
		if finalW < 2 {
			d.Title = "hazard along the pour in other sequences"
		}
		if !strings.Contains(d.Title, "order of addition matters") {
			d.Title += "; order of addition matters: " + seqText
		}
	}
	if allW > bestW && level >= 2 && level < 3 && !strings.Contains(d.Title, "order of addition matters") && !strings.Contains(d.Title, "in every sequence") {
		// Other sequences meet worse than the best; the level comes from
		// elsewhere (the final mix), but the title still names the
		// sequence the advice gives.
		d.Title += "; order of addition matters: " + seqText
	}
	if add.Advice != "" && allW >= 2 {
		d.Actions = appendNew(d.Actions, add.Advice)
	}
	return withLevel(d, level, final)
}

// worseOrderTitle names the worst hazard met in the other order(s).
func worseOrderTitle(add *engine.Addition, good *engine.PourOrder) string {
	w, t := 0, ""
	for i := range add.Orders {
		o := &add.Orders[i]
		if o == good || o.Added != good.Into || o.Into != good.Added {
			continue
		}
		for _, h := range o.Hazards {
			if rank(h.Worst) > w && h.Code != "warms" {
				w, t = rank(h.Worst), codeTitle(h.Code)
			}
		}
	}
	if t == "" {
		return "hazard along the pour"
	}
	if t == codeTitle("boils") || t == codeTitle("near-boiling") {
		t = "boils locally"
	}
	return t + " if poured the other way"
}

// pourLevels judges the pour pair by pair (the orders come in pairs: one
// pair of streams, both ways). For each pair the better order counts, as the
// operator can choose it. best is the worst of those over the pairs, with
// its order; all is the worst rank met in any order; choice is the better
// order of the pair where the order matters most (nil when it never does).
func pourLevels(add *engine.Addition) (best int, order *engine.PourOrder, all int, choice *engine.PourOrder) {
	if add == nil {
		return 0, nil, 0, nil
	}
	gap := 0
	for i := 0; i+1 < len(add.Orders); i += 2 {
		x, y := &add.Orders[i], &add.Orders[i+1]
		wx, wy := orderRank(x), orderRank(y)
		good, pb := x, wx
		if wy < wx {
			good, pb = y, wy
		}
		if pb > best || order == nil {
			best, order = max(best, pb), good
		}
		all = max(all, wx, wy)
		if d := max(wx, wy) - pb; d > 0 && max(wx, wy) > gap {
			// The order the pour advice names (pour.Rank's choice, or
			// the smaller stream dosed into the larger).
			gap, choice = max(wx, wy), good
			if y.Advised {
				choice = y
			} else if x.Advised {
				choice = x
			}
		}
	}
	return best, order, all, choice
}

// orderRank is the worst hazard met along an order. A mix that only warms
// on the way (below scalding: "warms") counts for nothing: a passing warm-up
// of part of the tank is no hazard of the pour, and a warning for it (water
// run onto a heap of trisodium phosphate warms the first litre) teaches
// operators to ignore warnings. The final mix's own warming still counts.
func orderRank(o *engine.PourOrder) int { return pour.Rank(o) }

func pourTitle(add *engine.Addition, o *engine.PourOrder) string {
	worst := o.Hazards[0]
	for _, h := range o.Hazards[1:] {
		if rank(h.Worst) > rank(worst.Worst) {
			worst = h
		}
	}
	t := codeTitle(worst.Code)
	if len(add.Orders) == 2 {
		return t + " in either order of addition"
	}
	return t + " along the pour"
}

func worstOf(hs []engine.Hazard) int {
	w := 0
	for _, h := range hs {
		w = max(w, rank(h.Severity))
	}
	return w
}

// titleOf is the title of the worst hazards, at most two; among them a
// hazard that forms an explosive comes first, whatever gas comes off
// beside it.
func titleOf(hs []engine.Hazard) string {
	var ts []string
	w := worstOf(hs)
	for _, first := range []bool{true, false} {
		for _, h := range hs {
			if rank(h.Severity) == w && len(ts) < 2 && explosive(h.Code) == first {
				ts = appendNew(ts, h.Title)
			}
		}
	}
	return strings.Join(ts, "; ")
}

// explosive reports whether a code names an explosive product.
func explosive(code string) bool {
	return strings.Contains(codeTitle(code), "explosive")
}

// Reason is a hazard in a few words with its numbers.
func Reason(h engine.Hazard) string {
	switch {
	case h.Gas != nil && h.Gas.RoomPPM > 0:
		g := h.Gas
		return h.Title + ": " + fmtNum(g.Mol, 3) + " mol " + g.Formula + " (" + fmtNum(g.VolumeL, 3) + " L), headspace " +
			fmtNum(g.HeadspacePPM, 3) + " ppm; over a " + fmtNum(RoomM3, 2) + " m³ room " + fmtNum(g.RoomPPM, 3) + " ppm = " + fmtNum(g.Ratio, 2) + "× " + g.LimitName + " " + fmtNum(g.LimitPPM, 3) + " ppm"
	case h.Gas != nil:
		g := h.Gas
		return h.Title + ": " + fmtNum(g.Mol, 3) + " mol " + g.Formula + " (" + fmtNum(g.VolumeL, 3) + " L), headspace " +
			fmtNum(g.HeadspacePPM, 3) + " ppm = " + fmtNum(g.Ratio, 2) + "× " + g.LimitName + " " + fmtNum(g.LimitPPM, 3) + " ppm"
	case h.Heat != nil && h.Heat.Boils:
		return h.Title + ": " + fmtNum(h.Heat.ReleasedkJ, 3) + " kJ, would reach about " + fmtNum(h.Heat.ReachedC, 3) + " °C"
	case h.Heat != nil:
		return h.Title + ": " + fmtNum(h.Heat.ReleasedkJ, 3) + " kJ, to about " + fmtNum(h.Heat.ReachedC, 3) + " °C"
	case len(h.Counts) > 0:
		return h.Title + ": " + countsText(h.Counts)
	}
	return h.Title
}

// countsText is the gases a hazard counts by amount, in a few words.
func countsText(cs []engine.GasCount) string {
	var parts []string
	for _, c := range cs {
		switch {
		case c.InLiquid:
			parts = append(parts, fmtNum(c.Mol, 3)+" mol "+c.Formula+" in the liquid")
		default:
			parts = append(parts, "up to "+fmtNum(c.Mol, 3)+" mol "+c.Formula+" ("+fmtNum(c.VolumeL, 3)+" L)")
		}
	}
	return strings.Join(parts, ", ")
}

func codeTitle(code string) string {
	for _, c := range codes {
		if c.Code == code {
			return c.Title
		}
	}
	return code
}

func appendNew(xs []string, s string) []string {
	if s == "" {
		return xs
	}
	for _, x := range xs {
		if x == s {
			return xs
		}
	}
	return append(xs, s)
}

func pct(f float64) string { return fmtNum(f*100, 2) + " %" }
