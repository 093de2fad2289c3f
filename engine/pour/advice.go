package pour

import (
	"slices"
	"strconv"
	"strings"

	"mixward/engine"
)

// worst is the highest severity rank met in an order.
func worst(o engine.PourOrder) int {
	w := 0
	for _, h := range o.Hazards {
		w = max(w, rank(h.Worst))
	}
	return w
}

// Rank is the worst hazard met along an order, the one rule by which the
// orders of a pair are compared, here and in the decision (hazard.Decide):
// a mix that only warms on the way (below scalding: "warms") counts for
// nothing, since a passing warm-up of part of the tank is no hazard of the
// pour.
func Rank(o *engine.PourOrder) int {
	w := 0
	for _, h := range o.Hazards {
		if h.Code == "warms" {
			continue
		}
		w = max(w, rank(h.Worst))
	}
	return w
}

// span is how much of the addition the order's worst hazards cover (by
// Rank; by the warm-up when that is all the order meets).
func span(o engine.PourOrder) float64 {
	w, s := Rank(&o), 0.0
	for _, h := range o.Hazards {
		if w > 0 && h.Code == "warms" {
			continue
		}
		if rank(h.Worst) == w || (w == 0 && h.Code == "warms") {
			s += h.ToFraction - h.FromFraction + 0.001
		}
	}
	return s
}

// advice compares the orders of each pair of streams, says which to use and
// marks it Advised.
func advice(add *engine.Addition) string {
	var parts []string
	quiet := 0
	// A sequence of three or more streams that meets no danger keeps the
	// unsafe pairs apart.
	safeSeq := len(add.Sequences) > 0 && rank(add.Sequences[0].Worst) < 3
	// A sequence named before this advice sets the order of every pair:
	// a pair's own advice that runs the other way is left out.
	var seq *engine.PourSequence
	if sequenceAdvice(add.Sequences, add.Orders) != "" {
		seq = &add.Sequences[0]
	}
	for i := 0; i+1 < len(add.Orders); i += 2 {
		x, y := &add.Orders[i], &add.Orders[i+1]
		if worst(*x) == 0 && worst(*y) == 0 {
			quiet++
			if len(add.Orders) > 2 {
				continue // with three or more streams only the pairs that matter are named
			}
		}
		if len(add.Orders) > 2 && Rank(x) == 0 && Rank(y) == 0 {
			// A pair that only warms either way (no hazard of the pour,
			// Rank) is not worth an order of its own among three or more
			// streams: advice to run it one way "over less of the pour"
			// beside a pair that no order makes safe reads as a
			// contradiction.
			quiet++
			continue
		}
		if safeSeq && Rank(x) >= 3 && Rank(y) >= 3 && !heatOnly(*x) && !heatOnly(*y) {
			// With three or more streams such a pair meets only in the
			// sequence named before this advice, never neat.
			parts = append(parts, "Never let "+x.Added+" and "+x.Into+" meet neat ("+codes(*x)+" while "+x.Added+" runs into "+x.Into+", "+codes(*y)+" the other way).")
			continue
		}
		a := pairAdvice(x, y)
		if seq != nil && ((x.Advised && againstSequence(x, seq)) || (y.Advised && againstSequence(y, seq))) {
			x.Advised, x.Dosed, y.Advised, y.Dosed = false, false, false, false
			continue
		}
		if !slices.Contains(parts, a) {
			parts = append(parts, a)
		}
	}
	if len(add.Orders) > 2 && quiet*2 == len(add.Orders) {
		return "Any order: nothing of concern appears along the pour of any pair."
	}
	return strings.Join(parts, " ")
}

// pairAdvice chooses between the two orders of a pair by one rule, marks
// the one it names Advised (and Dosed) and says why:
//   - the order of the lower Rank, unless it runs a stream ten or more times
//     larger into the smaller and what the other order meets beyond it is
//     a gas that holding the pH (or neutralising first) prevents: then the
//     smaller stream is dosed into the larger under that control (a
//     treatment reagent into the waste tank; common practice, no source);
//   - at the same Rank, the smaller stream dosed into the larger when one is
//     ten times the other, else the order that meets its hazards over less
//     of the pour.
//
// No order is named when neither is safe or nothing of concern appears.
func pairAdvice(x, y *engine.PourOrder) string {
	rx, ry := Rank(x), Rank(y)
	switch {
	case worst(*x) == 0 && worst(*y) == 0:
		return "Either order: nothing of concern appears along the pour of " + x.Added + " and " + x.Into + "."
	case rx >= 3 && ry >= 3 && heatOnly(*x) && heatOnly(*y):
		return "Neither order is safe with this little water: use more water and run the concentrate into it slowly, with cooling and stirring (" +
			codes(*x) + " while " + x.Added + " runs into " + x.Into + ", " + codes(*y) + " the other way)."
	case rx >= 3 && ry >= 3:
		return "Neither order is safe: " + codes(*x) + " while " + x.Added + " runs into " + x.Into + ", " + codes(*y) + " the other way."
	case rx < ry:
		return better(x, y)
	case ry < rx:
		return better(y, x)
	case bulkInto(*x):
		// Both orders meet the same level: running a tank into a drum to
		// shorten the stretch is no practical advice; dose the drum.
		y.Advised = true
		return doseSmall(*y, *x)
	case bulkInto(*y):
		x.Advised = true
		return doseSmall(*x, *y)
	case span(*x) < span(*y):
		x.Advised = true
		return lessens(*x, *y)
	case span(*y) < span(*x):
		y.Advised = true
		return lessens(*y, *x)
	}
	return "Both orders of " + x.Added + " and " + x.Into + " meet the same hazards (" + codes(*x) + "); no order of adding these two avoids them: follow the actions above."
}

