package engine

import (
	"fmt"
	"math"
	"sort"
	"strings"
)

// CaveatInput is what the caveats look at: the mix and the prediction made
// for it.
type CaveatInput struct {
	Present      []SpeciesAmount
	Chemicals    []string
	Oxidizer     *Couple
	Reducer      *Couple
	Reaction     *Reaction
	ECell        float64
	HasECell     bool
	PH           float64
	Alternatives []Alternative
}

// Caveats lists, in plain words and in a fixed order, what the table method
// cannot see about this prediction: a verdict too close to call, slow
// electrode reactions, passivation, products that depend on concentration,
// complex formation and spreads between sources. All are common practice
// unless a source is named in the text.
func Caveats(in CaveatInput) []string {
	c := &caveatCtx{in: in}
	c.ox, c.hasOx = coupleSpecies(in.Oxidizer)
	c.red, c.hasRed = coupleSpecies(in.Reducer)
	var out []string
	for _, f := range []func() []string{
		c.nearZero,
		c.sourceSpread,
		c.oxygenOverpotential,
		c.hydrogenFromWater,
		c.passivation,
		c.nitrate,
		c.sulfate,
		c.perchlorate,
		c.complexes,
		c.closeAlternatives,
	} {
		out = append(out, f()...)
	}
	return out
}

type caveatCtx struct {
	in            CaveatInput
	ox, red       Species
	hasOx, hasRed bool
}

// coupleSpecies reads the species of a chosen couple ("NO3-", "Al(s)",
// "Ag(s) + Cl-"): the first species written.
func coupleSpecies(c *Couple) (Species, bool) {
	if c == nil {
		return Species{}, false
	}
	t := strings.TrimSpace(c.Species)
	if i := strings.IndexAny(t, " ,"); i >= 0 {
		t = t[:i]
	}
	sp, err := ParseSpecies(t)
	if err != nil {
		return Species{}, false
	}
	return sp, true
}

func (c *caveatCtx) present(formula string, charge int) (SpeciesAmount, bool) {
	for _, s := range c.in.Present {
		if s.Species.Formula == formula && s.Species.Charge == charge {
			return s, true
		}
	}
	return SpeciesAmount{}, false
}

func (c *caveatCtx) hasChemical(formulas ...string) bool {
	for _, have := range c.in.Chemicals {
		for _, f := range formulas {
			if strings.TrimSpace(have) == f {
				return true
			}
		}
	}
	return false
}

func (c *caveatCtx) product(formula string, charge int) bool {
	if c.in.Reaction == nil {
		return false
	}
	for _, t := range c.in.Reaction.Products {
		if t.Formula == formula && t.Charge == charge {
			return true
		}
	}
	return false
}

// metals lists the mix's metals (solid elements present, the reducer if it
// is a metal, metals named as chemicals), sorted.
func (c *caveatCtx) metals() []string {
	set := map[string]bool{}
	for _, s := range c.in.Present {
		if s.Species.Charge == 0 && s.Species.Phase == Solid && metalName(s.Species.Formula) != "" {
			set[s.Species.Formula] = true
		}
	}
	if c.hasRed && c.red.Charge == 0 && metalName(c.red.Formula) != "" {
		set[c.red.Formula] = true
	}
	for _, f := range c.in.Chemicals {
		if metalName(strings.TrimSpace(f)) != "" {
			set[strings.TrimSpace(f)] = true
		}
	}
	out := make([]string, 0, len(set))
	for m := range set {
		out = append(out, m)
	}
	sort.Strings(out)
	return out
}

func metalName(f string) string {
	switch f {
	case "Al":
		return "aluminium"
	case "Cr":
		return "chromium"
	case "Fe":
		return "iron"
	case "Ni":
		return "nickel"
	case "Ti":
		return "titanium"
	case "Au":
		return "gold"
	case "Pt":
		return "platinum"
	case "Pd":
		return "palladium"
	case "Ag":
		return "silver"
	case "Cu":
		return "copper"
	case "Zn":
		return "zinc"
	case "Co":
		return "cobalt"
	case "Mg":
		return "magnesium"
	case "Sn":
		return "tin"
	case "Pb":
		return "lead"
	case "Mn":
		return "manganese"
	case "Cd":
		return "cadmium"
	case "Hg":
		return "mercury"
	}
	return ""
}

func volts(v float64) string { return fmt.Sprintf("%+.2f V", v) }

