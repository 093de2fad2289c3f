package bot

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"strings"
	"unicode/utf8"

	"github.com/slack-go/slack"

	"mixward/engine"
	"mixward/engine/advice"
)

// Block Kit limits (Slack's Block Kit reference; the library does not
// enforce them).
const (
	MaxBlocks      = 50   // blocks per message
	MaxHeaderChars = 150  // plain text of a header block
	MaxSectionText = 3000 // text of a section block
	MaxContextText = 3000 // each element of a context block
	MaxFallback    = 3900 // the message "text": Slack truncates past 4000
)

// maxAlternatives is how many other reacting pairs a Slack answer lists.
const maxAlternatives = 3

// Advisory is said under every mix answer, whatever the engine adds.
const Advisory = "Advisory only, not a permit: follow the safety data sheets, site procedures, management-of-change and local codes, and ask a qualified person before mixing."

// VerdictTitle is the headline of an answer: the decision (do not mix,
// with precautions, no concern) with its marker when the answer carries
// one, else a marker for the verdict and the engine's one-line headline.
func VerdictTitle(r *engine.Result) string {
	if d := r.Decision; d != nil {
		mark := map[engine.Level]string{engine.DoNotMix: ":red_circle:", engine.WithPrecautions: ":large_orange_circle:"}[d.Level]
		if mark == "" {
			mark = ":large_green_circle:"
		}
		return mark + " " + advice.DecisionLine(r)
	}
	mark := ":large_green_circle:"
	switch {
	case countSeverity(r.Hazards, engine.Danger) > 0:
		mark = ":red_circle:"
	case r.Verdict == engine.Spontaneous:
		mark = ":large_orange_circle:"
	}
	return mark + " " + engine.Headline(r)
}

func plural(n int) string {
	if n == 1 {
		return ""
	}
	return "s"
}

func countSeverity(hz []engine.Hazard, s engine.Severity) int {
	n := 0
	for _, h := range hz {
		if h.Severity == s {
			n++
		}
	}
	return n
}

// SortHazards returns the hazards danger first, then warning, then info,
// keeping the engine's order within a severity.
func SortHazards(hz []engine.Hazard) []engine.Hazard {
	out := slices.Clone(hz)
	rank := func(s engine.Severity) int {
		switch s {
		case engine.Danger:
			return 0
		case engine.Warning:
			return 1
		case engine.Info:
			return 2
		}
		return 3
	}
	slices.SortStableFunc(out, func(a, b engine.Hazard) int { return cmp.Compare(rank(a.Severity), rank(b.Severity)) })
	return out
}

// esc escapes text for Slack mrkdwn (Slack's "escaping text" rules), with
// control, escape and bidi characters shown escaped (chatText), so
// that no stored or echoed text can reorder or hide what a message says.
func esc(s string) string {
	return mrkdwnEscaper.Replace(chatText(s))
}

var mrkdwnEscaper = strings.NewReplacer("&", "&amp;", "<", "&lt;", ">", "&gt;")

func volts(v float64) string { return fmt.Sprintf("%+.3f V", v) }

func num(v float64) string {
	switch a := math.Abs(v); {
	case a == 0:
		return "0"
	case a >= 1e7 || a < 0.001:
		return fmt.Sprintf("%.3g", v)
	case a >= 100:
		return fmt.Sprintf("%.0f", v)
	case a >= 10:
		return fmt.Sprintf("%.1f", v)
	default:
		return fmt.Sprintf("%.3g", v)
	}
}

