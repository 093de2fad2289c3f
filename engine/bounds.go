package engine

import (
	"fmt"
	"math"
	"strconv"
)

// Plausibility bounds of the request language. ParseRequest refuses a value
// outside them with a *ParseError naming the number and its position, before
// anything is computed or logged, so that a typing slip ("HCl 40 M",
// "1e308 g/L", "1e-320 kPa") never reaches the arithmetic as +Inf or as an
// answer about a solution that cannot exist.
const (
	// Temperatures. Concentrated brines and acids stay liquid to about
	// −30 °C (20 % CaCl2 freezes near −18 °C, 30 % near −50 °C; CRC
	// Handbook, Concentrative Properties of Aqueous Solutions; from memory);
	// water under 5 bar stays liquid to 151.8 °C (IAPWS steam tables; from
	// memory). Beyond these the 25 °C tables and their van 't Hoff
	// corrections are no longer a fair account of the mix.
	minTemperatureC = -30
	maxTemperatureC = 150

	// pH. The strongest plant solutions reach about pH −1 (37 % HCl) and
	// pH 15 (50 % caustic); −2…16 leaves room and no more (common practice,
	// no source).
	minPH = -2
	maxPH = 16

	// Pressures, absolute. Below 1 kPa water boils at about 7 °C (its vapour
	// pressure is 1.0 kPa at 7 °C; IAPWS steam tables; from memory), so no
	// liquid mix exists at plant temperatures; 10 MPa is above the rating of
	// process vessels and where the ideal-gas estimates of gas volumes stop
	// being fair (common practice, no source).
	minPressureKPa = 1
	maxPressureKPa = 10000

	// Amounts. A microlitre or a milligram is less than a drop or a few
	// crystals; 10 000 m³ or 10 000 t is more than a process vessel holds.
	// Either way the unit is wrong (common practice, no source).
	minVolumeL = 1e-6
	maxVolumeL = 1e7
	minMassKg  = 1e-6
	maxMassKg  = 1e7

	// General concentration ceilings for a chemical without a row in
	// data/ceilings.txt. No solution holds more of a solute than about
	// 3 kg per litre: the densest brines in trade use, zinc bromide
	// completion fluids, weigh about 2.3 kg per litre in all (19.2 lb/gal;
	// common practice, from memory). And none holds more than 60 mol/L of a
	// solute: pure water itself is 55.5 mol/L, pure liquid HF about
	// 50 mol/L (CRC Handbook, Physical Constants; from memory).
	maxGPerLGeneral  = 3000
	maxMolarGeneral  = 60
	ceilingsFileName = tableDir + CeilingsFile
)

// inRange reports whether v lies in [lo, hi]; NaN never does.
func inRange(v, lo, hi float64) bool { return v >= lo && v <= hi }

// fmtNum formats a number for a message: 4 significant figures, no
// exponent for ordinary sizes.
func fmtNum(v float64) string { return strconv.FormatFloat(v, 'g', 4, 64) }

// chemName is the first English name of a chemical, else its formula.
func chemName(ch *Chemical) string {
	if len(ch.Names) > 0 {
		return ch.Names[0]
	}
	return ch.Formula
}

// checkTemperature bounds a stated temperature, given in unit as typed.
func (p *parser) checkTemperature(num, unit *token, k float64) error {
	c := k - 273.15
	if inRange(c, minTemperatureC, maxTemperatureC) {
		return nil
	}
	return p.errAt(num, "bad-temperature",
		"temperature %s %s is outside the range mixward handles, −30 to 150 °C: concentrated brines and acids stay liquid to about −30 °C, water under 5 bar to about 150 °C; state the temperature of the mix in C, F or K",
		num.text, unit.text)
}

// checkPressure bounds a stated pressure, converted to kPa.
func (p *parser) checkPressure(num, unit *token, kPa float64) error {
	if inRange(kPa, minPressureKPa, maxPressureKPa) {
		return nil
	}
	return p.errAt(num, "bad-pressure",
		"pressure %s %s is outside 1 kPa to 10 MPa (absolute): below 1 kPa water boils at plant temperatures, above 10 MPa is beyond process vessels; check the value and the unit (kPa, MPa, bar, atm)",
		num.text, unit.text)
}

