package hazard

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io/fs"
	"math"
	"strconv"
	"strings"

	"mixward/engine"
)

// VapourFile is the table of partial pressures of a gas over its own
// aqueous solution by strength, at the root of the data FS.
const VapourFile = "vapour.txt"

// VapourRow is one row of the vapour table: the partial pressure of a gas
// over its aqueous solution at one strength, at 25 °C, and the van 't Hoff
// slope (ΔH/R, kelvin) that takes it to other temperatures.
type VapourRow struct {
	Gas     string
	Percent float64 // % w/w of the free solute
	KPa25   float64
	SlopeK  float64
	Source  string
}

// Vapour methods name where a headspace figure came from (GasJudged.Method).
const (
	MethodState  = "mixed state"  // Henry's law or the mixed state's activities
	MethodVapour = "vapour table" // data/vapour.txt by the liquid's strength
)

// freeSolute is, per gas of the vapour table, the formula whose % w/w the
// table is read at and how the free solute is counted in the liquid
// (mol/L, from the amounts after reaction): hydrochloric acid as the lesser
// of H+ and Cl-, hydrofluoric acid as molecular HF plus the fluoride the
// free acid pairs with (bifluoride counting twice), ammonia as the dissolved molecule.
var freeSolute = map[string]func(xs []Amount) float64{
	"HCl": func(xs []Amount) float64 {
		return math.Min(sumMolar(xs, []string{"H+"}), sumMolar(xs, []string{"Cl-"}))
	},
	"HF": func(xs []Amount) float64 {
		h, bi := sumMolar(xs, []string{"H+"}), sumMolar(xs, []string{"HF2-"})
		n1 := math.Min(h, bi) // H+ + HF2- → 2 HF
		n2 := math.Min(h-n1, sumMolar(xs, []string{"F-"}))
		return sumMolar(xs, []string{"HF"}) + 2*n1 + n2
	},
	"NH3": func(xs []Amount) float64 { return sumMolar(xs, []string{"NH3"}) },
}

func loadVapour(fsys fs.FS, gases map[string]*GasData) (map[string][]VapourRow, error) {
	b, err := fs.ReadFile(fsys, VapourFile)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, nil
	}
	if err != nil {
		return nil, fmt.Errorf("read vapour table: %w", err)
	}
	out := map[string][]VapourRow{}
	sc := bufio.NewScanner(bytes.NewReader(b))
	for n := 1; sc.Scan(); n++ {
		line := strings.TrimSpace(sc.Text())
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		r, err := parseVapourRow(line)
		if err != nil {
			return nil, fmt.Errorf("%s:%d: %w", VapourFile, n, err)
		}
		if gases[r.Gas] == nil || freeSolute[r.Gas] == nil {
			return nil, fmt.Errorf("%s:%d: gas %q has no row in %s or no way to count its free solute; use HCl, HF or NH3", VapourFile, n, r.Gas, GasFile)
		}
		if rs := out[r.Gas]; len(rs) > 0 && !(r.Percent > rs[len(rs)-1].Percent) {
			return nil, fmt.Errorf("%s:%d: rows of %s must rise in %% w/w (%g after %g)", VapourFile, n, r.Gas, r.Percent, rs[len(rs)-1].Percent)
		}
		out[r.Gas] = append(out[r.Gas], r)
	}
	if err := sc.Err(); err != nil {
		return nil, fmt.Errorf("%s: %w", VapourFile, err)
	}
	return out, nil
}

func parseVapourRow(line string) (VapourRow, error) {
	f := strings.Split(line, " | ")
	if len(f) != 5 {
		return VapourRow{}, fmt.Errorf("want 5 fields separated by \" | \" (gas | %% w/w | kPa at 25 °C | slope K | source), got %d", len(f))
	}
	for i := range f {
		f[i] = strings.TrimSpace(f[i])
	}
	r := VapourRow{Gas: f[0], Source: f[4]}
	var nums [3]float64
	for i, s := range f[1:4] {
		v, err := strconv.ParseFloat(s, 64)
		if err != nil || !finite(v) || v <= 0 {
			return VapourRow{}, fmt.Errorf("gas %s: field %d %q is not a positive number", f[0], i+2, s)
		}
		nums[i] = v
	}
	r.Percent, r.KPa25, r.SlopeK = nums[0], nums[1], nums[2]
	if r.Percent >= 100 {
		return VapourRow{}, fmt.Errorf("gas %s: %% w/w %g must be below 100", r.Gas, r.Percent)
	}
	if r.Source == "" {
		return VapourRow{}, fmt.Errorf("gas %s: name the source of the row", r.Gas)
	}
	return r, nil
}

