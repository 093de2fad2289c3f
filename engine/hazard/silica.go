package hazard

import "mixward/engine"

// SilicaGelMolar is the dissolved silicate (mol/L of silicon in the mix)
// from which acid on it sets a gel that blocks lines: about 1 % of sodium
// metasilicate. Common practice, no source.
const SilicaGelMolar = 0.1

// Silica gels fastest in the middle of the pH range and slowly on either
// side: above about pH 10 it stays in solution as silicate, and below about
// pH 3 an acid silica sol keeps for hours (Iler, The Chemistry of Silica,
// 1979, gel time against pH, from memory; the bounds as used in the trade:
// common practice, no source). A tank held on one side of that range while
// the other stream runs in gels only where that stream lands.
const (
	SilicaGelLowPH  = 3.0
	SilicaGelHighPH = 10.0
)

func silicaGelsAt(ph float64) bool { return ph > SilicaGelLowPH && ph < SilicaGelHighPH }

// silicaGel: a strong acid on sodium silicate precipitates silica as a
// gel, where the acid lands at once and throughout the tank once the mix
// falls below about pH 10–11; it sets in lines, pumps and valves. The
// neutralisation itself only warms the mix (its heat is in the Heat line).
func silicaGel(o *Outcome) (engine.Hazard, bool) {
	si := o.MolarBefore("SiO3^2-", "H3SiO4-", "H4SiO4")
	if si < SilicaGelMolar || !o.StrongAcid {
		return engine.Hazard{}, false
	}
	// The order the action names is the one that keeps the tank on the
	// side of the end point, which the pour (AlongPourAt) chooses too; when
	// the end point itself gels, no order avoids it and none is named.
	run := "Dilute the silicate first, add slowly with strong stirring"
	switch {
	case o.PH >= SilicaGelHighPH:
		run = "Dilute the silicate first, run the acid into it slowly with strong stirring (the tank stays above pH 10, where it does not gel)"
	case o.PH <= SilicaGelLowPH:
		run = "Run the silicate into the acid slowly with strong stirring (the tank stays below pH 3, where silica gels slowly)"
	}
	return mk("silica-gel", engine.Warning,
		"Acid on silicate ("+fmtNum(si, 2)+" mol/L of silicon in the mix) precipitates silica as a gel where the acid lands, and throughout the tank while the mix is between about pH 3 and 10: it sets in lines, pumps and valves.",
		run+", and flush lines and pumps with water straight after; never leave acidified silicate standing in a line.",
		"Vogel's Textbook of Macro and Semimicro Qualitative Inorganic Analysis, silicates with dilute acids (from memory); Iler, The Chemistry of Silica (1979), gel time against pH (from memory); gel in lines and the 0.1 mol/L threshold: common practice, no source"), true
}
