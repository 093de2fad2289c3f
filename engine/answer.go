package engine

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"mixward/engine/explain"
	"mixward/engine/state"
	"mixward/engine/thermo"
)

// trace is the concentration (mol/L) below which a species is not listed.
const trace = 1e-7

// speciesOut lists the species of the mix as combined, with their roles in
// the redox steps; every listed species that takes part in no step is a
// spectator.
func speciesOut(mx *state.Mix, steps []explain.Step) []SpeciesInfo {
	roles := map[*thermo.Species][]Role{}
	inStep := map[*thermo.Species]bool{}
	for _, st := range steps {
		roles[st.Oxidizer.Agent] = appendRole(roles[st.Oxidizer.Agent], OxidizerRole)
		roles[st.Reducer.Agent] = appendRole(roles[st.Reducer.Agent], ReducerRole)
		for _, t := range st.Net.Terms {
			inStep[t.Species] = true
		}
	}
	var out []SpeciesInfo
	for i, sp := range mx.Species {
		n := mx.Combined.Amount[i]
		water := sp.Text == "H2O"
		if !water && (n <= 0 || state.IsStandIn(sp) || (sp.Phase == Aqueous && n/mx.VolumeL < trace)) {
			continue
		}
		si := SpeciesInfo{Text: sp.Species.Text(), Formula: sp.Formula, Charge: sp.Charge, Phase: sp.Phase,
			Roles: roles[sp], Mol: sigDigits(n, 6), Spectator: !inStep[sp] && !water}
		if si.Roles == nil {
			si.Roles = []Role{}
		}
		if sp.Phase == Aqueous {
			si.Molar = sigDigits(n/mx.VolumeL, 6)
		}
		if water {
			si.Mol, si.Excess = 0, true
		}
		out = append(out, si)
	}
	sort.SliceStable(out, func(i, j int) bool { return out[i].Mol > out[j].Mol })
	return out
}

func appendRole(rs []Role, r Role) []Role {
	for _, x := range rs {
		if x == r {
			return rs
		}
	}
	return append(rs, r)
}

// reactionOut is the JSON form of a balanced reaction.
func reactionOut(r thermo.Reaction, electrons int) *Reaction {
	out := &Reaction{Reactants: []EqTerm{}, Products: []EqTerm{}, Electrons: electrons}
	for _, t := range r.Terms {
		et := EqTerm{Formula: t.Species.Formula, Charge: t.Species.Charge, Phase: t.Species.Phase,
			Coef: int(math.Abs(t.Nu)), Text: t.Species.Species.Text()}
		if t.Nu < 0 {
			out.Reactants = append(out.Reactants, et)
		} else {
			out.Products = append(out.Products, et)
		}
	}
	out.Text = sideText(out.Reactants, 0) + " → " + sideText(out.Products, 0)
	return out
}

// sideText joins terms ("2 Fe^3+ + Cu(s)"), with electrons added when n > 0.
func sideText(ts []EqTerm, electrons int) string {
	parts := make([]string, 0, len(ts)+1)
	for _, t := range ts {
		if t.Coef == 1 {
			parts = append(parts, t.Text)
		} else {
			parts = append(parts, strconv.Itoa(t.Coef)+" "+t.Text)
		}
	}
	switch {
	case electrons == 1:
		parts = append(parts, "e-")
	case electrons > 1:
		parts = append(parts, strconv.Itoa(electrons)+" e-")
	}
	return strings.Join(parts, " + ")
}

// halfOut writes a half-reaction as a reduction, or reversed as an oxidation.
func halfOut(r thermo.Reaction, reversed bool) string {
	h := reactionOut(r, r.Electrons)
	if reversed {
		return sideText(h.Products, 0) + " → " + sideText(h.Reactants, r.Electrons)
	}
	return sideText(h.Reactants, r.Electrons) + " → " + sideText(h.Products, 0)
}

