package hazard

import (
	"math"
	"slices"
	"strings"

	"mixward/engine"
)

// cyanideComplex is a metal cyanide complex of the species data: the hydrogen
// cyanide acid frees from one formula unit (the rest stays in the metal
// cyanide solid: Au(CN)2- + H+ → AuCN(s) + HCN), the pH below which acid takes it apart to hydrogen
// cyanide, and whether the equilibrium state of the mix already shows that
// (labile: the state's hydrogen cyanide is the figure to go by).
type cyanideComplex struct {
	Species []string
	Freed   float64
	Name    string
	BelowPH float64
	Labile  bool
}

// cyanideComplexes are every metal cyanide complex the species data holds.
//
//   - Hexacyanoferrates: acid below about pH 4 gives hydrogen cyanide off them,
//     slowly in the cold, fast warm (potassium ferrocyanide and ferricyanide
//     safety data sheets, EUH032 "contact with acids liberates very toxic gas";
//     Vogel's Textbook of Macro and Semimicro Qualitative Inorganic Analysis,
//     hexacyanoferrates with dilute acid, hydrogen cyanide on warming; from
//     memory). The state holds them by the hexacyanoferrate-inert lock below
//     60 °C.
//   - Dicyanoaurate: below about pH 3 it breaks down to gold(I) cyanide and
//     hydrogen cyanide, slowly cold, fast hot; acid gold baths run at pH 3.5–5
//     for that reason (common practice, no source; potassium dicyanoaurate
//     safety data sheets, EUH032, from memory). The species data has no
//     AuCN(s), so the state cannot show it.
//   - Silver, copper(I), zinc, cadmium and nickel cyanide complexes are "weak
//     acid dissociable": acid at pH 4.5 frees their cyanide, the basis of the
//     WAD cyanide distillation (Standard Methods 4500-CN I, from memory). The
//     state shows that itself (AgCN(s), CuCN(s) and the free ions are on the
//     table), so the rule speaks for them only where the state's hydrogen
//     cyanide did not raise hcn-release.
var cyanideComplexes = []cyanideComplex{
	{[]string{"Fe(CN)6^4-", "Fe(CN)6^3-"}, 6, "hexacyanoferrate (iron cyanide)", 4, false},
	{[]string{"Au(CN)2-"}, 1, "dicyanoaurate (gold cyanide)", 3, false},
	{[]string{"Ag(CN)2-"}, 1, "dicyanoargentate (silver cyanide)", 4.5, true},
	{[]string{"Cu(CN)2-"}, 1, "cyanocuprate (copper cyanide)", 4.5, true},
	{[]string{"Cu(CN)3^2-"}, 2, "cyanocuprate (copper cyanide)", 4.5, true},
	{[]string{"Cu(CN)4^3-"}, 3, "cyanocuprate (copper cyanide)", 4.5, true},
	{[]string{"Zn(CN)4^2-"}, 4, "tetracyanozincate (zinc cyanide)", 4.5, true},
	{[]string{"Cd(CN)4^2-"}, 4, "tetracyanocadmate (cadmium cyanide)", 4.5, true},
	{[]string{"Ni(CN)4^2-"}, 4, "tetracyanonickelate (nickel cyanide)", 4.5, true},
}

// pastLimit reports whether mol of gas formula, spread over a small plant
// room (RoomM3), would stand at or above the gas table's limit for it.
func pastLimit(o *Outcome, d *Data, formula string, mol float64) bool {
	g, ok := d.Gases[formula]
	return ok && g.LimitPPM > 0 && roomPPM(o, mol) >= g.LimitPPM
}

// cyanideAcidHotC is the temperature from which acid frees hydrogen cyanide
// from a cyanide complex fast, not slowly: the hexacyanoferrate-inert lock
// lifts there too (common practice, no source).
const cyanideAcidHotC = 60

// cyanideAcidStrongMolar is the strong acid (mol/L of H+ in the mix as
// combined) from which a cyanide complex goes to the free acid and gives
// hydrogen cyanide off at once rather than slowly: the same 3 mol/L the
// hexacyanoferrate rule used (common practice, no source).
const cyanideAcidStrongMolar = 3

