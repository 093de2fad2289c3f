package engine

import (
	"errors"
	"fmt"
	"strconv"
	"strings"
)

// amountUnit is a unit of a stream's amount.
type amountUnit struct {
	factor float64 // litres, or kilograms when mass is set, per unit
	mass   bool
	note   string // how the unit was read, for the answer's notes; "" for none
}

const (
	usGallonNote  = "read as US gallons: %s L (1 US gal = 3.785411784 L, NIST SP 811)"
	usGallonGuess = usGallonNote + "; write imp gal for imperial gallons"
	impGallonNote = "read as imperial gallons: %s L (1 imp gal = 4.54609 L, NIST SP 811)"
)

// amountUnits are the amount units of one word, by lower-case spelling. A
// bare gallon is the US gallon, and the answer says so.
var amountUnits = map[string]amountUnit{
	"l": {factor: 1}, "litre": {factor: 1}, "liter": {factor: 1}, "litres": {factor: 1}, "liters": {factor: 1},
	"ml": {factor: 1e-3}, "m3": {factor: 1000}, "m³": {factor: 1000},
	"gal": {factor: litresPerUSGallon, note: usGallonGuess}, "gallon": {factor: litresPerUSGallon, note: usGallonGuess},
	"gallons": {factor: litresPerUSGallon, note: usGallonGuess},
	"kg":      {factor: 1, mass: true}, "g": {factor: 1e-3, mass: true}, "t": {factor: 1000, mass: true},
	"lb": {factor: kgPerPound, mass: true}, "lbs": {factor: kgPerPound, mass: true},
}

// gallonKinds are the words that name the kind of a gallon before it
// ("US gal", "imp gal").
var gallonKinds = map[string]amountUnit{
	"us":       {factor: litresPerUSGallon, note: usGallonNote},
	"u.s.":     {factor: litresPerUSGallon, note: usGallonNote},
	"imp":      {factor: litresPerImpGallon, note: impGallonNote},
	"imperial": {factor: litresPerImpGallon, note: impGallonNote},
}

// amountUnitAt looks up the amount unit starting at u (and the word after
// it, next, for "US gal" and "imp gal"). It returns the unit, the number of
// words it takes and its text.
func amountUnitAt(u, next *token) (amountUnit, int, string, bool) {
	lu := strings.ToLower(u.text)
	if k, ok := gallonKinds[lu]; ok && next != nil && next.kind == tWord {
		if g := strings.ToLower(next.text); g == "gal" || g == "gallon" || g == "gallons" {
			return k, 2, u.text + " " + next.text, true
		}
	}
	au, ok := amountUnits[lu]
	return au, 1, u.text, ok
}

const amountUnitHelp = "use L, mL, m3, gal (US), US gal or imp gal for a liquid; kg, g, t or lb for a solid"

// amount reads the amount num that starts a stream, with its unit, into
// st, and returns it as typed ("40 L").
func (p *parser) amount(st *Stream, num *token) (string, error) {
	p.i++
	u := p.peek()
	if u == nil || u.kind != tWord {
		return "", p.errAt(u, "missing-unit", "a unit must follow the amount %s: %s", num.text, amountUnitHelp)
	}
	au, n, text, ok := amountUnitAt(u, p.peekAt(1))
	if !ok {
		return "", p.errAt(u, "unknown-unit", "%q is not an amount unit; %s", u.text, amountUnitHelp)
	}
	p.i += n
	v := num.num * au.factor
	if err := p.checkAmount(num, &token{kind: tWord, text: text, pos: u.pos}, v, au.mass); err != nil {
		return "", err
	}
	if au.mass {
		st.MassKg = v
	} else {
		st.VolumeL = v
	}
	if au.note != "" {
		p.note(num.text+" "+text+" "+au.note, fmtNum(v))
	}
	return num.text + " " + text, nil
}

