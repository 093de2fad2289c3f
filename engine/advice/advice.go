// Package advice answers a mix request the way an operator reads it: the
// engine's prediction, judged through the hazard package's Outcome, the
// pour along the addition, and the decision first. It also renders the
// short answer and reviews a catalogue of streams pair by pair. No I/O.
package advice

import (
	"fmt"
	"io/fs"
	"math"

	"mixward/engine"
	"mixward/engine/hazard"
	"mixward/engine/pour"
)

// Advisor answers requests with a decision. It is safe for concurrent use.
type Advisor struct {
	Engine *engine.Engine
	Gases  *hazard.Data

	water *engine.Stream // one litre of water, parsed once (see concentrates)
}

// New builds an Advisor on a loaded engine, reading the gas table from fsys
// (normally data.FS).
func New(e *engine.Engine, fsys fs.FS) (*Advisor, error) {
	d, err := hazard.Load(fsys)
	if err != nil {
		return nil, err
	}
	if err := d.UseSpecies(e.Tables.Thermo); err != nil {
		return nil, err
	}
	a := &Advisor{Engine: e, Gases: d}
	if w, err := engine.Parse("mix 1 L water", e.Tables, engine.AskOptions{}); err == nil && len(w.Streams) == 1 {
		a.water = &w.Streams[0]
	}
	return a, nil
}

// Ask parses and answers a request: the engine's prediction with the
// hazards judged from what forms, the pour, and the decision.
func (a *Advisor) Ask(text string, opt engine.AskOptions) (*engine.Result, error) {
	req, err := engine.Parse(text, a.Engine.Tables, opt)
	if err != nil {
		return nil, err
	}
	return a.Predict(req)
}

// Predict answers a parsed request.
func (a *Advisor) Predict(req *engine.Request) (*engine.Result, error) {
	// The pour and the concentrate checks work on the amounts as read (a
	// mass of a solution as its volume), as the prediction does.
	req = engine.ReadAmounts(req, a.Engine.Tables)
	res, err := a.Engine.Predict(req)
	if err != nil {
		return nil, err
	}
	o := hazard.FromResult(res, a.Engine.Tables)
	o.HottestC = hottestC(req)
	alone := a.alone(req, o.HeadspaceL)
	res.Hazards = hazard.RelativeFinal(hazard.Judge(o, a.Gases), pick(alone, req.Streams))
	if o.Heat.Known && len(o.Heat.Families) > 0 {
		res.Notes = append(res.Notes, fmt.Sprintf("heat counted for the hazards: %.0f kJ, of which %.0f kJ from reactions judged as families (their stoichiometry and reaction enthalpy, limited by the reagent that runs out first)", o.Heat.ReleasedkJ, o.Heat.ReleasedkJ-o.Heat.StatekJ))
	} else if o.Heat.Known && o.Heat.RiseC != rise(res) {
		res.Notes = append(res.Notes, fmt.Sprintf("heat counted for the hazards: %.0f kJ, about %+.1f °C (reactions that do not proceed left out)", o.Heat.ReleasedkJ, o.Heat.RiseC))
	}
	if o.Named("NaOCl") && !o.Named("NaOH") {
		res.Notes = append(res.Notes, BleachCausticNote)
	}
	res.Notes = append(res.Notes, "gas concentrations are for "+HeadspaceBasis(o.HeadspaceL, o.HeadspaceStated)+", at equilibrium")
	// tankPH is the pH of the tank a point of the pour was poured into
	// (every stream of the point but the last, the one added), solved
	// once per tank: the pour judges whether the tank has crossed the
	// middle of the pH range between two points.
	tanks := map[string]float64{}
	tankPH := func(r *engine.Request) float64 {
		n := len(r.Streams) - 1
		if n < 1 {
			return math.NaN()
		}
		key := ""
		for _, s := range r.Streams[:n] {
			key += streamKey(s) + fmt.Sprintf("\x00%g\x00%g\x01", s.VolumeL, s.MassKg)
		}
		if ph, ok := tanks[key]; ok {
			return ph
		}
		t := *r
		t.Streams = r.Streams[:n]
		ph := math.NaN()
		if _, to, err := a.judgeIn(&t, o.HeadspaceL); err == nil {
			ph = to.PH
		}
		tanks[key] = ph
		return ph
	}
	res.Addition = pour.AnalyseLocal(req, func(r *engine.Request) ([]engine.Hazard, error) {
		if r.TempFromStreams {
			// A point of the pour starts at the temperature of the
			// streams in it, in its own shares: the first litre of hot
			// water in a drum of peroxide does not heat the drum to the
			// temperature of the finished mix.
			r.TemperatureK, _ = engine.StreamsTemperatureK(r.Streams)
		}
		hs, po, err := a.judgeIn(r, o.HeadspaceL)
		if err != nil {
			return nil, err
		}
		return hazard.Relative(hazard.AlongPourAt(hs, po, func() float64 { return tankPH(r) }), pick(alone, r.Streams)), nil
	}, a.landing(req, a.concentrates(req)))
	if res.Addition == nil {
		res.Addition = &engine.Addition{Orders: []engine.PourOrder{}, Advice: "One stream: nothing is poured into anything."}
	}
	pour.Written(res.Addition, req)
	d := hazard.Decide(res.Hazards, res.Addition)
	d.HeadspaceL, d.HeadspaceStated = o.HeadspaceL, o.HeadspaceStated
	d.Held = []string{}
	d.Gases = []engine.GasRelease{}
	for _, g := range o.Gases {
		d.Gases = append(d.Gases, engine.GasReleaseOf(g.Formula+"(g)", g.Mol, o.TemperatureK(), o.PressureKPa))
	}
	judgedGases(&d, res.Hazards)
	for _, h := range o.HeldBack {
		d.Held = append(d.Held, h.Text+": "+h.Reason)
	}
	if o.Heat.Known {
		d.Heat = &engine.HeatJudged{ReleasedkJ: round1(o.Heat.ReleasedkJ), ReachedC: round1(o.Heat.ReachedC), Boils: o.Heat.Boils, IfRuns: o.Heat.IfRuns, SteamKg: round1(o.Heat.SteamKg)}
		if res.Heat != nil {
			res.Heat.IfRuns = o.Heat.IfRuns
		}
		if len(o.Heat.Families) > 0 {
			state := round1(o.Heat.StatekJ)
			d.Heat.StatekJ, d.Heat.Reactions = &state, o.Heat.Families
			if res.Heat != nil {
				total := d.Heat.ReleasedkJ
				res.Heat.FamilyReactions, res.Heat.TotalReleasedkJ = o.Heat.Families, &total
			}
		}
	}
	res.Decision = &d
	return res, nil
}