// ResultBlocks renders a mix answer as Block Kit blocks, in order: the
// verdict header, the request, species with roles, the two half-reactions,
// the net equation, potentials, amounts/gas/heat, hazards (danger first),
// caveats and the caution. Long parts are split to respect MaxSectionText;
// use SplitMessages to keep within MaxBlocks per message.
func ResultBlocks(r *engine.Result, queryID int64) []slack.Block {
	var bl []slack.Block
	bl = append(bl, header(VerdictTitle(r)))
	if d := r.Decision; d != nil && len(d.Actions) > 0 {
		bl = append(bl, sections("What to do", escAll(d.Actions))...)
	}
	req := "*Request:* `" + esc(r.Request) + "`"
	if r.Decision != nil {
		req += "  ·  redox: " + esc(engine.Headline(r))
	}
	if queryID > 0 {
		req += fmt.Sprintf("  ·  logged as query #%d", queryID)
	}
	bl = append(bl, contextBlock(req))
	if len(r.Streams) > 0 {
		var lines []string
		for _, s := range r.Streams {
			l := "• " + esc(s.Text)
			if s.Tag != "" {
				l = "• *" + esc(s.Tag) + "*: " + esc(s.Text)
			}
			lines = append(lines, l)
		}
		bl = append(bl, sections("Streams", lines)...)
	}

	if len(r.Species) > 0 {
		var lines []string
		for _, s := range r.Species {
			lines = append(lines, speciesLine(s))
		}
		bl = append(bl, sections("Species present", lines)...)
	}

	if r.Oxidizer != nil || r.Reducer != nil {
		var lines []string
		if c := r.Oxidizer; c != nil {
			lines = append(lines, fmt.Sprintf("*Oxidizing agent* %s (reduction):\n`%s`  E° = %s, E = %s", esc(c.Species), esc(c.HalfReaction), volts(c.EStandard), volts(c.E)))
		}
		if c := r.Reducer; c != nil {
			lines = append(lines, fmt.Sprintf("*Reducing agent* %s (oxidation):\n`%s`  E° = %s, E = %s", esc(c.Species), esc(c.HalfReaction), volts(c.EStandard), volts(c.E)))
		}
		bl = append(bl, sections("Half-reactions", lines)...)
	}

	if r.Reaction != nil && r.Reaction.Text != "" {
		line := "`" + esc(r.Reaction.Text) + "`"
		if r.Reaction.Electrons > 0 {
			line += fmt.Sprintf("\n%d electron%s transferred", r.Reaction.Electrons, plural(r.Reaction.Electrons))
		}
		bl = append(bl, sections("Net ionic equation", []string{line})...)
	}

	if lines := potentialLines(r); len(lines) > 0 {
		bl = append(bl, sections("Potentials", lines)...)
	}
	if lines := amountLines(r); len(lines) > 0 {
		bl = append(bl, sections("Amounts, gas and heat", lines)...)
	}

	if len(r.Hazards) > 0 {
		var lines []string
		for _, h := range SortHazards(r.Hazards) {
			lines = append(lines, hazardLine(h))
		}
		bl = append(bl, sections("Hazards", lines)...)
	}

	caveats := append(slices.Clone(r.Caveats), r.Notes...)
	if len(caveats) > 0 {
		var lines []string
		for _, c := range caveats {
			lines = append(lines, "• "+esc(c))
		}
		bl = append(bl, sections("Caveats", lines)...)
	}

	bl = append(bl, slack.NewDividerBlock())
	for _, c := range cautionTexts(r) {
		for _, part := range splitText(":warning: "+esc(c), MaxContextText) {
			bl = append(bl, contextBlock(part))
		}
	}
	return bl
}

// cautionTexts is the engine's cautions, followed by the advisory line
// unless the engine already says the answer is not a permit.
func cautionTexts(r *engine.Result) []string {
	out := slices.Clone(r.Cautions)
	for _, c := range out {
		if strings.Contains(strings.ToLower(c), "not a permit") {
			return out
		}
	}
	return append(out, Advisory)
}

