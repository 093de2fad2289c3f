package engine

import (
	"fmt"
	"math"
	"sort"
	"strings"
)

// maxSteps bounds the follow-on reactions predicted after the headline.
const maxSteps = 10

// limitingPH: below this pH the free H+ of the mix is a reagent that can run
// out; above its mirror (14 − limitingPH) OH- is. In between, buffers and
// water supply what a reaction takes, and the pH moves instead.
const limitingPH = 4.0

func (m *mixture) clone() *mixture {
	c := *m
	c.species = make(map[string]*inMix, len(m.species))
	for k, p := range m.species {
		q := *p
		c.species[k] = &q
	}
	c.order = append([]string(nil), m.order...)
	c.notes = nil
	return &c
}

// available is the amount of a reactant that can be consumed, and whether it
// limits the reaction at all (water, excess solids and buffered H+/OH- do not).
// H+ counts the acid that can be taken out before the mix reaches
// limitingPH, weak acids and HSO4- included; OH- likewise down to
// 14 − limitingPH.
func (m *mixture) available(s Species, t *Tables) (mol float64, limited bool) {
	switch {
	case s.IsWater():
		return 0, false
	case s.IsProton():
		if m.pH < limitingPH {
			return math.Max(0, -m.balance(t)(limitingPH)*m.volumeL), true
		}
		return 0, false
	case s.IsHydroxide():
		if m.pH > 14-limitingPH {
			return math.Max(0, m.balance(t)(14-limitingPH)*m.volumeL), true
		}
		return 0, false
	}
	p := m.lookup(mixKey(s), t)
	if p == nil {
		return 0, true
	}
	if p.excess {
		return 0, false
	}
	return p.mol, true
}

// extent finds how far a reaction runs: the limiting reactant and the
// extent in mol of reaction as written. ok is false when nothing limits it.
func (m *mixture) extent(rx *netReaction, t *Tables) (xi float64, limiting *Species, ok bool) {
	xi = math.Inf(1)
	for i := range rx.reactants {
		tm := &rx.reactants[i]
		mol, limited := m.available(tm.Species, t)
		if !limited {
			continue
		}
		if x := mol / float64(tm.Coef); x < xi {
			xi = x
			sp := tm.Species
			limiting = &sp
		}
	}
	if math.IsInf(xi, 1) {
		return 0, nil, false
	}
	return xi, limiting, true
}

// react applies a reaction of extent xi to the mixture. Gases leave the
// liquid; H+ and OH- are left to the charge balance.
func (m *mixture) react(rx *netReaction, xi float64, t *Tables) (consumed, formed []AmountOf, gases []GasRelease) {
	for _, tm := range rx.reactants {
		n := xi * float64(tm.Coef)
		consumed = append(consumed, AmountOf{Text: tm.Species.Text(), Mol: sigDigits(n, 6), Phase: tm.Phase})
		if isSolvent(tm.Species) {
			continue
		}
		if p := m.lookup(mixKey(tm.Species), t); p != nil && !p.excess {
			p.mol = math.Max(0, p.mol-n)
		}
	}
	for _, t := range rx.products {
		n := xi * float64(t.Coef)
		formed = append(formed, AmountOf{Text: t.Species.Text(), Mol: sigDigits(n, 6), Phase: t.Phase})
		if isSolvent(t.Species) {
			continue
		}
		if t.Phase == Gas {
			gases = append(gases, GasRelease{Text: t.Species.Text(), Mol: n})
			continue
		}
		m.add(t.Species, n, false)
	}
	return consumed, formed, gases
}

// respeciate recomputes the pH and the acid–base forms after a reaction.
func (m *mixture) respeciate(t *Tables) {
	if !m.aqueous {
		return
	}
	for _, k := range []string{"H+", "OH-"} {
		if p, ok := m.species[k]; ok {
			p.mol = 0
		}
	}
	if !m.pHStated {
		m.pH = solvePH(m, t)
	}
	m.distribute(t)
	m.setSolvent()
}

// setSolvent sets the H+ and OH- amounts from the pH.
func (m *mixture) setSolvent() {
	h := Species{Formula: "H", Charge: 1, Phase: Aqueous}
	oh := Species{Formula: "OH", Charge: -1, Phase: Aqueous}
	m.add(h, 0, false)
	m.add(oh, 0, false)
	m.get(h).mol = math.Pow(10, -m.pH) * m.volumeL
	m.get(oh).mol = math.Pow(10, m.pH-pKw(m.tempK)) * m.volumeL
}

