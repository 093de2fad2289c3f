package engine

import (
	"fmt"
	"strings"
)

// RenderText writes a result as plain text for a terminal, the console or a
// chat fallback. It is deterministic: the same result gives the same text.
func RenderText(r *Result) string {
	var b strings.Builder
	w := func(format string, args ...any) { fmt.Fprintf(&b, format, args...) }
	w("Request: %s\n", r.Request)
	w("Verdict: %s\n", Headline(r))
	for _, s := range r.Streams {
		if s.Tag != "" {
			w("  %s is %s\n", s.Tag, s.Text)
		}
	}
	c := r.Conditions
	if c.VolumeL > 0 {
		w("Conditions: %s, %.1f °C, %s L mixed, %s\n", conditionsPH(c), c.TemperatureC, trimFloat(c.VolumeL, 4), conditionsMedium(c))
	} else {
		w("Conditions: %.1f °C, no liquid\n", c.TemperatureC)
	}
	if len(r.Species) > 0 {
		if reacts(c) {
			w("\nSpecies present as combined, before any reaction:\n")
		} else {
			w("\nSpecies present:\n")
		}
		width := 0
		for _, s := range r.Species {
			width = max(width, len(s.Text))
		}
		for _, s := range r.Species {
			w("  %-*s  %s\n", width, s.Text, speciesRole(s))
		}
	}
	// A pair that does not run (the table method's strongest pair in a mix
	// where nothing changes) is shown as on paper only, never as a reaction.
	onPaper := r.Verdict == NonSpontaneous || r.Verdict == Spontaneous && r.Hindered
	fam := familyCounted(r)
	switch {
	case r.Oxidizer != nil && r.Reducer != nil && onPaper && fam != "" && r.Verdict == Spontaneous:
		w("\nThe strongest pair on the table, held back in the equilibrium state; the reaction runs as its family instead (%s), counted in the heat below\n", fam)
	case r.Oxidizer != nil && r.Reducer != nil && onPaper:
		w("\nOn paper only, not running at these conditions: the strongest pair on the table\n")
		if fam != "" {
			w("What runs instead is judged as a reaction family: %s (its heat below)\n", fam)
		}
	}
	if r.Oxidizer != nil && r.Reducer != nil {
		w("\nOxidizing agent: %s   E° %+.3f V, E here %+.3f V\n", r.Oxidizer.Species, r.Oxidizer.EStandard, r.Oxidizer.E)
		w("  reduction: %s\n", r.Oxidizer.HalfReaction)
		w("Reducing agent:  %s   E° %+.3f V, E here %+.3f V\n", r.Reducer.Species, r.Reducer.EStandard, r.Reducer.E)
		w("  oxidation: %s\n", r.Reducer.HalfReaction)
	}
	switch {
	case r.Reaction != nil && onPaper && fam != "" && r.Verdict == Spontaneous:
		w("\nNet ionic equation of the pair (%d e-), as the table writes it:\n  %s\n", r.Reaction.Electrons, r.Reaction.Text)
	case r.Reaction != nil && onPaper:
		w("\nNet ionic equation on paper (%d e-), does not run:\n  %s\n", r.Reaction.Electrons, r.Reaction.Text)
	case r.Reaction != nil && r.OutsideAqueous != "":
		w("\nNet ionic equation of the aqueous model (%d e-), not what happens here:\n  %s\n", r.Reaction.Electrons, r.Reaction.Text)
		w("What happens: %s\n", r.OutsideAqueous)
	case r.Reaction != nil:
		w("\nNet ionic equation (%d e- transferred):\n  %s\n", r.Reaction.Electrons, r.Reaction.Text)
	}
	if r.ECell != nil {
		w("E°cell %+.3f V, E cell %+.3f V at the mix's conditions", *r.ECellStandard, *r.ECell)
		if r.DeltaGkJ != nil {
			w(", ΔG %s kJ", trimFloat(*r.DeltaGkJ, 1))
		}
		if r.Log10K != nil {
			w(", log10 K %.1f", *r.Log10K)
		}
		w("\n")
	}
	if r.Allowance != nil {
		w("Kinetic allowance used in ranking (%s, %.1f V): %s (%s)\n", r.Allowance.ID, r.Allowance.Volts, r.Allowance.Reason, r.Allowance.Source)
	}
	if len(r.Alternatives) > 0 {
		w("\nOther changes that also proceed, largest first:\n")
		for i, a := range r.Alternatives {
			w("  %d. %s with %s, E cell %+.3f V\n     %s\n", i+1, a.Oxidizer.Species, a.Reducer.Species, a.ECell, a.Reaction.Text)
			if a.Note != "" {
				w("     %s\n", a.Note)
			}
		}
	}
	renderAmounts(&b, r)
	if len(r.Hazards) > 0 {
		w("\nHazards:\n")
		for _, h := range r.Hazards {
			w("  [%s] %s: %s\n", strings.ToUpper(string(h.Severity)), h.Code, h.Message)
		}
	}
	if len(r.Caveats) > 0 {
		w("\nCaveats:\n")
		for _, c := range r.Caveats {
			w("  - %s\n", c)
		}
	}
	if len(r.Notes) > 0 {
		w("\nAssumptions:\n")
		for _, n := range r.Notes {
			w("  - %s\n", n)
		}
	}
	w("\n")
	for _, c := range r.Cautions {
		w("CAUTION: %s\n", c)
	}
	return b.String()
}

