package engine

import (
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"
	"sync"

	"mixward/engine/explain"
	"mixward/engine/state"
	"mixward/engine/thermo"
)

// tableRow is a row of the half-reaction table as a reaction of the species
// data, with its key for matching a derived half-reaction.
type tableRow struct {
	h   *HalfReaction
	r   thermo.Reaction
	key string
}

// tableRows parses the half-reaction table against the species data once.
// Rows whose species have no data are left out.
func (e *Engine) tableRows() []tableRow {
	e.rowsOnce.Do(func() {
		for _, h := range e.Tables.Half {
			r, err := thermo.ParseReaction(e.Tables.Thermo, HalfText(h, false))
			if err != nil {
				continue
			}
			e.rows = append(e.rows, tableRow{h: h, r: r, key: reductionKey(r)})
		}
	})
	return e.rows
}

// reductionKey identifies a half-reaction whatever its multiple: each term's
// coefficient per electron.
func reductionKey(r thermo.Reaction) string {
	parts := make([]string, 0, len(r.Terms))
	for _, t := range r.Terms {
		parts = append(parts, t.Species.Text+":"+strconv.FormatFloat(t.Nu/float64(r.Electrons), 'f', 4, 64))
	}
	sort.Strings(parts)
	return strings.Join(parts, " ")
}

// tableRow finds the table row a derived half-reaction matches.
func (e *Engine) tableRow(r thermo.Reaction) (*HalfReaction, bool) {
	k := reductionKey(r)
	for _, row := range e.tableRows() {
		if row.key == k {
			return row.h, true
		}
	}
	return nil, false
}

// candidate is a table couple that can act in the mix as combined.
type candidate struct {
	row tableRow
	e0  float64 // V at the mix temperature, from the species data
	e   float64 // V at the mix's conditions (Nernst)
}

// noChange explains a mix in which nothing changes oxidation state, by the
// table method at the mix's conditions: the strongest oxidizing agent and
// the strongest reducing agent present, and why they do not react (E cell
// not positive, or a change held back at plant conditions).
func (e *Engine) noChange(res *Result, mx *state.Mix) {
	ox, red := e.strongest(mx)
	if ox == nil || red == nil || solventOnly(ox, mx.Combined.PH) || solventOnly(red, mx.Combined.PH) {
		res.Verdict = NoReaction
		return
	}
	net, n := explain.Combine(ox.row.r, red.row.r)
	res.Oxidizer = e.tableCouple(ox, false)
	res.Reducer = e.tableCouple(red, true)
	res.Reaction = reactionOut(net, n)
	eCell := ox.e - red.e
	res.ECellStandard = ptr(roundDec(ox.e0-red.e0, 4))
	res.ECell = ptr(roundDec(eCell, 4))
	res.DeltaGkJ = ptr(roundDec(-float64(n)*thermo.F*eCell/1000, 2))
	res.Log10K = ptr(roundDec(net.LogK(mx.TempK), 2))
	res.Spontaneous = eCell > 0
	res.Verdict = NonSpontaneous
	if res.Spontaneous {
		res.Verdict = Spontaneous
		res.Hindered = true
		res.Notes = append(res.Notes, "the strongest pair on the table has a positive E cell, but the change is held back at plant conditions (see held back): nothing is run to completion")
	}
}

// solventOnly reports whether a couple is water itself acting: a water
// couple other than the H+ of an acid (below pH 3) taking electrons. A mix
// whose strongest agent is water itself holds no pair stronger than water.
func solventOnly(c *candidate, pH float64) bool {
	if !isWaterCouple(c.row.h) {
		return false
	}
	for _, t := range c.row.r.Terms {
		if t.Nu < 0 && t.Species.Text == "H+" && pH < 3 {
			return false
		}
	}
	return true
}

func isWaterCouple(h *HalfReaction) bool {
	for _, ts := range [][]Term{h.Reactants, h.Products} {
		for _, t := range ts {
			if !isSolvent(t.Species) && !(t.Formula == "H2" || t.Formula == "O2") {
				return false
			}
		}
	}
	return true
}

// strongest finds, among the table couples in the mix's medium whose
// oxidized (reduced) forms are present as combined, the one with the highest
// (lowest) potential at the mix's conditions. A couple that would form a
// species a lock keeps from forming (oxygen from water, iodate from iodine)
// does not stand; water taking electrons always competes, as the solvent
// does, so that no sodium ion is ever the strongest oxidizing agent.
// Couples of minor species (triiodide, ion pairs) stand for no agent.
func (e *Engine) strongest(mx *state.Mix) (ox, red *candidate) {
	med := Medium(explain.MediumAt(e.Tables.Thermo, mx.Combined.PH, mx.TempK))
	present := map[*thermo.Species]bool{}
	for i, sp := range mx.Species {
		n := mx.Combined.Amount[i]
		if n > 0 && (sp.Phase != Aqueous || n/mx.VolumeL >= trace) {
			present[sp] = true
		}
	}
	var reds []candidate
	for _, row := range e.tableRows() {
		if (row.h.Medium != Any && row.h.Medium != med) || hasMinor(row.r) {
			continue
		}
		c := candidate{row: row, e0: row.r.E0(mx.TempK)}
		c.e = c.e0 - thermo.R*mx.TempK/(float64(row.r.Electrons)*thermo.F)*lnQAt(mx, row.r)
		water := isWaterCouple(row.h)
		if sidePresent(row.r, -1, present) && (water || !formsShut(row.r, 1, mx.Final.Shut)) && (ox == nil || c.e > ox.e) {
			cc := c
			ox = &cc
		}
		if sidePresent(row.r, 1, present) && !formsShut(row.r, -1, mx.Final.Shut) {
			reds = append(reds, c)
		}
	}
	for i := range reds {
		if (ox == nil || !sameChange(ox.row.r, reds[i].row.r)) && (red == nil || reds[i].e < red.e) {
			red = &reds[i]
		}
	}
	return ox, red
}

