package engine

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Request is a parsed mix request.
type Request struct {
	Text         string
	Streams      []Stream
	TemperatureK float64 // 298.15 unless stated
	PressureKPa  float64 // 101.325 unless stated
	PH           *float64
	TempStated   bool
}

// Stream is one stream of a mix request.
type Stream struct {
	Text       string // the stream as typed (or as resolved from its tag)
	Pos        int    // 1-based position of the stream in the request
	Tag        string // catalogue tag the stream was named by, if any
	VolumeL    float64
	MassKg     float64
	Components []Component
	PH         *float64
}

// Label names the stream for counting: its catalogue tag, or what it
// holds without its amount ("NaOCl 12.5 %, NaOH 1 %"), so that the same
// stream in different amounts counts as one.
func (s *Stream) Label() string {
	if s.Tag != "" {
		return s.Tag
	}
	parts := make([]string, 0, len(s.Components)+1)
	for _, c := range s.Components {
		p := c.Chemical.Formula
		if c.Unit != NoConc {
			u := string(c.Unit)
			if c.Unit == PctWW {
				u = "%"
			}
			p += " " + strconv.FormatFloat(c.Value, 'g', -1, 64) + " " + u
		}
		parts = append(parts, p)
	}
	if s.PH != nil {
		parts = append(parts, "pH "+strconv.FormatFloat(*s.PH, 'g', -1, 64))
	}
	return strings.Join(parts, ", ")
}

// HasVolume reports whether the stream states a liquid volume.
func (s *Stream) HasVolume() bool { return s.VolumeL > 0 }

// Component is one chemical of a stream with its stated concentration.
type Component struct {
	Chemical *Chemical
	Name     string  // as typed
	Pos      int     // 1-based position in the request
	Value    float64 // concentration value, in Unit
	Unit     ConcUnit
}

// ConcUnit is a concentration unit of the request language.
type ConcUnit string

// Concentration units. NoConc means none was given.
const (
	NoConc ConcUnit = ""
	Molar  ConcUnit = "mol/L"
	MilliM ConcUnit = "mmol/L"
	PctWW  ConcUnit = "% w/w"
	PctWV  ConcUnit = "% w/v"
	GPerL  ConcUnit = "g/L"
	MgPerL ConcUnit = "mg/L"
	PPM    ConcUnit = "ppm"
)

// Standard conditions: 25 °C and one standard atmosphere, used unless a
// request states otherwise.
const (
	StandardTemperatureK = 298.15
	StandardPressureKPa  = 101.325
)

// Conversion factors, exact by definition (NIST SP 811, Appendix B).
const (
	litresPerUSGallon = 3.785411784
	kgPerPound        = 0.45359237
)

type tokKind int

const (
	tWord tokKind = iota
	tNumber
	tPlus
	tComma
	tPercent
)

type token struct {
	kind tokKind
	text string
	num  float64
	pos  int // 1-based rune position
}

func lex(s string) ([]token, error) {
	var toks []token
	rs := []rune(s)
	i := 0
	for i < len(rs) {
		r := rs[i]
		switch {
		case unicode.IsSpace(r):
			i++
		case r == '+':
			toks = append(toks, token{kind: tPlus, text: "+", pos: i + 1})
			i++
		case r == ',' || r == ';':
			toks = append(toks, token{kind: tComma, text: string(r), pos: i + 1})
			i++
		case r == '%':
			toks = append(toks, token{kind: tPercent, text: "%", pos: i + 1})
			i++
		case isDigit(r) || (r == '.' && i+1 < len(rs) && isDigit(rs[i+1])) ||
			(r == '-' && i+1 < len(rs) && (isDigit(rs[i+1]) || rs[i+1] == '.') && (i == 0 || unicode.IsSpace(rs[i-1]))):
			start := i
			if r == '-' {
				i++
			}
			for i < len(rs) && (isDigit(rs[i]) || rs[i] == '.') {
				i++
			}
			if i < len(rs) && (rs[i] == 'e' || rs[i] == 'E') && i+1 < len(rs) &&
				(isDigit(rs[i+1]) || ((rs[i+1] == '-' || rs[i+1] == '+') && i+2 < len(rs) && isDigit(rs[i+2]))) {
				i += 2
				for i < len(rs) && isDigit(rs[i]) {
					i++
				}
			}
			text := string(rs[start:i])
			v, err := strconv.ParseFloat(text, 64)
			if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
				return nil, &ParseError{Code: "bad-number", Message: fmt.Sprintf("%q is not a number", text), Position: start + 1, Token: text}
			}
			toks = append(toks, token{kind: tNumber, text: text, num: v, pos: start + 1})
		default:
			start := i
			for i < len(rs) && !unicode.IsSpace(rs[i]) && rs[i] != '+' && rs[i] != ',' && rs[i] != ';' && rs[i] != '%' {
				i++
			}
			toks = append(toks, token{kind: tWord, text: string(rs[start:i]), pos: start + 1})
		}
	}
	return toks, nil
}

