package engine

import (
	"errors"
	"fmt"
	"io/fs"
	"math"
	"sort"
	"strings"
	"sync"

	"mixward/engine/equilibrium"
	"mixward/engine/explain"
	"mixward/engine/state"
	"mixward/engine/thermo"
)

// New loads every table in fsys (normally data.FS), the species data
// included, and returns an engine ready to answer requests. To start quickly
// it only parses the tables that Load validates (see loadFast) and the
// species table (thermo.Load; thermo's DB.Check is the full validation): the
// tests run both validations on data/, so a table that reaches a build has
// passed them.
//
// The tables are read on three goroutines that share nothing until all are
// done (see others): this one reads the tables of Load, then the tables
// that refer to their chemicals and the indexes built from them.
func New(fsys fs.FS) (*Engine, error) {
	o := startOthers(fsys)
	t, err := loadFast(fsys)
	var after error
	if err == nil {
		after = loadAfter(fsys, t)
	}
	o.wg.Wait()
	// The first error in the order loadFast, species, hazards, enthalpies,
	// dilution, ceilings, solubility, products, locks is returned.
	if err != nil {
		return nil, err
	}
	for _, err := range o.errs {
		if err != nil {
			return nil, err
		}
	}
	if after != nil {
		return nil, after
	}
	if o.modelErr != nil {
		return nil, o.modelErr
	}
	t.Thermo, t.Hazards, t.Enthalpies, t.Dilution = o.db, o.haz, o.enth, o.dil
	return &Engine{Tables: t, Model: o.model}, nil
}

// loadAfter reads the tables that refer to the chemicals of t (ceilings,
// solubility, products) and builds t's indexes. None of it needs the
// species data.
func loadAfter(fsys fs.FS, t *Tables) error {
	var err error
	if t.Ceilings, err = LoadCeilings(fsys, t); err != nil {
		return err
	}
	if t.Solubility, err = LoadSolubility(fsys, t); err != nil {
		return err
	}
	if t.Products, err = LoadProducts(fsys, t); err != nil {
		return err
	}
	t.atoms = map[string]Atoms{}
	for _, h := range t.Half {
		t.indexHalf(h)
	}
	t.byFormula, t.byName, t.byFold = map[string]*Chemical{}, map[string]*Chemical{}, map[string]*Chemical{}
	for _, c := range t.Chemicals {
		t.byFormula[c.Formula] = c
		for _, n := range c.Names {
			t.byName[n] = c
		}
		k := strings.ToLower(c.Formula)
		if _, dup := t.byFold[k]; dup {
			t.byFold[k] = nil
		} else {
			t.byFold[k] = c
		}
	}
	t.families = families(t)
	t.famOf = map[string]int{}
	for i, f := range t.families {
		for _, s := range f.members {
			t.famOf[s.Ion()] = i
		}
	}
	t.standIn = map[string]string{}
	for _, h := range t.Half {
		h.canon = canonical(t, h)
		for _, tm := range append(append([]Term(nil), h.Reactants...), h.Products...) {
			if ion, ok := hydroxideIon(t, tm.Species); ok {
				t.standIn[mixKey(tm.Species)] = mixKey(ion)
			}
		}
	}
	return nil
}

// indexHalf fills the cached keys, texts and atom counts of one
// half-reaction.
func (t *Tables) indexHalf(h *HalfReaction) {
	for _, ts := range [][]Term{h.Reactants, h.Products} {
		for i := range ts {
			ts[i].key, ts[i].text = mixKey(ts[i].Species), ts[i].Species.Text()
			if _, done := t.atoms[ts[i].Formula]; done {
				continue
			}
			if a, err := ParseFormula(ts[i].Formula); err == nil {
				t.atoms[ts[i].Formula] = a
			}
		}
	}
	h.textRed, h.textOx = halfText(h, false), halfText(h, true)
	h.oxKeys, h.redKeys = nil, nil
	for _, r := range h.Reactants {
		if !isSolvent(r.Species) {
			h.oxKeys = append(h.oxKeys, mixKey(r.Species))
		}
	}
	for _, p := range h.Products {
		if !isSolvent(p.Species) {
			h.redKeys = append(h.redKeys, mixKey(p.Species))
		}
	}
}