// BleachCausticNote says how sodium hypochlorite is read. Commercial bleach
// carries 0.2–1 % NaOH as a stabiliser (common practice, no source), which
// varies by supplier and age; "NaOCl x %" is taken as the hypochlorite
// named, without it. That errs towards more chlorine when bleach meets acid
// (the dangerous side) and towards a more acid end after dechlorination; an
// operator who knows the caustic names it ("NaOCl 12.5 %, NaOH 0.5 %") or
// states the stream's pH.
const BleachCausticNote = "sodium hypochlorite is taken as named, without the 0.2–1 % NaOH that commercial bleach carries as a stabiliser (common practice): name it (\"NaOCl 12.5 %, NaOH 0.5 %\") or state the stream's pH to count it"

// evaluate judges one stream or mix by itself.
func (a *Advisor) evaluate(req *engine.Request) ([]engine.Hazard, error) {
	return a.evaluateIn(req, 0)
}

// evaluateIn judges one point of a pour in a tank whose headspace is
// headspaceL (see hazard.Outcome.InTank).
func (a *Advisor) evaluateIn(req *engine.Request, headspaceL float64) ([]engine.Hazard, error) {
	hs, _, err := a.judgeIn(req, headspaceL)
	return hs, err
}

// judgeIn is evaluateIn with the Outcome judged.
func (a *Advisor) judgeIn(req *engine.Request, headspaceL float64) ([]engine.Hazard, *hazard.Outcome, error) {
	res, err := a.Engine.PredictBrief(req)
	if err != nil {
		return nil, nil, err
	}
	o := hazard.FromResult(res, a.Engine.Tables)
	o.HottestC = hottestC(req)
	o.InTank(headspaceL)
	return hazard.Judge(o, a.Gases), o, nil
}

