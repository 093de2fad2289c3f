package hazard

import "mixward/engine"

// SilicaGelMolar is the dissolved silicate (mol/L of silicon in the mix)
// from which acid on it sets a gel that blocks lines: about 1 % of sodium
// metasilicate. Common practice, no source.
const SilicaGelMolar = 0.1

// silicaGel: a strong acid on sodium silicate precipitates silica as a
// gel, where the acid lands at once and throughout the tank once the mix
// falls below about pH 10–11; it sets in lines, pumps and valves. The
// neutralisation itself only warms the mix (its heat is in the Heat line).
func silicaGel(o *Outcome) (engine.Hazard, bool) {
	si := o.MolarBefore("SiO3^2-", "H3SiO4-", "H4SiO4")
	if si < SilicaGelMolar || !o.StrongAcid {
		return engine.Hazard{}, false
	}
	return mk("silica-gel", engine.Warning,
		"Acid on silicate ("+fmtNum(si, 2)+" mol/L of silicon in the mix) precipitates silica as a gel where the acid lands, and throughout the tank once the mix falls below about pH 10: it sets in lines, pumps and valves.",
		"Dilute the silicate first, run the acid in slowly with strong stirring, and flush lines and pumps with water straight after; never leave acidified silicate standing in a line.",
		"Vogel's Textbook of Macro and Semimicro Qualitative Inorganic Analysis, silicates with dilute acids (from memory); gel in lines and the 0.1 mol/L threshold: common practice, no source"), true
}
