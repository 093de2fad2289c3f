package hazard

import (
	"math"
	"strconv"
	"strings"

	"mixward/engine"
)

// BoilingC is the boiling point taken for a dilute aqueous mix at
// atmospheric pressure (common practice, no source: strong salt or acid
// solutions boil a few degrees higher).
const BoilingC = 100.0

// catalysts are the dissolved metal ions that set hypochlorite and
// peroxide decomposing to oxygen (Bretherick's Handbook of Reactive
// Chemical Hazards, entries for sodium hypochlorite and hydrogen peroxide,
// from memory).
var catalysts = []string{"Cu^2+", "Ni^2+", "Co^2+", "Fe^3+", "Fe^2+", "Mn^2+", "Ag+"}

// selfDecomposing are the species whose own decomposition to oxygen is
// held back without a catalyst, by family (acid–base forms of one
// species). Two different families together (hypochlorite with peroxide)
// react fast and are not held back.
var selfDecomposing = map[string]string{"OCl-": "OCl", "HOCl": "OCl", "H2O2": "H2O2", "HO2-": "H2O2", "ClO2-": "ClO2", "HClO2": "ClO2"}

// FromResult fills an Outcome from today's engine answer. Reactions count
// only when they proceed (E cell above ProceedMarginV, not kinetically
// hindered, not a decomposition that needs a catalyst the mix lacks); the
// gases and heat are those of the reactions that proceed.
func FromResult(r *engine.Result, t *engine.Tables) *Outcome {
	c := r.Conditions
	o := &Outcome{
		VolumeL: c.VolumeL, HeadspaceL: c.VolumeL, TemperatureC: c.TemperatureC,
		PressureKPa: c.PressureKPa, PH: c.PH, PHStated: c.PHStated,
	}
	if c.HeadspaceStated && c.HeadspaceL > 0 {
		o.HeadspaceL, o.HeadspaceStated = c.HeadspaceL, true
		defer o.boundByHeadspace()
	}
	for _, s := range r.Species {
		o.Before = append(o.Before, Amount{Species: engine.Species{Formula: s.Formula, Charge: s.Charge, Phase: s.Phase}, Mol: s.Mol, Molar: s.Molar})
	}
	for _, s := range r.Streams {
		o.Chemicals = append(o.Chemicals, s.Components...)
		if s.MassKg > 0 && s.VolumeL == 0 {
			o.SolidChemicals = append(o.SolidChemicals, s.Components...)
			if len(s.Components) == 1 {
				if o.SolidKg == nil {
					o.SolidKg = map[string]float64{}
				}
				o.SolidKg[s.Components[0]] += s.MassKg
			}
		}
		for _, f := range s.Components {
			if ch, ok := t.Lookup(f); ok {
				o.StrongAcid = o.StrongAcid || ch.Class == engine.StrongAcid
				o.StrongBase = o.StrongBase || ch.Class == engine.StrongBase
				if s.MassKg > 0 && s.VolumeL == 0 && solidAcid(ch) {
					o.SolidAcids = append(o.SolidAcids, f)
				}
			}
		}
	}
	for _, n := range r.NotAssessed {
		if n.Role != engine.RoleFuel || !(n.Mol > 0) {
			continue
		}
		a := Amount{Species: engine.Species{Formula: n.Formula, Phase: engine.Aqueous}, Mol: n.Mol}
		if o.VolumeL > 0 {
			a.Molar = n.Mol / o.VolumeL
		}
		o.Fuel = append(o.Fuel, a)
		o.FuelOxidizer = n.Oxidizer
	}
	o.fromState = r.Conditions.PHFinal != nil
	headRuns := o.reactions(r)
	o.After = o.Before
	if headRuns {
		o.After = afterAmounts(r.FinalComposition, o.VolumeL)
		o.gasesOf(r)
	}
	o.heatOf(r, headRuns)
	o.measured(r, t)
	o.strengths(r, t)
	return o
}

// kineticGas are gases that fast side reactions give off although the
// equilibrium does not hold them (chlorine dioxide from chlorate and
// hydrochloric acid ends as chlorine at equilibrium): when the mixed state
// shows none, the pool rules still estimate them.
var kineticGas = map[string]bool{"ClO2": true, "CNCl": true,
	// carbon monoxide from formic or oxalic acid in concentrated sulfuric
	// acid: the carbon-monoxide lock keeps it out of the cold state
	"CO": true}

