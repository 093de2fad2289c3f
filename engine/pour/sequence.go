package pour

import (
	"slices"
	"sort"
	"strconv"
	"strings"

	"mixward/engine"
)

// MaxSequenceStreams is the most streams whose sequences are searched: four
// streams have 24 sequences of 16 distinct steps; five would have 120.
const MaxSequenceStreams = 4

// sequences judges every order of running the streams one after another into
// one tank. A step (what the tank holds, the stream run in) is evaluated once
// however many sequences share it; the first step of each is a pair's order
// already judged (orders, by added and into stream).
func sequences(req *engine.Request, eval Evaluate, orders map[[2]int]engine.PourOrder, local Local) ([]engine.PourSequence, int) {
	n := len(req.Streams)
	if n < 3 || n > MaxSequenceStreams {
		return nil, 0
	}
	steps := map[string]engine.PourOrder{}
	memo := map[string]tankHazards{} // each stream alone, for atInlet
	pts := 0
	var out []engine.PourSequence
	var solidFirst []bool
	bulk := bulkStreams(req)
	for _, perm := range permutations(n) {
		solidFirst = append(solidFirst, dry(&req.Streams[perm[0]]))
		seq := engine.PourSequence{Streams: make([]string, n), Steps: []engine.PourOrder{}, WaterFirst: water(&req.Streams[perm[0]]),
			BulkFirst: bulk[perm[0]]}
		for i, k := range perm {
			seq.Streams[i] = Name(&req.Streams[k])
		}
		for k := 1; k < n; k++ {
			tank, added := perm[:k], perm[k]
			key := stepKey(tank, added)
			st, ok := steps[key]
			if !ok && k == 1 {
				st, ok = orders[[2]int{added, tank[0]}]
			}
			if !ok {
				var p int
				st, p = into(req, tank, added, eval, local, memo)
				pts += p
			}
			st.DryStep = allDry(req, tank) && (dry(&req.Streams[added]) || water(&req.Streams[added]))
			steps[key] = st
			seq.Steps = append(seq.Steps, st)
			if w := worst(st); w > rank(seq.Worst) {
				seq.Worst = severityOf(w)
			}
		}
		out = append(out, seq)
	}
	// Among equally safe sequences one that starts the tank with a liquid
	// comes first: solids are dissolved into a liquid, not run into each
	// other dry.
	idx := make([]int, len(out))
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(a, b int) bool {
		i, j := idx[a], idx[b]
		// By the rule the decision follows (Rank over the steps, then
		// the worst severity), so that the sequence advised is the
		// title's.
		if ri, rj := SequenceRank(&out[i]), SequenceRank(&out[j]); ri != rj {
			return ri < rj
		}
		wi, wj := rank(out[i].Worst), rank(out[j].Worst)
		if wi != wj {
			return wi < wj
		}
		if solidFirst[i] != solidFirst[j] {
			return !solidFirst[i]
		}
		if out[i].WaterFirst != out[j].WaterFirst {
			// The natural make-up, water first, among equally safe ones.
			return out[i].WaterFirst
		}
		return seqSpan(out[i]) < seqSpan(out[j])
	})
	sorted := make([]engine.PourSequence, len(out))
	for k, i := range idx {
		sorted[k] = out[i]
	}
	out = sorted
	return out, pts
}

// into runs stream added into a tank holding the streams of tank.
func into(req *engine.Request, tank []int, added int, eval Evaluate, local Local, memo map[string]tankHazards) (engine.PourOrder, int) {
	r := *req
	r.Streams = make([]engine.Stream, 0, len(tank)+1)
	names := make([]string, 0, len(tank))
	for _, k := range tank {
		r.Streams = append(r.Streams, req.Streams[k])
		names = append(names, Name(&req.Streams[k]))
	}
	r.Streams = append(r.Streams, req.Streams[added])
	po, pts := order(&r, len(tank), 0, eval, func(f float64) []engine.Stream {
		sts := make([]engine.Stream, 0, len(tank)+1)
		for i := range tank {
			sts = append(sts, withAmount(r.Streams[i]))
		}
		return append(sts, scaled(withAmount(r.Streams[len(tank)]), f))
	})
	po.Into = strings.Join(names, " + ")
	po.Hazards = withLocal(po.Hazards, local, req.Streams[added], r.Streams[:len(tank)])
	inlet, p := atInlet(&r, eval, memo)
	po.Hazards = append(inlet, po.Hazards...)
	return po, pts + p
}

