package engine

import (
	"fmt"
	"math"
	"sort"
	"strings"
)

// inMix is one species in the mix with its amount.
type inMix struct {
	sp     Species
	mol    float64
	excess bool   // solid or solvent present in excess
	minor  bool   // a conjugate form under minorShare of its family
	key    string // mixKey(sp)

}

// mixture is the tank after the streams are combined, before any redox
// reaction: strong electrolytes dissociated, neutralisation done, weak acids
// and bases distributed over their conjugate forms at the mix pH.
type mixture struct {
	volumeL     float64
	tempK       float64
	pressureKPa float64
	pH          float64
	pHStated    bool
	aqueous     bool
	species     map[string]*inMix // by Species.Ion for aqueous/gas, Key for solids
	order       []string
	chemicals   []string
	strongAcid  float64 // mol H+ from strong acids before neutralisation
	strongBase  float64 // mol OH- from strong bases before neutralisation
	neutralised float64 // mol H+ + OH- → H2O
	notes       []string
	assumed     []string    // strengths assumed, also in notes: shown in the short answer
	massKg      float64     // total mass of the mixed liquid and dissolved solids, for heat
	fict        float64     // charge standing in for streams with a stated pH (see buildMixture)
	dissolved   []dissolved // solids and near-pure liquids that dissolve into the mix
	solutes     []soluteIn  // solutes with heats of concentrated solution (data/dilution.txt)
	notAssessed []NotAssessed
	// fuelOxidizer names the strong oxidizing agent of the request (E° of
	// organicFuelV or more, solid or strong: partnerAbove) beside which an
	// organic chemical without data is taken in as fuel for the hazard
	// rules instead of withholding the answer.
	fuelOxidizer string
	// water is set when a liquid stream carries water (as water or as a
	// solution); neatOrganic when a liquid stream is a neat organic liquid.
	water, neatOrganic bool
	solidStream        bool // a stream poured as a solid (kg, no volume)
}

func (m *mixture) note(format string, args ...any) {
	n := fmt.Sprintf(format, args...)
	for _, x := range m.notes {
		if x == n {
			return
		}
	}
	m.notes = append(m.notes, n)
}

// assume notes a strength the engine assumed: the short answer shows it
// with the request's own readings (Result.ReadAs).
func (m *mixture) assume(format string, args ...any) {
	n := fmt.Sprintf(format, args...)
	for _, x := range m.assumed {
		if x == n {
			return
		}
	}
	m.assumed = append(m.assumed, n)
	m.note("%s", n)
}

// key indexes the mixture. Dissolved and gaseous forms of one neutral
// molecule (Cl2(aq), Cl2(g)) share a key, solids and liquids are separate.
func mixKey(s Species) string {
	if s.Phase == Solid {
		return s.Ion() + "(s)"
	}
	return s.Ion()
}

func (m *mixture) add(s Species, mol float64, excess bool) {
	k := mixKey(s)
	p, ok := m.species[k]
	if !ok {
		p = &inMix{sp: s, key: k}
		m.species[k] = p
		m.order = append(m.order, k)
	}
	p.mol += mol
	p.excess = p.excess || excess
}

func (m *mixture) get(s Species) *inMix {
	return m.species[mixKey(s)]
}

// molar is the concentration of an aqueous species in mol/L, 0 when absent.
func (m *mixture) molar(s Species) float64 {
	p := m.get(s)
	if p == nil || m.volumeL <= 0 {
		return 0
	}
	return p.mol / m.volumeL
}

// pKw is the ionic product of water at temperature T, from its value at
// 25 °C and the van 't Hoff equation with the enthalpy of neutralisation.
// pKw(25 °C) = 13.995 (CRC Handbook, Ionization Constant of Water; from memory).
func pKw(tempK float64) float64 {
	const pKw25 = 13.995
	const dH = 55.84e3 // J/mol for H2O → H+ + OH- (NBS 1982 formation enthalpies; from memory)
	return pKw25 - dH/(gasConstant*math.Ln10)*(1/StandardTemperatureK-1/tempK)
}

