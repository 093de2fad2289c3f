package bot

import (
	"encoding/json"
	"fmt"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/slack-go/slack"

	"mixward/engine"
	"mixward/store"
)

// The request form: its callback id and the block ids of its inputs (the
// keys of field errors).
const (
	FormCallback   = "mixward_form"
	FieldTags      = "tags"
	FieldAmounts   = "amounts"
	FieldStreams   = "streams"
	FieldTemp      = "temperature"
	FieldPH        = "ph"
	FieldChannel   = "channel"
	formMaxOptions = 100 // Slack's limit on the options of a static select
)

// FormInput is what a person entered in the request form.
type FormInput struct {
	Tags    []string // catalogue tags picked, in the order picked
	Amounts string   // amounts for the picked tags, comma-separated, same order; may be empty
	Streams string   // typed streams, one a line
	Temp    string   // °C, may be empty
	PH      string   // may be empty
	Channel string   // where to answer, from the form (global shortcut only)
}

// formMeta is what the form carries in its private metadata: where it was
// opened, so the answer goes there.
type formMeta struct {
	Channel string `json:"c,omitempty"`
	Thread  string `json:"t,omitempty"`
}

// formPart is a piece of the request text built from the form, with the
// field it came from, so an error at a character is shown on its field.
type formPart struct {
	field      string
	start, end int // rune offsets in the request text, end exclusive
}

// Request builds the mix request text from the form: the picked tags (each
// after its amount, when given) and the typed streams joined by " + ", then
// "at T C" and "at pH X". errs holds the field errors found before the
// engine reads the text (empty form, amounts that do not match the tags,
// a temperature or pH that is not a number).
func (f FormInput) Request() (text string, parts []formPart, errs map[string]string) {
	errs = map[string]string{}
	var streams []string
	var fields []string
	amounts := splitList(f.Amounts)
	if len(amounts) > 0 && len(amounts) != len(f.Tags) {
		errs[FieldAmounts] = fmt.Sprintf("Give one amount for each picked tag (%d picked, %d amounts), or none.", len(f.Tags), len(amounts))
	}
	for i, tag := range f.Tags {
		s := tag
		if i < len(amounts) && len(amounts) == len(f.Tags) {
			s = amounts[i] + " " + tag
		}
		streams, fields = append(streams, s), append(fields, FieldTags)
	}
	typed := strings.TrimSpace(f.Streams)
	if len(typed) > 4 && strings.EqualFold(typed[:4], "mix ") {
		typed = typed[4:] // a whole request typed in: its streams
	}
	for _, line := range strings.Split(typed, "\n") {
		for _, l := range strings.Split(line, " + ") {
			if l = strings.Join(strings.Fields(l), " "); l != "" {
				streams, fields = append(streams, l), append(fields, FieldStreams)
			}
		}
	}
	if len(streams) == 0 {
		errs[FieldStreams] = "Pick at least one tag or type a stream, such as 200 L NaOCl 12.5 %."
	}
	var b strings.Builder
	add := func(field, s string) {
		start := utf8.RuneCountInString(b.String())
		b.WriteString(s)
		parts = append(parts, formPart{field: field, start: start, end: start + utf8.RuneCountInString(s)})
	}
	b.WriteString("mix ")
	for i, s := range streams {
		if i > 0 {
			b.WriteString(" + ")
		}
		add(fields[i], s)
	}
	if t := strings.TrimSpace(f.Temp); t != "" {
		v, err := strconv.ParseFloat(strings.TrimSpace(strings.TrimRight(t, "°Cc ")), 64)
		if err != nil || v < -50 || v > 300 {
			errs[FieldTemp] = fmt.Sprintf("Write the temperature in °C as a number such as 40; %q is not one.", t)
		} else {
			add(FieldTemp, " at "+strconv.FormatFloat(v, 'f', -1, 64)+" C")
		}
	}
	if p := strings.TrimSpace(f.PH); p != "" {
		v, err := strconv.ParseFloat(p, 64)
		if err != nil || v < -2 || v > 16 {
			errs[FieldPH] = fmt.Sprintf("Write the pH as a number such as 3 or 11.5; %q is not one.", p)
		} else {
			add(FieldPH, " at pH "+strconv.FormatFloat(v, 'f', -1, 64))
		}
	}
	return b.String(), parts, errs
}

// splitList splits "200 L, 50 L" (commas, semicolons or line breaks).
func splitList(s string) []string {
	var out []string
	for _, x := range strings.FieldsFunc(s, func(r rune) bool { return r == ',' || r == ';' || r == '\n' }) {
		if x = strings.Join(strings.Fields(x), " "); x != "" {
			out = append(out, x)
		}
	}
	return out
}

// fieldAt is the form field the rune position pos (1-based, as in
// engine.ParseError) falls in; the typed streams when it falls between.
func fieldAt(parts []formPart, pos int) string {
	for _, p := range parts {
		if pos-1 >= p.start && pos-1 < p.end {
			return p.field
		}
	}
	for _, p := range parts {
		if p.field == FieldStreams || p.field == FieldTags {
			return p.field
		}
	}
	return FieldStreams
}