// VapourKPa is the partial pressure (kPa) of gas over its aqueous solution
// at percent % w/w and tempK, read from the rows (interpolated in log space
// between rows, van 't Hoff in temperature). ok is false below the first
// row or for a gas without rows; lower is true above the last row, whose
// figure is then a lower bound.
func VapourKPa(rows []VapourRow, percent, tempK float64) (kPa float64, lower bool, src []string, ok bool) {
	if len(rows) == 0 || !(percent >= rows[0].Percent) || !(tempK > 0) {
		return 0, false, nil, false
	}
	at := func(r VapourRow) float64 {
		return math.Log(r.KPa25) - r.SlopeK*(1/tempK-1/298.15)
	}
	last := rows[len(rows)-1]
	if percent >= last.Percent {
		return math.Exp(at(last)), percent > last.Percent, []string{last.Source}, true
	}
	for i := 1; i < len(rows); i++ {
		a, b := rows[i-1], rows[i]
		if percent > b.Percent {
			continue
		}
		f := (percent - a.Percent) / (b.Percent - a.Percent)
		lp := at(a) + f*(at(b)-at(a))
		return math.Exp(lp), false, []string{a.Source, b.Source}, true
	}
	return math.Exp(at(last)), false, []string{last.Source}, true
}

// strengths fills Outcome.Strength: the % w/w of the free solute of each
// gas of the vapour table in the liquid after reaction, with the density of
// that solute's own solution (densities.txt; 1 g/mL where it has none).
func (o *Outcome) strengths(r *engine.Result, t *engine.Tables) {
	xs := o.After
	if len(r.FinalComposition) > 0 {
		xs = afterAmounts(r.FinalComposition, o.VolumeL)
	}
	for gas, count := range freeSolute {
		c := count(xs)
		mm, err := t.MolarMass(gas)
		if !(c > 0) || err != nil {
			continue
		}
		pct := c * mm / 10 // g/L over 10 g/L per % at 1 g/mL
		for range 8 {
			rho, ok := t.Density(gas, pct)
			if !ok {
				break
			}
			pct = c * mm / (10 * rho)
		}
		if o.Strength == nil {
			o.Strength = map[string]float64{}
		}
		o.Strength[gas] = pct
	}
}

// vapourTemperatureC is the temperature the vapour figure is read at: the
// mix's temperature after its own heat when that is known.
func (o *Outcome) vapourTemperatureC() float64 {
	if o.Heat.Known && finite(o.Heat.ReachedC) {
		return o.Heat.ReachedC
	}
	return o.TemperatureC
}

// vapourFigure is the headspace of gas read from the vapour table by the
// liquid's strength, when the strength is inside the table's range.
func vapourFigure(o *Outcome, d *Data, gas string) (Headspace, []string, bool, bool) {
	pct, have := o.Strength[gas]
	if !have || d.Vapour == nil {
		return Headspace{}, nil, false, false
	}
	tK := o.vapourTemperatureC() + 273.15
	kPa, lower, src, ok := VapourKPa(d.Vapour[gas], pct, tK)
	if !ok || !(o.PressureKPa > 0) || !(o.HeadspaceL > 0) {
		return Headspace{}, nil, false, false
	}
	h := Headspace{PartialBar: kPa / 100}
	if kPa >= o.PressureKPa {
		h.PartialBar, h.Vents = o.PressureKPa/100, true
	}
	h.PPM = h.PartialBar / (o.PressureKPa / 100) * 1e6
	h.GasMol = h.PartialBar * o.HeadspaceL / (litreBarPerMolK() * tK)
	return h, src, lower, true
}

// figureNote says which method gave the headspace figure of a gas the
// vapour table covers: the table at the liquid's strength, or the mixed
// state (Henry's law) for a liquid weaker than its rows.
func figureNote(p *pool, g *GasData) string {
	if freeSolute[g.Formula] == nil || p == nil {
		return ""
	}
	if !p.vapour {
		return " Figure from the mixed state (Henry's law with the liquid's activities): the liquid is weaker than the vapour table's rows."
	}
	n := fmt.Sprintf(" Figure from the vapour table: the partial pressure over %s %% %s at %s °C (%s).", fmtNum(p.pct, 3), g.Formula, fmtNum(p.tempC, 3), VapourFile)
	if p.lower {
		n += " The liquid is stronger than the table's last row: the real figure is higher."
	}
	return n
}
