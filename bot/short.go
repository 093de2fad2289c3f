package bot

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/slack-go/slack"

	"mixward/engine"
	"mixward/engine/advice"
)

// The action ids of the buttons the bot shows, and the block that holds
// them under an answer. A button's value is the query id it acts on.
const (
	ActionDetails = "mixward_details" // the full answer, in the thread
	ActionPicture = "mixward_picture" // the E–pH picture, drawn on request
	ActionPour    = "mixward_pour"    // the order of addition
	ActionNewMix  = "mixward_new"     // opens the request form
	answerBlockID = "mixward_answer"
)

// The short answer's size on a phone: a two-stream answer stays within
// these (a test holds it to them).
const (
	ShortMaxBlocks = 6
	ShortMaxChars  = 1200
)

// shortParts is the short answer (advice.RenderShort) taken apart by line.
type shortParts struct {
	tags, forms, heat, redox, note string
	actions                        []string
	more                           string
}

// splitShort reads the lines of advice.RenderShort into their parts, so
// the chat answer says exactly what the console's short answer says.
func splitShort(r *engine.Result) shortParts {
	var p shortParts
	lines := strings.Split(strings.TrimRight(advice.RenderShort(r), "\n"), "\n")
	for _, l := range lines[1:] {
		switch {
		case strings.HasPrefix(l, "Forms: "):
			p.forms = strings.TrimPrefix(l, "Forms: ")
		case strings.HasPrefix(l, "Heat: "):
			p.heat = strings.TrimPrefix(l, "Heat: ")
		case strings.HasPrefix(l, "Redox: "):
			p.redox = strings.TrimPrefix(l, "Redox: ")
		case strings.HasPrefix(l, "- "):
			p.actions = append(p.actions, strings.TrimPrefix(l, "- "))
		case strings.HasPrefix(l, "  ("):
			p.more = strings.TrimSpace(l)
		case strings.HasPrefix(l, "  "):
			p.tags += strings.TrimSpace(l) + "; "
		default:
			p.note = strings.TrimSpace(p.note + " " + l)
		}
	}
	p.tags = strings.TrimSuffix(p.tags, "; ")
	return p
}

// ShortBlocks renders the short answer for a thread: the decision with its
// marker, what forms (gas and heat), what to do, the net equation, one line
// of context with the query number and the caution, and the buttons
// Details, E–pH picture, Pour order and New mix (shown when the answer is
// logged, since a press is recorded against its query).
func ShortBlocks(r *engine.Result, queryID int64) []slack.Block {
	p := splitShort(r)
	bl := []slack.Block{header(VerdictTitle(r))}
	forms := "*Forms:* " + esc(orDefault(p.forms, "nothing of concern")) + "\n*Heat:* " + esc(orDefault(p.heat, "no estimate"))
	if p.tags != "" {
		forms = "_" + esc(p.tags) + "_\n" + forms
	}
	bl = append(bl, section(truncate(forms, MaxSectionText)))
	if len(p.actions) > 0 {
		do := "*Do:*\n" + strings.Join(escAll(p.actions), "\n")
		if p.more != "" {
			do += "\n" + esc(strings.Replace(p.more, "in the details", "under Details", 1))
		}
		bl = append(bl, section(truncate(do, MaxSectionText)))
	}
	if len(p.actions) == 0 && r.Decision == nil {
		var hz []string
		for _, h := range SortHazards(r.Hazards) {
			if h.Severity != engine.Info && len(hz) < 3 {
				hz = append(hz, hazardLine(h))
			}
		}
		if len(hz) > 0 {
			bl = append(bl, section(truncate("*Hazards:*\n"+strings.Join(hz, "\n"), MaxSectionText)))
		}
	}
	if p.redox != "" {
		bl = append(bl, section(truncate("*Net:* "+netText(r, p.redox), MaxSectionText)))
	}
	ctx := esc(orDefault(p.note, Advisory))
	if queryID > 0 {
		ctx = fmt.Sprintf("Query #%d · ", queryID) + ctx
	}
	bl = append(bl, contextBlock(ctx))
	if queryID > 0 {
		bl = append(bl, answerButtons(queryID))
	}
	return bl
}