// composition lists what is in the tank, largest amount first, water last.
func (m *mixture) composition() []AmountOf {
	var out []AmountOf
	var water *AmountOf
	for _, p := range m.list() {
		if p.sp.IsWater() {
			water = &AmountOf{Text: p.sp.Text(), Mol: 0, Phase: p.sp.Phase}
			continue
		}
		if p.mol <= 0 && !p.excess {
			continue
		}
		out = append(out, AmountOf{Text: p.sp.Text(), Mol: sigDigits(p.mol, 6), Phase: p.sp.Phase})
	}
	sort.SliceStable(out, func(i, j int) bool { return out[i].Mol > out[j].Mol })
	if water != nil {
		out = append(out, *water)
	}
	return out
}

func (m *mixture) amounts() []SpeciesAmount {
	var out []SpeciesAmount
	for _, p := range m.list() {
		sa := SpeciesAmount{Species: p.sp, Mol: p.mol}
		if p.sp.Phase == Aqueous && m.volumeL > 0 {
			sa.Molar = p.mol / m.volumeL
		}
		out = append(out, sa)
	}
	return out
}

// outcome runs the headline reaction and its follow-on reactions on the
// amounts in the tank, then estimates gas, heat, hazards and caveats.
func (e *Engine) outcome(res *Result, m *mixture, head *pair) {
	cases := []ReactionCase{}
	var heatRx []ReactionExtent
	gasMol := map[string]float64{}
	var gasOrder []string
	addGases := func(gs []GasRelease) {
		for _, g := range gs {
			if _, ok := gasMol[g.Text]; !ok {
				gasOrder = append(gasOrder, g.Text)
			}
			gasMol[g.Text] += g.Mol
		}
	}
	before := m.amounts()
	cur := m.clone()
	if head != nil {
		if !res.Hindered {
			cases = append(cases, ReactionCase{Label: "headline", Reaction: res.Reaction, ECell: head.eCell})
		}

		// Kinetically hindered alternatives are listed, but their
		// products are not what the tank gives off.
		for i, a := range res.Alternatives {
			if !a.Hindered {
				cases = append(cases, ReactionCase{Label: fmt.Sprintf("alternative %d", i+1), Reaction: a.Reaction, ECell: a.ECell})
			}
		}

	}
	p := head
	firstXi := 0.0
	// Each net reaction runs once, and never its reverse: a repeat would
	// only chase the traces its conjugate forms hand back.
	ran := map[string]bool{}
	if head != nil && head.eCell > 0 && head.eff <= 0 {

		res.Notes = append(res.Notes, "the headline reaction is spontaneous but kinetically hindered at these conditions, so it is not run to completion in the amounts")
		p = nil
	}
	// A step runs only when it is spontaneous after the kinetic allowances
	// too: a reaction known to be slow is not carried to completion.
	for step := 0; p != nil && p.eCell > 0 && p.eff > 0; step++ {
		xi, lim, ok := cur.extent(p.rxn(), e.Tables)

		if !ok {
			if step == 0 {
				res.Notes = append(res.Notes, "no reactant of "+p.rxn().text()+" runs out (excess solids, buffered pH): amounts are not bounded")
			}
			break
		}

		// Stop at a trace: what is left of a reagent after its conjugate
		// forms are redistributed is not a reaction worth reporting.
		if xi <= 1e-12 || (step > 0 && xi < 1e-6*firstXi) {
			break
		}
		if step == 0 {
			firstXi = xi
		}
		ran[p.rxn().key()] = true
		consumed, formed, gases := cur.react(p.rxn(), xi, e.Tables)
		limText := lim.Text()
		am := &Amounts{Limiting: &limText, ExtentMol: sigDigits(xi, 6), Consumed: consumed, Formed: formed}
		rx := p.rxn().out()
		heatRx = append(heatRx, ReactionExtent{Reaction: rx, ExtentMol: xi})
		addGases(gases)
		if step == 0 {
			res.Amounts = am
		} else {
			n := float64(p.rxn().electrons)
			res.Steps = append(res.Steps, Step{
				Oxidizer: p.ox.couple(), Reducer: p.red.couple(), Reaction: rx,
				ECellStandard: ptr(roundDec(p.eCellStd, 4)), ECell: ptr(roundDec(p.eCell, 4)),
				Spontaneous: true, Verdict: Spontaneous,
				DeltaGkJ: ptr(roundDec(-n*faraday*p.eCell/1000, 2)),
				Log10K:   ptr(roundDec(n*p.eCellStd/nernstSlope(cur.tempK), 2)),
				Amounts:  am,
			})
			cases = append(cases, ReactionCase{Label: fmt.Sprintf("step %d", step+1), Reaction: rx, ECell: p.eCell})
		}
		cur.respeciate(e.Tables)
		ox, red := e.sides(cur)
		p = nil
		for _, q := range e.pairs(cur, ox, red) {
			if q.eCell <= 0 || q.eff <= 0 {
				break
			}
			// Skip a pair that can only run to a trace (a reagent used up
			// but for what its conjugate forms hand back).
			if q.rxn() == nil || ran[q.rxn().key()] || ran[reverseKey(q.rxn())] {
				continue
			}
			if x, _, ok := cur.extent(q.rxn(), e.Tables); ok && x < 1e-6*firstXi {
				continue
			}
			p = q
			break
		}

		if step == maxSteps && p != nil {
			res.Notes = append(res.Notes, fmt.Sprintf("stopped after %d follow-on reactions; more may follow", maxSteps))
			break
		}
	}
	if res.Amounts == nil {
		// Nothing ran (no pair, not spontaneous, hindered or unbounded):
		// an empty account, so that the JSON shape never changes.
		res.Amounts = &Amounts{Consumed: []AmountOf{}, Formed: []AmountOf{}}
	}
	gasKind := map[string]string{}
	for _, g := range gasOrder {
		gasKind[g] = "formed"
	}
	for _, g := range cur.outgas() {
		if _, ok := gasKind[g.Text]; !ok {
			gasKind[g.Text] = g.Kind
		}
		addGases([]GasRelease{g})
	}
	res.FinalComposition = cur.composition()
	if res.FinalComposition == nil {
		res.FinalComposition = []AmountOf{}
	}

	for _, g := range gasOrder {
		gr := GasReleaseOf(g, gasMol[g], m.tempK, m.pressureKPa)
		gr.Kind = gasKind[g]

		gr.Mol, gr.VolumeL, gr.VolumeM3 = sigDigits(gr.Mol, 6), sigDigits(gr.VolumeL, 6), sigDigits(gr.VolumeM3, 6)
		res.Gases = append(res.Gases, gr)
	}
	heat := EstimateHeat(HeatInput{Reactions: heatRx, NeutralisedMol: m.neutralised, MassKg: m.massKg}, e.Tables.Enthalpies)
	if q, ok := m.solutionHeat(e.Tables); ok && q != 0 {
		heat.DissolutionkJ = q
		if heat.HeatReleasedkJ != nil {
			total := *heat.HeatReleasedkJ + q
			heat.HeatReleasedkJ = &total
			if m.massKg > 0 {
				rise := TemperatureRise(total, m.massKg)
				heat.TemperatureRiseC = &rise
			}
		}
	}
	roundPtr := func(p *float64, d int) {
		if p != nil {
			*p = roundDec(*p, d)
		}
	}
	roundPtr(heat.DeltaHkJPerMol, 2)
	roundPtr(heat.HeatReleasedkJ, 1)
	roundPtr(heat.TemperatureRiseC, 2)
	heat.NeutralisationkJ = roundDec(heat.NeutralisationkJ, 1)
	heat.DissolutionkJ = roundDec(heat.DissolutionkJ, 1)
	res.Heat = &heat

	if len(heat.Missing) > 0 {
		res.Notes = append(res.Notes, "no heat estimate: no formation-enthalpy data for "+strings.Join(heat.Missing, ", "))
	}
	hin := HazardInput{
		Present: before, Chemicals: m.chemicals, Reactions: cases, Gases: res.Gases,
		PH: m.pH, VolumeL: m.volumeL, TemperatureC: m.tempK - 273.15, TemperatureRiseC: heat.TemperatureRiseC,
		StrongAcidMol: m.strongAcid, StrongBaseMol: m.strongBase,
	}
	res.Hazards = EvaluateHazards(e.Tables.Hazards, hin)
	cin := CaveatInput{Present: before, Chemicals: m.chemicals, Oxidizer: res.Oxidizer, Reducer: res.Reducer,
		Reaction: res.Reaction, PH: m.pH, Alternatives: res.Alternatives}
	if res.ECell != nil {
		cin.ECell, cin.HasECell = *res.ECell, true
	}
	if res.Allowance != nil {
		cin.AllowanceIDs = []string{res.Allowance.ID}
	}
	res.Caveats = Caveats(cin)
	if res.Hazards == nil {
		res.Hazards = []Hazard{}
	}
	if res.Caveats == nil {
		res.Caveats = []string{}
	}
}