// others reads, beside New's own goroutine, what does not depend on the
// tables of Load: the species data and then the locks (state.NewModel, which
// needs the species data) on one goroutine, the hazard rules, the enthalpies
// and the dilution heats on another.
type others struct {
	wg       sync.WaitGroup
	db       *thermo.DB
	model    *state.Model
	haz      []*HazardRule
	enth     map[string]Enthalpy
	dil      *Dilution
	errs     [4]error // species, hazards, enthalpies, dilution
	modelErr error
}

func startOthers(fsys fs.FS) *others {
	o := &others{}
	o.wg.Go(func() {
		if o.db, o.errs[0] = thermo.Load(fsys); o.errs[0] == nil {
			o.model, o.modelErr = state.NewModel(o.db, fsys)
		}
	})
	o.wg.Go(func() {
		o.haz, o.errs[1] = LoadHazardRules(fsys)
		o.enth, o.errs[2] = LoadEnthalpies(fsys)
		o.dil, o.errs[3] = loadDilution(fsys)
	})
	return o
}

// maxAlternatives bounds the other reacting pairs listed with an answer.
const maxAlternatives = 10

// Cautions close every answer.
var cautions = []string{
	"Advisory only, not a permit to mix. Confirm with the safety data sheets, the site's procedures and management-of-change, local codes and licensed practice before combining any streams.",
	"The prediction uses standard potentials corrected for pH, concentration and temperature (Nernst); it cannot see reaction rates, impurities or every side reaction.",
}

// Cautions returns the cautions every answer ends with.
func Cautions() []string { return append([]string(nil), cautions...) }

// Ask parses a request and predicts what happens.
func (e *Engine) Ask(text string, opt AskOptions) (*Result, error) {
	req, err := Parse(text, e.Tables, opt)
	if err != nil {
		return nil, err
	}
	return e.Predict(req)
}

// Predict answers a parsed request: the states of the streams and of the
// mix (package state), the redox steps between them (package explain), and
// the amounts, gas, heat and hazards derived from those states.
func (e *Engine) Predict(req *Request) (*Result, error) { return e.predict(req, true) }

// PredictBrief is Predict without the held-back changes (each needs the mix
// solved again with one lock lifted): for the points of a pour, where only
// what forms is judged.
func (e *Engine) PredictBrief(req *Request) (*Result, error) { return e.predict(req, false) }

func (e *Engine) predict(asked *Request, full bool) (*Result, error) {
	req := readAmounts(asked, e.Tables)
	m, err := buildMixture(req, e.Tables)
	if err != nil {
		var pe *ParseError
		if errors.As(err, &pe) {
			return nil, pe
		}
		return nil, err
	}
	res := baseResult(req, m)
	if !m.aqueous {
		res.Notes = append(res.Notes, "no liquid stream: solids alone do not react in the tank; add the liquid they will meet")
		res.Verdict = NoReaction
		res.Species = speciesOfSolids(m)
		e.finish(res, m, nil)
		return res, nil
	}
	feed, err := feedOf(req, e.Tables, e.Tables.Thermo, m)
	if err != nil {
		return nil, err
	}
	res.NotAssessed = m.notAssessed
	mx, err := e.solveHot(feed, m)
	if err != nil {
		return nil, unsolved(err)
	}
	steps, err := explain.Steps(e.Tables.Thermo, mx)
	switch {
	case errors.Is(err, explain.ErrUnexplained):
		res.Notes = append(res.Notes, fmt.Sprintf("the mixed state changes oxidation states in a way the table method cannot write out (%v); see the final composition", err))
	case err != nil:
		return nil, err
	}
	res.Notes = append(append(res.Notes, mx.Notes...), mx.Final.Eq.Notes...)
	res.Conditions.PH = roundDec(mx.Combined.PH, 2)
	res.Conditions.PHFinal = ptr(roundDec(mx.Final.PH, 2))
	res.Conditions.Medium = Medium(explain.HeadlineMedium(e.Tables.Thermo, mx))
	if !math.IsNaN(mx.Final.PH) {
		res.Conditions.MediumFinal = Medium(explain.MediumAt(e.Tables.Thermo, mx.Final.PH, mx.TempK))
	}
	res.Species = speciesOut(mx, steps)
	for _, st := range steps {
		res.Steps = append(res.Steps, e.stepOut(mx, st))
	}
	if len(steps) > 0 {
		e.headline(res, mx, steps)
	} else {
		e.noChange(res, mx)
	}
	if full {
		res.HeldBack = e.heldBack(mx)
	}
	res.FinalComposition = compositionOut(mx)
	res.ReadAs = append(res.ReadAs, metalFormNotes(req, mx)...)
	res.Gases = gasesOut(mx, formedBy(steps), m.pressureKPa, res.Conditions.HeadspaceL)
	res.Heat = heatOut(mx, m, e.Tables)
	e.outsideAqueous(res, m)
	e.finish(res, m, mx)
	return res, nil
}