func (c *caveatCtx) nearZero() []string {
	if !c.in.HasECell || math.IsNaN(c.in.ECell) || math.Abs(c.in.ECell) >= UncertainECellV {
		return nil
	}
	return []string{fmt.Sprintf("The cell potential is %s, within %.1f V of zero, so the verdict is uncertain: "+
		"a small change in concentration, temperature or the tabulated potentials (sources differ by up to about 0.1 V) "+
		"can reverse it. Treat the mix as able to react.", volts(c.in.ECell), UncertainECellV)}
}

// sourceSpread names couples whose published potentials differ enough to
// change a verdict this close to zero (CRC Electrochemical Series, recent
// editions, against older tables; from memory).
func (c *caveatCtx) sourceSpread() []string {
	if !c.in.HasECell || !c.hasOx || math.Abs(c.in.ECell) >= 0.15 {
		return nil
	}
	switch {
	case c.ox.Formula == "Cr2O7" && c.ox.Charge == -2:
		return []string{"Published potentials for acidic dichromate differ: 1.232 V in recent CRC Handbook editions, 1.33 V in older tables " +
			"(from memory). At this cell potential the choice can change the verdict."}
	case c.ox.Formula == "OCl" && c.ox.Charge == -1:
		return []string{"Published potentials for hypochlorite in base range from 0.81 to 0.90 V (from memory). " +
			"At this cell potential the choice can change the verdict."}
	}
	return nil
}

func (c *caveatCtx) oxygenOverpotential() []string {
	if !c.hasRed || !(c.red.IsWater() || c.red.IsHydroxide()) || !c.product("O2", 0) {
		return nil
	}
	msg := "The table predicts oxygen from water, but oxygen evolution needs a large overpotential (about 0.4–0.6 V on most surfaces) " +
		"and is slow at room temperature."
	var halides []string
	for _, h := range []struct{ f, name string }{{"Cl", "chloride"}, {"Br", "bromide"}, {"I", "iodide"}} {
		if _, ok := c.present(h.f, -1); ok {
			halides = append(halides, h.name)
		}
	}
	if len(halides) > 0 {
		msg += " In practice the " + strings.Join(halides, " and ") + " in the mix is oxidised first (to the halogen), which the table ranks lower."
	} else {
		msg += " Expect little or no gas unless a catalyst or electrode is present."
	}
	return []string{msg}
}

func (c *caveatCtx) hydrogenFromWater() []string {
	if !c.hasOx || !c.ox.IsWater() || !c.product("H2", 0) || c.in.PH < 4 || c.in.PH > 10 {
		return nil
	}
	return []string{fmt.Sprintf("Hydrogen from water at pH %.1f is slow for most metals: expect corrosion over days rather than a reaction in the tank. "+
		"Alkali and alkaline-earth metals are the exception, and aluminium or zinc react quickly only in strong alkali.", c.in.PH)}
}

// oxidisingAcid names the oxidising acid in the mix, if any: nitric,
// chromic, or concentrated sulfuric.
func (c *caveatCtx) oxidisingAcid() string {
	acidic := c.in.PH < 2
	if _, ok := c.present("NO3", -1); ok && acidic || c.hasChemical("HNO3") {
		return "nitric acid"
	}
	if _, ok := c.present("Cr2O7", -2); ok && acidic || c.hasChemical("CrO3", "H2CrO4") {
		return "chromic acid"
	}
	for _, f := range []string{"HSO4", "SO4"} {
		z := -1
		if f == "SO4" {
			z = -2
		}
		if s, ok := c.present(f, z); ok && s.Molar >= 10 {
			return "concentrated sulfuric acid"
		}
	}
	return ""
}

func (c *caveatCtx) passivation() []string {
	acid := c.oxidisingAcid()
	if acid == "" {
		return nil
	}
	var names []string
	for _, m := range c.metals() {
		switch m {
		case "Al", "Cr", "Fe", "Ni", "Ti":
			names = append(names, metalName(m))
		}
	}
	if len(names) == 0 {
		return nil
	}
	return []string{"Passivation: " + strings.Join(names, " and ") + " in " + acid + " can grow a thin oxide film that stops the attack the table predicts " +
		"(stainless steel behaves the same way). The metal may look inert and then start reacting suddenly if chloride, scratching or dilution breaks the film."}
}

