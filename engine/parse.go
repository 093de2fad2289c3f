package engine

import (
	"fmt"
	"math"
	"slices"
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
	// HeadspaceL is the closed gas space above the mix stated with
	// "headspace 2 m3" after "at"; 0 when not stated (the answer then
	// takes a headspace equal to the liquid volume, and says so).
	HeadspaceL float64
	TempStated bool
	// TempFromStreams: TemperatureK is the streams' own temperatures
	// averaged (StreamsTemperatureK), not one stated for the whole mix.
	TempFromStreams bool
	// PourInto: the request wrote an order of addition, "pour A into B"
	// (two streams): the first stream runs into the second.
	PourInto bool
	Notes    []string // how the parser read the request where the answer should say so
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
	// TemperatureK is the stream's own temperature ("NaOH 2 %, 75 C"), nil
	// when not stated. The mix starts at the streams' temperatures averaged
	// by amount unless the whole mix has one ("at 40 C").
	TemperatureK *float64

	// shown is the stream as written when the engine has read its amount
	// differently (readAmounts): the label it keeps.
	shown string
}

// Label names the stream for counting: its catalogue tag, or what it
// holds without its amount ("NaOCl 12.5 %, NaOH 1 %"), so that the same
// stream in different amounts counts as one.
func (s *Stream) Label() string {
	if s.Tag != "" {
		return s.Tag
	}
	if s.shown != "" {
		return s.shown
	}
	return s.contents()
}

// contents is what the stream holds, without its amount or tag.
func (s *Stream) contents() string {
	parts := make([]string, 0, len(s.Components)+1)
	for _, c := range s.Components {
		p := c.Chemical.Formula
		if c.Unit != NoConc {
			u := string(c.Unit)
			if c.Unit == PctWW {
				u = "%"
			}
			p += " " + strconv.FormatFloat(c.Value, 'g', 6, 64) + " " + u
		}
		parts = append(parts, p)
	}
	if s.PH != nil {
		parts = append(parts, "pH "+strconv.FormatFloat(*s.PH, 'g', 6, 64))
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
	Form     string // the word for a solid's form that followed its name ("turnings"), if any

	numText string // the value as typed ("12,5"), for errors
	numPos  int    // its position, for errors
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
	litresPerUSGallon  = 3.785411784
	litresPerImpGallon = 4.54609
	kgPerPound         = 0.45359237
)

type tokKind int

const (
	tWord tokKind = iota
	tNumber
	tPlus // "+" or "&" between streams
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
		case r == '+' || r == '&':
			toks = append(toks, token{kind: tPlus, text: string(r), pos: i + 1})
			i++
		case r == ',' || r == ';':
			toks = append(toks, token{kind: tComma, text: string(r), pos: i + 1})
			i++
		case r == '%':
			toks = append(toks, token{kind: tPercent, text: "%", pos: i + 1})
			i++
		case isNumberStart(rs, i):
			tk, next, err := lexNumber(rs, i)
			if err != nil {
				return nil, err
			}
			toks = append(toks, tk)
			i = next
		default:
			start := i
			for i < len(rs) && !unicode.IsSpace(rs[i]) && !strings.ContainsRune("+&,;%", rs[i]) {
				i++
			}
			toks = append(toks, token{kind: tWord, text: string(rs[start:i]), pos: start + 1})
		}
	}
	return toks, nil
}

// isNumberStart reports whether a number begins at rs[i]: a digit, a point
// before a digit, or a minus sign before either at the start of a word.
func isNumberStart(rs []rune, i int) bool {
	r := rs[i]
	return isDigit(r) || (r == '.' && i+1 < len(rs) && isDigit(rs[i+1])) ||
		(r == '-' && i+1 < len(rs) && (isDigit(rs[i+1]) || rs[i+1] == '.') && (i == 0 || unicode.IsSpace(rs[i-1])))
}