// alone judges each stream by itself, keyed by streamKey: as it is stored
// before it is poured, at its own stated temperature (25 °C when it has
// none) and without the pH stated for the mix. A hazard is the stream's own
// only if the stock gives it off as stored: a drum of peroxide at 25 °C
// gives off no oxygen, whatever the hot tank it goes into makes of it.
//
// Each stream is also judged in the tank's headspace (headspaceL, the one
// the points of the pour are judged with, hazard.Alone.InTank), so that a
// gas is compared with the stream's own at the same gas space.
func (a *Advisor) alone(req *engine.Request, headspaceL float64) map[string]hazard.Alone {
	out := map[string]hazard.Alone{}
	for _, s := range req.Streams {
		r := streamAlone(req, s)
		if a.water != nil && engine.GasAsSold(&s, a.Engine.Tables) {
			// A liquefied gas by itself has no liquid to hold it: judged
			// over a film of water (a litre per tonne, as it meets moist
			// air), it gives off what it is.
			film := *a.water
			film.VolumeL = math.Max(s.MassKg, 0.001) * 1e-3
			r.Streams = append(r.Streams, film)
		}
		hs, err := a.evaluate(&r)
		if err != nil {
			continue
		}
		al := hazard.Alone{Name: pour.Name(&s), Hazards: hs}
		if in, err := a.evaluateIn(&r, headspaceL); err == nil {
			al.InTank = in
		}
		if k, ok := statedHotter(req, &r); ok {
			// The stream at the temperature stated for the mix: what it
			// gives off by itself there (hazard.Alone.Hot).
			hr := r
			hr.TemperatureK, hr.TempStated = k, true
			if hs, err := a.evaluate(&hr); err == nil {
				al.Hot = hs
			}
			if in, err := a.evaluateIn(&hr, headspaceL); err == nil {
				al.Hot = append(al.Hot, in...)
			}
			al.HotC = k - 273.15
		}
		out[streamKey(s)] = al
	}
	return out
}

// hottestC is the temperature (°C) of the hottest stream of req as
// stored (25 °C for one without its own), or the one stated for the whole
// mix when that is hotter (hazard.Outcome.HottestC).
func hottestC(req *engine.Request) float64 {
	k := engine.StandardTemperatureK
	if req.TempStated && !req.TempFromStreams {
		k = req.TemperatureK
	}
	for _, s := range req.Streams {
		if s.TemperatureK != nil {
			k = max(k, *s.TemperatureK)
		}
	}
	return k - 273.15
}

// statedHotter gives the temperature stated for the whole mix of req when
// it is hotter than the stream alone (r, as stored) by more than a degree.
func statedHotter(req, r *engine.Request) (float64, bool) {
	if !req.TempStated || req.TempFromStreams || !(req.TemperatureK > r.TemperatureK+1) {
		return 0, false
	}
	return req.TemperatureK, true
}

// streamAlone is the request of one stream of req by itself, as stored.
func streamAlone(req *engine.Request, s engine.Stream) engine.Request {
	r := *req
	r.Streams = []engine.Stream{s}
	r.PH = nil
	r.TemperatureK, r.TempStated = engine.StandardTemperatureK, false
	if s.TemperatureK != nil {
		r.TemperatureK, r.TempStated = *s.TemperatureK, true
	}
	return r
}

// pick returns the judgements alone of the streams given (a pour point
// holds two of the request's streams, one of them scaled).
func pick(alone map[string]hazard.Alone, ss []engine.Stream) []hazard.Alone {
	var out []hazard.Alone
	for _, s := range ss {
		if a, ok := alone[streamKey(s)]; ok {
			out = append(out, a)
		}
	}
	return out
}

func streamKey(s engine.Stream) string { return s.Tag + "\x00" + s.Text }

func rise(r *engine.Result) float64 {
	if r.Heat == nil || r.Heat.TemperatureRiseC == nil {
		return 0
	}
	return *r.Heat.TemperatureRiseC
}

func round1(x float64) float64 { return math.Round(x*10) / 10 }

func trim(x float64) string { return fmt.Sprintf("%.4g", x) }

// judgedGases raises a gas of the decision to the amount its hazard judges
// when that is larger: a gas the mix's own heat drives off (the Henry
// constant at the temperature reached), a boil-off, or a fast reaction
// beyond the equilibrium state. The decision's list then agrees with the
// short answer's Forms line; Kind "driven-off" marks such a figure.
func judgedGases(d *engine.Decision, hs []engine.Hazard) {
	for _, h := range hs {
		j := h.Gas
		if j == nil || !(j.Mol > 0) {
			continue
		}
		for i := range d.Gases {
			g := &d.Gases[i]
			if g.Text == j.Formula+"(g)" && j.Mol > 1.2*g.Mol {
				g.Mol, g.VolumeL, g.VolumeM3, g.Kind = j.Mol, j.VolumeL, j.VolumeL/1000, "driven-off"
			}
		}
	}
}