// netText is the redox line with its equation set as code.
func netText(r *engine.Result, redox string) string {
	if r.Reaction == nil || r.Reaction.Text == "" || !strings.Contains(redox, r.Reaction.Text) {
		return esc(redox)
	}
	before, after, _ := strings.Cut(redox, r.Reaction.Text)
	return esc(before) + "`" + esc(r.Reaction.Text) + "`" + esc(after)
}

// answerButtons is the actions block under an answer.
func answerButtons(queryID int64) slack.Block {
	id := strconv.FormatInt(queryID, 10)
	btn := func(action, label string) *slack.ButtonBlockElement {
		return slack.NewButtonBlockElement(action, id, slack.NewTextBlockObject(slack.PlainTextType, label, true, false))
	}
	details := btn(ActionDetails, "Details")
	details.Style = slack.StylePrimary
	return slack.NewActionBlock(answerBlockID, details, btn(ActionPicture, "E–pH picture"), btn(ActionPour, "Pour order"),
		slack.NewButtonBlockElement(ActionNewMix, "new", slack.NewTextBlockObject(slack.PlainTextType, "New mix", false, false)))
}

// DetailsBlocks is the full answer posted for Details: the decision with
// every reason, then the whole answer (ResultBlocks), then the pour.
func DetailsBlocks(r *engine.Result, queryID int64) []slack.Block {
	full := ResultBlocks(r, queryID)
	var why []string
	if d := r.Decision; d != nil {
		why = append(why, escAll(d.Reasons)...)
		for _, h := range d.Held {
			why = append(why, "• not counted: "+esc(h))
		}
	}
	out := []slack.Block{full[0]}
	if len(why) > 0 {
		out = append(out, sections("Why", why)...)
	}
	out = append(out, full[1:]...)
	return append(out, PourBlocks(r)...)
}

// PourText is the order of addition in plain text: each order, the
// hazards met along it and between which fractions, and the advice.
func PourText(r *engine.Result) string {
	a := r.Addition
	if a == nil {
		return "No pour analysis for this answer."
	}
	var b strings.Builder
	fmt.Fprintf(&b, "Along the pour (%d mixes evaluated):\n", a.Points)
	for _, o := range a.Orders {
		fmt.Fprintf(&b, "%s into %s: ", o.Added, o.Into)
		if len(o.Hazards) == 0 {
			b.WriteString("nothing of concern\n")
			continue
		}
		var hs []string
		for _, h := range o.Hazards {
			hs = append(hs, fmt.Sprintf("%s %s from %s to %s", strings.ToUpper(string(h.Worst)), h.Code, pct(h.FromFraction), pct(h.ToFraction)))
		}
		b.WriteString(strings.Join(hs, "; ") + "\n")
	}
	b.WriteString(a.Advice)
	return b.String()
}

func pct(f float64) string { return strings.TrimSuffix(fmt.Sprintf("%.1f", f*100), ".0") + " %" }

// PourBlocks is PourText as blocks; none when the answer has no pour.
func PourBlocks(r *engine.Result) []slack.Block {
	if r.Addition == nil {
		return nil
	}
	lines := strings.Split(PourText(r), "\n")
	return sections("Pour order", escLines(lines[1:]))
}

func escLines(xs []string) []string {
	out := make([]string, len(xs))
	for i, x := range xs {
		out[i] = esc(x)
	}
	return out
}

// BlockChars counts the characters a person reads in blocks: every text
// of every block, buttons included (what ShortMaxChars bounds).
func BlockChars(bl []slack.Block) int {
	n := 0
	add := func(t *slack.TextBlockObject) {
		if t != nil {
			n += len([]rune(t.Text))
		}
	}
	for _, b := range bl {
		switch x := b.(type) {
		case *slack.HeaderBlock:
			add(x.Text)
		case *slack.SectionBlock:
			add(x.Text)
			for _, f := range x.Fields {
				add(f)
			}
		case *slack.ContextBlock:
			for _, e := range x.ContextElements.Elements {
				if t, ok := e.(*slack.TextBlockObject); ok {
					add(t)
				}
			}
		case *slack.ActionBlock:
			for _, e := range x.Elements.ElementSet {
				if btn, ok := e.(*slack.ButtonBlockElement); ok {
					add(btn.Text)
				}
			}
		}
	}
	return n
}