// lexNumber reads the number starting at rs[i] and returns it with the
// index after it. A comma directly between digits is a decimal comma
// ("12,5 %"), except where it could as well separate thousands ("1,500":
// one to three digits, not a lone 0, then exactly three), which is refused
// rather than guessed; a comma followed by a space separates components.
func lexNumber(rs []rune, i int) (token, int, error) {
	start := i
	if rs[i] == '-' {
		i++
	}
	for i < len(rs) && (isDigit(rs[i]) || rs[i] == '.') {
		i++
	}
	text := string(rs[start:i])
	value := text
	if i+1 < len(rs) && rs[i] == ',' && isDigit(rs[i+1]) && isDigit(rs[i-1]) && !strings.ContainsRune(text, '.') {
		j := i + 1
		for j < len(rs) && isDigit(rs[j]) {
			j++
		}
		whole, frac := strings.TrimPrefix(text, "-"), string(rs[i+1:j])
		if len(frac) == 3 && len(whole) <= 3 && whole != "0" {
			amb := string(rs[start:j])
			dec := whole
			if f := strings.TrimRight(frac, "0"); f != "" {
				dec += "." + f
			}
			return token{}, 0, &ParseError{Code: "ambiguous-number", Position: start + 1, Token: amb, Suggestions: []string{},
				Message: fmt.Sprintf("%q could be a decimal comma or a thousands separator; write %s or %s", amb, whole+frac, dec)}
		}
		text = string(rs[start:j])
		value = strings.Replace(text, ",", ".", 1)
		i = j
	}
	if i < len(rs) && (rs[i] == 'e' || rs[i] == 'E') && i+1 < len(rs) &&
		(isDigit(rs[i+1]) || ((rs[i+1] == '-' || rs[i+1] == '+') && i+2 < len(rs) && isDigit(rs[i+2]))) {
		e := i
		i += 2
		for i < len(rs) && isDigit(rs[i]) {
			i++
		}
		text += string(rs[e:i])
		value += string(rs[e:i])
	}
	v, err := strconv.ParseFloat(value, 64)
	if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
		return token{}, 0, &ParseError{Code: "bad-number", Message: fmt.Sprintf("%q is not a number", text), Position: start + 1, Token: text, Suggestions: []string{}}
	}
	return token{kind: tNumber, text: text, num: v, pos: start + 1}, i, nil
}

func isDigit(r rune) bool { return r >= '0' && r <= '9' }

// maxRequestLen bounds the request size; chat messages are far shorter.
const maxRequestLen = 4000

// ParseRequest reads a mix request in the mixward request language:
//
//	[mix] <stream> <sep> <stream> [<sep> <stream> ...] [at <condition>[, <condition>]]
//	sep       = + | & | and | with
//	stream    = [<amount>] <component>[, <component> ...] | [<amount>] <TAG>
//	amount    = <number> L|mL|m3|gal|US gal|imp gal | <number> kg|g|lb|t
//	component = <chemical> [<number> <unit>] | pH <number>
//	unit      = M | mol/L | mmol/L | mM | % | % w/w | % w/v | g/L | mg/L | ppm
//	condition = <number> C|F|K | <number> kPa|MPa|bar|atm | pH <number> | headspace <amount>
//
// A number may use a decimal comma ("12,5 %") where it cannot be read as a
// thousands separator. Every number is bounded (see bounds.go): a value no
// plant stream can have is refused with a *ParseError. Streams named by a
// site tag are looked up with resolve (which may be nil).
func ParseRequest(text string, t *Tables, resolve Resolver) (*Request, error) {
	return Parse(text, t, AskOptions{Resolve: resolve})
}

// Parse is ParseRequest with every option of a request: the tag resolver
// and the list of known tags, from which an unknown tag gets "did you mean"
// suggestions.
func Parse(text string, t *Tables, opt AskOptions) (*Request, error) {
	if !utf8.ValidString(text) {
		return nil, &ParseError{Code: "bad-encoding", Message: "the request is not valid UTF-8 text", Position: 1, Suggestions: []string{}}
	}
	if len(text) > maxRequestLen {
		return nil, &ParseError{Code: "too-long", Message: fmt.Sprintf("the request is %d bytes long; keep it under %d", len(text), maxRequestLen), Position: 1, Suggestions: []string{}}
	}
	toks, err := lex(text)
	if err != nil {
		return nil, err
	}
	p := &parser{toks: toks, t: t, resolve: opt.Resolve, tags: opt.Tags, text: text}
	req, err := p.request()
	if err != nil {
		return nil, err
	}
	req.Text = text
	req.Notes = p.notes
	return req, nil
}

type parser struct {
	toks    []token
	i       int
	t       *Tables
	resolve Resolver
	tags    func() []string
	text    string
	depth   int // tag resolution depth
	tagPos  int
	notes   []string // what was read in a way the answer should state
}

func (p *parser) peek() *token {
	if p.i < len(p.toks) {
		return &p.toks[p.i]
	}
	return nil
}

func (p *parser) peekAt(k int) *token {
	if p.i+k < len(p.toks) {
		return &p.toks[p.i+k]
	}
	return nil
}