// dissolved is a reagent that enters the mix as a solid or as a near-pure
// liquid, whose heat of solution counts with the heat of the mix.
type dissolved struct {
	chem  *Chemical
	mol   float64
	phase Phase
}

// pureLiquidPct: a liquid reagent at or above this strength is taken as the
// pure liquid for its heat of dilution (96 % sulfuric acid as H2SO4(l)).
const pureLiquidPct = 90

// buildMixture combines the streams of a request.
func buildMixture(req *Request, t *Tables) (*mixture, error) {
	m := &mixture{species: map[string]*inMix{}, tempK: req.TemperatureK, pressureKPa: req.PressureKPa}
	anyVolume, assumedVol := false, false
	for i := range req.Streams {
		anyVolume = anyVolume || req.Streams[i].VolumeL > 0
	}
	// fict is the charge (mol) of an imagined spectator ion that makes the
	// streams with a stated pH come out at that pH: their own strong acid or
	// base is set aside and the stated H+/OH- excess used instead.
	fict := 0.0
	seenChem := map[string]bool{}
	for si := range req.Streams {
		f, assumed, err := m.addStream(&req.Streams[si], si, t, seenChem)
		if err != nil {
			return nil, err
		}
		fict += f
		assumedVol = assumedVol || assumed
	}
	if assumedVol {
		if anyVolume {
			m.note("a stream without an amount was taken as 1 L")
		} else {
			m.note("no volumes given: equal volumes of 1 L each assumed")
		}
	}
	if !m.aqueous {
		// Solids only: nothing dissolves, the table method does not apply.
		for _, k := range m.order {
			p := m.species[k]
			if p.sp.Phase == Aqueous {
				p.sp.Phase = Solid
			}
		}
		return m, nil
	}
	m.add(Species{Formula: "H2O", Phase: Liquid}, 0, true)
	// Neutralisation of strong acid by strong base.
	m.neutralised = math.Min(m.strongAcid, m.strongBase)
	if req.PH != nil {
		m.pH = *req.PH
		m.pHStated = true
	} else {
		m.fict = fict
		m.pH = solvePH(m, t)
	}
	m.distribute(t)
	m.setSolvent()
	return m, nil
}

// addStream adds one stream (number si) to the mixture: its volume and
// mass, its species, the solids and near-pure liquids it dissolves, and its
// strong acid and base. It returns the stand-in charge of a stated pH (see
// buildMixture) and whether the stream's volume was assumed.
func (m *mixture) addStream(st *Stream, si int, t *Tables, seenChem map[string]bool) (fict float64, assumed bool, err error) {
	vol := st.VolumeL
	liquid := vol > 0
	if vol == 0 && st.MassKg == 0 && streamIsSolution(st) {
		vol, liquid, assumed = 1, true, true
	}
	if st.MassKg > 0 {
		m.massKg += st.MassKg
		m.solidStream = m.solidStream || !liquid
	}
	if liquid {
		m.volumeL += vol
		m.aqueous = true
		m.massKg += vol * streamDensity(st, t)
	}
	var streamH, streamOH float64
	for ci := range st.Components {
		c := &st.Components[ci]
		ch := c.Chemical
		if !seenChem[ch.Formula] {
			seenChem[ch.Formula] = true
			m.chemicals = append(m.chemicals, ch.Formula)
		}
		if ch.Formula == "H2O" {
			m.water = m.water || liquid
			continue
		}
		mol, excess, err := componentMoles(st, c, vol, liquid, t, m)
		if err != nil {
			return 0, false, err
		}
		switch {
		case !liquid && st.MassKg > 0 && ch.Class != Metal && ch.Class != SparingSalt:
			m.dissolved = append(m.dissolved, dissolved{chem: ch, mol: mol, phase: Solid})
		case liquid && isNeat(c, t):
			m.dissolved = append(m.dissolved, dissolved{chem: ch, mol: mol, phase: Liquid})
		}
		if liquid {
			neat := isNeat(c, t)
			m.water = m.water || !neat
			m.neatOrganic = m.neatOrganic || (neat && t.organic(ch.Formula))
		}
		for _, g := range ch.Gives {
			n := mol * float64(g.Coef)
			switch {
			case g.IsProton():
				streamH += n
			case g.IsHydroxide():
				streamOH += n
			case g.IsWater():
			default:
				m.add(g.Species, n, excess)
			}
		}
	}
	if st.PH != nil && liquid {
		h := math.Pow(10, -*st.PH) * vol
		oh := math.Pow(10, *st.PH-pKw(m.tempK)) * vol
		fict = (streamH - streamOH) - (h - oh)
		// A stated pH that conflicts with a named strong acid or base is
		// ignored by the state (engine/state, fitPH), which says so.
		named := math.Max(streamH, streamOH)
		conflict := named/vol >= 0.01 && math.Abs(fict)/vol >= 0.01 && math.Abs(fict) > 0.25*named
		if (streamH > 0 || streamOH > 0) && !conflict {
			m.note("the stated pH %.4g of stream %d replaces the acid or base content computed from its components", *st.PH, si+1)
		}
	} else {
		m.strongAcid += streamH
		m.strongBase += streamOH
	}
	return fict, assumed, nil
}