func (c *caveatCtx) nitrate() []string {
	if !c.hasOx || c.ox.Formula != "NO3" && c.ox.Formula != "HNO3" {
		return nil
	}
	var out []string
	msg := "Nitrate gives different products at different strengths: concentrated nitric acid (above about 8 M) mainly brown NO2, " +
		"dilute acid mainly NO, and very dilute acid with active metals (zinc, magnesium, iron) also N2O or ammonium."
	if s, ok := c.present("NO3", -1); ok && s.Molar > 0 {
		expect := "NO"
		switch {
		case s.Molar >= 8:
			expect = "mainly NO2"
		case s.Molar >= 4:
			expect = "a mixture of NO and NO2"
		case s.Molar < 0.5:
			expect = "NO, with some N2O or ammonium from active metals"
		}
		msg += fmt.Sprintf(" Here nitrate is about %.2g M, where %s is expected.", s.Molar, expect)
	}
	switch {
	case c.product("NO2", 0):
		msg += " The equation shown gives NO2."
	case c.product("NO", 0):
		msg += " The equation shown gives NO."
	}
	out = append(out, msg)
	if c.in.PH >= 4 {
		out = append(out, fmt.Sprintf("Nitrate oxidises slowly outside acid: at pH %.1f the reaction may not be seen at room temperature.", c.in.PH))
	}
	return out
}

func (c *caveatCtx) sulfate() []string {
	if c.hasOx && (c.ox.Formula == "SO4" || c.ox.Formula == "HSO4") {
		return []string{"Sulfate oxidises metals only in hot, concentrated sulfuric acid (giving SO2); in dilute acid at room temperature it does not " +
			"react, and metals give hydrogen instead."}
	}
	if c.oxidisingAcid() == "concentrated sulfuric acid" && len(c.metals()) > 0 {
		return []string{"Concentrated sulfuric acid, when hot, oxidises metals such as copper and gives sulfur dioxide, which the table method does not show; " +
			"cold, it reacts slowly."}
	}
	return nil
}

func (c *caveatCtx) perchlorate() []string {
	if !c.hasOx || c.ox.Formula != "ClO4" || c.ox.Charge != -1 {
		return nil
	}
	return []string{"Perchlorate is kinetically inert in dilute solution at room temperature: the predicted reaction is unlikely to be seen. " +
		"(Hot, concentrated perchloric acid is a different and explosive hazard.)"}
}

func (c *caveatCtx) complexes() []string {
	metals := c.metals()
	if len(metals) == 0 {
		return nil
	}
	cl, hasCl := c.present("Cl", -1)
	_, hasCN := c.present("CN", -1)
	_, hasNH3 := c.present("NH3", 0)
	var out []string
	for _, m := range metals {
		name := metalName(m)
		switch m {
		case "Au", "Pt", "Pd":
			var ways []string
			if hasCl && c.hasOx {
				ways = append(ways, "chloride with a strong oxidizer (as chloro-complexes such as AuCl4-)")
			}
			if hasCN && m == "Au" {
				ways = append(ways, "cyanide with air (as Au(CN)2-)")
			}
			if len(ways) > 0 {
				out = append(out, "Complex formation: "+name+" dissolves only with a complexing ligand, here "+strings.Join(ways, " or ")+
					". The bare potential table understates this, so expect "+name+" to dissolve.")
			} else {
				out = append(out, "Complex formation: "+name+" dissolves only with a complexing ligand (chloride with a strong oxidizer, or cyanide with air); "+
					"none is present, so expect no attack on it.")
			}
		case "Ag", "Cu", "Zn", "Ni", "Co":
			var ligands []string
			if hasCN && m != "Ni" && m != "Co" {
				ligands = append(ligands, "cyanide")
			}
			if hasNH3 {
				ligands = append(ligands, "ammonia")
			}
			if m == "Cu" && hasCl && cl.Molar >= 1 {
				ligands = append(ligands, "concentrated chloride")
			}
			if len(ligands) > 0 {
				out = append(out, "Complex formation: "+strings.Join(ligands, " and ")+" bind "+name+" ions strongly, which lowers its effective potential: "+
					name+" can dissolve in this mix with milder oxidizers (even air) than the bare table shows.")
			}
		}
	}
	return out
}

func (c *caveatCtx) closeAlternatives() []string {
	if !c.in.HasECell {
		return nil
	}
	var pairs []string
	for _, a := range c.in.Alternatives {
		if a.Oxidizer == nil || a.Reducer == nil || math.Abs(a.ECell-c.in.ECell) >= UncertainECellV {
			continue
		}
		pairs = append(pairs, fmt.Sprintf("%s with %s (%s)", a.Oxidizer.Species, a.Reducer.Species, volts(a.ECell)))
	}
	if len(pairs) == 0 {
		return nil
	}
	return []string{"Close competitors: " + strings.Join(pairs, "; ") + " react almost as readily as the headline pair (" + volts(c.in.ECell) +
		"). Both may run, and the products can be a mixture; the faster reaction usually wins."}
}