func (p *parser) stream() (Stream, error) {
	start := p.peek()
	st := Stream{Pos: p.pos(start)}
	amount := ""
	if start.kind == tNumber {
		var err error
		if amount, err = p.amount(&st, start); err != nil {
			return st, err
		}
	}
	// A stream named by its catalogue tag.
	if tk := p.peek(); tk != nil && tk.kind == tWord && p.resolve != nil && p.depth == 0 && looksLikeTag(tk.text) && endsStream(p.peekAt(1)) {
		if text, ok := p.resolve(strings.ToUpper(tk.text)); ok {
			p.i++
			return p.tagStream(st, tk, text, amount)
		}
	}
	if err := p.components(&st, start); err != nil {
		return st, err
	}
	p.asSold(&st)
	if err := p.checkStream(&st); err != nil {
		return st, err
	}
	if st.VolumeL > 0 && onlyMetals(&st) {
		m := st.Components[0].Name
		return st, p.errAt(start, "metal-by-volume", "%s is a metal: a volume of it says nothing of how much there is; give its mass (\"1 kg %s\") or leave the amount out", m, m)
	}
	st.Text = p.sourceText(start)
	return st, nil
}

// onlyMetals reports whether every component of a stream is a metal.
func onlyMetals(st *Stream) bool {
	for _, c := range st.Components {
		if c.Chemical == nil || c.Chemical.Class != Metal {
			return false
		}
	}
	return len(st.Components) > 0
}

// components reads the components of a stream, up to its end.
func (p *parser) components(st *Stream, start *token) error {
	for {
		tk := p.peek()
		if endsStream(tk) {
			return p.errAt(tk, "missing-chemical", "expected a chemical here, e.g. \"HCl 10 %%\" or \"sodium hypochlorite 12.5 %%\"")
		}
		if isWord(tk, "ph") {
			p.i++
			v, err := p.phValue(tk)
			if err != nil {
				return err
			}
			st.PH = &v
		} else if u := p.peekAt(1); tk.kind == tNumber && u != nil && u.kind == tWord && temperatureUnits[strings.ToLower(u.text)] != nil {
			p.i += 2
			k := temperatureUnits[strings.ToLower(u.text)](tk.num)
			if err := p.checkTemperature(tk, u, k); err != nil {
				return err
			}
			st.TemperatureK = &k
		} else {
			c, err := p.component()
			if err != nil {
				return err
			}
			st.Components = append(st.Components, c)
		}
		tk = p.peek()
		if endsStream(tk) {
			break
		}
		if tk.kind == tComma {
			p.i++
			continue
		}
		// A stream's own pH or temperature may follow a component without a
		// comma: "NaCN 500 mg/L pH 10", "water 60 C".
		if u := p.peekAt(1); isWord(tk, "ph") || tk.kind == tNumber && u != nil && u.kind == tWord && temperatureUnits[strings.ToLower(u.text)] != nil {
			continue
		}
		return p.errAt(tk, "unexpected-token", "did not expect %q here; separate components of a stream with \",\" and streams with \"+\" or \"and\"", tk.text)
	}
	if len(st.Components) == 0 {
		return p.errAt(start, "missing-chemical", "the stream has a pH or a temperature but no chemical; name what it contains, e.g. \"200 L water, pH 11\" or \"200 L water, 60 C\"")
	}
	return nil
}

// sourceText returns the request text from the start token to the token
// before the current one.
func (p *parser) sourceText(start *token) string {
	if p.depth > 0 {
		return p.text
	}
	rs := []rune(p.text)
	from := start.pos - 1
	to := len(rs)
	if tk := p.peek(); tk != nil {
		to = tk.pos - 1
	}
	if from < 0 || from > to || to > len(rs) {
		return ""
	}
	return strings.TrimSpace(string(rs[from:to]))
}

func looksLikeTag(w string) bool {
	if len(w) < 2 || len(w) > 32 {
		return false
	}
	hasDigit := false
	for _, r := range w {
		switch {
		case isDigit(r):
			hasDigit = true
		case r == '-' || r == '_' || (r >= 'A' && r <= 'Z') || (r >= 'a' && r <= 'z'):
		default:
			return false
		}
	}
	return hasDigit
}

