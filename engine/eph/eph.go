// Package eph draws the E–pH picture of a mix: the reduction potentials of
// the chosen oxidizing and reducing couples against pH, under the mix's
// concentrations and temperature, with the pH range where the reaction is
// spontaneous shaded and the mix's own pH marked. It does no I/O beyond
// writing to the io.Writer it is given and is safe for concurrent use.
package eph

import (
	"errors"
	"fmt"
	"image/color"
	"image/png"
	"io"
	"math"
	"strings"

	"gonum.org/v1/gonum/unit/constant"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
)

// The pH span of the picture. A mix pH outside it widens the span to
// include it.
const (
	PHMin = 0.0
	PHMax = 14.0
)

// Size of the rendered picture: 8 × 5 inches at 90 dpi. (At 960 × 600 a
// picture took 38 ms and 7.9 MB of allocations to draw; at this size
// about 24 ms and 5 MB, measured with BenchmarkDraw.)
const (
	WidthPx  = 720
	HeightPx = 450
	dpi      = 90
)

// samples is the number of points each curve is evaluated at across the
// pH span.
const samples = 561

// Curve is one couple's reduction potential against pH under the mix's
// conditions, volts vs SHE. E may return NaN where the couple does not
// apply; that part of the curve is not drawn.
type Curve struct {
	Label string
	E     func(pH float64) float64
}

// Range is a pH interval.
type Range struct{ From, To float64 }

// ErrNoCurve is returned when a curve has no potential function or no finite
// potential anywhere in the pH span.
var ErrNoCurve = errors.New("eph: curve has no finite potential")

// NernstSlope is RT·ln10/F in volts per pH unit at temperatureK (0.05916 V
// at 25 °C), from the CODATA constants in gonum.
func NernstSlope(temperatureK float64) float64 {
	r := float64(constant.Avogadro) * float64(constant.Boltzmann)
	return r * temperatureK * math.Ln10 / float64(constant.Faraday)
}

// NernstLine is the curve of a couple whose reduction consumes protons
// hydrogen ions (or, written for base, releases as many hydroxide ions) for
// electrons electrons: its potential falls by protons/electrons ·
// NernstSlope per pH unit. eRef is the couple's potential at pH pHRef under
// the mix's conditions, such as the Nernst potential at the mix pH; the
// other concentrations are held as they are there.
func NernstLine(label string, eRef, pHRef float64, protons, electrons int, temperatureK float64) Curve {
	if electrons <= 0 {
		return Curve{Label: label, E: func(float64) float64 { return math.NaN() }}
	}
	slope := float64(protons) / float64(electrons) * NernstSlope(temperatureK)
	return Curve{Label: label, E: func(pH float64) float64 { return eRef - slope*(pH-pHRef) }}
}

// span is the pH span drawn for a mix at mixPH.
func span(mixPH float64) (lo, hi float64) {
	lo, hi = PHMin, PHMax
	if mixPH < lo {
		lo = math.Floor(mixPH)
	}
	if mixPH > hi {
		hi = math.Ceil(mixPH)
	}
	return lo, hi
}

// Spontaneous returns the pH intervals within [lo, hi] where ox.E − red.E
// is positive, i.e. where the oxidizer's couple lies above the reducer's.
// Interval ends are located to within 0.001 pH.
func Spontaneous(ox, red Curve, lo, hi float64) []Range {
	if ox.E == nil || red.E == nil || !(hi > lo) {
		return nil
	}
	pos := func(x float64) bool { return ox.E(x)-red.E(x) > 0 }
	var out []Range
	step := (hi - lo) / float64(samples-1)
	in := pos(lo)
	start := lo
	prev := lo
	for i := 1; i < samples; i++ {
		x := lo + float64(i)*step
		if i == samples-1 {
			x = hi
		}
		if p := pos(x); p != in {
			edge := bisect(pos, prev, x, in)
			if in {
				out = append(out, Range{start, edge})
			} else {
				start = edge
			}
			in = p
		}
		prev = x
	}
	if in {
		out = append(out, Range{start, hi})
	}
	return out
}