// volatile lists dissolved molecules that leave an aqueous mix as gas, with
// their Henry's-law solubility in mol/(L·bar) at 25 °C (Sander, Compilation
// of Henry's law constants for water, Atmos. Chem. Phys. 15, 2015; from
// memory). What the liquid holds at the mix's pressure stays dissolved; the
// rest is given off.
var volatile = []struct {
	aq, gas string
	kH      float64
}{
	{"H2CO3", "CO2(g)", 0.034},
	{"H2S", "H2S(g)", 0.10},
	{"Cl2", "Cl2(g)", 0.062},
	{"H2SO3", "SO2(g)", 1.3},
	{"ClO2", "ClO2(g)", 1.0},
	{"HCN", "HCN(g)", 9},
	{"O3", "O3(g)", 0.010},
}

// outgas moves dissolved gases beyond their solubility out of the mix.
func (m *mixture) outgas() []GasRelease {
	if !m.aqueous || m.volumeL <= 0 {
		return nil
	}
	var out []GasRelease
	bar := m.pressureKPa / 100
	for _, v := range volatile {
		p := m.species[v.aq]
		if p == nil || p.mol <= 0 {
			continue
		}
		keep := v.kH * bar * m.volumeL
		if p.mol <= keep {
			continue
		}
		out = append(out, GasRelease{Text: v.gas, Mol: p.mol - keep, Kind: "volatile"})
		p.mol = keep
	}
	return out
}