func (p *parser) note(format string, args ...any) {
	n := fmt.Sprintf(format, args...)
	if !slices.Contains(p.notes, n) {
		p.notes = append(p.notes, n)
	}
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

// isSeparator reports whether tk separates two streams: "+", "&", "and" or
// "with".
func isSeparator(tk *token) bool {
	return tk != nil && (tk.kind == tPlus || isWord(tk, "and", "with", "into"))
}

// endsStream reports whether a stream ends before tk: at the end of the
// request, at a stream separator or at the conditions.
func endsStream(tk *token) bool {
	return tk == nil || isSeparator(tk) || isWord(tk, "at")
}

const example = "mix 200 L NaOCl 12.5 % + 50 L HCl 10 % at 20 C"

func (p *parser) request() (*Request, error) {
	req := &Request{TemperatureK: StandardTemperatureK, PressureKPa: StandardPressureKPa}
	if len(p.toks) == 0 {
		return nil, &ParseError{Code: "empty-request", Message: "the request is empty; write the streams to mix, e.g. " + example, Position: 1, Suggestions: []string{}}
	}
	pour := false
	if tk := p.peek(); isWord(tk, "mix") || isWord(tk, "combine") || isWord(tk, "pour") {
		// The verbs operators type for the same question.
		pour = isWord(tk, "pour")
		p.i++
	}
	for {
		tk := p.peek()
		if endsStream(tk) {
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
		if isSeparator(tk) {
			if len(req.Streams) == 1 && pour && isWord(tk, "into") {
				req.PourInto = true
			}
			p.i++
			continue
		}
		if isWord(tk, "at") {
			if err := p.conditions(req); err != nil {
				return nil, err
			}
			break
		}
		return nil, p.errAt(tk, "unexpected-token", "did not expect %q here; separate streams with \"+\" or \"and\", and components with \",\"", tk.text)
	}
	p.startTemperature(req)
	req.PourInto = req.PourInto && len(req.Streams) == 2
	if len(req.Streams) > 20 {
		return nil, &ParseError{Code: "too-many-streams", Message: fmt.Sprintf("%d streams: mixward takes at most 20 in one request", len(req.Streams)), Position: req.Streams[20].Pos, Suggestions: []string{}}
	}
	return req, nil
}

func (p *parser) conditions(req *Request) error {
	start := p.i // at "at"
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
		if isWord(tk, "headspace") {
			p.i++
			v, err := p.headspace(tk)
			if err != nil {
				return err
			}
			req.HeadspaceL = v
			continue
		}
		if tk.kind != tNumber && isSeparator(tk) && p.i > start+1 {
			return p.streamAfterConditions(tk, start)
		}
		if tk.kind != tNumber {
			return p.errAt(tk, "bad-condition", "expected a temperature (25 C, 77 F, 298 K), a pressure (2 bar, 150 kPa), a pH (pH 3) or a headspace (headspace 2 m3) after \"at\", not %q", tk.text)
		}
		p.i++
		u := p.peek()
		if u == nil || u.kind != tWord {
			return p.errAt(u, "missing-unit", "a unit must follow %s: C, F or K for a temperature; kPa, MPa, bar or atm for a pressure", tk.text)
		}
		p.i++
		if err := p.condition(req, tk, u); err != nil {
			return err
		}
	}
}

// streamAfterConditions is the error for a stream after the whole mix's
// conditions ("mix 1000 L water at 80 C + 20 kg NaOH"): the grammar keeps
// "at" for the whole mix, and the error shows the stream form that gives a
// stream its own temperature ("mix 1000 L water, 80 C + 20 kg NaOH").
func (p *parser) streamAfterConditions(sep *token, start int) error {
	runes := []rune(p.text)
	at, cond := p.toks[start], []string{}
	toks := p.toks[start+1 : p.i]
	for k := 0; k+1 < len(toks); k++ {
		a, b := &toks[k], &toks[k+1]
		switch {
		case isWord(a, "ph") && b.kind == tNumber:
			cond = append(cond, a.text+" "+b.text)
		case a.kind == tNumber && b.kind == tWord && !isWord(b, "kpa", "mpa", "pa", "bar", "atm", "psi", "mbar"):
			cond = append(cond, a.text+" "+b.text) // a temperature: a stream can have its own
		default:
			continue
		}
		k++
	}
	if len(cond) == 0 {
		return p.errAt(sep, "bad-condition", "conditions after \"at\" are the whole mix's and end the request; %q cannot follow them: move \"at …\" to the end", sep.text)
	}
	if at.pos < 1 || sep.pos < 1 || sep.pos > len(runes) || at.pos > len(runes) {
		return p.errAt(sep, "bad-condition", "conditions after \"at\" are the whole mix's and end the request; %q cannot follow them", sep.text)
	}
	cs := strings.Join(cond, ", ")
	fix := strings.TrimSpace(string(runes[:at.pos-1])) + ", " + cs + " " + string(runes[sep.pos-1:])
	e := p.errAt(sep, "bad-condition", "conditions after \"at\" are the whole mix's and end the request, so %q cannot follow them; for one stream's own temperature or pH put it in the stream: %q (or move the conditions after \"at\" to the end for the whole mix)", sep.text, fix)
	e.Suggestions = []string{fix}
	return e
}

// startTemperature sets the mix's starting temperature from the streams'
// own when the whole mix has none: their average weighted by volume (or mass
// for a solid), as if each had the heat capacity of water, a stream without
// one counted at 25 °C.
func (p *parser) startTemperature(req *Request) {
	if req.TempStated {
		return
	}
	k, any := StreamsTemperatureK(req.Streams)
	if !any {
		return
	}
	req.TemperatureK, req.TempStated, req.TempFromStreams = k, true, true
	p.note("the streams' own temperatures give the mix a starting temperature of about %s °C (averaged by amount, as water; a stream without one at 25 °C)", fmtNum(math.Round((k-273.15)*10)/10))
}

// StreamsTemperatureK is the starting temperature of streams poured
// together: their own temperatures averaged by volume (or mass for a
// solid), as if each had the heat capacity of water, a stream without one
// counted at 25 °C; any reports whether a stream has one. A point of a pour
// holds the streams in other shares, so it starts at its own average.
func StreamsTemperatureK(ss []Stream) (k float64, any bool) {
	sum, w := 0.0, 0.0
	for _, st := range ss {
		k := StandardTemperatureK
		if st.TemperatureK != nil {
			k, any = *st.TemperatureK, true
		}
		x := st.VolumeL + st.MassKg
		if x <= 0 {
			x = 1
		}
		sum, w = sum+k*x, w+x
	}
	if w <= 0 {
		return StandardTemperatureK, any
	}
	return sum / w, any
}

// temperatureUnits convert a stated temperature to kelvin.
var temperatureUnits = map[string]func(float64) float64{
	"c": celsius, "°c": celsius, "degc": celsius, "celsius": celsius,
	"f": fahrenheit, "°f": fahrenheit, "degf": fahrenheit, "fahrenheit": fahrenheit,
	"k": kelvin, "kelvin": kelvin,
}

func celsius(v float64) float64    { return v + 273.15 }
func fahrenheit(v float64) float64 { return (v-32)*5/9 + 273.15 }
func kelvin(v float64) float64     { return v }

// pressureUnits are kPa per unit (1 atm = 101.325 kPa exactly, 1 bar =
// 100 kPa exactly; NIST SP 811, Appendix B).
var pressureUnits = map[string]float64{"kpa": 1, "mpa": 1000, "bar": 100, "atm": StandardPressureKPa}

// condition reads one temperature or pressure: the number num in unit u.
func (p *parser) condition(req *Request, num, u *token) error {
	lu := strings.ToLower(u.text)
	if f, ok := pressureUnits[lu]; ok {
		req.PressureKPa = num.num * f
		return p.checkPressure(num, u, req.PressureKPa)
	}
	conv, ok := temperatureUnits[lu]
	if !ok {
		return p.errAt(u, "unknown-unit", "%q is not a temperature or pressure unit; use C, F, K, kPa, MPa, bar or atm", u.text)
	}
	req.TemperatureK = conv(num.num)
	req.TempStated = true
	return p.checkTemperature(num, u, req.TemperatureK)
}

// headspace reads the closed gas space above the mix after the word
// "headspace": a volume in any amount unit of a liquid ("headspace 2 m3",
// "headspace 500 L").
func (p *parser) headspace(word *token) (float64, error) {
	num := p.peek()
	if num == nil || num.kind != tNumber {
		return 0, p.errAt(num, "bad-headspace", "a volume must follow headspace, e.g. \"headspace 2 m3\" or \"headspace 500 L\"")
	}
	p.i++
	u := p.peek()
	if u == nil || u.kind != tWord {
		return 0, p.errAt(u, "missing-unit", "a unit must follow the headspace %s: L, m3, gal, US gal or imp gal", num.text)
	}
	au, n, text, ok := amountUnitAt(u, p.peekAt(1))
	if !ok || au.mass {
		return 0, p.errAt(u, "unknown-unit", "%q is not a volume unit for the headspace; use L, m3, gal, US gal or imp gal", u.text)
	}
	p.i += n
	v := num.num * au.factor
	if err := p.checkAmount(num, &token{kind: tWord, text: text, pos: u.pos}, v, false); err != nil {
		return 0, err
	}
	if au.note != "" {
		p.note("headspace "+num.text+" "+text+" "+au.note, fmtNum(v))
	}
	return v, nil
}

func (p *parser) phValue(at *token) (float64, error) {
	tk := p.peek()
	if tk == nil || tk.kind != tNumber {
		return 0, p.errAt(tk, "bad-ph", "a number must follow pH, e.g. pH 12.5")
	}
	p.i++
	if !inRange(tk.num, minPH, maxPH) {
		return 0, p.errAt(tk, "bad-ph", "pH %s is outside −2…16, beyond the strongest acids and caustics in plant use; check the value", tk.text)
	}
	return tk.num, nil
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