// measured records the gases the equilibrium state of the mix covers: every
// gas of the species data made only of elements the mix holds, at the
// amount and headspace concentration of the answer's gases (zero when the
// answer lists none).
func (o *Outcome) measured(r *engine.Result, t *engine.Tables) {
	if t.Thermo == nil || r.Conditions.PHFinal == nil {
		return // not an answer from the equilibrium state
	}
	els := map[string]bool{"H": true, "O": true}
	for _, s := range r.Species {
		if a, err := engine.ParseFormula(s.Formula); err == nil {
			for el := range a {
				els[el] = true
			}
		}
	}
	o.Measured = map[string]MeasuredGas{}
	for _, sp := range t.Thermo.Within(els) {
		if sp.Phase == engine.Gas && !kineticGas[sp.Formula] {
			o.Measured[sp.Formula] = MeasuredGas{}
		}
	}
	for _, g := range r.Gases {
		f := strings.TrimSuffix(g.Text, "(g)")
		if _, ok := o.Measured[f]; (ok || kineticGas[f]) && g.PartialKPa > 0 {
			dissolved, form, waters := dissolvedAs(r.FinalComposition, f)
			if g.Kind == "headspace" || g.LiquidMol > 0 {
				// The closed headspace's share was taken out of the
				// liquid after the state: the composition still holds it.
				dissolved = g.LiquidMol
			}
			m := MeasuredGas{Mol: g.Mol, PPM: g.HeadspacePPM, Dissolved: dissolved}
			m.SolHkJ, m.HasSolH = solutionEnthalpy(t, f, form, waters)
			o.Measured[f] = m
		}
	}
	// Dinitrogen tetroxide is nitrogen dioxide paired up (N2O4 ⇌ 2 NO2,
	// mostly NO2 again once it warms or spreads in air): the fumes are
	// counted as NO2 (CRC Handbook, from memory).
	if d, ok := o.Measured["N2O4"]; ok && d.Mol > 0 {
		m := o.Measured["NO2"]
		m.Mol += 2 * d.Mol
		m.PPM = math.Min(m.PPM+2*d.PPM, 1e6)
		o.Measured["NO2"] = m
		delete(o.Measured, "N2O4")
	}
}

// dissolvedAs is the mol of a gas left dissolved as its neutral molecule:
// the same formula in solution, or the formula with water (dissolved sulfur
// and carbon dioxide are written H2SO3 and H2CO3 in the NBS tables). It
// also returns the text of the largest such form and its waters added.
func dissolvedAs(comp []engine.AmountOf, gas string) (n float64, form string, waters int) {
	ga, err := engine.ParseFormula(gas)
	if err != nil {
		return 0, "", 0
	}
	most := 0.0
	for _, a := range comp {
		if a.Phase != engine.Aqueous && a.Phase != "" || strings.ContainsAny(a.Text, "+-^") {
			continue
		}
		aa, err := engine.ParseFormula(a.Text)
		if err != nil {
			continue
		}
		w := aa["O"] - ga["O"] // waters added
		same := w >= 0 && aa["H"]-ga["H"] == 2*w
		for el, k := range aa {
			if el != "H" && el != "O" && ga[el] != k {
				same = false
			}
		}
		for el := range ga {
			if aa[el] == 0 {
				same = false
			}
		}
		if same {
			n += a.Mol
			if a.Mol > most {
				most, form, waters = a.Mol, a.Text, w
			}
		}
	}
	return n, form, waters
}

// solutionEnthalpy is ΔH of dissolving the gas as its dissolved form (with
// its waters, H2O(l) taken up), from the species data: negative, as gases
// dissolve with heat given off. False when either ΔfH° is missing.
func solutionEnthalpy(t *engine.Tables, gas, form string, waters int) (float64, bool) {
	g, ok1 := t.Thermo.Get(gas + "(g)")
	d, ok2 := t.Thermo.Get(form)
	w, ok3 := t.Thermo.Get("H2O")
	if !ok1 || !ok2 || !ok3 || !g.HasDfH || !d.HasDfH || !w.HasDfH || form == "" {
		return 0, false
	}
	return d.DfH - g.DfH - float64(waters)*w.DfH, true
}