// maxDefaultGPerL bounds the 1 mol/L read for a solution named without a
// strength: a chemical whose 1 mol/L would be more than this many grams per
// litre (polyaluminium chloride, 1269 g/mol) is refused without a strength
// rather than read as a solution with no water left in it.
const maxDefaultGPerL = 500

// neatDensity is the density of a liquid sold neat (a 100 % row in
// data/densities.txt: alcohols, glycols, ketones, amines, solvents, bromine,
// hydrazine): a stream naming it without a concentration is that liquid, not
// a 1 mol/L solution of it (see soldStrength).
func neatDensity(ch *Chemical, t *Tables) (float64, bool) {
	pct, d, ok := soldStrength(ch, t)
	return d, ok && pct >= 100
}

// isNeat reports whether a component is a liquid sold neat named without a
// concentration, or given at 90 % w/w or more.
func isNeat(c *Component, t *Tables) bool {
	if c.Unit == NoConc {
		_, ok := neatDensity(c.Chemical, t)
		return ok
	}
	return c.Unit == PctWW && c.Value >= pureLiquidPct
}

// streamIsSolution reports whether a stream without an amount is a liquid:
// anything but metals and sparingly soluble solids alone.
func streamIsSolution(st *Stream) bool {
	for _, c := range st.Components {
		switch c.Chemical.Class {
		case Metal, SparingSalt:
		default:
			return true
		}
	}
	return false
}

// streamDensity is the density of a liquid stream in kg/L, from the density
// table of its main component where there is one, else 1.
func streamDensity(st *Stream, t *Tables) float64 {
	for _, c := range st.Components {
		switch c.Unit {
		case PctWW:
			if d, ok := t.Density(c.Chemical.Formula, c.Value); ok {
				return d
			}
		case NoConc:
			if d, ok := neatDensity(c.Chemical, t); ok {
				return d
			}
		}
	}
	return 1
}