// FormErrors maps an engine parse error of the form's request text onto
// the field it came from, in words for the form.
func FormErrors(parts []formPart, pe *engine.ParseError) map[string]string {
	msg := chatHints(pe.Message)
	if pe.Token != "" {
		msg = fmt.Sprintf("%s (at %q)", msg, pe.Token)
	}
	if len(pe.Suggestions) > 0 {
		msg += ". Did you mean: " + strings.Join(pe.Suggestions, ", ") + "?"
	}
	return map[string]string{fieldAt(parts, pe.Position): truncate(msg, 150)}
}

// FormInputFromState reads the submitted values of the form.
func FormInputFromState(st *slack.ViewState) FormInput {
	var f FormInput
	if st == nil {
		return f
	}
	get := func(block string) slack.BlockAction { return st.Values[block][block] }
	for _, o := range get(FieldTags).SelectedOptions {
		f.Tags = append(f.Tags, o.Value)
	}
	f.Amounts = get(FieldAmounts).Value
	f.Streams = get(FieldStreams).Value
	f.Temp = get(FieldTemp).Value
	f.PH = get(FieldPH).Value
	f.Channel = get(FieldChannel).SelectedConversation
	return f
}

// FormView is the request form. streams are the catalogue's tags to pick
// from (the first formMaxOptions); askChannel adds a field for where to
// answer (a global shortcut knows no channel).
func FormView(streams []store.Stream, meta formMeta, askChannel bool) slack.ModalViewRequest {
	pt := func(s string) *slack.TextBlockObject {
		return slack.NewTextBlockObject(slack.PlainTextType, s, false, false)
	}
	input := func(id, label, hint, placeholder string, multiline bool) *slack.InputBlock {
		el := slack.NewPlainTextInputBlockElement(pt(placeholder), id)
		el.Multiline = multiline
		el.MaxLength = 1000
		b := slack.NewInputBlock(id, pt(label), pt(hint), el)
		b.Optional = true
		return b
	}
	var bl []slack.Block
	if len(streams) > 0 {
		var opts []*slack.OptionBlockObject
		for _, s := range streams[:min(len(streams), formMaxOptions)] {
			opts = append(opts, slack.NewOptionBlockObject(s.Tag, pt(truncate(s.Tag+" · "+chatText(s.Stream), 75)), nil))
		}
		sel := slack.NewOptionsMultiSelectBlockElement(slack.MultiOptTypeStatic, pt("Pick tanks or lines"), FieldTags, opts...)
		tags := slack.NewInputBlock(FieldTags, pt("Streams from the site catalogue"), nil, sel)
		tags.Optional = true
		bl = append(bl, tags, input(FieldAmounts, "Amounts for the picked streams", "Same order as picked, e.g. 200 L, 50 L. Leave empty for the catalogue amounts.", "200 L, 50 L", false))
	}
	bl = append(bl,
		input(FieldStreams, "Other streams, one a line", "As in a mix request: amount, chemical, concentration.", "200 L NaOCl 12.5 %", true),
		input(FieldTemp, "Temperature, °C (optional)", "", "25", false),
		input(FieldPH, "pH (optional, overrides the computed one)", "", "7", false))
	if askChannel {
		sel := slack.NewOptionsSelectBlockElement(slack.OptTypeConversations, pt("Where to answer"), FieldChannel)
		sel.DefaultToCurrentConversation = true
		bl = append(bl, slack.NewInputBlock(FieldChannel, pt("Answer in"), pt("The answer is posted there, in a thread under your request."), sel))
	}
	bl = append(bl, contextBlock(esc(Advisory)))
	md, _ := json.Marshal(meta)
	return slack.ModalViewRequest{
		Type: slack.VTModal, CallbackID: FormCallback, PrivateMetadata: string(md),
		Title: pt("New mix"), Submit: pt("Check the mix"), Close: pt("Cancel"),
		Blocks: slack.Blocks{BlockSet: bl},
	}
}

// loadingView is shown at once while the catalogue is read for the form
// (a trigger is good for about 3 s; views.update fills the form in after).
func loadingView(meta formMeta) slack.ModalViewRequest {
	md, _ := json.Marshal(meta)
	pt := func(s string) *slack.TextBlockObject {
		return slack.NewTextBlockObject(slack.PlainTextType, s, false, false)
	}
	return slack.ModalViewRequest{
		Type: slack.VTModal, CallbackID: FormCallback, PrivateMetadata: string(md), Title: pt("New mix"), Close: pt("Cancel"),
		Blocks: slack.Blocks{BlockSet: []slack.Block{section("Reading the stream catalogue…")}},
	}
}

// chatHints turns the engine's pointers to shell commands into the chat
// commands that do the same.
func chatHints(s string) string {
	return strings.NewReplacer("'mixward streams list'", "`streams`", "'mixward streams set ", "'streams set ",
		"mixward streams list", "streams", "mixward streams set ", "streams set ").Replace(s)
}
