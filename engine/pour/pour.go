// Package pour judges a mix along the addition: while one stream runs into
// another every ratio from the first drop to the final one occurs in the
// tank. It evaluates the mix at fractions of the added stream, both orders
// of addition (each pair of streams when there are three or more), and
// reports where each hazard appears and which order avoids or lessens it.
//
// It knows nothing of how a point is evaluated: the caller passes an
// Evaluate function (today the engine's prediction judged through the
// hazard package's Outcome; later the equilibrium state). No I/O.
package pour

import (
	"strings"

	"mixward/engine"
)

// fractions are the shares of the added stream at which the pour is judged:
// 23 points, denser near the first drop and near the end.
var fractions = [...]float64{0.001, 0.003, 0.01, 0.02, 0.04, 0.07, 0.1, 0.15, 0.2, 0.3, 0.4, 0.5,
	0.6, 0.7, 0.8, 0.85, 0.9, 0.93, 0.96, 0.98, 0.99, 0.995, 1}

// Fractions returns the shares of the added stream at which the pour is
// judged.
func Fractions() []float64 { return append([]float64(nil), fractions[:]...) }

// Evaluate judges one mix and returns its hazards.
type Evaluate func(req *engine.Request) ([]engine.Hazard, error)

// Local gives the hazards an order of addition meets where the added
// stream lands, whatever the share poured, which the mix judged as a whole
// at each point cannot show: water run onto concentrated sulfuric acid boils
// where it lands although the tank on average stays cool. tank holds the
// streams already in the tank.
type Local func(added engine.Stream, tank []engine.Stream) []engine.PourHazard

// Analyse judges the pour of a request's streams. With fewer than two
// streams there is no pour and it returns nil.
func Analyse(req *engine.Request, eval Evaluate) *engine.Addition {
	return AnalyseLocal(req, eval, nil)
}

// AnalyseLocal is Analyse with the hazards where the added stream lands
// (nil for none).
func AnalyseLocal(req *engine.Request, eval Evaluate, local Local) *engine.Addition {
	n := len(req.Streams)
	if n < 2 {
		return nil
	}
	add := &engine.Addition{Orders: []engine.PourOrder{}}
	byPair := map[[2]int]engine.PourOrder{} // (added, into) → order
	for i := 0; i < n; i++ {
		for j := i + 1; j < n; j++ {
			for _, ord := range [][2]int{{j, i}, {i, j}} {
				sa, sb := withAmount(req.Streams[ord[0]]), withAmount(req.Streams[ord[1]])
				o, pts := order(req, ord[0], ord[1], eval, func(f float64) []engine.Stream {
					return []engine.Stream{sb, scaled(sa, f)}
				})
				o.Hazards = withLocal(o.Hazards, local, req.Streams[ord[0]], req.Streams[ord[1]:ord[1]+1])
				add.Orders = append(add.Orders, o)
				add.Points += pts
				byPair[ord] = o
			}
		}
	}
	var pts int
	add.Sequences, pts = sequences(req, eval, byPair, local)
	add.Points += pts
	add.Advice = advice(add)
	if s := sequenceAdvice(add.Sequences, add.Orders); s != "" {
		add.Advice = s + " " + add.Advice
	}
	return add
}

// Name is how a stream is called in the pour: its tag, or what it holds.
func Name(s *engine.Stream) string {
	if s.Tag != "" {
		return s.Tag
	}
	if l := s.Label(); l != "" {
		return l
	}
	return strings.TrimSpace(s.Text)
}

// order runs stream a into stream b and records the hazards met; streams
// gives the streams in the tank when the share f of a has gone in.
func order(req *engine.Request, a, b int, eval Evaluate, streams func(f float64) []engine.Stream) (engine.PourOrder, int) {
	po := engine.PourOrder{Added: Name(&req.Streams[a]), Into: Name(&req.Streams[b]), Hazards: []engine.PourHazard{},
		AddedL: req.Streams[a].VolumeL, IntoL: req.Streams[b].VolumeL}
	open := map[string]*engine.PourHazard{}
	worstRatio := map[string]float64{} // the message kept is that of the worst point
	var keys []string
	own, _ := tankAlone(req, eval, streams) // not points along the pour
	pts := 0
	for _, f := range fractions {
		r := *req
		r.Streams = streams(f)
		hs, err := eval(&r)
		if err != nil {
			continue
		}
		pts++
		seen := map[string]bool{}
		for _, h := range hs {
			if h.Severity == engine.Info || seen[h.Code] || own.covers(h) {
				continue
			}
			seen[h.Code] = true
			if ph := open[h.Code]; ph != nil {
				largestGas(ph, h, f)
				ph.ToFraction = f
				if rank(h.Severity) > rank(ph.Worst) || (h.Severity == ph.Worst && ratio(h) > worstRatio[h.Code]) {
					ph.Worst, ph.Message = h.Severity, h.Message
					worstRatio[h.Code] = ratio(h)
				}
				continue
			}
			worstRatio[h.Code] = ratio(h)
			open[h.Code] = &engine.PourHazard{Code: h.Code, FromFraction: f, ToFraction: f, Worst: h.Severity, Message: h.Message}
			largestGas(open[h.Code], h, f)
			keys = append(keys, h.Code)
		}
		// A hazard that stopped is closed; if it comes back it is a new run.
		for _, k := range keys {
			if ph := open[k]; ph != nil && !seen[k] {
				po.Hazards = append(po.Hazards, *ph)
				delete(open, k)
			}
		}
	}
	for _, k := range keys {
		if ph := open[k]; ph != nil {
			po.Hazards = append(po.Hazards, *ph)
			delete(open, k)
		}
	}
	return po, pts
}