// inletShares are the shares of the tank's liquid that meet the whole of
// the added stream where it lands, before the tank's other streams can act
// on it.
var inletShares = [...]float64{0.01, 0.05}

// atInlet judges where the added stream (the last of r's streams) lands in a
// tank that holds two or more streams: there the added stream is in excess
// over a little of the tank's liquid, so acid run into a tank that holds
// hypochlorite and caustic meets the hypochlorite before the caustic
// (common practice, no source: never add acid to a tank containing
// hypochlorite; neutralise the acid and the base with each other before any
// hypochlorite, cyanide or sulfide stream goes in). The mix as a whole at
// each point of the pour cannot show it. Heat is not judged here: the
// stream runs in over time and its heat spreads through the tank, which the
// points of the pour follow (and the landing rule, water onto a
// concentrate); the whole of a stream set free in a hundredth of the tank
// at once (20 kg of caustic flakes in 2 L) is no state the tank passes
// through.
func atInlet(r *engine.Request, eval Evaluate, memo map[string]tankHazards) ([]engine.PourHazard, int) {
	n := len(r.Streams)
	if n < 3 {
		return nil, 0
	}
	added := withAmount(r.Streams[n-1])
	var out []engine.PourHazard
	seen := map[string]bool{}
	// What the added stream has by itself it has wherever it lands; what a
	// stream of the tank gives off by itself (hot dilute ammonia's own
	// vapour) is the tank's, not made where the stream lands. Each stream
	// alone is judged once for all the steps (memo).
	own := tankHazards{}
	for _, s := range r.Streams {
		one := withAmount(s)
		key := Name(&one) + "\x00" + strconv.FormatFloat(one.VolumeL, 'g', -1, 64) + "\x00" + strconv.FormatFloat(one.MassKg, 'g', -1, 64)
		o, ok := memo[key]
		if !ok {
			o, _ = tankAlone(r, eval, func(f float64) []engine.Stream {
				if f == 0 {
					return nil
				}
				return []engine.Stream{one}
			})
			memo[key] = o
		}
		own.merge(o)
	}
	diluted := dilutedTank(r.Streams[:n-1])
	pts := 0
	for _, f := range inletShares {
		q := *r
		q.Streams = make([]engine.Stream, 0, n)
		for _, s := range r.Streams[:n-1] {
			q.Streams = append(q.Streams, scaled(withAmount(s), f))
		}
		q.Streams = append(q.Streams, added)
		hs, err := eval(&q)
		if err != nil {
			continue
		}
		pts++
		for _, h := range hs {
			if h.Severity != engine.Danger || h.Heat != nil || heatGrade[h.Code] > 0 || seen[h.Code] || own.covers(h) {
				continue
			}
			seen[h.Code] = true
			ph := engine.PourHazard{Code: h.Code, FromFraction: fractions[0], ToFraction: fractions[0], Worst: h.Severity,
				Message: "where " + Name(&r.Streams[n-1]) + " lands, in excess over the tank's liquid: " + h.Message}
			if diluted {
				ph.Worst, ph.Diluted = engine.Warning, true
				ph.Message = "where " + Name(&r.Streams[n-1]) + " lands, in excess over the tank's liquid, if dosed where the tank's reagents went in: " + h.Message +
					" Dosed into the diluted tank at a separate point, with mixing, it meets no concentrate."
			}
			out = append(out, ph)
		}
	}
	return out, pts
}

// DilutionFactor is how many times the volume of the tank's reagents its
// water must be for the tank to count as diluted where a stream lands: acid
// dosed into water that already holds a little bleach, at a point away from
// where the bleach went in and with mixing, meets no concentrate (common
// practice, no source: pool and cooling-water acid dosing).
const DilutionFactor = 5.0