// tagStream is the stream of catalogue tag tag, whose text is text. An
// amount typed before the tag (outer, amount) takes the place of the
// catalogue's amount, at the catalogue's concentrations.
func (p *parser) tagStream(outer Stream, tag *token, text, amount string) (Stream, error) {
	st, err := p.resolved(tag, text)
	if err != nil {
		return st, err
	}
	st.Pos = outer.Pos
	st.Tag = strings.ToUpper(tag.text)
	if amount == "" {
		return st, nil
	}
	if err := p.scaleTag(&st, outer, tag, amount); err != nil {
		return st, err
	}
	return st, nil
}

// scaleTag gives the tag's stream st the amount of outer, typed as amount.
func (p *parser) scaleTag(st *Stream, outer Stream, tag *token, amount string) error {
	was := ""
	switch {
	case st.VolumeL > 0:
		was = fmtNum(st.VolumeL) + " L"
	case st.MassKg > 0:
		was = fmtNum(st.MassKg) + " kg"
	}
	contents := st.contents()
	switch {
	case outer.VolumeL > 0 && st.MassKg > 0 && st.VolumeL == 0:
		return p.errAt(tag, "bad-amount", "stream tag %s is a solid (%s) in the catalogue; give its amount as a mass (kg, g, t or lb), not %s", st.Tag, st.Text, amount)
	case outer.MassKg > 0 && st.isLiquid():
		d, known := liquidDensity(st, p.t)
		st.VolumeL, st.MassKg = outer.MassKg/d, 0
		how := "from data/densities.txt"
		if !known {
			how = "assumed: no density table"
		}
		p.note("%s of %s (%s) taken as %s L at %s kg/L (%s), at its catalogue concentrations", amount, st.Tag, contents, fmtNum(st.VolumeL), fmtNum(d), how)
	default:
		st.VolumeL, st.MassKg = outer.VolumeL, outer.MassKg
		n := fmt.Sprintf("%s of %s used at its catalogue concentrations (%s)", amount, st.Tag, contents)
		if was != "" {
			n += "; the catalogue states " + was
		}
		p.note("%s", n)
	}
	if err := p.checkStream(st); err != nil {
		var pe *ParseError
		if !errors.As(err, &pe) {
			return err
		}
		pe.Message = fmt.Sprintf("with %s, stream tag %s (%q): %s", amount, st.Tag, st.Text, pe.Message)
		pe.Position, pe.Token = tag.pos, tag.text
		return pe
	}
	return nil
}

// liquidDensity is the density of a liquid stream in kg/L and whether a
// density table gave it (else 1 is assumed), as streamDensity reads it.
func liquidDensity(st *Stream, t *Tables) (float64, bool) {
	for _, c := range st.Components {
		if c.Unit == PctWW {
			if d, ok := t.Density(c.Chemical.Formula, c.Value); ok {
				return d, true
			}
		}
	}
	return 1, false
}

// resolved parses the stream text of a catalogue tag.
func (p *parser) resolved(tag *token, text string) (Stream, error) {
	toks, err := lex(text)
	if err != nil {
		return Stream{}, p.tagError(tag, text, err)
	}
	sub := &parser{toks: toks, t: p.t, text: text, depth: 1, tagPos: tag.pos}
	st, err := sub.stream()
	if err == nil && sub.peek() != nil {
		err = sub.errAt(sub.peek(), "unexpected-token", "did not expect %q", sub.peek().text)
	}
	if err != nil {
		return Stream{}, p.tagError(tag, text, err)
	}
	for _, n := range sub.notes {
		p.note("%s: %s", strings.ToUpper(tag.text), n)
	}
	st.Text = text
	return st, nil
}