func isDigit(r rune) bool { return r >= '0' && r <= '9' }

// maxRequestLen bounds the request size; chat messages are far shorter.
const maxRequestLen = 4000

// ParseRequest reads a mix request in the mixward request language:
//
//	[mix] <stream> + <stream> [+ <stream> ...] [at <condition>[, <condition>]]
//	stream    = [<amount>] <component>[, <component> ...] | [<amount>] <TAG>
//	amount    = <number> L|mL|m3|gal | <number> kg|g|lb
//	component = <chemical> [<number> <unit>] | pH <number>
//	unit      = M | mol/L | mmol/L | mM | % | % w/w | % w/v | g/L | mg/L | ppm
//	condition = <number> C|F|K | <number> kPa|bar|atm | pH <number>
//
// Streams named by a site tag are looked up with resolve (which may be nil).
func ParseRequest(text string, t *Tables, resolve Resolver) (*Request, error) {
	if !utf8.ValidString(text) {
		return nil, &ParseError{Code: "bad-encoding", Message: "the request is not valid UTF-8 text", Position: 1}
	}
	if len(text) > maxRequestLen {
		return nil, &ParseError{Code: "too-long", Message: fmt.Sprintf("the request is %d bytes long; keep it under %d", len(text), maxRequestLen), Position: 1}
	}
	toks, err := lex(text)
	if err != nil {
		return nil, err
	}
	p := &parser{toks: toks, t: t, resolve: resolve, text: text}
	req, err := p.request()
	if err != nil {
		return nil, err
	}
	req.Text = text
	return req, nil
}

type parser struct {
	toks    []token
	i       int
	t       *Tables
	resolve Resolver
	text    string
	depth   int // tag resolution depth
	offset  int // position offset when parsing a resolved tag's text
	tagPos  int
}

func (p *parser) peek() *token {
	if p.i < len(p.toks) {
		return &p.toks[p.i]
	}
	return nil
}

func (p *parser) endPos() int { return utf8.RuneCountInString(p.text) + 1 }

func (p *parser) pos(tk *token) int {
	if p.depth > 0 {
		return p.tagPos
	}
	if tk == nil {
		return p.endPos()
	}
	return tk.pos
}

func (p *parser) errAt(tk *token, code, format string, args ...any) *ParseError {
	e := &ParseError{Code: code, Message: fmt.Sprintf(format, args...), Position: p.pos(tk), Suggestions: []string{}}
	if tk != nil {
		e.Token = tk.text
	}
	return e
}

func isWord(tk *token, words ...string) bool {
	if tk == nil || tk.kind != tWord {
		return false
	}
	for _, w := range words {
		if strings.EqualFold(tk.text, w) {
			return true
		}
	}
	return false
}

const example = "mix 200 L NaOCl 12.5 % + 50 L HCl 10 % at 20 C"