// sameChange reports whether two half-reactions are one change of oxidation
// state written with other forms (I2(s)/I- and I2/I-): the same element
// states on both sides. Such couples do not make a pair.
func sameChange(a, b thermo.Reaction) bool {
	return sideStates(a, -1) == sideStates(b, -1) && sideStates(a, 1) == sideStates(b, 1)
}

// sideStates lists the element states of one side's species other than
// water, H+ and OH- ("I0" for iodine), sorted.
func sideStates(r thermo.Reaction, sign float64) string {
	var out []string
	for _, t := range r.Terms {
		if t.Nu*sign <= 0 || isSolvent(t.Species.Species) {
			continue
		}
		for el, ox := range t.Species.Ox {
			if el != "H" && el != "O" {
				out = append(out, el+strconv.FormatFloat(math.Round(ox*100)/100, 'f', -1, 64))
			}
		}
	}
	sort.Strings(out)
	return strings.Join(slices.Compact(out), " ")
}

// hasMinor reports whether a half-reaction names a minor species (an ion
// pair, a hydrolysis form, triiodide): such a couple stands for no agent.
func hasMinor(r thermo.Reaction) bool {
	for _, t := range r.Terms {
		if t.Species.Minor {
			return true
		}
	}
	return false
}

// sidePresent reports whether every species on one side (sign −1: the
// oxidized side, +1: the reduced side) other than water, H+ and OH- is
// present.
func sidePresent(r thermo.Reaction, sign float64, present map[*thermo.Species]bool) bool {
	for _, t := range r.Terms {
		if t.Nu*sign <= 0 || isSolvent(t.Species.Species) {
			continue
		}
		if !present[t.Species] {
			return false
		}
	}
	return true // water itself is always there
}

// formsShut reports whether acting in a role would form a species that a
// lock keeps from forming (sign +1: the reduced side, as an oxidizing agent;
// −1: the oxidized side, as a reducing agent): such a couple is held back
// and does not stand for the mix on the table.
func formsShut(r thermo.Reaction, sign float64, shut map[*thermo.Species]bool) bool {
	for _, t := range r.Terms {
		if t.Nu*sign > 0 && shut[t.Species] {
			return true
		}
	}
	return false
}

// lnQAt is ln Q of a reaction as the mix is combined (explain.LnQ).
func lnQAt(mx *state.Mix, r thermo.Reaction) float64 {
	return explain.LnQ(mx.Species, mx.Combined.LnA, r)
}

func (e *Engine) tableCouple(c *candidate, reducer bool) *Couple {
	species := ""
	for _, t := range c.row.r.Terms {
		if (t.Nu < 0) != reducer && !isSolvent(t.Species.Species) {
			species = t.Species.Species.Text()
			break
		}
	}
	if species == "" { // water itself acting: name H+ (an acid) or H2O, never a blank
		species = "H2O"
		for _, t := range c.row.r.Terms {
			if (t.Nu < 0) != reducer && t.Species.Text == "H+" {
				species = "H+"
			}
		}
	}
	return &Couple{Species: species, HalfReaction: halfOut(c.row.r, reducer), EStandard: roundDec(c.e0, 4),
		E: roundDec(c.e, 4), ID: c.row.h.ID, Medium: c.row.h.Medium, Electrons: c.row.r.Electrons,
		Source: "E° derived from ΔfG° of data/species.txt; published " + strconv.FormatFloat(c.row.h.E0, 'g', 4, 64) + " V, " + c.row.h.Source}
}

// heldBack lists the locks that held something back in the mix.
func (e *Engine) heldBack(mx *state.Mix) []HeldBack {
	var locks []*state.Lock
	for _, l := range append(mx.Final.Held[:len(mx.Final.Held):len(mx.Final.Held)], mx.Final.Undecided...) {
		if !l.Never() { // what cannot happen in water is not "possible on paper"
			locks = append(locks, l)
		}
	}
	// Each lock is lifted in its own solve; the solves share nothing but
	// the read-only mix and the model's locked caches, so they run side by
	// side and the answer keeps the locks' order.
	found := make([]*HeldBack, len(locks))
	var wg sync.WaitGroup
	for i, l := range locks {
		wg.Go(func() { found[i] = e.liftLock(mx, l) })
	}
	wg.Wait()
	out := []HeldBack{}
	for _, h := range found {
		if h != nil {
			out = append(out, *h)
		}
	}
	return out
}