// componentMoles converts a component's stated concentration into moles of
// the chemical in its stream.
func componentMoles(st *Stream, c *Component, vol float64, liquid bool, t *Tables, m *mixture) (mol float64, excess bool, err error) {
	ch := c.Chemical
	mm := ch.MolarMass
	if mm <= 0 {
		return 0, false, fmt.Errorf("engine: %s has no molar mass", ch.Formula)
	}
	if !liquid {
		// A solid stream: the mass is the chemical, or a share of it.
		if st.MassKg == 0 {
			return 0, true, nil
		}
		frac := 1.0
		switch c.Unit {
		case NoConc:
		case PctWW:
			frac = c.Value / 100
		default:
			return 0, false, &ParseError{Code: "bad-concentration", Message: fmt.Sprintf("%s is in a solid stream (%g kg); give its share as %% w/w, or give the stream a volume in L", c.Name, st.MassKg), Position: c.Pos, Token: c.Name, Suggestions: []string{}}
		}
		return st.MassKg * 1000 * frac / mm, false, nil
	}
	var molar float64
	switch c.Unit {
	case NoConc:
		if ch.Class == Metal || ch.Class == SparingSalt {
			if st.MassKg > 0 {
				return st.MassKg * 1000 / mm, false, nil
			}
			m.note("%s given without an amount: present in excess", ch.Formula)
			return 0, true, nil
		}
		if st.PH != nil && liquid && (ch.Class == StrongAcid || ch.Class == StrongBase) {
			// "NaOH pH 11": the acid or base is what brings the stream to
			// the stated pH, whose stand-in (buildMixture) stands for it.
			m.note("%s named without a strength beside pH %.4g: read as the %s that brings the stream to that pH", ch.Formula, *st.PH, ch.Formula)
			return 0, false, nil
		}
		if pct, d, ok := soldStrength(ch, t); ok {
			// Requests read through readAmounts carry this strength already.
			molar = pct / 100 * d * 1000 / mm
			m.note("no concentration given for %s: read as %g %% w/w (%.4g kg/L, %.3g mol/L)", ch.Formula, pct, d, molar)
			break
		}
		if mm > maxDefaultGPerL {
			return 0, false, &ParseError{Code: "no-strength", Message: fmt.Sprintf("%s is given by volume without a strength, and the 1 mol/L otherwise assumed would be %.0f g/L of it, more than a solution holds; state the strength, for example \"%s 10 %%\"", c.Name, mm, c.Name), Position: c.Pos, Token: c.Name, Suggestions: []string{}}
		}
		molar = 1
		m.assume("no concentration given for %s: 1 mol/L assumed; state the strength", ch.Formula)
	case Molar:
		molar = c.Value
	case MilliM:
		molar = c.Value / 1000
	case PctWW:
		d, ok := t.Density(ch.Formula, c.Value)
		if sd, sok := solutionDensity(st, t); sok && len(st.Components) > 1 {
			// One liquid has one density: every share of a blend given in
			// % w/w is read with the density of the stream, taken from the
			// first of its chemicals with a density row at its strength
			// (oleum 20 % is 20 % SO3 and 80 % H2SO4 at 1.92 kg/L, not the
			// sulfuric acid at the 1.73 of its 80 % solution in water).
			d, ok = sd, true
		}
		if !ok {
			d = 1
			if c.Value > 5 {
				// Shown in the short answer too: at strengths like these the
				// amount can be a third short (ferric chloride 42 % is about
				// 1.45 g/mL).
				m.assume("no density table for %s at %g %% w/w: 1.00 g/mL assumed, which understates its concentration", ch.Formula, c.Value)
			}
		}
		molar = c.Value / 100 * d * 1000 / mm
		if base, ok := saltOfSolution(c, ch, t); ok {
			// A solution of a salt the trade sells as a hydrate, named by
			// the salt's plain name (ferrous sulfate 20 %, zinc sulfate
			// 20 %): its strength is the salt dissolved, as solution
			// strengths are given (common practice, no source), on the
			// salt's own density table. The crystal (copperas, the
			// heptahydrate, its formula) keeps its own mass.
			if db, dok := t.Density(base, c.Value); dok {
				mb, _ := t.MolarMass(base)
				molar = c.Value / 100 * db * 1000 / mb
				m.note("%s %g %% read as %g %% %s, the salt dissolved; name the hydrate (%s) for a strength counted as the crystal", c.Name, c.Value, c.Value, base, ch.Formula)
			}
		}
	case PctWV:
		molar = c.Value * 10 / mm
	case GPerL:
		molar = c.Value / mm
	case MgPerL, PPM:
		molar = c.Value / 1000 / mm
		if c.Unit == PPM {
			m.note("ppm read as mg/L, right for dilute water solutions")
		}
	}
	if ch.Formula == "NaOCl" && (c.Unit == PctWW || c.Unit == PctWV) {
		m.note("hypochlorite %% read as %% NaOCl by weight, not as %% available chlorine")
	}
	if ch.Class == Metal || ch.Class == SparingSalt {
		// A solid suspended in a liquid stream.
		return molar * vol, false, nil
	}
	return molar * vol, false, nil
}