// Headline is the one-line verdict shown first.
func Headline(r *Result) string {
	fam := familyCounted(r)
	switch {
	case fam != "" && r.Verdict == Spontaneous && r.Reaction != nil:
		s := "SPONTANEOUS — " + r.Oxidizer.Species + " oxidizes " + r.Reducer.Species + "; runs, judged as a reaction family: " + fam
		if d := dangerCount(r); d > 0 {
			s += fmt.Sprintf(" (%d danger hazard%s)", d, plural(d))
		}
		return s
	case fam != "":
		s := "REACTS — " + fam + ", judged as a reaction family (the potential table has no pair for it that runs)"
		if d := dangerCount(r); d > 0 {
			s += fmt.Sprintf(" (%d danger hazard%s)", d, plural(d))
		}
		return s
	}
	switch r.Verdict {
	case Spontaneous:
		s := "SPONTANEOUS"
		if r.Hindered {
			s += " but kinetically slow"
		}

		if r.Reaction != nil {
			s += " — " + r.Oxidizer.Species + " oxidizes " + r.Reducer.Species
		}
		if d := dangerCount(r); d > 0 {
			s += fmt.Sprintf(" (%d danger hazard%s)", d, plural(d))
		}
		return s
	case NonSpontaneous:
		s := "NOT SPONTANEOUS — no redox reaction expected"
		if d := dangerCount(r); d > 0 {
			s += fmt.Sprintf(", but %d danger hazard%s", d, plural(d))
		}
		return s
	default:
		s := "NO REACTION — no oxidizing and reducing agent pair present"
		if d := dangerCount(r); d > 0 {
			s += fmt.Sprintf(", but %d danger hazard%s", d, plural(d))
		}
		return s
	}
}

// familyCounted is the reaction judged as a family whose heat the decision
// counts (chromic acid or hypochlorite burning an alcohol, nitric acid with
// formic acid), as written, when there is one.
func familyCounted(r *Result) string {
	if r.Decision == nil || r.Decision.Heat == nil || len(r.Decision.Heat.Reactions) == 0 {
		return ""
	}
	x, _, _ := strings.Cut(r.Decision.Heat.Reactions[0].Reaction, " (")
	return x
}

func dangerCount(r *Result) int {
	n := 0
	for _, h := range r.Hazards {
		if h.Severity == Danger {
			n++
		}
	}
	return n
}

func plural(n int) string {
	if n == 1 {
		return ""
	}
	return "s"
}

func speciesRole(s SpeciesInfo) string {
	var parts []string
	switch {
	case len(s.Roles) == 2:
		parts = append(parts, "oxidizing and reducing agent")
	case len(s.Roles) == 1 && s.Roles[0] == OxidizerRole:
		parts = append(parts, "oxidizing agent")
	case len(s.Roles) == 1:
		parts = append(parts, "reducing agent")
	default:
		parts = append(parts, "neither")
	}
	if len(s.Partners) > 0 {
		parts = append(parts, "with "+strings.Join(s.Partners, ", "))
	}
	if s.Spectator {
		parts = append(parts, "spectator")
	}
	switch {
	case s.Excess:
		parts = append(parts, "in excess")
	case s.Phase == Aqueous && s.Molar > 0:
		parts = append(parts, fmt.Sprintf("%.3g mol/L", s.Molar))
	case s.Mol > 0:
		parts = append(parts, fmt.Sprintf("%.3g mol", s.Mol))
	}
	return strings.Join(parts, "; ")
}