// solveHot solves the feed, and once more when the mix's own heat takes it
// past a temperature that decides a lock (peroxide that a hot mix
// decomposes): the locks are then judged at the temperature reached, the
// equilibrium constants still at the starting temperature.
func (e *Engine) solveHot(feed state.Feed, m *mixture) (*state.Mix, error) {
	mx, err := e.Model.Solve(feed)
	if err != nil {
		return nil, err
	}
	h := heatOut(mx, m, e.Tables)
	if h.TemperatureReachedC == nil || !e.Model.HeatDecides(mx, *h.TemperatureReachedC) {
		return mx, nil
	}
	feed.ReachedC = h.TemperatureReachedC
	hot, err := e.Model.Solve(feed)
	if err != nil {
		return nil, err
	}
	hot.Notes = append(hot.Notes, fmt.Sprintf("the mix's own heat takes it to about %.0f °C, hot enough to undo a kinetic lock; the mix is judged with the locks as they stand at that temperature", *h.TemperatureReachedC))
	return hot, nil
}

// baseResult holds what every answer carries before any chemistry.
// req is the request with its amounts read (readAmounts): a mass of a
// solution is echoed as its volume, and the notes say so.
func baseResult(req *Request, m *mixture) *Result {
	res := &Result{
		Request: req.Text, Alternatives: []Alternative{}, Hazards: []Hazard{}, Cautions: Cautions(),
		Gases: []GasRelease{}, Steps: []Step{}, Caveats: []string{}, HeldBack: []HeldBack{},
		FinalComposition: []AmountOf{}, Species: []SpeciesInfo{},
		Amounts: &Amounts{Consumed: []AmountOf{}, Formed: []AmountOf{}},
		Notes:   append(append([]string{}, req.Notes...), m.notes...), ReadAs: append(append([]string{}, req.Notes...), m.assumed...),
		Conditions: Conditions{
			PH: roundDec(m.pH, 2), PHStated: m.pHStated,
			TemperatureK: roundDec(m.tempK, 2), TemperatureC: roundDec(m.tempK-273.15, 2),
			PressureKPa: m.pressureKPa, VolumeL: roundDec(m.volumeL, 6), Medium: mediumOf(m.pH),
			HeadspaceL: roundDec(m.volumeL, 6),
		},
	}
	if req.HeadspaceL > 0 {
		res.Conditions.HeadspaceL, res.Conditions.HeadspaceStated = req.HeadspaceL, true
	}
	for _, st := range req.Streams {
		so := StreamOut{Text: st.Text, Label: st.Label(), Tag: st.Tag, VolumeL: st.VolumeL, MassKg: st.MassKg, PH: st.PH, Components: []string{}}
		if st.TemperatureK != nil {
			c := roundDec(*st.TemperatureK-273.15, 2)
			so.TemperatureC = &c
		}
		for _, c := range st.Components {
			so.Components = append(so.Components, c.Chemical.Formula)
		}
		res.Streams = append(res.Streams, so)
	}
	return res
}

// headline fills the headline fields from the step that moved the most
// electrons; the others are its alternatives.
func (e *Engine) headline(res *Result, mx *state.Mix, steps []explain.Step) {
	h := res.Steps[0]
	res.Oxidizer, res.Reducer, res.Reaction = h.Oxidizer, h.Reducer, h.Reaction
	res.ECellStandard, res.ECell, res.DeltaGkJ, res.Log10K = h.ECellStandard, h.ECell, h.DeltaGkJ, h.Log10K
	res.Spontaneous, res.Verdict = true, Spontaneous
	res.Amounts = h.Amounts
	for i, st := range res.Steps[1:] {
		res.Alternatives = append(res.Alternatives, Alternative{
			Oxidizer: st.Oxidizer, Reducer: st.Reducer, Reaction: st.Reaction,
			ECellStandard: *st.ECellStandard, ECell: *st.ECell,
			Note: fmt.Sprintf("also proceeds: %.3g mol of electrons against %.3g in the headline", steps[i+1].ElectronsMol, steps[0].ElectronsMol),
		})
	}
}