// family is a chain of conjugate acid–base forms, most protonated first.
type family struct {
	// hydrolysis: a hydrated metal ion and its hydroxo form. They set the
	// pH of metal-salt solutions, but the ion keeps its name in the species
	// list and acts through its own couples (Cu^2+ stands for the hydrated
	// ion in every form), so its amount is not split.
	hydrolysis bool
	members    []Species
	keys       []string  // mixKey of each member
	pKa        []float64 // pKa[i] links members[i] and members[i+1]
}

// families groups the acid–base pairs into chains (H3PO4 … PO4^3-).
func families(t *Tables) []family {
	// Link acid → base.
	next := map[string]*AcidBasePair{}
	hasAcid := map[string]bool{}
	for _, p := range t.AcidBase {
		if p.Acid.IsWater() || p.Base.IsWater() || p.Acid.IsProton() || p.Base.IsHydroxide() {
			continue
		}
		next[p.Acid.Ion()] = p
		hasAcid[p.Base.Ion()] = true
	}
	var out []family
	var heads []string
	for k := range next {
		if !hasAcid[k] {
			heads = append(heads, k)
		}
	}
	sort.Strings(heads)
	for _, h := range heads {
		p := next[h]
		f := family{members: []Species{aqueousOf(p.Acid)}, keys: []string{p.Acid.Ion()}, hydrolysis: isHydrolysis(p)}
		seen := map[string]bool{h: true}
		for p != nil {
			f.members = append(f.members, aqueousOf(p.Base))
			f.keys = append(f.keys, p.Base.Ion())
			f.pKa = append(f.pKa, p.PKa)
			k := p.Base.Ion()
			if seen[k] {
				break
			}
			seen[k] = true
			p = next[k]
		}
		out = append(out, f)
	}
	return out
}

// isHydrolysis reports whether a pair is a metal ion losing H+ from a bound
// water (Fe^3+ / FeOH^2+): the base carries one O more than the acid.
func isHydrolysis(p *AcidBasePair) bool {
	a, err1 := ParseFormula(p.Acid.Formula)
	b, err2 := ParseFormula(p.Base.Formula)
	return err1 == nil && err2 == nil && b["O"] == a["O"]+1
}

func aqueousOf(s Species) Species {
	s.Phase = Aqueous
	return s
}

// fractions returns the share of each member of f at hydrogen-ion
// concentration h (mol/L).
func (f *family) fractions(h float64, out []float64) []float64 {
	out = out[:0]
	// log of the unnormalised share, relative to the most protonated form.
	logs := make([]float64, len(f.members))
	for i := 1; i < len(f.members); i++ {
		logs[i] = logs[i-1] + (-f.pKa[i-1]*math.Ln10 - math.Log(h))
	}
	mx := logs[0]
	for _, l := range logs {
		mx = math.Max(mx, l)
	}
	sum := 0.0
	for _, l := range logs {
		v := math.Exp(l - mx)
		out = append(out, v)
		sum += v
	}
	for i := range out {
		out[i] /= sum
	}
	return out
}