// trimFloat formats x with at most d decimals and no trailing zeros.
func trimFloat(x float64, d int) string {
	s := fmt.Sprintf("%.*f", d, x)
	if strings.Contains(s, ".") {
		s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
	}
	if s == "-0" {
		s = "0"
	}
	return s
}

func renderAmounts(b *strings.Builder, r *Result) {
	w := func(format string, args ...any) { fmt.Fprintf(b, format, args...) }
	if a := r.Amounts; a != nil && a.Limiting != nil {
		w("\nAmounts (headline reaction):\n")
		w("  limiting reagent %s, extent %s mol\n", *a.Limiting, sigText(a.ExtentMol))
		w("  consumed: %s\n", amountsText(a.Consumed))
		w("  formed:   %s\n", amountsText(a.Formed))
	}
	if len(r.HeldBack) > 0 {
		w("\nPossible on paper, held back at plant conditions:\n")
		for _, h := range r.HeldBack {
			if h.Reaction != nil {
				w("  %s\n", h.Reaction.Text)
			}
			w("     %s (%s)\n", h.Reason, h.Lock)
		}
	}
	if len(r.NotAssessed) > 0 {
		w("\nNot assessed (answered for the rest of the mix; neither the chemical nor its counter-ions are counted):\n")
		for _, n := range r.NotAssessed {
			w("  %s (%s, in %s): %s\n", n.Name, n.Formula, n.Stream, n.Reason)
		}
	}
	if len(r.Gases) > 0 {
		w("\nGas released (%.0f °C, %s kPa):\n", r.Conditions.TemperatureC, trimFloat(r.Conditions.PressureKPa, 3))
		for _, g := range r.Gases {
			w("  %-8s %s mol = %s L = %s m³\n", g.Text, sigText(g.Mol), sigText(g.VolumeL), sigText(g.VolumeM3))
		}
		if r.Decision != nil {
			for _, g := range r.Decision.Gases {
				if g.Kind == "driven-off" {
					w("  %-8s %s mol = %s L counted by the decision: driven off by the mix's own heat or beyond the mixed state (see Hazards)\n", g.Text, sigText(g.Mol), sigText(g.VolumeL))
				}
			}
		}
	}
	if h := r.Heat; h != nil {
		label := "Heat"
		if d := r.Decision; d != nil && d.Heat != nil && len(d.Heat.Reactions) > 0 {
			writeFamilyHeat(w, d.Heat)
			label = "  Heat of the mixed state alone"
		}
		switch {
		case h.HeatReleasedkJ != nil && *h.HeatReleasedkJ == 0 && label != "Heat":
			w("\n%s: none (no strong acid meets strong base, nothing solid dissolves)\n", label)
		case h.HeatReleasedkJ != nil && *h.HeatReleasedkJ == 0:
			w("\n%s: none estimated (no reaction runs, no strong acid meets strong base, nothing solid dissolves)\n", label)

		case h.HeatReleasedkJ != nil:

			if q := *h.HeatReleasedkJ; q >= 0 {
				w("\n%s: %s kJ released", label, sigText(q))
			} else {
				w("\n%s: %s kJ taken up (the mix cools)", label, sigText(-q))
			}

			if h.NeutralisationkJ != 0 {
				w(" (%s kJ of it from neutralisation)", sigText(h.NeutralisationkJ))
			}
			if h.DissolutionkJ != 0 {
				w(" (%s kJ from dissolving solid or concentrated reagents)", sigText(h.DissolutionkJ))
			}

			if h.TemperatureRiseC != nil {
				w(", temperature change about %+.1f °C", *h.TemperatureRiseC)
			}

			w("\n")
			if h.LeftOutBoundkJ != nil && len(h.GibbsStandIn) > 0 {
				w("  %s without ΔfH°: counted as a related form with ΔfH° plus hydroxide and water where one exists, else at ΔfG° (%s); what that leaves out is at most about %s kJ in all\n", strings.Join(h.Missing, ", "), strings.Join(h.GibbsStandIn, ", "), sigText(*h.LeftOutBoundkJ))
			} else if h.LeftOutBoundkJ != nil {
				w("  %s counted as a related form with ΔfH° plus hydroxide and water; the heat of forming it from that form is left out (at most about %s kJ in all)\n", strings.Join(h.Missing, ", "), sigText(*h.LeftOutBoundkJ))
			}
			if h.DeltaHkJPerMol != nil {
				w("  ΔH of the headline reaction %s kJ per mol as written\n", trimFloat(*h.DeltaHkJPerMol, 1))
			}
			w("  %s\n", h.Assumption)
			for _, x := range h.IfRuns {
				w("  Not counted above, held back: if %s runs, it gives off %s kJ more", x.Reaction, sigText(x.ReleasedkJ))
				if x.Boils {
					w(" and the mix boils")
				} else if x.ReachedC != nil {
					w(", to about %.0f °C", *x.ReachedC)
				}
				w(" (%s)\n", x.Source)
			}
		case h.Withheld != "":
			w("\nHeat: no estimate, %s\n", h.Withheld)
		case len(h.Missing) > 0:
			w("\nHeat: no estimate, the formation-enthalpy table lacks %s\n", strings.Join(h.Missing, ", "))
		}
	}
	if len(r.FinalComposition) > 0 && (r.Amounts != nil && r.Amounts.Limiting != nil) {
		w("\nIn the tank afterwards:\n")
		for _, c := range r.FinalComposition {
			if c.Mol == 0 {
				w("  %s\n", c.Text)
				continue
			}
			w("  %-10s %s mol\n", c.Text, sigText(c.Mol))
		}
	}
}