func speciesLine(s engine.SpeciesInfo) string {
	l := "• " + esc(s.Text)
	switch {
	case s.Excess:
		l += " (in excess)"
	case s.Molar > 0:
		l += " " + num(s.Molar) + " mol/L"
	case s.Mol > 0:
		l += " " + num(s.Mol) + " mol"
	}
	var roles []string
	for _, r := range s.Roles {
		switch r {
		case engine.OxidizerRole:
			roles = append(roles, "oxidizing agent")
		case engine.ReducerRole:
			roles = append(roles, "reducing agent")
		default:
			roles = append(roles, string(r))
		}
	}
	if s.Spectator {
		roles = append(roles, "spectator")
	}
	if len(roles) > 0 {
		l += " — " + strings.Join(roles, ", ")
	}
	if len(s.Partners) > 0 {
		l += " (with " + esc(strings.Join(s.Partners, ", ")) + ")"
	}
	return l
}

func potentialLines(r *engine.Result) []string {
	var lines []string
	if r.ECellStandard != nil {
		lines = append(lines, "E°cell = "+volts(*r.ECellStandard))
	}
	if r.ECell != nil {
		c := r.Conditions
		lines = append(lines, fmt.Sprintf("Ecell = %s at pH %.2f, %.0f °C (Nernst)", volts(*r.ECell), c.PH, c.TemperatureC))
	}
	if r.DeltaGkJ != nil {
		lines = append(lines, fmt.Sprintf("ΔG = %s kJ per reaction as written", num(*r.DeltaGkJ)))
	}
	if r.Log10K != nil {
		lines = append(lines, fmt.Sprintf("log₁₀ K = %s", num(*r.Log10K)))
	}
	if a := r.Allowance; a != nil {
		lines = append(lines, fmt.Sprintf("Kinetic allowance %s (%s): %s", esc(a.ID), volts(a.Volts), esc(a.Reason)))
	}
	shown := 0
	for _, alt := range r.Alternatives {
		if alt.Oxidizer == nil || alt.Reducer == nil {
			continue
		}
		if shown == maxAlternatives {
			lines = append(lines, fmt.Sprintf("… and %d more pairs with Ecell > 0 (the plain-text answer lists them all)", len(r.Alternatives)-shown))
			break
		}
		shown++
		l := fmt.Sprintf("Also possible: %s with %s, Ecell = %s", esc(alt.Oxidizer.Species), esc(alt.Reducer.Species), volts(alt.ECell))
		if alt.Note != "" {
			l += " (" + esc(truncate(alt.Note, 140)) + ")"
		}
		lines = append(lines, l)
	}
	return lines
}

func amountLines(r *engine.Result) []string {
	var lines []string
	if a := r.Amounts; a != nil {
		if a.Limiting != nil {
			lines = append(lines, "Limiting: "+esc(*a.Limiting))
		}
		if len(a.Consumed) > 0 {
			lines = append(lines, "Consumed: "+amountList(a.Consumed))
		}
		if len(a.Formed) > 0 {
			lines = append(lines, "Formed: "+amountList(a.Formed))
		}
	}
	for _, g := range r.Gases {
		lines = append(lines, fmt.Sprintf("Gas: %s %s mol, about %s L (%s m³)", esc(g.Text), num(g.Mol), num(g.VolumeL), num(g.VolumeM3)))
	}
	if h := r.Heat; h != nil {
		if h.HeatReleasedkJ != nil {
			l := "Heat released: about " + num(*h.HeatReleasedkJ) + " kJ"
			if h.TemperatureRiseC != nil {
				l += fmt.Sprintf(", temperature rise about %s °C", num(*h.TemperatureRiseC))
			}
			lines = append(lines, l)
		}
		if h.NeutralisationkJ != 0 {
			lines = append(lines, "of which neutralisation: "+num(h.NeutralisationkJ)+" kJ")
		}
		if h.Assumption != "" {
			lines = append(lines, "_"+esc(h.Assumption)+"_")
		}
		if len(h.Missing) > 0 {
			lines = append(lines, "No formation-enthalpy data for "+esc(strings.Join(h.Missing, ", ")))
		}
	}
	return lines
}