// better advises good, of the lower Rank, over bad; or, when good runs a
// much larger stream into the smaller and bad meets beyond it only gases
// that the pH decides, bad dosed under control.
func better(good, bad *engine.PourOrder) string {
	if bulkInto(*good) && pHGasesBeyond(*bad, Rank(good)) {
		bad.Advised, bad.Dosed = true, true
		return dosed(*good, *bad)
	}
	good.Advised = true
	s := "Add " + good.Added + " into " + good.Into + ", slowly; never " + bad.Added + " into " + bad.Into + " (" + codes(*bad) + " from " + pct(firstWorst(*bad)) + " of the addition)."
	if Rank(good) > 0 {
		s += " That order still meets " + codes(*good) + "."
	}
	return s
}

// dosed is the advice to dose bad.Added, the smaller stream, into the
// larger under control, when running the larger into it (good) meets less
// but is not practical. Running a tank into a drum is seldom practical: a
// treatment reagent is dosed into the waste tank, with its pH held (common
// practice, no source).
func dosed(good, bad engine.PourOrder) string {
	tail := "; running " + good.Added + " into " + good.Into + " meets less but is not practical at these volumes."
	if acidGasOnly(bad) {
		// The gas comes from the acid of the larger stream, which can be
		// changed first.
		return "Bring " + bad.Into + " to neutral first (pH 7 or more), then dose " + bad.Added + " slowly into it: as they are, " +
			bad.Added + " into " + bad.Into + " meets " + codes(bad) + " from " + pct(firstWorst(bad)) + " of the addition" + tail
	}
	return "Dose " + bad.Added + " slowly into " + bad.Into + ", under control, holding the pH at " + holdPH(bad, Rank(&good)) + " or more: without that, it meets " +
		gasesBeyond(bad, Rank(&good)) + " from " + pct(firstWorst(bad)) + " of the addition" + tail
}

// holdPH is the pH at or above which the tank keeps in the liquid every
// gas of o above the rank r (the highest of their pHGases floors).
func holdPH(o engine.PourOrder, r int) string {
	ph := 0.0
	for _, h := range o.Hazards {
		if h.Code != "warms" && rank(h.Worst) > r {
			ph = max(ph, pHGases[h.Code])
		}
	}
	return strconv.FormatFloat(ph, 'f', -1, 64)
}

// pHGases are the gases that holding the tank's pH keeps in the liquid,
// with the pH to hold: chlorine from hypochlorite 7 or more, hydrogen
// cyanide and cyanogen chloride 10.5 or more (alkaline cyanide treatment:
// common practice, no source; White's Handbook of Chlorination, cyanogen
// chloride below pH 10, from memory), hydrogen sulfide 10 or more (pKa1
// about 7, CRC Handbook, from memory: a thousandth left as H2S), sulfur
// dioxide 7 or more (common practice, no source).
var pHGases = map[string]float64{"chlorine-release": 7, "hcn-release": 10.5, "cyanogen-chloride-release": 10.5,
	"h2s-release": 10, "so2-release": 7}

// pHGasesBeyond reports whether every hazard of o above the rank r is one
// of the pHGases (and there is one).
func pHGasesBeyond(o engine.PourOrder, r int) bool {
	n := 0
	for _, h := range o.Hazards {
		if h.Code == "warms" || rank(h.Worst) <= r {
			continue
		}
		if _, ok := pHGases[h.Code]; !ok {
			return false
		}
		n++
	}
	return n > 0
}

// gasesBeyond names the hazards of o above the rank r, each once.
func gasesBeyond(o engine.PourOrder, r int) string {
	var cs []string
	for _, h := range o.Hazards {
		if h.Code != "warms" && rank(h.Worst) > r && !slices.Contains(cs, h.Code) {
			cs = append(cs, h.Code)
		}
	}
	return strings.Join(cs, ", ")
}

