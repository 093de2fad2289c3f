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

// span is how much of the addition the order's worst hazards cover.
func span(o engine.PourOrder) float64 {
	w, s := worst(o), 0.0
	for _, h := range o.Hazards {
		if rank(h.Worst) == w {
			s += h.ToFraction - h.FromFraction + 0.001
		}
	}
	return s
}

// advice compares the orders of each pair of streams and says which to use.
func advice(add *engine.Addition) string {
	var parts []string
	quiet := 0
	// A sequence of three or more streams that meets no danger keeps the
	// unsafe pairs apart.
	safeSeq := len(add.Sequences) > 0 && rank(add.Sequences[0].Worst) < 3
	for i := 0; i+1 < len(add.Orders); i += 2 {
		x, y := add.Orders[i], add.Orders[i+1]
		if worst(x) == 0 && worst(y) == 0 {
			quiet++
			if len(add.Orders) > 2 {
				continue // with three or more streams only the pairs that matter are named
			}
		}
		if safeSeq && worst(x) >= 3 && worst(y) >= 3 && !heatOnly(x) && !heatOnly(y) {
			// With three or more streams such a pair meets only in the
			// sequence named before this advice, never neat.
			parts = append(parts, "Never let "+x.Added+" and "+x.Into+" meet neat ("+codes(x)+" while "+x.Added+" runs into "+x.Into+", "+codes(y)+" the other way).")
			continue
		}
		if a := pairAdvice(x, y); !slices.Contains(parts, a) {
			parts = append(parts, a)
		}
	}
	if len(add.Orders) > 2 && quiet*2 == len(add.Orders) {
		return "Any order: nothing of concern appears along the pour of any pair."
	}
	return strings.Join(parts, " ")
}

func pairAdvice(x, y engine.PourOrder) string {
	wx, wy := worst(x), worst(y)
	switch {
	case wx == 0 && wy == 0:
		return "Either order: nothing of concern appears along the pour of " + x.Added + " and " + x.Into + "."
	case wx >= 3 && wy >= 3 && heatOnly(x) && heatOnly(y):
		return "Neither order is safe with this little water: use more water and run the concentrate into it slowly, with cooling and stirring (" +
			codes(x) + " while " + x.Added + " runs into " + x.Into + ", " + codes(y) + " the other way)."
	case wx >= 3 && wy >= 3:
		return "Neither order is safe: " + codes(x) + " while " + x.Added + " runs into " + x.Into + ", " + codes(y) + " the other way."
	case wx < wy:
		return better(x, y)
	case wy < wx:
		return better(y, x)
	case bulkInto(x):
		// Both orders meet the same level: running a tank into a drum to
		// shorten the stretch is no practical advice; dose the drum.
		return doseSmall(y)
	case bulkInto(y):
		return doseSmall(x)
	case span(x) < span(y):
		return lessens(x, y)
	case span(y) < span(x):
		return lessens(y, x)
	}
	return "Both orders meet the same hazards (" + codes(x) + "); no order of addition avoids them: follow the actions above."
}

func better(good, bad engine.PourOrder) string {
	s := "Add " + good.Added + " into " + good.Into + ", slowly; never " + bad.Added + " into " + bad.Into + " (" + codes(bad) + " from " + pct(firstWorst(bad)) + " of the addition)."
	if worst(good) > 0 {
		s += " That order still meets " + codes(good) + "."
	}
	if good.IntoL > 0 && good.AddedL >= 10*good.IntoL && acidGasOnly(bad) {
		// Running a tank into a drum is seldom practical: the gas comes
		// from the acid of the larger stream, which can be changed first.
		s += " At these volumes, rather bring " + good.Added + " to neutral first (pH 7 or more), then run " + good.Into + " into it."
	}
	return s
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

func doseSmall(o engine.PourOrder) string {
	return "Dose " + o.Added + " slowly into " + o.Into + ", under control: either order meets " + codes(o) + ", and running the larger stream into the smaller is not practical."
}

func lessens(good, bad engine.PourOrder) string {
	return "Add " + good.Added + " into " + good.Into + ", slowly: it meets " + codes(good) + " over less of the pour than the other way."
}

func firstWorst(o engine.PourOrder) float64 {
	w, f := worst(o), 1.0
	for _, h := range o.Hazards {
		if rank(h.Worst) == w && h.FromFraction < f {
			f = h.FromFraction
		}
	}
	return f
}

// codes names the hazards an order meets, each once; of the graded heat
// hazards only the hottest is named (the pour passes through the milder
// ones on the way to it).
func codes(o engine.PourOrder) string {
	var cs []string
	seen := map[string]bool{}
	hottest := 0
	for _, h := range o.Hazards {
		hottest = max(hottest, heatGrade[h.Code])
	}
	for _, h := range o.Hazards {
		if g := heatGrade[h.Code]; g > 0 && g < hottest {
			continue
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
	w, other := add.Orders[1], add.Orders[0]
	add.Written = &engine.WrittenOrder{Added: w.Added, Into: w.Into, Worse: worst(w) > worst(other)}
	if ww := worst(w); ww > 0 && ww == worst(other) && firstWorst(w) < firstWorst(other)/2 {
		// Neither order avoids the hazard, but the one written meets it
		// much sooner (water into strong acid boils at the first drop).
		add.Advice = "The order written is the worse one: " + codes(w) + " from " + pct(firstWorst(w)) + " of the addition while " +
			w.Added + " runs into " + w.Into + ", from " + pct(firstWorst(other)) + " the other way. " + add.Advice
	}
}