func (p *parser) tagError(tag *token, text string, err error) error {
	pe, ok := err.(*ParseError)
	if !ok {
		pe = &ParseError{Code: "bad-tag", Message: err.Error()}
	}
	sugg := pe.Suggestions
	if sugg == nil {
		sugg = []string{}
	}
	return &ParseError{
		Code:        pe.Code,
		Message:     fmt.Sprintf("stream tag %s resolves to %q, which does not parse: %s; fix it with 'mixward streams set %s ...'", tag.text, text, pe.Message, strings.ToUpper(tag.text)),
		Position:    tag.pos,
		Token:       tag.text,
		Suggestions: sugg,
	}
}

// solidForms are the words for the physical form of a solid that may
// follow its name (trade usage, common practice, no source).
var solidForms = map[string]bool{
	"powder": true, "powdered": true, "dust": true, "flake": true, "flakes": true, "pellet": true, "pellets": true,
	"prills": true, "prilled": true, "granules": true, "granular": true, "beads": true, "pearls": true,
	"crystals": true, "crystal": true, "filings": true, "turnings": true, "shavings": true, "chips": true,
	"scrap": true, "swarf": true, "pieces": true, "lumps": true, "briquettes": true, "tablets": true, "pucks": true,
	"solid": true, "foil": true, "wire": true, "sheet": true,
}

// numberWord reports whether a word reads as a number to strconv ("Inf",
// "NaN"): a misplaced value, not part of a chemical's name.
func numberWord(s string) bool {
	_, err := strconv.ParseFloat(s, 64)
	return err == nil
}

// liquidForms are the words for a liquid's form that may follow its name
// (trade usage, common practice, no source).
var liquidForms = map[string]bool{"solution": true, "soln": true, "liquor": true, "liquid": true, "lye": true}

// stopWord: a word that ends a chemical's name: the conditions, a pH, or a
// word that separates streams ("and", "with", "into").
func stopWord(tk *token) bool { return isWord(tk, "at", "ph", "and", "with", "into") }

// nameWords are the words from the current token that may name a chemical.
func (p *parser) nameWords() []*token {
	var words []*token
	for j := p.i; j < len(p.toks); j++ {
		tk := &p.toks[j]
		if tk.kind != tWord || stopWord(tk) {
			break
		}
		words = append(words, tk)
	}
	return words
}

func (p *parser) component() (Component, error) {
	first := p.peek()
	words := p.nameWords()
	if len(words) == 0 {
		if first.kind == tNumber {
			return Component{}, p.errAt(first, "unexpected-number", "expected a chemical name before %s; write the chemical first, then its concentration (\"HCl 10 %%\")", first.text)
		}
		return Component{}, p.errAt(first, "missing-chemical", "expected a chemical here, not %q", first.text)
	}
	// Longest run of words that names a chemical.
	for k := len(words); k >= 1; k-- {
		name := joinWords(words[:k])
		chem, ok := p.t.Lookup(name)
		if !ok {
			continue
		}
		p.i += k
		c := Component{Chemical: chem, Name: name, Pos: p.pos(words[0])}
		if tk := p.peek(); tk != nil && tk.kind == tWord && solidForms[strings.ToLower(tk.text)] {
			// "caustic soda flakes", "aluminium powder": the physical form
			// of a solid, read and said, not an unknown word.
			p.i++
			c.Form = strings.ToLower(tk.text)
			p.note("%q read as the form of solid %s: the form changes how fast it reacts (powder and dust fastest), not what forms", tk.text, name)
		}
		if tk := p.peek(); tk != nil && tk.kind == tWord && liquidForms[strings.ToLower(tk.text)] {
			// "caustic soda liquor", "ferric chloride solution": the
			// form of a liquid, which the concentration says already.
			p.i++
		}
		if tk := p.peek(); tk != nil && tk.kind == tNumber {
			p.i++
			return c, p.concUnit(&c, tk)
		} else if tk != nil && tk.kind == tWord && !stopWord(tk) {
			if _, known := p.t.Lookup(tk.text); !known && !numberWord(tk.text) {
				// "calcium carbide", "stainless steel": a name mixward
				// does not know that begins with one it does.
				p.i -= k
				return Component{}, p.unknownName(words)
			}
			return c, p.errAt(tk, "unknown-word",
				"%q does not belong after %s; give a concentration (\"%s 10 %%\") or separate components with \",\"", tk.text, name, name)
		}
		return c, nil
	}
	return Component{}, p.unknownName(words)
}