// reverseKey is the key of rx run backwards.
func reverseKey(rx *netReaction) string {
	r := netReaction{reactants: rx.products, products: rx.reactants}
	return r.key()
}

// solutionHeat is the heat released (kJ) by dissolving the solid and
// near-pure liquid reagents of the mix into it, from formation enthalpies:
// caustic pellets, quicklime, 96 % sulfuric acid. ok is false when a reagent
// lacks data; those are left out of the estimate.
func (m *mixture) solutionHeat(t *Tables) (kJ float64, ok bool) {
	if !m.aqueous {
		return 0, false
	}
	ok = true
	for _, d := range m.dissolved {
		rx, err := dissolution(d, t)
		if err != nil {
			ok = false
			continue
		}
		dh, missing := ReactionEnthalpy(rx, t.Enthalpies)
		if len(missing) > 0 {
			ok = false
			continue
		}
		kJ += -dh * d.mol
	}
	return kJ, ok
}

// dissolution writes "NaOH(s) → Na+ + OH-" for a dissolving reagent, with
// the water it takes up or gives off.
func dissolution(d dissolved, t *Tables) (*Reaction, error) {
	solid := Species{Formula: d.chem.Formula, Phase: d.phase}
	atoms, err := t.atomsOf(d.chem.Formula)
	if err != nil {
		return nil, err
	}
	diff := Atoms{}
	for el, n := range atoms {
		diff[el] = -n
	}
	r := &Reaction{Reactants: []EqTerm{{Formula: solid.Formula, Phase: solid.Phase, Coef: 1, Text: solid.Text()}}}
	for _, g := range d.chem.Gives {
		a, err := t.atomsOf(g.Formula)
		if err != nil {
			return nil, err
		}
		diff.Add(a, g.Coef)
		r.Products = append(r.Products, EqTerm{Formula: g.Formula, Charge: g.Charge, Phase: g.Phase, Coef: g.Coef, Text: g.Species.Text()})
	}
	// What is left over is water taken up (CaO + H2O) or given off.
	if k := diff["O"]; k != 0 {
		w := EqTerm{Formula: "H2O", Phase: Liquid, Text: "H2O(l)"}
		if k > 0 {
			w.Coef = k
			r.Reactants = append(r.Reactants, w)
		} else {
			w.Coef = -k
			r.Products = append(r.Products, w)
		}
	}
	return r, nil
}
