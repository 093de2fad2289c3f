package engine

import (
	"errors"
	"fmt"
	"io/fs"
	"math"
	"sort"
	"strings"
)

// New loads and validates every table in fsys (normally data.FS) and
// returns an engine ready to answer requests.
func New(fsys fs.FS) (*Engine, error) {
	t, err := Load(fsys)
	if err != nil {
		return nil, err
	}
	if t.Kinetics, err = loadKinetics(fsys); err != nil {
		return nil, err
	}
	if t.Hazards, err = LoadHazardRules(fsys); err != nil {
		return nil, err
	}
	if t.Enthalpies, err = LoadEnthalpies(fsys); err != nil {
		return nil, err
	}
	if t.Ceilings, err = LoadCeilings(fsys, t); err != nil {
		return nil, err
	}
	t.atoms = map[string]Atoms{}
	for _, h := range t.Half {
		for _, ts := range [][]Term{h.Reactants, h.Products} {
			for i := range ts {
				ts[i].key, ts[i].text = mixKey(ts[i].Species), ts[i].Species.Text()
			}
		}
		for _, tm := range append(append([]Term(nil), h.Reactants...), h.Products...) {
			if a, err := ParseFormula(tm.Formula); err == nil {
				t.atoms[tm.Formula] = a
			}
		}
		h.sig = signature(h)
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
	t.pairRules = map[string]bool{}
	for _, k := range t.Kinetics {
		if k.Side == PairRole {
			for _, s := range k.Species {
				t.pairRules[s] = true
			}
		}
	}
	t.rows = map[Medium]mediumRows{}
	for _, med := range []Medium{Acid, Base} {
		var r mediumRows
		fits := map[string]bool{}
		for i, h := range t.Half {
			if h.Medium == Any || h.Medium == med {
				r.fitting = append(r.fitting, i)
				fits[h.sig] = true
			}
		}
		for i, h := range t.Half {
			if h.Medium != Any && h.Medium != med && !fits[h.sig] {
				r.fallback = append(r.fallback, i)
			}
		}
		t.rows[med] = r
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
	return &Engine{Tables: t}, nil
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

// Predict answers a parsed request.
func (e *Engine) Predict(req *Request) (*Result, error) {
	m, err := buildMixture(req, e.Tables)
	if err != nil {
		var pe *ParseError
		if errors.As(err, &pe) {
			return nil, pe
		}
		return nil, err
	}
	res := &Result{
		Request:      req.Text,
		Alternatives: []Alternative{},
		Hazards:      []Hazard{},
		Cautions:     Cautions(),
		Gases:        []GasRelease{},
		Steps:        []Step{},
		Caveats:      []string{},
		Notes:        append(append([]string{}, req.Notes...), m.notes...),
		ReadAs:       append([]string{}, req.Notes...),
		Conditions: Conditions{
			PH:           roundDec(m.pH, 2),
			PHStated:     m.pHStated,
			TemperatureK: roundDec(m.tempK, 2),
			TemperatureC: roundDec(m.tempK-273.15, 2),
			PressureKPa:  m.pressureKPa,
			VolumeL:      roundDec(m.volumeL, 6),
			Medium:       mediumOf(m.pH),
		},
	}
	for _, st := range req.Streams {
		so := StreamOut{Text: st.Text, Label: st.Label(), Tag: st.Tag, VolumeL: st.VolumeL, MassKg: st.MassKg, PH: st.PH, Components: []string{}}
		for _, c := range st.Components {
			so.Components = append(so.Components, c.Chemical.Formula)
		}
		res.Streams = append(res.Streams, so)
	}
	if !m.aqueous {
		res.Notes = append(res.Notes, "no liquid stream: solids alone do not react by the table method; add the liquid they will meet")
	}
	ox, red := e.sides(m)
	ps := e.pairs(m, ox, red)
	for len(ps) > 0 && ps[0].rxn() == nil {
		ps = ps[1:]
	}
	res.Species = speciesInfo(m, ox, red)
	if len(ps) == 0 {
		res.Verdict = NoReaction
		for i := range res.Species {
			res.Species[i].Spectator = !isWaterText(res.Species[i])
		}
		e.outcome(res, m, nil)
		return res, nil
	}
	head := e.terminal(m, ps)
	res.Oxidizer = head.ox.couple()
	res.Reducer = head.red.couple()
	if err := e.Tables.checkBalance(head.rxn()); err != nil {
		return nil, err
	}
	res.Reaction = head.rxn().out()
	res.ECellStandard = ptr(roundDec(head.eCellStd, 4))
	res.ECell = ptr(roundDec(head.eCell, 4))
	res.Spontaneous = head.eCell > 0
	res.Hindered = res.Spontaneous && head.eff <= 0

	res.Verdict = NonSpontaneous
	if res.Spontaneous {
		res.Verdict = Spontaneous
	}
	n := float64(head.rxn().electrons)
	res.DeltaGkJ = ptr(roundDec(-n*faraday*head.eCell/1000, 2))
	res.Log10K = ptr(roundDec(n*head.eCellStd/nernstSlope(m.tempK), 2))
	if a := head.self; a != nil {
		res.Allowance = allowanceOut(a)
	} else if a := head.ox.allowance; a != nil {
		res.Allowance = allowanceOut(a)
	} else if a := head.red.allowance; a != nil {
		res.Allowance = allowanceOut(a)
	}
	// Allowances that moved the ranking: a thermodynamically stronger pair
	// was passed over.
	for _, p := range ps {
		if p != head && p.eCell > head.eCell && (p.ox.allowance != nil || p.red.allowance != nil || p.self != nil) && res.Allowance == nil {
			a := p.self
			if a == nil {
				a = p.ox.allowance
			}
			if a == nil {
				a = p.red.allowance
			}
			res.Allowance = allowanceOut(a)
		}
	}
	inHead := map[string]bool{}
	for _, t := range head.rxn().reactants {
		inHead[t.Species.Ion()] = true
	}
	for _, t := range head.rxn().products {
		inHead[t.Species.Ion()] = true
	}
	for i := range res.Species {
		s := &res.Species[i]
		sp := Species{Formula: s.Formula, Charge: s.Charge, Phase: s.Phase}
		s.Spectator = !inHead[sp.Ion()] && !sp.IsWater()
	}
	// Every other pair that could react, one entry per net reaction,
	// strongest by E cell first, at most maxAlternatives.
	var alts []*pair
	seen := map[string]bool{head.rxn().key(): true}
	for _, p := range ps {
		if p.eCell <= 0 || p.rxn() == nil || seen[p.rxn().key()] {
			continue
		}
		seen[p.rxn().key()] = true
		alts = append(alts, p)
	}
	sort.SliceStable(alts, func(i, j int) bool { return alts[i].eCell > alts[j].eCell })
	if len(alts) > maxAlternatives {
		alts = alts[:maxAlternatives]
	}
	// The headline is checked below; every pairing of table rows is
	// checked by TestEveryPairBalances, so the alternatives are not
	// checked again on each request.
	for _, p := range alts {
		alt := Alternative{
			Oxidizer: p.ox.couple(), Reducer: p.red.couple(), Reaction: p.rxn().out(),
			ECellStandard: roundDec(p.eCellStd, 4), ECell: roundDec(p.eCell, 4),
			Hindered: p.eff <= 0,
		}
		switch {
		case p.self != nil:
			alt.Note = "kinetically slow here: " + p.self.Reason
		case p.ox.allowance != nil:
			alt.Note = "kinetically slow here: " + p.ox.allowance.Reason
		case p.red.allowance != nil:
			alt.Note = "kinetically slow here: " + p.red.allowance.Reason
		}
		res.Alternatives = append(res.Alternatives, alt)
	}
	e.outcome(res, m, head)
	return res, nil
}

func isWaterText(s SpeciesInfo) bool { return s.Formula == "H2O" && s.Charge == 0 }

func allowanceOut(a *KineticRule) *Allowance {
	return &Allowance{ID: a.ID, Volts: a.Volts, Reason: a.Reason, Source: a.Source}
}

// speciesInfo lists the species of the mix with their roles.
func speciesInfo(m *mixture, ox, red []*side) []SpeciesInfo {
	roles := map[string][]Role{}
	partners := map[string][]string{}
	mark := func(s *side) {
		k := s.main.Ion()
		for _, r := range roles[k] {
			if r == s.role {
				goto partnersOnly
			}
		}
		roles[k] = append(roles[k], s.role)
	partnersOnly:
		for _, p := range s.partners {
			t := p.Text()
			dup := false
			for _, x := range partners[k] {
				dup = dup || x == t
			}
			if !dup {
				partners[k] = append(partners[k], t)
			}
		}
	}
	for _, s := range ox {
		mark(s)
	}
	for _, s := range red {
		mark(s)
	}
	var out []SpeciesInfo
	for _, p := range m.list() {
		si := SpeciesInfo{
			Text: p.sp.Text(), Formula: p.sp.Formula, Charge: p.sp.Charge, Phase: p.sp.Phase,
			Roles: []Role{}, Mol: roundDec(p.mol, 9), Excess: p.excess,
		}
		if p.sp.Phase == Aqueous && m.volumeL > 0 {
			si.Molar = sigDigits(p.mol/m.volumeL, 4)
		}
		if p.sp.IsWater() {
			si.Mol = 0
		}
		k := p.sp.Ion()
		// Keep the order oxidizer, reducer.
		for _, r := range []Role{OxidizerRole, ReducerRole} {
			for _, x := range roles[k] {
				if x == r {
					si.Roles = append(si.Roles, r)
				}
			}
		}
		si.Partners = partners[k]
		out = append(out, si)
	}
	return out
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

// checkBalance is the last check on every equation reported: it must
// conserve every element and charge. Combining balanced half-reactions
// cannot fail it, so a failure is a bug, reported rather than shown.
func (t *Tables) checkBalance(rx *netReaction) error {
	if err := balanceErrorWith(t.atomsOf, rx.reactants, rx.products, 0); err != nil {
		return fmt.Errorf("engine: %s does not balance: %w", rx.text(), err)
	}
	return nil
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