func (p *parser) request() (*Request, error) {
	req := &Request{TemperatureK: StandardTemperatureK, PressureKPa: StandardPressureKPa}
	if len(p.toks) == 0 {
		return nil, &ParseError{Code: "empty-request", Message: "the request is empty; write the streams to mix, e.g. " + example, Position: 1, Suggestions: []string{}}
	}
	if isWord(p.peek(), "mix") {
		p.i++
	}
	for {
		tk := p.peek()
		if tk == nil || tk.kind == tPlus || isWord(tk, "at") {
			return nil, p.errAt(tk, "missing-stream", "expected a stream here (an amount and a chemical, e.g. \"50 L HCl 10 %%\")")
		}
		st, err := p.stream()
		if err != nil {
			return nil, err
		}
		req.Streams = append(req.Streams, st)
		tk = p.peek()
		if tk == nil {
			break
		}
		if tk.kind == tPlus {
			p.i++
			continue
		}
		if isWord(tk, "at") {
			if err := p.conditions(req); err != nil {
				return nil, err
			}
			break
		}
		return nil, p.errAt(tk, "unexpected-token", "did not expect %q here; separate streams with \"+\" and components with \",\"", tk.text)
	}
	if len(req.Streams) > 20 {
		return nil, &ParseError{Code: "too-many-streams", Message: fmt.Sprintf("%d streams: mixward takes at most 20 in one request", len(req.Streams)), Position: req.Streams[20].Pos, Suggestions: []string{}}
	}
	return req, nil
}

func (p *parser) conditions(req *Request) error {
	for {
		tk := p.peek()
		if tk == nil {
			return nil
		}
		if isWord(tk, "at", "and") || tk.kind == tComma {
			p.i++
			continue
		}
		if isWord(tk, "ph") {
			p.i++
			v, err := p.phValue(tk)
			if err != nil {
				return err
			}
			req.PH = &v
			continue
		}
		if tk.kind != tNumber {
			return p.errAt(tk, "bad-condition", "expected a temperature (25 C, 77 F, 298 K), a pressure (2 bar, 150 kPa) or a pH (pH 3) after \"at\", not %q", tk.text)
		}
		p.i++
		u := p.peek()
		if u == nil || u.kind != tWord {
			return p.errAt(u, "missing-unit", "a unit must follow %s: C, F or K for a temperature; kPa, bar or atm for a pressure", tk.text)
		}
		p.i++
		switch strings.ToLower(u.text) {
		case "c", "°c", "degc", "celsius":
			req.TemperatureK = tk.num + 273.15
		case "f", "°f", "degf", "fahrenheit":
			req.TemperatureK = (tk.num-32)*5/9 + 273.15
		case "k", "kelvin":
			req.TemperatureK = tk.num
		case "kpa":
			req.PressureKPa = tk.num
			if tk.num <= 0 || tk.num > 10000 {
				return p.errAt(tk, "bad-pressure", "pressure %s kPa is outside 0–10000 kPa", tk.text)
			}
			continue
		case "bar":
			req.PressureKPa = tk.num * 100
			if tk.num <= 0 || tk.num > 100 {
				return p.errAt(tk, "bad-pressure", "pressure %s bar is outside 0–100 bar", tk.text)
			}
			continue
		case "atm":
			req.PressureKPa = tk.num * StandardPressureKPa
			if tk.num <= 0 || tk.num > 100 {
				return p.errAt(tk, "bad-pressure", "pressure %s atm is outside 0–100 atm", tk.text)
			}
			continue
		default:
			return p.errAt(u, "unknown-unit", "%q is not a temperature or pressure unit; use C, F, K, kPa, bar or atm", u.text)
		}
		req.TempStated = true
		if req.TemperatureK < 273.15-30 || req.TemperatureK > 273.15+150 {
			return p.errAt(tk, "bad-temperature", "temperature %s %s is outside the range mixward handles (−30 to 150 °C)", tk.text, u.text)
		}
	}
}