func amountList(as []engine.AmountOf) string {
	var parts []string
	for _, a := range as {
		parts = append(parts, esc(a.Text)+" "+num(a.Mol)+" mol")
	}
	return strings.Join(parts, ", ")
}

func hazardLine(h engine.Hazard) string {
	icon := ":large_blue_circle: info"
	switch h.Severity {
	case engine.Danger:
		icon = ":red_circle: *DANGER*"
	case engine.Warning:
		icon = ":large_orange_circle: *warning*"
	}
	l := icon + " " + esc(h.Message)
	if h.Code != "" {
		l += " (" + esc(h.Code) + ")"
	}
	return l
}

func header(text string) slack.Block {
	return slack.NewHeaderBlock(slack.NewTextBlockObject(slack.PlainTextType, truncate(text, MaxHeaderChars), true, false))
}

func contextBlock(mrkdwn string) slack.Block {
	return slack.NewContextBlock("", slack.NewTextBlockObject(slack.MarkdownType, truncate(mrkdwn, MaxContextText), false, false))
}

func section(mrkdwn string) slack.Block {
	return slack.NewSectionBlock(slack.NewTextBlockObject(slack.MarkdownType, mrkdwn, false, false), nil, nil)
}

// sections renders a titled list as one or more section blocks, each within
// MaxSectionText.
func sections(title string, lines []string) []slack.Block {
	var out []slack.Block
	for _, part := range splitText("*"+title+"*\n"+strings.Join(lines, "\n"), MaxSectionText) {
		out = append(out, section(part))
	}
	return out
}

// TextBlocks renders plain mrkdwn text as section blocks within the limits.
func TextBlocks(mrkdwn string) []slack.Block {
	var out []slack.Block
	for _, part := range splitText(mrkdwn, MaxSectionText) {
		out = append(out, section(part))
	}
	return out
}

// splitText cuts s into pieces of at most limit bytes, preferring line
// breaks, then spaces, and never cutting a UTF-8 sequence.
func splitText(s string, limit int) []string {
	var out []string
	for len(s) > limit {
		// The separator may sit just past the limit: it is dropped.
		cut := strings.LastIndexByte(s[:limit+1], '\n')
		if cut <= 0 {
			cut = strings.LastIndexByte(s[:limit+1], ' ')
		}
		if cut <= 0 {
			cut = limit
			for cut > 0 && !utf8.RuneStart(s[cut]) {
				cut--
			}
		}
		out = append(out, s[:cut])
		s = strings.TrimLeft(s[cut:], "\n ")
	}
	if s != "" || len(out) == 0 {
		out = append(out, s)
	}
	return out
}

// truncate shortens s to at most limit bytes, ending in "…" when cut.
func truncate(s string, limit int) string {
	if len(s) <= limit {
		return s
	}
	cut := limit - len("…")
	for cut > 0 && !utf8.RuneStart(s[cut]) {
		cut--
	}
	return s[:cut] + "…"
}

// SplitMessages groups blocks into messages of at most MaxBlocks blocks.
// Every message carries fallback text; continuation messages say so.
// The fallback is plain text made safe for Slack (esc): a mention typed in
// a request (<!here>) never pings from it.
func SplitMessages(fallback string, blocks []slack.Block) []Message {
	fallback = truncate(esc(fallback), MaxFallback)
	if len(blocks) == 0 {
		return []Message{{Text: fallback}}
	}
	var out []Message
	for i := 0; i < len(blocks); i += MaxBlocks {
		j := min(i+MaxBlocks, len(blocks))
		text := fallback
		if i > 0 {
			text = fmt.Sprintf("(continued, part %d)", len(out)+1)
		}
		out = append(out, Message{Text: text, Blocks: blocks[i:j]})
	}
	return out
}

func escAll(xs []string) []string {
	out := make([]string, len(xs))
	for i, x := range xs {
		out[i] = "• " + esc(x)
	}
	return out
}