// bisect finds where pos changes from at to !at between a and b.
func bisect(pos func(float64) bool, a, b float64, at bool) float64 {
	for b-a > 1e-4 {
		m := (a + b) / 2
		if pos(m) == at {
			a = m
		} else {
			b = m
		}
	}
	return (a + b) / 2
}

// Summary is a one-paragraph caption of the picture for operators and for
// readers who cannot see the image.
func Summary(ox, red Curve, mixPH float64) string {
	if ox.E == nil || red.E == nil {
		return "No E–pH picture: a couple has no potential."
	}
	lo, hi := span(mixPH)
	rs := Spontaneous(ox, red, lo, hi)
	var b strings.Builder
	switch {
	case len(rs) == 0:
		fmt.Fprintf(&b, "Not spontaneous anywhere from pH %s to %s: %s lies below %s.", num(lo), num(hi), ox.Label, red.Label)
	case len(rs) == 1 && rs[0].From == lo && rs[0].To == hi:
		fmt.Fprintf(&b, "Spontaneous over the whole range from pH %s to %s (shaded).", num(lo), num(hi))
	default:
		parts := make([]string, len(rs))
		for i, r := range rs {
			parts[i] = "pH " + num(r.From) + " to " + num(r.To)
		}
		fmt.Fprintf(&b, "Spontaneous for %s (shaded).", strings.Join(parts, ", "))
	}
	eo, er := ox.E(mixPH), red.E(mixPH)
	if !math.IsNaN(eo) && !math.IsNaN(er) && !math.IsInf(eo, 0) && !math.IsInf(er, 0) {
		fmt.Fprintf(&b, " At the mix pH %s: %s %+.2f V, %s %+.2f V, E cell %+.2f V.", num(mixPH), ox.Label, eo, red.Label, er, eo-er)
	}
	return b.String()
}

func num(x float64) string {
	s := fmt.Sprintf("%.1f", x)
	if s == "-0.0" {
		s = "0.0"
	}
	return s
}

// ShadeColour is the fill of the spontaneous pH range.
func ShadeColour() color.RGBA { return color.RGBA{R: 198, G: 239, B: 206, A: 255} }

// Draw writes the E–pH picture of the pair as a PNG of WidthPx × HeightPx:
// both curves from pH 0 to 14 (wider if the mix pH lies outside), the pH
// range where ox.E − red.E > 0 shaded, a dashed vertical line at mixPH, a
// legend and axis labels with units.
func Draw(w io.Writer, ox, red Curve, mixPH float64, title string) error {
	if math.IsNaN(mixPH) || math.IsInf(mixPH, 0) {
		return fmt.Errorf("eph: mix pH %v is not a number", mixPH)
	}
	if mixPH < -5 || mixPH > 19 {
		return fmt.Errorf("eph: mix pH %g is outside -5..19", mixPH)
	}
	lo, hi := span(mixPH)
	oxXY, err := sample(ox, lo, hi)
	if err != nil {
		return err
	}
	redXY, err := sample(red, lo, hi)
	if err != nil {
		return err
	}
	ymin, ymax := yRange(oxXY, redXY)
	p := frame(title, lo, hi, ymin, ymax)
	// Shading first, so that the grid and the curves lie on top.
	if err := shade(p, ox, red, lo, hi, ymin, ymax); err != nil {
		return err
	}
	grid := plotter.NewGrid()
	grid.Vertical.Color = color.Gray{Y: 215}
	grid.Horizontal.Color = color.Gray{Y: 215}
	p.Add(grid)
	// Colour-blind-safe orange and blue for the two couples.
	if err := curve(p, ox, oxXY, color.RGBA{R: 213, G: 94, B: 0, A: 255}, "oxidizer"); err != nil {
		return err
	}
	if err := curve(p, red, redXY, color.RGBA{R: 0, G: 114, B: 178, A: 255}, "reducer"); err != nil {
		return err
	}
	if err := markPH(p, ox, red, mixPH, ymin, ymax); err != nil {
		return err
	}
	return encode(w, p)
}