// writeFamilyHeat writes the heat the decision counts when it adds
// reactions judged as families to the mixed state's: the figure of the
// short answer, each family's part, then (by the caller) the state's own.
func writeFamilyHeat(w func(string, ...any), h *HeatJudged) {
	w("\nHeat: %s kJ released in all", sigText(h.ReleasedkJ))
	if h.Boils {
		w(", would reach the boiling point: boils\n")
	} else {
		w(", to about %.0f °C\n", h.ReachedC)
	}
	for _, x := range h.Reactions {
		w("  %s kJ of it from %s, judged as a reaction family (%s)\n", sigText(x.ReleasedkJ), x.Reaction, x.Source)
	}
}

// conditionsPH is the pH of the Conditions line: the mix at equilibrium,
// after every change that runs, with the pH as combined (before any
// reaction, where the species list stands) beside it when the two differ.
// An answer without the equilibrium state has the combined pH only.
func conditionsPH(c Conditions) string {
	how := "computed"
	if c.PHStated {
		how = "stated"
	}
	if !reacts(c) {
		return fmt.Sprintf("pH %.2f (%s)", c.PH, how)
	}
	return fmt.Sprintf("pH %.2f at equilibrium (%.2f as combined, before any reaction, %s)", *c.PHFinal, c.PH, how)
}

// conditionsMedium names the medium beside the pH the Conditions line
// leads with: after the reaction when it reacts, with the medium the
// equations are written in when that differs (the mix as combined).
func conditionsMedium(c Conditions) string {
	if !reacts(c) || c.MediumFinal == "" || c.MediumFinal == c.Medium {
		return string(c.Medium) + " medium"
	}
	return fmt.Sprintf("%s medium after the reaction (equations written in %s medium, as combined)", c.MediumFinal, c.Medium)
}

// reacts reports whether the equilibrium pH differs from the pH as
// combined (to the two decimals shown).
func reacts(c Conditions) bool {
	return c.PHFinal != nil && fmt.Sprintf("%.2f", *c.PHFinal) != fmt.Sprintf("%.2f", c.PH)
}

func amountsText(xs []AmountOf) string {
	parts := make([]string, len(xs))
	for i, x := range xs {
		parts[i] = sigText(x.Mol) + " mol " + x.Text
	}
	return strings.Join(parts, ", ")
}

// sigText writes x with 4 significant digits, without exponent for
// everyday magnitudes.
func sigText(x float64) string {
	ax := x
	if ax < 0 {
		ax = -ax
	}
	if ax != 0 && (ax < 1e-3 || ax >= 1e7) {
		return fmt.Sprintf("%.3g", x)
	}
	return trimFloat(sigDigits(x, 4), 6)
}