// sig rounds x to d significant digits.
func sigDigits(x float64, d int) float64 {
	if x == 0 || math.IsInf(x, 0) || math.IsNaN(x) {
		return x
	}
	e := math.Floor(math.Log10(math.Abs(x)))
	p := math.Pow(10, float64(d-1)-e)
	return math.Round(x*p) / p
}

// atomsOf counts the atoms of a formula, from the cache built by New for
// every formula in the half-reaction table.
func (t *Tables) atomsOf(formula string) (Atoms, error) {
	if a, ok := t.atoms[formula]; ok {
		return a, nil
	}
	return ParseFormula(formula)
}

// canonical is a couple's signature with every species replaced by the
// first member of its acid–base family, so that the acid and base forms of
// one couple (HOCl/Cl- and OCl-/Cl-) compare equal.
func canonical(t *Tables, h *HalfReaction) string {
	form := func(ts []Term) string {
		var parts []string
		for _, tm := range ts {
			if isSolvent(tm.Species) {
				continue
			}
			k := tm.Species.Ion()
			if i, ok := t.famOf[k]; ok && tm.Phase == Aqueous {
				k = t.families[i].keys[0]
			}
			parts = append(parts, k)
		}
		sort.Strings(parts)
		return strings.Join(parts, "+")
	}
	return form(h.Reactants) + "/" + form(h.Products)
}

// hydroxideIon is the dissolved metal ion a hydroxide or oxide solid
// (Cr(OH)3, Fe(OH)2, ZnO) stands for: one metal atom, oxygen and hydrogen
// only, the metal's charge 2·O − H.
func hydroxideIon(t *Tables, s Species) (Species, bool) {
	if s.Phase != Solid || s.Charge != 0 {
		return Species{}, false
	}
	a, err := t.atomsOf(s.Formula)
	if err != nil || a["O"] == 0 {
		return Species{}, false
	}
	metal := ""
	for el, n := range a {
		if el == "O" || el == "H" {
			continue
		}
		if metal != "" || n != 1 {
			return Species{}, false
		}
		metal = el
	}
	z := 2*a["O"] - a["H"]
	if metal == "" || z <= 0 || z > 4 {
		return Species{}, false
	}
	return Species{Formula: metal, Charge: z, Phase: Aqueous}, true
}

// unsolved turns a mix the equilibrium cannot be found for into an answer
// withheld with its reason: too little water for a solution, or a solve
// that did not converge.
func unsolved(err error) error {
	code := "no-convergence"
	if errors.Is(err, equilibrium.ErrInfeasible) {
		code = "not-a-solution"
	}
	return &ParseError{Code: code, Suggestions: []string{},
		Message: "no answer for this mix: " + err.Error() + "; the answer is withheld rather than guessed: check the safety data sheets and ask a chemist before combining"}
}

// metalFormNotes says, for each metal poured as a solid without a word for
// its form ("turnings", "powder"), that the answer counts it as reacting as
// far as the mix takes it, as chips and powder do: a solid part reacts at
// its surface only, so the same gas and heat come over minutes to hours,
// and a passive metal (aluminium, stainless steel) in cold acid may hardly
// react (common practice, no source).
func metalFormNotes(req *Request, mx *state.Mix) []string {
	var out []string
	for _, st := range req.Streams {
		if st.VolumeL > 0 || st.MassKg <= 0 || len(st.Components) != 1 {
			continue
		}
		c := st.Components[0]
		if c.Chemical == nil || c.Chemical.Class != Metal || c.Form != "" || alkaliMetal[c.Chemical.Formula] {
			continue
		}
		for i, sp := range mx.Species {
			if sp.Text != c.Chemical.Formula+"(s)" || !(mx.Initial[i] > 0) {
				continue
			}
			if used := (mx.Initial[i] - mx.Final.Amount[i]) / mx.Initial[i]; used >= 0.1 {
				out = append(out, fmt.Sprintf("%s counted as reacting as far as the mix takes it, as turnings, chips or powder do; solid parts react at their surface, more slowly, and a passive metal in cold acid may hardly react", c.Name))
			}
		}
	}
	return out
}

// alkaliMetal are the metals that react with water in any form, lumps
// as fast as anything (Greenwood & Earnshaw, alkali metals, from memory).
var alkaliMetal = map[string]bool{"Li": true, "Na": true, "K": true, "Ca": true, "Sr": true, "Ba": true}