// dilutedTank reports whether the streams of a tank hold water at least
// DilutionFactor times the volume (a solid's mass in kg counted as litres)
// of everything else in it: the reagents in it are diluted.
func dilutedTank(tank []engine.Stream) bool {
	w, other := 0.0, 0.0
	for i := range tank {
		s := withAmount(tank[i])
		if water(&s) {
			w += s.VolumeL
			continue
		}
		other += s.VolumeL + s.MassKg
	}
	return w > 0 && other > 0 && w >= DilutionFactor*other
}

// bulkStreams marks, when no stream of req is water, the liquid streams of
// the largest volume: the bulk the others are dosed into.
func bulkStreams(req *engine.Request) map[int]bool {
	most := 0.0
	for i := range req.Streams {
		if water(&req.Streams[i]) {
			return nil
		}
		most = max(most, req.Streams[i].VolumeL)
	}
	out := map[int]bool{}
	for i, s := range req.Streams {
		if most > 0 && s.VolumeL == most {
			out[i] = true
		}
	}
	return out
}

// dry reports whether a stream is a solid given by mass alone.
func dry(s *engine.Stream) bool { return s.MassKg > 0 && s.VolumeL == 0 }

// allDry reports whether every stream of tank is dry.
func allDry(req *engine.Request, tank []int) bool {
	for _, k := range tank {
		if !dry(&req.Streams[k]) {
			return false
		}
	}
	return len(tank) > 0
}

// water reports whether a stream is water alone (at any stated pH or
// temperature), given by volume.
func water(s *engine.Stream) bool {
	if s.VolumeL <= 0 || len(s.Components) == 0 {
		return false
	}
	for _, c := range s.Components {
		if c.Chemical == nil || c.Chemical.Formula != "H2O" {
			return false
		}
	}
	return true
}

// stepKey names a step by the set of streams in the tank and the one added.
func stepKey(tank []int, added int) string {
	s := slices.Clone(tank)
	slices.Sort(s)
	var b strings.Builder
	for _, k := range s {
		b.WriteByte(byte('a' + k))
	}
	return b.String() + ">" + string(rune('a'+added))
}

func permutations(n int) [][]int {
	var out [][]int
	var rec func(p []int, used []bool)
	rec = func(p []int, used []bool) {
		if len(p) == n {
			out = append(out, slices.Clone(p))
			return
		}
		for k := 0; k < n; k++ {
			if !used[k] {
				used[k] = true
				rec(append(p, k), used)
				used[k] = false
			}
		}
	}
	rec(nil, make([]bool, n))
	return out
}

func seqSpan(s engine.PourSequence) float64 {
	t := 0.0
	for _, st := range s.Steps {
		if worst(st) == rank(s.Worst) {
			t += span(st)
		}
	}
	return t
}

func severityOf(r int) engine.Severity {
	for _, s := range []engine.Severity{engine.Info, engine.Warning, engine.Danger} {
		if s.Rank() == r {
			return s
		}
	}
	return ""
}

// sequenceAdvice names the best sequence when it avoids what others meet.
// When a pair of the streams meets a hazard run directly into each other
// (orders), the advice names it rather than saying nothing is of concern:
// the sequence only keeps that pair apart.
func sequenceAdvice(seqs []engine.PourSequence, orders []engine.PourOrder) string {
	if len(seqs) == 0 {
		return ""
	}
	best, worstAll := seqs[0], 0
	for _, s := range seqs {
		worstAll = max(worstAll, rank(s.Worst))
	}
	if worstAll == rank(best.Worst) {
		return ""
	}
	s := "In sequence: start with " + best.Streams[0]
	for _, n := range best.Streams[1:] {
		s += ", then add " + n
	}
	s += ", slowly"
	if d := dilutedSteps(&best); d != "" {
		return s + ": " + d
	}
	if rank(best.Worst) > 0 {
		var cs []string
		for _, st := range best.Steps {
			for _, h := range st.Hazards {
				if !slices.Contains(cs, h.Code) {
					cs = append(cs, h.Code)
				}
			}
		}
		return s + "; that sequence still meets " + strings.Join(cs, ", ") + "."
	}
	var pair []string
	for _, o := range orders {
		for _, h := range o.Hazards {
			if rank(h.Worst) >= engine.Warning.Rank() && !slices.Contains(pair, h.Code) {
				pair = append(pair, h.Code)
			}
		}
	}
	if len(pair) > 0 {
		return s + ": that sequence keeps apart the streams that meet " + strings.Join(pair, ", ") + " when run directly into each other."
	}
	return s + ": nothing of concern appears along that sequence."
}