// unknownName is the error for words that name no chemical: an unknown tag
// (with the catalogue's near tags) or an unknown chemical (with near names).
func (p *parser) unknownName(words []*token) error {
	name := joinWords(words)
	if len(words) == 1 && p.resolve != nil && looksLikeTag(name) {
		var near []string
		if p.tags != nil {
			near = SuggestTags(name, p.tags(), 3)
		}
		if len(near) > 0 || strings.Contains(name, "-") {
			e := p.errAt(words[0], "unknown-tag", "%s is not in the site stream catalogue", strings.ToUpper(name))
			if len(near) > 0 {
				e.Suggestions = near
				e.Message += "; did you mean " + quoteList(near) + "?"
			} else {
				e.Message += "; list the tags with 'mixward streams list', or write the stream out (\"40 L HCl 10 %\")"
			}
			return e
		}
	}
	if len(words) == 1 && p.resolve == nil && p.depth == 0 && looksLikeTag(name) && strings.Contains(name, "-") && len(p.t.Suggest(name, 1)) == 0 {
		return p.errAt(words[0], "unknown-tag", "%s looks like a stream tag, but no site stream catalogue was given to look it up in; use the catalogue's database, or write the stream out (\"40 L HCl 10 %%\")", strings.ToUpper(name))
	}
	e := p.errAt(words[0], "unknown-chemical", "%q is not a chemical mixward knows", name)
	e.Token = name
	e.Suggestions = p.t.Suggest(name, 5)
	if len(e.Suggestions) == 0 && len(words) > 1 {
		e.Suggestions = p.t.Suggest(words[0].text, 5)
	}
	if e.Suggestions == nil {
		e.Suggestions = []string{}
	}
	if len(e.Suggestions) > 0 {
		e.Message += "; did you mean " + quoteList(e.Suggestions) + "?"
	} else {
		e.Message += "; write its formula (NaOCl, H2SO4) or its English name"
	}
	return e
}

// concUnits are the concentration units written as one word.
var concUnits = map[string]ConcUnit{
	"M": Molar, "mol/L": Molar, "mol/l": Molar, "mol/dm3": Molar,
	"mM": MilliM, "mmol/L": MilliM, "mmol/l": MilliM,
	"g/L": GPerL, "g/l": GPerL, "mg/L": MgPerL, "mg/l": MgPerL, "ppm": PPM, "PPM": PPM,
}

const concUnitHelp = "M, mol/L, mmol/L, %, % w/w, % w/v, g/L, mg/L or ppm"

// concUnit reads the unit of the concentration num of c. The value is
// bounded once the whole stream is read (checkStream), when it is known
// whether the stream is a liquid.
func (p *parser) concUnit(c *Component, num *token) error {
	c.Value, c.numText, c.numPos = num.num, num.text, p.pos(num)
	tk := p.peek()
	if tk == nil || (tk.kind != tWord && tk.kind != tPercent) {
		return p.errAt(tk, "missing-unit", "a unit must follow %s %s: %s", c.Name, num.text, concUnitHelp)
	}
	p.i++
	if isWord(tk, "wt") && p.peek() != nil && p.peek().kind == tPercent {
		// "10 wt%"
		tk = p.peek()
		p.i++
	}
	if tk.kind != tPercent {
		u, ok := concUnits[tk.text]
		if !ok {
			return p.errAt(tk, "unknown-unit", "%q is not a concentration unit; use %s", tk.text, concUnitHelp)
		}
		c.Unit = u
		return nil
	}
	c.Unit = PctWW
	if n := p.peek(); n != nil && n.kind == tWord {
		switch strings.ToLower(n.text) {
		case "w/w", "wt", "(w/w)":
			p.i++
		case "w/v", "(w/v)":
			c.Unit = PctWV
			p.i++
		}
	}
	return nil
}