// reactions sorts the engine's reactions into those that proceed and those
// held back. It reports whether the headline (whose amounts the engine ran)
// proceeds.
func (o *Outcome) reactions(r *engine.Result) bool {
	head := false
	if r.Reaction != nil && r.ECell != nil {
		head = o.consider("headline", r.Reaction, *r.ECell, r.Hindered)
	}
	for i, a := range r.Alternatives {
		o.consider(label("alternative", i+1), a.Reaction, a.ECell, a.Hindered)
	}
	for i, s := range r.Steps {
		if s.ECell != nil && head {
			o.consider(label("step", i+2), s.Reaction, *s.ECell, false)
		}
	}
	for _, h := range r.HeldBack {
		text := h.Lock
		if h.Reaction != nil {
			text = h.Reaction.Text
		}
		o.HeldBack = append(o.HeldBack, HeldBack{Text: text, Reason: "held back at plant conditions: " + h.Reason, Lock: h.Lock})
	}
	return head
}

func label(what string, n int) string { return what + " " + strconv.Itoa(n) }

// consider adds one reaction to Reactions or HeldBack; it reports whether
// the reaction proceeds.
func (o *Outcome) consider(lbl string, rx *engine.Reaction, eCell float64, hindered bool) bool {
	if rx == nil {
		return false
	}
	p := Proceeding{Label: lbl, Text: rx.Text, ECell: eCell}
	for _, t := range rx.Reactants {
		p.Reactants = append(p.Reactants, engine.Species{Formula: t.Formula, Charge: t.Charge, Phase: t.Phase})
	}
	for _, t := range rx.Products {
		p.Products = append(p.Products, engine.Species{Formula: t.Formula, Charge: t.Charge, Phase: t.Phase})
	}
	reason := ""
	switch {
	case !(eCell > ProceedMarginV):
		reason = "E cell within the uncertainty of the potential table (not above +0.05 V): not counted as proceeding"
	case hindered:
		reason = "kinetically hindered at these conditions"
	case !o.fromState && o.uncatalysedOxygen(p):
		// An answer from the equilibrium state has its kinetic locks
		// applied already (a hot or catalysed peroxide does give oxygen);
		// this rule is for answers of the table method alone.
		reason = "oxygen from hypochlorite or peroxide alone needs a catalyst (Cu, Ni, Co, Fe, Mn ions) or heat; none is present, so it is slow at plant temperature"
	case !o.fromState && producesGas(p, "H2") && hasReactant(p, "BH4-") && o.PH >= 10:
		reason = "borohydride hydrolyses only slowly above about pH 10 (it is stored in caustic for that reason: Bretherick's Handbook, sodium tetrahydroborate, from memory)"
	case producesGas(p, "Cl2") && o.PH >= 5:
		reason = "chlorine does not persist above about pH 5 (it hydrolyses to hypochlorous acid and chloride); chlorine is judged from that equilibrium instead"
	}
	if reason != "" {
		for _, h := range o.HeldBack {
			if h.Text == rx.Text {
				return false
			}
		}
		o.HeldBack = append(o.HeldBack, HeldBack{Text: rx.Text, Reason: reason})
		return false
	}
	o.Reactions = append(o.Reactions, p)
	return true
}

// uncatalysedOxygen: the reaction gives oxygen, every reactant other than
// water, H+ and OH- is one species decomposing by itself, and no catalyst
// ion is present.
func (o *Outcome) uncatalysedOxygen(p Proceeding) bool {
	if !producesGas(p, "O2") {
		return false
	}
	fam := ""
	for _, s := range p.Reactants {
		if s.IsWater() || s.IsProton() || s.IsHydroxide() {
			continue
		}
		f, ok := selfDecomposing[s.Text()]
		if !ok || (fam != "" && f != fam) {
			return false
		}
		fam = f
	}
	return !(o.MolarBefore(catalysts...) >= TraceMolar)
}

func hasReactant(p Proceeding, text string) bool {
	for _, s := range p.Reactants {
		if s.Text() == text {
			return true
		}
	}
	return false
}

func producesGas(p Proceeding, formula string) bool {
	for _, s := range p.Products {
		if s.Formula == formula && s.Charge == 0 && s.Phase == engine.Gas {
			return true
		}
	}
	return false
}

func afterAmounts(xs []engine.AmountOf, volumeL float64) []Amount {
	var out []Amount
	for _, x := range xs {
		sp, err := engine.ParseSpecies(x.Text)
		if err != nil {
			continue
		}
		a := Amount{Species: sp, Mol: x.Mol}
		if sp.Phase == engine.Aqueous && volumeL > 0 {
			a.Molar = x.Mol / volumeL
		}
		out = append(out, a)
	}
	return out
}