// tankHazards are the hazards of what is in the tank before anything is
// added, by code.
type tankHazards map[string]engine.Hazard

// tankAlone judges what is poured together, each apart: the tank before
// the pour (the streams at the share 0 of the added one, without it) and the
// added stream by itself (at its full amount). It returns their hazards, the
// louder of the two by code, and the mixes evaluated.
func tankAlone(req *engine.Request, eval Evaluate, streams func(f float64) []engine.Stream) (tankHazards, int) {
	var tank []engine.Stream
	for _, s := range streams(0) {
		if s.VolumeL > 0 || s.MassKg > 0 {
			tank = append(tank, s)
		}
	}
	all := streams(1)
	var added []engine.Stream
	if len(all) > len(tank) {
		added = all[len(all)-1:] // streams puts the added stream last
	}
	own := tankHazards{}
	pts := 0
	for _, part := range [][]engine.Stream{tank, added} {
		if len(part) == 0 || !allLiquid(part) {
			// A dry solid by itself is not the liquid it is judged as:
			// water run onto dithionite powder meets what the solution
			// alone would not show.
			continue
		}
		r := *req
		r.Streams = part
		hs, err := eval(&r)
		if err != nil {
			continue
		}
		pts++
		for _, h := range hs {
			if o, ok := own[h.Code]; !ok || rank(h.Severity) > rank(o.Severity) ||
				(h.Severity == o.Severity && ratio(h) > ratio(o)) {
				own[h.Code] = h
			}
		}
	}
	return own, pts
}

// merge keeps in own the louder of its hazards and those of o, by code.
func (own tankHazards) merge(o tankHazards) {
	for c, h := range o {
		if p, ok := own[c]; !ok || rank(h.Severity) > rank(p.Severity) || (h.Severity == p.Severity && ratio(h) > ratio(p)) {
			own[c] = h
		}
	}
}

// allLiquid reports whether every stream is given by volume.
func allLiquid(ss []engine.Stream) bool {
	for _, s := range ss {
		if !(s.VolumeL > 0) {
			return false
		}
	}
	return true
}

// covers reports whether the tank or the added stream alone already has
// the hazard h, as loud and as strong (its gas no more than a tenth above):
// the pour does not meet it, the stream has it whatever it meets (a cyanide
// liquor's own hydrogen cyanide over its closed headspace when caustic is
// dosed into it; strong ammonia's own fumes when water runs into it or it
// runs into water). A stream's own hazards are the final mix's to name,
// with the stream's own precautions.
func (own tankHazards) covers(h engine.Hazard) bool {
	o, ok := own[h.Code]
	if !ok || rank(h.Severity) > rank(o.Severity) {
		return false
	}
	// Only gases are compared: a hazard without a figure (hydrofluoric acid
	// burns, chromium(VI) exposure) stays with the pour, whose order the
	// advice may still settle.
	return h.Gas != nil && o.Gas != nil && h.Gas.Ratio <= 1.1*o.Gas.Ratio
}

// withLocal puts the hazards where the added stream lands before those of
// the mix along the pour.
func withLocal(hs []engine.PourHazard, local Local, added engine.Stream, tank []engine.Stream) []engine.PourHazard {
	if local == nil {
		return hs
	}
	lh := local(added, tank)
	if len(lh) == 0 {
		return hs
	}
	return append(lh, hs...)
}

// withAmount gives a stream without an amount the 1 L the engine assumes
// when volumes are not stated (equal volumes).
func withAmount(s engine.Stream) engine.Stream {
	if s.VolumeL <= 0 && s.MassKg <= 0 {
		s.VolumeL = 1
	}
	return s
}

func scaled(s engine.Stream, f float64) engine.Stream {
	s.VolumeL *= f
	s.MassKg *= f
	return s
}

func ratio(h engine.Hazard) float64 {
	if h.Gas != nil {
		return h.Gas.Ratio
	}
	if h.Heat != nil {
		return h.Heat.ReachedC
	}
	return 0
}

func rank(s engine.Severity) int { return s.Rank() }

// largestGas keeps on ph the largest amount of the gas of h met so far.
func largestGas(ph *engine.PourHazard, h engine.Hazard, f float64) {
	if h.Gas == nil || !(h.Gas.Mol > ph.GasMol) {
		return
	}
	ph.GasFormula, ph.GasMol, ph.GasAtFraction = h.Gas.Formula, h.Gas.Mol, f
}