// frame is the empty plot: title, axes, ticks and legend placement.
func frame(title string, lo, hi, ymin, ymax float64) *plot.Plot {
	p := plot.New()
	sans := font.Font{Typeface: "Liberation", Variant: "Sans"}
	style := func(s *font.Font, pt float64) { *s = sans; s.Size = vg.Points(pt) }
	p.Title.Text = title
	style(&p.Title.TextStyle.Font, 14)
	p.Title.Padding = vg.Points(8)
	p.X.Label.Text = "pH"
	p.Y.Label.Text = "E / V vs SHE"
	style(&p.X.Label.TextStyle.Font, 12)
	style(&p.Y.Label.TextStyle.Font, 12)
	style(&p.X.Tick.Label.Font, 11)
	style(&p.Y.Tick.Label.Font, 11)
	style(&p.Legend.TextStyle.Font, 11)
	p.X.Min, p.X.Max = lo, hi
	p.Y.Min, p.Y.Max = ymin, ymax
	p.X.Tick.Marker = phTicks{}
	p.Y.Tick.Marker = voltTicks{}
	p.Legend.Top = true
	p.Legend.XOffs = -vg.Points(8)
	p.Legend.YOffs = -vg.Points(4)
	p.Legend.ThumbnailWidth = vg.Points(24)
	p.Legend.Padding = vg.Points(2)
	return p
}

// shade fills the pH ranges where the pair is spontaneous.
func shade(p *plot.Plot, ox, red Curve, lo, hi, ymin, ymax float64) error {
	shaded := false
	for _, r := range Spontaneous(ox, red, lo, hi) {
		poly, err := plotter.NewPolygon(plotter.XYs{{X: r.From, Y: ymin}, {X: r.To, Y: ymin}, {X: r.To, Y: ymax}, {X: r.From, Y: ymax}})
		if err != nil {
			return fmt.Errorf("eph: shading: %w", err)
		}
		poly.Color = ShadeColour()
		poly.LineStyle.Width = 0
		p.Add(poly)
		if !shaded {
			p.Legend.Add("spontaneous (oxidizer above reducer)", poly)
			shaded = true
		}
	}
	return nil
}

// curve draws one couple's potential, segment by segment, in col.
func curve(p *plot.Plot, c Curve, xy []plotter.XYs, col color.Color, role string) error {
	for i, seg := range xy {
		l, err := plotter.NewLine(seg)
		if err != nil {
			return fmt.Errorf("eph: %s curve: %w", role, err)
		}
		l.Color = col
		l.Width = vg.Points(2.5)
		p.Add(l)
		if i == 0 {
			p.Legend.Add(legendLabel(role, c.Label), l)
		}
	}
	return nil
}

// markPH draws the mix's pH as a dashed line with the cell potential there.
func markPH(p *plot.Plot, ox, red Curve, mixPH, ymin, ymax float64) error {
	mark, err := plotter.NewLine(plotter.XYs{{X: mixPH, Y: ymin}, {X: mixPH, Y: ymax}})
	if err != nil {
		return fmt.Errorf("eph: mix pH marker: %w", err)
	}
	mark.Color = color.RGBA{R: 60, G: 60, B: 60, A: 255}
	mark.Width = vg.Points(1.5)
	mark.Dashes = []vg.Length{vg.Points(6), vg.Points(4)}
	p.Add(mark)
	label := "mix pH " + num(mixPH)
	if eo, er := ox.E(mixPH), red.E(mixPH); !math.IsNaN(eo-er) && !math.IsInf(eo-er, 0) {
		label += fmt.Sprintf(" (E cell %+.2f V)", eo-er)
	}
	p.Legend.Add(label, mark)
	return nil
}