// gasesOf keeps the gases of the engine's answer that come from reactions
// that proceed (every reaction the engine ran when they all proceed; the
// headline alone otherwise), and the dissolved gases the liquid cannot hold.
func (o *Outcome) gasesOf(r *engine.Result) {
	held := map[string]bool{}
	for _, h := range o.HeldBack {
		held[h.Text] = true
	}
	stepHeld := false
	for _, s := range r.Steps {
		stepHeld = stepHeld || (s.Reaction != nil && held[s.Reaction.Text])
	}
	if stepHeld {
		if r.Amounts != nil {
			for _, f := range r.Amounts.Formed {
				if strings.HasSuffix(f.Text, "(g)") {
					o.Gases = append(o.Gases, Gas{Formula: strings.TrimSuffix(f.Text, "(g)"), Mol: f.Mol})
				}
			}
		}
		for _, g := range r.Gases {
			if g.Kind == "volatile" {
				o.Gases = append(o.Gases, Gas{Formula: strings.TrimSuffix(g.Text, "(g)"), Mol: g.Mol})
			}
		}
		return
	}
	for _, g := range r.Gases {
		o.Gases = append(o.Gases, Gas{Formula: strings.TrimSuffix(g.Text, "(g)"), Mol: g.Mol})
	}
}

// heatOf takes the engine's heat, without the reactions that do not
// proceed: neutralisation and dissolving always count; the reactions only
// when the headline proceeds.
func (o *Outcome) heatOf(r *engine.Result, headRuns bool) {
	h := r.Heat
	if h == nil || h.HeatReleasedkJ == nil {
		return
	}
	total, rise := *h.HeatReleasedkJ, 0.0
	if h.TemperatureRiseC != nil {
		rise = *h.TemperatureRiseC
	}
	q := total
	if !headRuns && r.Conditions.PHFinal == nil {
		// Today's engine runs held-back reactions in its heat; an answer
		// from the equilibrium state holds only what proceeds.
		q = h.NeutralisationkJ + h.DissolutionkJ
	}
	if q != total {
		// Scale the rise by the heat kept: the same mass and heat capacity.
		if total != 0 && rise != 0 {
			rise = rise * q / total
		} else {
			rise = engine.TemperatureRise(q, o.VolumeL) // about 1 kg per litre
		}
	}
	o.Heat = Heat{Known: true, ReleasedkJ: q, RiseC: rise, ReachedC: o.TemperatureC + rise, Reactions: headRuns && q != h.NeutralisationkJ+h.DissolutionkJ, MixingkJ: h.DissolutionkJ}
	o.Heat.Boils = rise > 0 && o.Heat.ReachedC >= BoilingC
	if o.Heat.Boils && h.WaterFlashedKg != nil && q == total {
		o.Heat.SteamKg = *h.WaterFlashedKg
	}
}

// Water's heat capacity, 4.18 kJ/(kg·K), and enthalpy of vaporisation at
// 100 °C, 40.65 kJ/mol = 2257 kJ/kg (CRC Handbook, Properties of water and
// Enthalpy of vaporization; from memory): the steam a boiling mix gives off
// is the heat past the boiling point over the latter.
const (
	waterCpKJ      = 4.18
	steamKJPerKg   = 2257.0
	steamMolarMass = 18.015
)

// notSolidAcids are weak acids too weak, or too much else, to count as the
// acid of a dry blend: boric acid (pKa 9.2), cyanuric acid (6.9, the
// stabiliser blended with chlorinated isocyanurates), and the acids that
// are oxidizers or poisons in their own right.
var notSolidAcids = map[string]bool{"H3BO3": true, "C3H3N3O3": true, "HOCl": true, "HCN": true, "H2O2": true, "CrO3": true, "HClO3": true, "HClO4": true}

// solidAcid reports whether a chemical poured dry is an acid in water:
// a strong or weak acid (first pKa below about 5: sulfamic, oxalic,
// citric acids) or a bisulfate (sodium bisulfate, the "dry acid" of pool
// stores).
func solidAcid(ch *engine.Chemical) bool {
	if notSolidAcids[ch.Formula] {
		return false
	}
	if ch.Class == engine.StrongAcid || ch.Class == engine.WeakAcid {
		return true
	}
	for _, g := range ch.Gives {
		if g.Formula == "HSO4" && g.Charge == -1 {
			return true
		}
	}
	return false
}