// acidGasOnly reports whether every hazard of an order is a gas that acid
// drives out of the added stream (chlorine from hypochlorite, HCN, H2S,
// SO2), which neutralising the acid side first removes.
func acidGasOnly(o engine.PourOrder) bool {
	for _, h := range o.Hazards {
		switch h.Code {
		case "chlorine-release", "hcn-release", "h2s-release", "so2-release":
		default:
			return false
		}
	}
	return len(o.Hazards) > 0
}

// bulkInto reports whether an order runs a stream at least ten times
// larger into the other.
func bulkInto(o engine.PourOrder) bool { return o.IntoL > 0 && o.AddedL >= 10*o.IntoL }

// doseSmall advises dosing o.Added, the smaller stream, into the larger;
// other is the other order of the pair. When the order dosed meets
// nothing itself (only the other way warms), the advice says what the other
// way meets rather than naming a blank hazard.
func doseSmall(o, other engine.PourOrder) string {
	if c := codes(o); c != "" {
		return "Dose " + o.Added + " slowly into " + o.Into + ", under control: either order meets " + c + ", and running the larger stream into the smaller is not practical."
	}
	s := "Dose " + o.Added + " slowly into " + o.Into
	if c := codes(other); c != "" {
		return s + ": the other way meets " + c + "."
	}
	return s + "."
}

func lessens(good, bad engine.PourOrder) string {
	c := codes(good)
	if c == "" {
		// The good order meets nothing: name what the other way meets.
		return "Add " + good.Added + " into " + good.Into + ", slowly: the other way meets " + codes(bad) + "."
	}
	return "Add " + good.Added + " into " + good.Into + ", slowly: it meets " + c + " over less of the pour than the other way."
}

func firstWorst(o engine.PourOrder) float64 {
	w, f := worst(o), 1.0
	r := Rank(&o)
	for _, h := range o.Hazards {
		if r > 0 && h.Code == "warms" {
			continue // named by the hazards that count (Rank)
		}
		if rank(h.Worst) == w && h.FromFraction < f {
			f = h.FromFraction
		}
	}
	return f
}

// codes names the hazards an order meets, each once; of the graded heat
// hazards only the hottest is named (the pour passes through the milder
// ones on the way to it), and a mere warm-up not beside a hazard that
// counts.
func codes(o engine.PourOrder) string {
	var cs []string
	seen := map[string]bool{}
	hottest := 0
	for _, h := range o.Hazards {
		hottest = max(hottest, heatGrade[h.Code])
	}
	counts := Rank(&o) > 0
	for _, h := range o.Hazards {
		if g := heatGrade[h.Code]; g > 0 && g < hottest {
			continue
		}
		if counts && h.Code == "warms" {
			continue // no hazard of the pour beside one that counts (Rank)
		}
		if !seen[h.Code] {
			seen[h.Code] = true
			cs = append(cs, h.Code)
		}
	}
	return strings.Join(cs, ", ")
}

func pct(f float64) string {
	s := strings.TrimRight(strings.TrimRight(strconvF(f*100), "0"), ".")
	return s + " %"
}

func strconvF(x float64) string { return strconv.FormatFloat(x, 'f', 1, 64) }

// heatGrade ranks the hazards of heat alone, mildest first.
var heatGrade = map[string]int{"warms": 1, "scalding-heat": 2, "near-boiling": 3, "boils": 4}

// heatOnly reports whether every hazard of an order is one of heat.
func heatOnly(o engine.PourOrder) bool {
	for _, h := range o.Hazards {
		if heatGrade[h.Code] == 0 {
			return false
		}
	}
	return len(o.Hazards) > 0
}

// Written records on add the order of addition the request wrote ("pour A
// into B": the first stream into the second), and whether it meets a
// hazard of a higher level than the other order.
func Written(add *engine.Addition, req *engine.Request) {
	if add == nil || !req.PourInto || len(req.Streams) != 2 || len(add.Orders) != 2 {
		return
	}
	// The orders of a pair come as (second into first, first into second).
	// The written order is judged by the rule that chose the advised one:
	// it is the worse one only when the other is advised.
	w, other := add.Orders[1], add.Orders[0]
	add.Written = &engine.WrittenOrder{Added: w.Added, Into: w.Into, Worse: !w.Advised && other.Advised && Rank(&w) > Rank(&other)}
	if ww := worst(w); ww > 0 && ww == worst(other) && !w.Advised && firstWorst(w) < firstWorst(other)/2 {
		// Neither order avoids the hazard, but the one written meets it
		// much sooner (water into strong acid boils at the first drop).
		add.Advice = "The order written is the worse one: " + codes(w) + " from " + pct(firstWorst(w)) + " of the addition while " +
			w.Added + " runs into " + w.Into + ", from " + pct(firstWorst(other)) + " the other way. " + add.Advice
	}
}