// liftLock is what lock l held back in mx: the first step from the state
// with it to the state without it, or nil when lifting it changes nothing.
func (e *Engine) liftLock(mx *state.Mix, l *state.Lock) *HeldBack {
	st, err := e.Model.Without(mx, l.ID)
	if err != nil {
		return nil
	}
	free := *mx
	free.Combined, free.Final = mx.Final, st
	steps, err := explain.StepsIn(e.Tables.Thermo, &free, explain.MediumAt(e.Tables.Thermo, free.Combined.PH, free.TempK))
	if err != nil {
		return nil
	}
	// The lock decides what it holds back: a step that moves none of its
	// group is a knock-on of the change it holds (hematite that would
	// free acid for more chlorine off bleach and iron(III) chloride), not
	// that change, and often the very change the mix runs and counts.
	for _, st := range steps {
		if formsNever(e.Model.Locks, st.Net) {
			continue
		}
		if touches(l, st.Net) {
			return &HeldBack{Lock: l.ID, Reason: l.Reason, Source: l.Source, Reaction: reactionOut(st.Net, st.N)}
		}
	}
	return nil
}

// formsNever reports whether a reaction forms a species of a never row
// (sodium, potassium or magnesium metal from their ions in water): such a
// change is not possible in water at all, whatever the row's condition (the
// condition only saves the solver the constraint where no strong reducer is
// brought), so it is not listed as held back either. Lifting a lock can
// otherwise let the solver reach it: hydrazoic acid falling apart to
// nitrogen by reducing sodium ions to the metal.
func formsNever(locks []state.Lock, r thermo.Reaction) bool {
	for i := range locks {
		if !locks[i].Never() {
			continue
		}
		for _, t := range r.Terms {
			if t.Nu > 0 && locks[i].Rules[0].Group.Weight(t.Species) > 0 {
				return true
			}
		}
	}
	return false
}

// touches reports whether a reaction moves a species of one of the lock's
// groups.
func touches(l *state.Lock, r thermo.Reaction) bool {
	for _, rule := range l.Rules {
		for _, t := range r.Terms {
			if rule.Group.Weight(t.Species) > 0 || rule.With != nil && rule.With.Weight(t.Species) > 0 {
				return true
			}
		}
	}
	return false
}

// finish judges the hazards and caveats of an answer from its species, steps,
// gases and heat.
func (e *Engine) finish(res *Result, m *mixture, mx *state.Mix) {
	hin := HazardInput{
		Chemicals: m.chemicals, Gases: res.Gases, PH: res.Conditions.PH, VolumeL: m.volumeL,
		TemperatureC: m.tempK - 273.15, StrongAcidMol: m.strongAcid, StrongBaseMol: m.strongBase,
	}
	if res.Heat != nil {
		hin.TemperatureRiseC = res.Heat.TemperatureRiseC
	}
	if mx != nil {
		for i, sp := range mx.Species {
			if n := mx.Combined.Amount[i]; n > 0 && !state.IsStandIn(sp) {
				hin.Present = append(hin.Present, SpeciesAmount{Species: sp.Species, Mol: n, Molar: n / mx.VolumeL})
			}
		}
	} else {
		hin.Present = m.amounts()
	}
	for i, st := range res.Steps {
		label := "headline"
		if i > 0 {
			label = "step " + strconv.Itoa(i+1)
		}
		hin.Reactions = append(hin.Reactions, ReactionCase{Label: label, Reaction: st.Reaction, ECell: *st.ECell})
	}
	res.Hazards = EvaluateHazards(e.Tables.Hazards, hin)
	if res.Hazards == nil {
		res.Hazards = []Hazard{}
	}
	cin := CaveatInput{Present: hin.Present, Chemicals: m.chemicals, Oxidizer: res.Oxidizer, Reducer: res.Reducer,
		Reaction: res.Reaction, PH: res.Conditions.PH, Alternatives: res.Alternatives}
	// A change found in the mixed state is not a verdict on the edge: the
	// close-call caveats belong to a pair judged by the table alone.
	if res.ECell != nil && len(res.Steps) == 0 {
		cin.ECell, cin.HasECell = *res.ECell, true
	}
	res.Caveats = Caveats(cin)
	if res.Caveats == nil {
		res.Caveats = []string{}
	}
	if res.Heat == nil {
		res.Heat = &Heat{Assumption: heatAssumption}
	}
}

// speciesOfSolids lists the species of a mix of solids alone.
func speciesOfSolids(m *mixture) []SpeciesInfo {
	out := []SpeciesInfo{}
	for _, a := range m.amounts() {
		out = append(out, SpeciesInfo{Text: a.Species.Text(), Formula: a.Species.Formula, Charge: a.Species.Charge,
			Phase: a.Species.Phase, Roles: []Role{}, Spectator: true, Mol: sigDigits(a.Mol, 6)})
	}
	return out
}