// cyanideFreedByAcid: a metal cyanide complex poured into acid gives off
// hydrogen cyanide, whether or not the equilibrium state shows it (the
// hexacyanoferrates are held by a lock in the cold, gold(I) cyanide is not
// on the table). A warning; a danger in strong acid or hot. Where the state's
// hydrogen cyanide already raised hcn-release at that level or above, that
// figure stands alone; for the labile complexes any hcn-release does.
func cyanideFreedByAcid(o *Outcome, d *Data, out []engine.Hazard) (engine.Hazard, bool) {
	var hcn *engine.Hazard
	for i := range out {
		if out[i].Code == "hcn-release" {
			hcn = &out[i]
		}
	}
	cn, notIron := 0.0, 0.0
	var names []string
	firm := false
	for _, c := range cyanideComplexes {
		m := math.Max(o.MolarBefore(c.Species...), o.Molar(c.Species...))
		if m < TraceMolar || o.PH >= c.BelowPH || (c.Labile && hcn != nil) {
			continue
		}
		cn += c.Freed * m
		if c.BelowPH < 4 || c.Labile {
			notIron += c.Freed * m
		}
		if !c.Labile {
			firm = true
		}
		if !slices.Contains(names, c.Name) {
			names = append(names, c.Name)
		}
	}
	if cn < TraceMolar {
		return engine.Hazard{}, false
	}
	sev := engine.Warning
	hot := math.Max(o.TemperatureC, o.Heat.ReachedC) >= cyanideAcidHotC
	strong := o.MolarBefore("H+") >= cyanideAcidStrongMolar
	// Hexacyanoferrates give their cyanide up slowly in cold dilute acid;
	// the other complexes do not hold it against acid for long, so enough
	// of them to bring a small room past the IDLH is a danger cold too
	// (the gas table's limit: NIOSH Pocket Guide, IDLH).
	if hot || strong || pastLimit(o, d, "HCN", notIron*o.VolumeL) {
		sev = engine.Danger
	}
	if hcn != nil && hcn.Severity.Rank() >= sev.Rank() {
		return engine.Hazard{}, false
	}
	mol := cn * o.VolumeL
	how := "slowly in the cold, faster warm or in light"
	switch {
	case hot && strong:
		how = "fast: the acid is strong and the mix hot"
	case hot:
		how = "fast: the mix is hot (about " + fmtNum(math.Max(o.TemperatureC, o.Heat.ReachedC), 2) + " °C)"
	case strong:
		how = "quickly: the acid is strong (" + fmtNum(o.MolarBefore("H+"), 2) + " mol/L)"
	}
	msg := "Acid takes the " + strings.Join(names, " and ") + " apart (pH " + fmtNum(o.PH, 2) + " here) and hydrogen cyanide comes off, " + how + ": up to " +
		fmtNum(mol, 3) + " mol HCN (" + fmtNum(engine.GasVolumeL(mol, o.TemperatureK(), o.PressureKPa), 3) + " L as gas) from " + fmtNum(cn, 2) + " mol/L of cyanide the acid can free."
	if !firm {
		msg += " The mix at equilibrium does not show it as a gas of concern, but the cyanide is no longer held."
	} else {
		msg += " The mix at equilibrium holds the complex, as it does for the first minutes; the hydrogen cyanide comes off as the complex breaks down."
	}
	act := "Do not acidify it: keep cyanide liquors, complexed ones too, above pH 10.5 and acids away from them; if it has happened, keep it covered and vented to a scrubber or outdoors, work with an HCN detector and neutralise it back to alkaline. Treat as cyanide waste, not for the drain."
	if sev == engine.Danger {
		act = "Do not combine. Keep cyanide liquors, complexed ones too, above pH 10.5 and acids away from them; if it has happened, leave the area at once and raise the alarm, and return only with breathing apparatus and an HCN detector to cover, vent and neutralise it. Treat as cyanide waste, not for the drain."
	}
	h := mk("cyanide-complex-acid", sev, msg, act,
		"metal cyanide complexes with acid: safety data sheets of potassium ferrocyanide, ferricyanide and dicyanoaurate, EUH032 (from memory); Vogel's Textbook of Macro and Semimicro Qualitative Inorganic Analysis, hexacyanoferrates with dilute acid (from memory); dicyanoaurate below about pH 3 and acid gold baths at pH 3.5–5: common practice, no source; weak-acid-dissociable complexes at pH 4.5: Standard Methods 4500-CN I (from memory); NIOSH Pocket Guide, hydrogen cyanide IDLH 50 ppm (from memory)")
	return withCounts(h, engine.GasCount{Formula: "HCN", Name: "hydrogen cyanide", Mol: mol, InLiquid: true, Beyond: true, From: "acid taking the cyanide complex apart"}), true
}