// encode renders the plot at WidthPx × HeightPx and writes it as PNG.
func encode(w io.Writer, p *plot.Plot) error {
	cv := vgimg.NewWith(vgimg.UseWH(vg.Length(WidthPx)*vg.Inch/dpi, vg.Length(HeightPx)*vg.Inch/dpi), vgimg.UseDPI(dpi))
	// Margins so that tick labels and the legend keep clear of the edges.
	p.Draw(draw.Crop(draw.New(cv), vg.Points(8), -vg.Points(18), vg.Points(4), -vg.Points(6)))
	// Fastest deflate: the picture is mostly flat colour, so it costs a few
	// per cent in size and saves a fifth of the encoding time.
	enc := png.Encoder{CompressionLevel: png.BestSpeed}
	if err := enc.Encode(w, cv.Image()); err != nil {
		return fmt.Errorf("eph: write PNG: %w", err)
	}
	return nil
}

func legendLabel(role, label string) string {
	if label == "" {
		return role
	}
	return role + ": " + label
}

// sample evaluates c across [lo, hi] and splits it where it is not finite.
func sample(c Curve, lo, hi float64) ([]plotter.XYs, error) {
	if c.E == nil {
		return nil, fmt.Errorf("%w: %q has no potential function", ErrNoCurve, c.Label)
	}
	var segs []plotter.XYs
	var cur plotter.XYs
	for i := 0; i < samples; i++ {
		x := lo + (hi-lo)*float64(i)/float64(samples-1)
		y := c.E(x)
		if math.IsNaN(y) || math.IsInf(y, 0) || math.Abs(y) > 100 {
			if len(cur) > 0 {
				segs = append(segs, cur)
				cur = nil
			}
			continue
		}
		cur = append(cur, plotter.XY{X: x, Y: y})
	}
	if len(cur) > 0 {
		segs = append(segs, cur)
	}
	if len(segs) == 0 {
		return nil, fmt.Errorf("%w: %q between pH %g and %g", ErrNoCurve, c.Label, lo, hi)
	}
	// A lone point cannot be drawn as a line: widen it into a short tick.
	for i, s := range segs {
		if len(s) == 1 {
			segs[i] = plotter.XYs{s[0], {X: s[0].X + (hi-lo)/float64(samples-1), Y: s[0].Y}}
		}
	}
	return segs, nil
}

// yRange covers both curves with a margin, leaving headroom for the legend
// at the top.
func yRange(curves ...[]plotter.XYs) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, segs := range curves {
		for _, s := range segs {
			for _, p := range s {
				lo, hi = math.Min(lo, p.Y), math.Max(hi, p.Y)
			}
		}
	}
	if hi-lo < 0.4 {
		mid := (hi + lo) / 2
		lo, hi = mid-0.2, mid+0.2
	}
	d := hi - lo
	return lo - 0.08*d, hi + 0.45*d
}

// voltTicks labels the potential axis every 0.05, 0.1, 0.2, 0.25, 0.5 or
// 1 V, whichever gives about five to ten labels.
type voltTicks struct{}

func (voltTicks) Ticks(min, max float64) []plot.Tick {
	step := 1.0
	for _, s := range []float64{0.05, 0.1, 0.2, 0.25, 0.5, 1} {
		if (max-min)/s <= 10 {
			step = s
			break
		}
	}
	if (max-min)/step > 50 {
		step = math.Pow(10, math.Ceil(math.Log10((max-min)/10)))
	}
	var ts []plot.Tick
	for i := math.Ceil(min / step); i*step <= max; i++ {
		v := i * step
		if v == 0 {
			v = 0 // no "-0.0"
		}
		ts = append(ts, plot.Tick{Value: v, Label: strings.TrimSuffix(fmt.Sprintf("%.2f", v), "0")})
		// A minor tick halfway to the next label.
		if m := v + step/2; m <= max {
			ts = append(ts, plot.Tick{Value: m})
		}
	}
	return ts
}

// phTicks puts a labelled tick at every whole pH unit.
type phTicks struct{}

func (phTicks) Ticks(min, max float64) []plot.Tick {
	var ts []plot.Tick
	for x := math.Ceil(min); x <= max; x++ {
		ts = append(ts, plot.Tick{Value: x, Label: fmt.Sprintf("%.0f", x)})
	}
	return ts
}