// SequenceRank is Rank over the steps of a sequence: how the sequences are
// ordered here and how the decision ranks them (hazard.decideSequence).
func SequenceRank(s *engine.PourSequence) int {
	w := 0
	for i := range s.Steps {
		w = max(w, Rank(&s.Steps[i]))
	}
	return w
}

// LiftRank is the rank by which a sequence other than the best lifts the
// decision of a make-up that a natural sequence (water first, the rest run
// into it) makes safely; hazard.decideSequence uses it then. Only a danger
// counts: a milder hazard along another sequence (soda ash run into alum
// water fizzes, a dry effervescent blend fizzes as it is wetted, a heap
// warms) stays in the advice, as an action line.
//   - Another sequence that also starts with the water counts by its
//     dangers: running the reagents into the water in the wrong order is a
//     mistake an operator makes (bleach into water already acidified).
//     Without a water stream the bulk liquid (PourSequence.BulkFirst)
//     plays the water's part.
//   - A sequence that starts with something else counts only by a danger
//     met among dry solids (PourOrder.DryStep): solids are charged from
//     bags, often into the empty tank or blended dry before the water goes
//     in, so a dry blend of oxidizer with fuel, of ammonium salt with
//     caustic, of acid with hypochlorite granules (Bretherick's Handbook of
//     Reactive Chemical Hazards, from memory) and water run onto caustic
//     flakes (it boils where it lands: common practice, no source) are
//     real. What concentrates meet run neat into each other or onto a
//     solid before the water is named by the advice ("never let … meet
//     neat") and does not lift the decision (common practice, no source).
func LiftRank(s *engine.PourSequence) int {
	danger := engine.Danger.Rank()
	if s.WaterFirst || s.BulkFirst {
		if r := SequenceRank(s); r >= danger {
			return r
		}
		return 0
	}
	w := 0
	for i := range s.Steps {
		st := &s.Steps[i]
		if r := Rank(st); st.DryStep && r >= danger {
			w = max(w, r)
		}
	}
	return w
}

// againstSequence reports whether running o.Added into o.Into goes against
// the sequence s, in which every stream runs into those before it.
func againstSequence(o *engine.PourOrder, s *engine.PourSequence) bool {
	a, b := slices.Index(s.Streams, o.Added), slices.Index(s.Streams, o.Into)
	return a >= 0 && b >= 0 && a < b
}

// DilutedRank tells whether the sequence s meets a hazard (one that
// counts, Rank) only where a stream lands in the diluted tank
// (PourHazard.Diluted), and the worst rank of its other hazards.
func DilutedRank(s *engine.PourSequence) (diluted bool, rest int) {
	for _, st := range s.Steps {
		for _, h := range st.Hazards {
			switch {
			case h.Code == "warms":
			case h.Diluted:
				diluted = true
			default:
				rest = max(rest, rank(h.Worst))
			}
		}
	}
	return diluted, rest
}

// dilutedSteps is the precaution for the steps of s that meet a hazard
// only where the added stream lands in the diluted tank: dose it into the
// diluted water at a separate point, with mixing; then what the sequence
// still meets besides ("" when s meets nothing there).
func dilutedSteps(s *engine.PourSequence) string {
	var parts, at, other []string
	for i, st := range s.Steps {
		dosed := false
		for _, h := range st.Hazards {
			switch {
			case h.Code == "warms":
			case h.Diluted:
				if !slices.Contains(at, h.Code) {
					at = append(at, h.Code)
				}
				if !dosed {
					dosed = true
					parts = append(parts, "dose "+st.Added+" into the diluted water at a separate point, away from where "+strings.Join(s.Streams[1:i+1], " and ")+" went in, with mixing")
				}
			case !slices.Contains(other, h.Code):
				other = append(other, h.Code)
			}
		}
	}
	if len(parts) == 0 {
		return ""
	}
	out := strings.Join(parts, "; ") + " (where it lands it would meet " + strings.Join(at, ", ") + ")"
	if len(other) > 0 {
		out += "; that sequence still meets " + strings.Join(other, ", ")
	}
	return out + "."
}