// solvePH finds the pH at which the mix is electrically neutral, with the
// weak acid–base families distributed at that pH (charge balance, activity
// coefficients taken as 1).
func solvePH(m *mixture, t *Tables) float64 {
	balance := m.balance(t)
	// balance falls as pH rises; bisect on pH in [-2, 16].
	lo, hi := -2.0, 16.0
	if balance(lo) < 0 {
		return lo
	}
	if balance(hi) > 0 {
		return hi
	}
	for range 34 { // 18 pH units / 2^34 ≈ 1e-9: well below any digit shown
		mid := (lo + hi) / 2
		if balance(mid) > 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2
}

// balance returns the net charge concentration (mol/L) of the mix as a
// function of pH, with every acid–base family distributed at that pH. It is
// zero at the mix's pH and falls as the pH rises; −balance(pH)·V is the
// acid (mol H+) to be taken out of the mix to bring it to that pH.
func (m *mixture) balance(t *Tables) func(pH float64) float64 {
	fams := t.families
	strong := 0.0 // charge of ions outside any family, mol/L
	famTotal := make([]float64, len(fams))
	for _, k := range m.order {
		p := m.species[k]
		if p.sp.Phase != Aqueous || p.sp.IsProton() || p.sp.IsHydroxide() {
			continue
		}
		if i, ok := t.famOf[p.key]; ok && p.sp.Phase == Aqueous {
			famTotal[i] += p.mol / m.volumeL
			continue
		}
		strong += float64(p.sp.Charge) * p.mol / m.volumeL
	}
	strong += m.fict / m.volumeL
	kw := math.Pow(10, -pKw(m.tempK))
	var buf []float64
	return func(pH float64) float64 {
		h := math.Pow(10, -pH)
		q := h - kw/h + strong
		for i, f := range fams {
			if famTotal[i] == 0 {
				continue
			}
			buf = f.fractions(h, buf)
			for j, s := range f.members {
				q += famTotal[i] * buf[j] * float64(s.Charge)
			}
		}
		return q
	}
}

// distribute spreads each acid–base family over its forms at the mix pH.
// Forms under 1 % of their family are dropped from the species list.
func (m *mixture) distribute(t *Tables) {
	h := math.Pow(10, -m.pH)
	var buf []float64
	for _, f := range t.families {
		total := 0.0
		for _, k := range f.keys {
			if p := m.species[k]; p != nil {
				total += p.mol
				p.mol = 0
			}
		}
		if total == 0 {
			continue
		}
		if f.hydrolysis {
			m.add(f.members[0], total, false)
			m.get(f.members[0]).minor = false
			continue
		}
		buf = f.fractions(h, buf)
		for j, s := range f.members {
			if buf[j] < 1e-12 {
				continue
			}
			m.add(s, total*buf[j], false)
			m.get(s).minor = buf[j] < minorShare
		}
	}
	// Drop emptied entries, keep order.
	keep := m.order[:0]
	for _, k := range m.order {
		p := m.species[k]
		if p.mol > 0 || p.excess {
			keep = append(keep, k)
		} else {
			delete(m.species, k)
		}
	}
	m.order = keep
}

// minorShare: a conjugate form under this share of its family is kept in
// the books (its charge and amount count) but not listed, and does not act
// as an oxidizer or reducer of its own; its main form does.
const minorShare = 0.01

// list returns the species in a stable order: as they entered the mix,
// water last. Minor conjugate forms are left out.
func (m *mixture) list() []*inMix {
	out := make([]*inMix, 0, len(m.order))
	var water *inMix
	for _, k := range m.order {
		p := m.species[k]
		if p.minor {
			continue
		}
		if p.sp.IsWater() {
			water = p
			continue
		}
		out = append(out, p)
	}
	if water != nil {
		out = append(out, water)
	}
	return out
}

// saltOfSolution reports, for a chemical read as a hydrate by a plain name
// of the salt (ferrous sulfate, zinc sulfate, TSP), the anhydrous formula
// whose strength a solution's % gives. A name that says hydrate or crystal,
// an old trade name of the crystal (copperas, vitriol, Epsom or Glauber's
// salt) or the hydrate's formula keeps the hydrate.
func saltOfSolution(c *Component, ch *Chemical, t *Tables) (string, bool) {
	base, _, hyd := strings.Cut(ch.Formula, ".")
	if !hyd {
		return "", false
	}
	name := strings.ToLower(strings.TrimSpace(c.Name))
	if hydrateDots(strings.TrimSpace(c.Name)) == ch.Formula {
		return "", false
	}
	for _, w := range []string{"hydrate", "crystal", "copperas", "vitriol", "epsom", "glauber"} {
		if strings.Contains(name, w) {
			return "", false
		}
	}
	if _, err := t.MolarMass(base); err != nil {
		return "", false
	}
	return base, true
}