// checkAmount bounds a stream's stated amount: v litres, or v kilograms
// when mass is set.
func (p *parser) checkAmount(num, unit *token, v float64, mass bool) error {
	lo, hi := minVolumeL, maxVolumeL
	if mass {
		lo, hi = minMassKg, maxMassKg
	}
	switch {
	case inRange(v, lo, hi):
		return nil
	case !(v > 0):
		return p.errAt(num, "bad-amount", "the amount %s %s must be more than zero", num.text, unit.text)
	case v < lo:
		return p.errAt(num, "bad-amount", "the amount %s %s is less than a microlitre or a milligram; check the unit", num.text, unit.text)
	}
	return p.errAt(num, "bad-amount", "the amount %s %s is larger than any process vessel (10 000 m³ or 10 000 t); check the unit", num.text, unit.text)
}

// isLiquid reports whether a stream is read as a liquid: it states a volume,
// or it states no amount and holds something other than metals and
// sparingly soluble solids (as buildMixture reads it).
func (st *Stream) isLiquid() bool {
	return st.VolumeL > 0 || (st.MassKg == 0 && streamIsSolution(st))
}

// checkStream bounds every stated concentration of a stream.
func (p *parser) checkStream(st *Stream) error {
	liquid := st.isLiquid()
	for i := range st.Components {
		if err := p.checkConc(&st.Components[i], liquid); err != nil {
			return err
		}
	}
	return nil
}

// checkConc refuses a concentration that is negative or above what any
// solution of the chemical can hold.
func (p *parser) checkConc(c *Component, liquid bool) error {
	if c.Unit == NoConc {
		return nil
	}
	num := &token{kind: tNumber, text: c.numText, num: c.Value, pos: c.numPos}
	if c.Value < 0 {
		return p.errAt(num, "bad-concentration", "the concentration of %s cannot be negative", c.Name)
	}
	max, why := ConcCeiling(p.t, c.Chemical, c.Unit, liquid)
	if c.Value <= max {
		return nil
	}
	return p.errAt(num, "bad-concentration", "%s %s %s is more than any solution can hold: %s; check the value and the unit",
		c.Name, c.numText, unitText(c.Unit), why)
}

// unitText is a unit as the request language writes it.
func unitText(u ConcUnit) string {
	switch u {
	case PctWW:
		return "%"
	case PctWV:
		return "% w/v"
	case Molar:
		return "M"
	case MilliM:
		return "mM"
	}
	return string(u)
}

// ConcCeiling is the highest concentration of ch, in unit u, that a request
// may state, with the reason in words. In a liquid stream it is the most
// concentrated water solution of the chemical (data/ceilings.txt), or the
// general ceilings of 3000 g/L and 60 mol/L where the chemical has no row;
// a percentage is never above 100. In a solid stream (a mass without a
// volume) % w/w is the chemical's share of the solid and only bounded by
// 100.
func ConcCeiling(t *Tables, ch *Chemical, u ConcUnit, liquid bool) (max float64, why string) {
	gpl, gwhy := float64(maxGPerLGeneral), "no solution holds more than about 3000 g of a solute per litre"
	molar, mwhy := float64(maxMolarGeneral), "no solution holds more than about 60 mol of a solute per litre (pure water is 55.5 mol/L)"
	var row *Ceiling
	if c, ok := t.Ceilings[ch.Formula]; ok && ch.MolarMass > 0 {
		row = &c
		gpl = c.GPerL()
		molar = gpl / ch.MolarMass
		if c.Pure {
			gwhy = fmt.Sprintf("pure %s is about %s g/L or %s mol/L at 20 °C (%s)", chemName(ch), fmtNum(gpl), fmtNum(molar), ceilingsFileName)
		} else {
			gwhy = fmt.Sprintf("saturated %s at 20 °C holds about %s %% w/w, %s g/L or %s mol/L (%s)", chemName(ch), fmtNum(c.PercentWW), fmtNum(gpl), fmtNum(molar), ceilingsFileName)
		}
		mwhy = gwhy
	} else if ch.MolarMass > 0 && gpl/ch.MolarMass < molar {
		molar = gpl / ch.MolarMass
		mwhy = fmt.Sprintf("3000 g/L of %s, more than any solution holds, is %s mol/L", ch.Formula, fmtNum(molar))
	}
	switch u {
	case PctWW:
		if liquid && row != nil {
			return row.PercentWW, gwhy
		}
		return 100, "a share by weight is at most 100 %"
	case PctWV:
		if gpl/10 < 100 {
			return gpl / 10, gwhy
		}
		return 100, "% w/v is grams per 100 mL and is taken as at most 100"
	case Molar:
		return molar, mwhy
	case MilliM:
		return molar * 1000, mwhy
	case GPerL:
		return gpl, gwhy
	case MgPerL:
		return gpl * 1000, gwhy
	case PPM:
		return math.Min(gpl*1000, 1e6), gwhy + "; ppm is read as mg/L and is at most 1 000 000"
	}
	return math.Inf(1), ""
}