func (p *parser) phValue(at *token) (float64, error) {
	tk := p.peek()
	if tk == nil || tk.kind != tNumber {
		return 0, p.errAt(tk, "bad-ph", "a number must follow pH, e.g. pH 12.5")
	}
	p.i++
	if tk.num < -2 || tk.num > 16 {
		return 0, p.errAt(tk, "bad-ph", "pH %s is outside −2…16", tk.text)
	}
	return tk.num, nil
}

var volumeUnits = map[string]float64{"l": 1, "ml": 1e-3, "m3": 1000, "m³": 1000, "gal": litresPerUSGallon, "litre": 1, "liter": 1, "litres": 1, "liters": 1}
var massUnits = map[string]float64{"kg": 1, "g": 1e-3, "lb": kgPerPound, "lbs": kgPerPound, "t": 1000}

func (p *parser) stream() (Stream, error) {
	start := p.peek()
	st := Stream{Pos: p.pos(start)}
	if start.kind == tNumber {
		p.i++
		u := p.peek()
		if u == nil || u.kind != tWord {
			return st, p.errAt(u, "missing-unit", "a unit must follow the amount %s: L, mL, m3 or gal for a liquid; kg, g or lb for a solid", start.text)
		}
		lu := strings.ToLower(u.text)
		if f, ok := volumeUnits[lu]; ok {
			st.VolumeL = start.num * f
		} else if f, ok := massUnits[lu]; ok {
			st.MassKg = start.num * f
		} else {
			return st, p.errAt(u, "unknown-unit", "%q is not an amount unit; use L, mL, m3 or gal for a liquid, kg, g or lb for a solid", u.text)
		}
		if start.num <= 0 {
			return st, p.errAt(start, "bad-amount", "the amount %s %s must be more than zero", start.text, u.text)
		}
		if st.VolumeL > 1e7 || st.MassKg > 1e7 {
			return st, p.errAt(start, "bad-amount", "the amount %s %s is larger than any plant vessel; check the unit", start.text, u.text)
		}
		p.i++
	}
	// A stream named by its catalogue tag.
	if tk := p.peek(); tk != nil && tk.kind == tWord && p.resolve != nil && p.depth == 0 && looksLikeTag(tk.text) {
		if next := p.peekAt(1); next == nil || next.kind == tPlus || isWord(next, "at") {
			if text, ok := p.resolve(strings.ToUpper(tk.text)); ok {
				p.i++
				sub, err := p.resolved(tk, text)
				if err != nil {
					return st, err
				}
				sub.Pos = st.Pos
				sub.Tag = strings.ToUpper(tk.text)
				if st.VolumeL > 0 || st.MassKg > 0 {
					sub.VolumeL, sub.MassKg = st.VolumeL, st.MassKg
				}
				return sub, nil
			}
		}
	}
	for {
		tk := p.peek()
		if tk == nil || tk.kind == tPlus || isWord(tk, "at") {
			return st, p.errAt(tk, "missing-chemical", "expected a chemical here, e.g. \"HCl 10 %%\" or \"sodium hypochlorite 12.5 %%\"")
		}
		if isWord(tk, "ph") {
			p.i++
			v, err := p.phValue(tk)
			if err != nil {
				return st, err
			}
			st.PH = &v
		} else {
			c, err := p.component()
			if err != nil {
				return st, err
			}
			st.Components = append(st.Components, c)
		}
		tk = p.peek()
		if tk == nil || tk.kind == tPlus || isWord(tk, "at") {
			break
		}
		if tk.kind == tComma {
			p.i++
			continue
		}
		return st, p.errAt(tk, "unexpected-token", "did not expect %q here; separate components of a stream with \",\" and streams with \"+\"", tk.text)
	}
	if len(st.Components) == 0 {
		return st, p.errAt(start, "missing-chemical", "the stream has a pH but no chemical; name what it contains, e.g. \"200 L water, pH 11\"")
	}
	st.Text = p.sourceText(start)
	return st, nil
}