// coupleOut is the JSON form of one side of a step.
func (e *Engine) coupleOut(c explain.Couple, med explain.Medium, reducer bool) *Couple {
	out := &Couple{
		Species: c.Agent.Species.Text(), HalfReaction: halfOut(c.Half, reducer),
		EStandard: roundDec(c.E0, 4), E: roundDec(c.E, 4), Medium: Medium(med), Electrons: c.Half.Electrons,
		ID: "derived", Source: "E° derived from ΔfG° of data/species.txt (" + shortSource(c.Agent.Source) + "; " + shortSource(c.Product.Source) + ")",
	}
	if row, ok := e.tableRow(c.Half); ok {
		out.ID = row.ID
		out.Source += fmt.Sprintf("; published %.4g V, %s", row.E0, row.Source)
	}
	return out
}

func shortSource(s string) string {
	if i := strings.Index(s, ";"); i > 0 {
		return s[:i]
	}
	return s
}

// stepOut is the JSON form of a redox step with the amounts it moved.
func (e *Engine) stepOut(mx *state.Mix, st explain.Step) Step {
	out := Step{
		Oxidizer: e.coupleOut(st.Oxidizer, st.Medium, false), Reducer: e.coupleOut(st.Reducer, st.Medium, true),
		Reaction:      reactionOut(st.Net, st.N),
		ECellStandard: ptr(roundDec(st.E0Cell, 4)), ECell: ptr(roundDec(st.ECell, 4)),
		Spontaneous: true, Verdict: Spontaneous,
		DeltaGkJ: ptr(roundDec(st.DeltaG, 2)), Log10K: ptr(roundDec(st.Log10K, 2)),
		Amounts: amountsOf(mx, st),
	}
	return out
}

// amountsOf is what a step consumed and formed: its net equation times its
// extent; the limiting agent is the one whose oxidation state ran out.
func amountsOf(mx *state.Mix, st explain.Step) *Amounts {
	am := &Amounts{ExtentMol: sigDigits(st.Extent, 6), Consumed: []AmountOf{}, Formed: []AmountOf{}}
	for _, t := range st.Net.Terms {
		a := AmountOf{Text: t.Species.Species.Text(), Mol: sigDigits(math.Abs(t.Nu)*st.Extent, 6), Phase: t.Species.Phase}
		if t.Nu < 0 {
			am.Consumed = append(am.Consumed, a)
		} else {
			am.Formed = append(am.Formed, a)
		}
	}
	for _, c := range []explain.Couple{st.Oxidizer, st.Reducer} {
		if exhausted(mx, c) {
			s := c.Agent.Species.Text()
			am.Limiting = &s
			break
		}
	}
	return am
}

// exhausted reports whether an agent's element left its oxidation state
// all but entirely (99 %; water itself not counted, so that an acid spent
// down to pH 4 is the limiting reagent).
func exhausted(mx *state.Mix, c explain.Couple) bool {
	before, after := 0.0, 0.0
	for i, sp := range mx.Species {
		n := sp.Atoms[c.Element]
		if n == 0 || sp.Text == "H2O" || math.Round(sp.Ox[c.Element]*100)/100 != c.From {
			continue
		}
		before += mx.Combined.Amount[i] * float64(n)
		after += mx.Final.Amount[i] * float64(n)
	}
	return before > 0 && after < 1e-2*before
}

// compositionOut lists the mix at equilibrium above trace, largest first.
func compositionOut(mx *state.Mix) []AmountOf {
	out := []AmountOf{}
	for i, sp := range mx.Species {
		n := mx.Final.Amount[i]
		if sp.Text == "H2O" || n <= 0 || state.IsStandIn(sp) || (sp.Phase == Aqueous && n/mx.VolumeL < trace) {
			continue
		}
		out = append(out, AmountOf{Text: sp.Species.Text(), Mol: sigDigits(n, 6), Phase: sp.Phase})
	}
	sort.SliceStable(out, func(i, j int) bool { return out[i].Mol > out[j].Mol })
	return out
}