func (p *parser) peekAt(k int) *token {
	if p.i+k < len(p.toks) {
		return &p.toks[p.i+k]
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
	st.Text = text
	return st, nil
}

func (p *parser) tagError(tag *token, text string, err error) error {
	pe, ok := err.(*ParseError)
	if !ok {
		pe = &ParseError{Code: "bad-tag", Message: err.Error()}
	}
	return &ParseError{
		Code:        pe.Code,
		Message:     fmt.Sprintf("stream tag %s resolves to %q, which does not parse: %s; fix it with 'mixward streams set %s ...'", tag.text, text, pe.Message, strings.ToUpper(tag.text)),
		Position:    tag.pos,
		Token:       tag.text,
		Suggestions: pe.Suggestions,
	}
}

func (p *parser) component() (Component, error) {
	// Gather the words of the chemical name.
	first := p.peek()
	var words []*token
	for j := p.i; j < len(p.toks); j++ {
		tk := &p.toks[j]
		if tk.kind != tWord || isWord(tk, "at", "ph") {
			break
		}
		words = append(words, tk)
	}
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
		if tk := p.peek(); tk != nil && tk.kind == tNumber {
			p.i++
			if err := p.concUnit(&c, tk); err != nil {
				return c, err
			}
		} else if tk != nil && tk.kind == tWord && !isWord(tk, "at", "ph") {
			return c, p.errAt(tk, "unknown-word",
				"%q does not belong after %s; give a concentration (\"%s 10 %%\") or separate components with \",\"", tk.text, name, name)
		}
		return c, nil
	}
	name := joinWords(words)
	if len(words) == 1 && p.resolve != nil && looksLikeTag(name) && strings.Contains(name, "-") {
		return Component{}, p.errAt(words[0], "unknown-tag", "%s is not in the site stream catalogue; list the tags with 'mixward streams list', or write the stream out (\"40 L HCl 10 %%\")", strings.ToUpper(name))
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
	return Component{}, e
}

func joinWords(ws []*token) string {
	parts := make([]string, len(ws))
	for i, w := range ws {
		parts[i] = w.text
	}
	return strings.Join(parts, " ")
}

func quoteList(xs []string) string {
	q := make([]string, len(xs))
	for i, x := range xs {
		q[i] = strconv.Quote(x)
	}
	return strings.Join(q, ", ")
}

func (p *parser) concUnit(c *Component, num *token) error {
	c.Value = num.num
	tk := p.peek()
	if tk == nil || (tk.kind != tWord && tk.kind != tPercent) {
		return p.errAt(tk, "missing-unit", "a unit must follow %s %s: M, mol/L, mmol/L, %%, %% w/w, %% w/v, g/L, mg/L or ppm", c.Name, num.text)
	}
	p.i++
	if tk.kind == tPercent {
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
	} else {
		switch tk.text {
		case "M", "mol/L", "mol/l", "mol/dm3":
			c.Unit = Molar
		case "mM", "mmol/L", "mmol/l":
			c.Unit = MilliM
		case "g/L", "g/l":
			c.Unit = GPerL
		case "mg/L", "mg/l":
			c.Unit = MgPerL
		case "ppm", "PPM":
			c.Unit = PPM
		case "wt%", "%w/w":
			c.Unit = PctWW
		case "%w/v":
			c.Unit = PctWV
		default:
			return p.errAt(tk, "unknown-unit", "%q is not a concentration unit; use M, mol/L, mmol/L, %%, %% w/w, %% w/v, g/L, mg/L or ppm", tk.text)
		}
	}
	if c.Value < 0 {
		return p.errAt(num, "bad-concentration", "the concentration of %s cannot be negative", c.Name)
	}
	if (c.Unit == PctWW || c.Unit == PctWV) && c.Value > 100 {
		return p.errAt(num, "bad-concentration", "%s %s%% is more than 100 %%", c.Name, num.text)
	}
	if c.Unit == Molar && c.Value > 60 {
		return p.errAt(num, "bad-concentration", "%s %s M is more concentrated than any solution; check the unit", c.Name, num.text)
	}
	return nil
}
