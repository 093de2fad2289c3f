package engine_test

import (
	"strings"
	"testing"

	"mixward/engine"
)

// mixOutcome is what a kinetic-lock case asserts about an answer: amounts in
// the final composition (summed over the listed species texts), gases, the
// pH as combined and the locks listed as held back.
type mixOutcome struct {
	atLeast map[string]float64 // species text list ("A|B") → at least this many mol
	atMost  map[string]float64 // species text list → at most this many mol
	phMin   float64            // pH as combined at least this (0: not checked)
	held    []string           // locks that must be listed as held back
	notHeld []string           // locks that must not be listed
}

// finalMol sums the final composition over a "|"-separated list of species
// texts; a gas counts both in the final composition and the gas list.
func finalMol(r *engine.Result, list string) float64 {
	tot := 0.0
	for _, text := range strings.Split(list, "|") {
		for _, a := range r.FinalComposition {
			if a.Text == text {
				tot += a.Mol
			}
		}
	}
	return tot
}

func heldIDs(r *engine.Result) []string {
	var out []string
	for _, h := range r.HeldBack {
		out = append(out, h.Lock)
	}
	return out
}

func checkOutcome(t *testing.T, req string, want mixOutcome) {
	t.Helper()
	r := ask(t, req)
	for list, min := range want.atLeast {
		if got := finalMol(r, list); got < min {
			t.Errorf("%s: %s = %.4g mol, want at least %g", req, list, got, min)
		}
	}
	for list, max := range want.atMost {
		if got := finalMol(r, list); got > max {
			t.Errorf("%s: %s = %.4g mol, want at most %g", req, list, got, max)
		}
	}
	if want.phMin != 0 && r.Conditions.PH < want.phMin {
		t.Errorf("%s: pH as combined %.2f, want at least %g", req, r.Conditions.PH, want.phMin)
	}
	held := strings.Join(heldIDs(r), " ")
	for _, id := range want.held {
		if !strings.Contains(" "+held+" ", " "+id+" ") {
			t.Errorf("%s: held back [%s], want %s listed", req, held, id)
		}
	}
	for _, id := range want.notHeld {
		if strings.Contains(" "+held+" ", " "+id+" ") {
			t.Errorf("%s: held back [%s], want %s not listed", req, held, id)
		}
	}
}

// TestStatedPHKeepsCyanide: a stream of cyanide at a stated alkaline pH is
// fitted with the same locks as the mix as combined, so the fit does not
// "hydrolyse" cyanide to carbon monoxide and ammonia and add a mole of acid
// per mole of cyanide (pKa of HCN 9.2, CRC Dissociation constants of
// inorganic acids and bases; from memory).
func TestStatedPHKeepsCyanide(t *testing.T) {
	cases := []struct {
		req  string
		want mixOutcome
	}{
		{"mix 100 L NaCN 0.5 %, pH 11 + 100 L water", mixOutcome{phMin: 10.5, atLeast: map[string]float64{"CN-": 8}, atMost: map[string]float64{"HCN": 2}}},
		{"mix 100 L NaCN 0.5 %, pH 12 + 100 L water", mixOutcome{phMin: 11.5, atLeast: map[string]float64{"CN-": 9.5}}},
	}
	for _, c := range cases {
		t.Run(c.req, func(t *testing.T) { checkOutcome(t, c.req, c.want) })
	}
}

// TestPeroxideDecomposition: hydrogen peroxide falls apart into oxygen with
// a catalyst (iron, copper, manganese), when the mix gets hot by its own
// heat, and when concentrated peroxide is made strongly alkaline; clean,
// dilute, cool peroxide keeps (Bretherick's Handbook of Reactive Chemical
// Hazards, hydrogen peroxide; from memory). Bulk metal in neutral peroxide
// is attacked only at its surface while the peroxide decomposes on it
// (common practice, no source).
func TestPeroxideDecomposition(t *testing.T) {
	cases := []struct {
		req  string
		want mixOutcome
	}{
		// 50 % peroxide into 98 % sulfuric acid boils by the heat of dilution: the peroxide then decomposes.
		{"mix 10 L H2O2 50 % + 10 L H2SO4 98 %", mixOutcome{atLeast: map[string]float64{"O2(g)": 40}}},
		// Copper metal catalyses; 116 mol H2O2 gives up to 58 mol O2, and the bulk metal stays.
		{"mix 10 L H2O2 35 % + 1 kg Cu", mixOutcome{atLeast: map[string]float64{"O2(g)": 50, "Cu(s)": 15}, atMost: map[string]float64{"Cu(OH)2(s)": 0.1}}},
		{"mix 10 L H2O2 35 % + 1 kg Fe", mixOutcome{atLeast: map[string]float64{"O2(g)": 50, "Fe(s)": 17}}},
		{"mix 10 L H2O2 5 % + 1 kg Fe", mixOutcome{atLeast: map[string]float64{"O2(g)": 7, "Fe(s)": 17}, atMost: map[string]float64{"Fe(OH)2(s)|Fe(OH)3(s)": 0.1}}},
		// Sulfide oxidation heats the mix to about 90 °C; the excess peroxide
		// (about 130 of 232 mol), without a catalyst and with only about a
		// tenth of it as the anion (sulfide the only base), stays as
		// peroxide, as in a hot alkaline bleaching bath (common practice, no
		// source); the answer still judges the heat (near boiling).
		{"mix 100 L Na2S 2 % + 20 L H2O2 35 %", mixOutcome{atLeast: map[string]float64{"H2O2|HO2-": 120, "SO4^2-|HSO4-|NaSO4-": 24}, atMost: map[string]float64{"O2(g)": 0}}},
		// Concentrated peroxide in strong caustic: about 580 mol O2 from 1160 mol H2O2.
		{"mix 100 L H2O2 35 % + 100 L NaOH 50 %", mixOutcome{atLeast: map[string]float64{"O2(g)": 500}}},
		// Permanganate is reduced to manganese dioxide, which catalyses the rest.
		{"mix 10 L H2O2 3 % + 10 L KMnO4 0.2 M", mixOutcome{atLeast: map[string]float64{"MnO2(s)": 1.9}, atMost: map[string]float64{"H2O2|HO2-": 0.1, "Mn(OH)2(s)": 0.01}}},
		// Clean peroxide diluted with water keeps.
		{"mix 10 L H2O2 35 % + 90 L water", mixOutcome{atLeast: map[string]float64{"H2O2": 110}, atMost: map[string]float64{"O2(g)": 0}, held: []string{"peroxide-self-decomposition"}}},
		// Made barely alkaline (pH about 8.9: 0.0125 mol/L OH- against 5.8 mol/L
		// H2O2, pKa 11.6) it keeps; at pH 9.5 and more (0.05 mol/L OH-) the
		// peroxide anion catalyses the breakdown of concentrated peroxide
		// (Bretherick's Handbook, hydrogen peroxide with bases, from memory;
		// commercial peroxide is stabilised at pH 2–4: common practice).
		{"mix 10 L H2O2 35 % + 10 L NaOH 0.1 %", mixOutcome{atLeast: map[string]float64{"H2O2|HO2-": 110}, atMost: map[string]float64{"O2(g)": 0}}},
		{"mix 10 L H2O2 35 % + 10 L NaOH 0.4 %", mixOutcome{atLeast: map[string]float64{"O2(g)": 50}}},
	}
	for _, c := range cases {
		t.Run(c.req, func(t *testing.T) { checkOutcome(t, c.req, c.want) })
	}
}

// TestThiosulfateLocks: thiosulfate gives sulfur and bisulfite or sulfur
// dioxide in acid, as far as the acid goes, and tetrathionate only with an
// oxidizing agent; in neutral or alkaline solution neither it nor dithionite
// splits into sulfur and sulfate (Vogel's Textbook of Macro and Semimicro
// Qualitative Inorganic Analysis, thiosulfate; from memory).
// A large dose of hypochlorite into unbuffered thiosulfate makes the acid
// that then breaks down the thiosulfate left over.
func TestThiosulfateLocks(t *testing.T) {
	cases := []struct {
		req  string
		want mixOutcome
	}{
		{"mix 100 L sodium thiosulfate 10 % + 20 L HCl 10 %", mixOutcome{
			atLeast: map[string]float64{"S(s)": 10, "H2SO3|HSO3-|SO2(g)": 10},
			atMost:  map[string]float64{"S4O6^2-": 0.01, "SO4^2-|HSO4-|NaSO4-": 0.01}}},
		// Hypochlorite takes thiosulfate to sulfate with 2 H+ per
		// thiosulfate (4 OCl- + S2O3^2- + H2O → 2 SO4^2- + 4 Cl- + 2 H+):
		// 40 mol hypochlorite, 10 mol thiosulfate, 20 mol acid, which takes
		// the thiosulfate left over to sulfur and bisulfite or sulfur dioxide
		// as far as it goes (White's Handbook of Chlorination,
		// dechlorination; Vogel, thiosulfate with acid; from memory).
		{"mix 100 L Na2S2O3 10 % + 20 L NaOCl 12.5 %", mixOutcome{
			atLeast: map[string]float64{"SO4^2-|HSO4-|NaSO4-": 19, "S(s)": 5, "H2SO3|HSO3-|SO2(g)": 5},
			atMost:  map[string]float64{"S4O6^2-": 0.01, "S(s)": 10}}},
		// The same with caustic enough for the acid: no sulfur.
		{"mix 100 L Na2S2O3 10 %, NaOH 2 % + 20 L NaOCl 12.5 %", mixOutcome{
			atLeast: map[string]float64{"SO4^2-|HSO4-|NaSO4-": 19},
			atMost:  map[string]float64{"S(s)": 0.01, "S4O6^2-": 0.01}}},
		{"mix 100 L Na2S2O3 10 % + 1000 L NaOCl 200 ppm", mixOutcome{atMost: map[string]float64{"S(s)": 0.5, "OCl-|HOCl": 0.01}}},
		{"mix 100 L Na2S2O4 5 % + 10 L NaOCl 12.5 %", mixOutcome{atMost: map[string]float64{"S(s)": 0.01}}},
	}
	for _, c := range cases {
		t.Run(c.req, func(t *testing.T) { checkOutcome(t, c.req, c.want) })
	}
}

// TestNitrateLocks: dilute nitric acid does not oxidize peroxide; iron and
// aluminium are passivated by concentrated nitric acid; metals reduce
// nitric acid only while the acid lasts, to nitric oxide rather than
// nitrite (Vogel's Textbook of Macro and Semimicro Qualitative Inorganic
// Analysis, copper with nitric acid: 3 Cu + 8 H+ + 2 NO3- → 3 Cu2+ + 2 NO +
// 4 H2O; Greenwood & Earnshaw, passivation; from memory).
func TestNitrateLocks(t *testing.T) {
	cases := []struct {
		req  string
		want mixOutcome
	}{
		{"mix 1000 L HNO3 1 % + 10 L H2O2 35 %", mixOutcome{
			atLeast: map[string]float64{"H2O2": 110, "NO3-": 150},
			atMost:  map[string]float64{"NO(g)|NO|NO2(g)|HNO2": 0.01, "O2(g)": 0},
			held:    []string{"nitrate-needs-strong-reducer"}}},
		{"mix 1 kg Fe + 10 L HNO3 68 %", mixOutcome{atLeast: map[string]float64{"Fe(s)": 17.9}, atMost: map[string]float64{"NO(g)|NO2(g)|N2O4(g)": 0}, held: []string{"nitric-passivation-iron"}}},
		{"mix 1 kg Al + 10 L HNO3 68 %", mixOutcome{atLeast: map[string]float64{"Al(s)": 37}, atMost: map[string]float64{"NO(g)|NO2(g)|N2O4(g)": 0}, held: []string{"nitric-passivation-aluminium"}}},
		// 16.3 mol HNO3 dissolve about 6.1 mol Cu and give about 4.1 mol NO; no copper hydroxide with acid left.
		{"mix 1 kg Cu + 10 L HNO3 10 %", mixOutcome{
			atLeast: map[string]float64{"NO(g)": 3.8, "Cu^2+": 5.5},
			atMost:  map[string]float64{"NO(g)": 4.5, "Cu(OH)2(s)": 0.01}}},
		{"mix 1 kg Zn + 100 L HNO3 2 %", mixOutcome{atMost: map[string]float64{"NO2-|HNO2": 0.01}}},
		// A little nitric acid in concentrated hydrochloric acid still oxidizes chloride (aqua regia).
		{"mix 10 L HCl 37 % + 0.5 L HNO3 65 %", mixOutcome{atLeast: map[string]float64{"Cl2|Cl2(g)": 1e-6, "NO2|NO2(g)|N2O4(g)|NO(g)|NO": 1e-6}, notHeld: []string{"nitrate-needs-strong-reducer"}}},
		// Concentrated nitric acid still gives nitrogen dioxide with copper.
		{"mix 1 kg Cu + 10 L HNO3 68 %", mixOutcome{atLeast: map[string]float64{"NO2(g)|N2O4(g)": 15}}},
		// Copper in excess: 720 mol HNO3 at four per copper give about 180 mol Cu^2+ and 360 N as NO2/N2O4; copper(I) oxide (60 mol before) at most a trace.
		{"Cu + 50 L HNO3 65 %", mixOutcome{atLeast: map[string]float64{"Cu^2+": 170}, atMost: map[string]float64{"Cu2O(s)|CuO(s)|Cu(OH)2(s)": 1, "Cu^2+": 190}}},
	}
	for _, c := range cases {
		t.Run(c.req, func(t *testing.T) { checkOutcome(t, c.req, c.want) })
	}
}

// TestChlorateHeldBack: hypochlorite turns into chlorate over hours to days
// even when hot, so the answer for the mix as made keeps it and lists the
// change as held back (White's Handbook of Chlorination, hypochlorite
// stability; from memory).
func TestChlorateHeldBack(t *testing.T) {
	cases := []struct {
		req  string
		want mixOutcome
	}{
		{"mix 100 L NaOCl 12.5 % + 100 L water at 60 C", mixOutcome{atLeast: map[string]float64{"OCl-|HOCl": 190}, atMost: map[string]float64{"ClO3-|ClO2-": 0}, held: []string{"chlorate-formation"}}},
		{"mix 100 L NaOCl 12.5 % + 100 L water at 80 C", mixOutcome{atMost: map[string]float64{"ClO3-|ClO2-": 0}}},
	}
	for _, c := range cases {
		t.Run(c.req, func(t *testing.T) { checkOutcome(t, c.req, c.want) })
	}
}

// TestCyanideStopsAtCyanate: at pH 10 and above, hypochlorite and peroxide
// take cyanide to cyanate (alkaline chlorination, first stage) and no
// cyanogen chloride survives (it hydrolyses to cyanate above pH 10); common
// practice, no source; Vogel, cyanide reactions, from memory.
func TestCyanideStopsAtCyanate(t *testing.T) {
	cases := []struct {
		req  string
		want mixOutcome
	}{
		{"mix 1000 L NaCN 1 g/L, pH 11 + 50 L NaOCl 12.5 %", mixOutcome{phMin: 10, atLeast: map[string]float64{"OCN-": 19}, atMost: map[string]float64{"CNCl(g)|CNCl": 0, "N2(g)|N2": 0, "HCN|CN-": 0.1}}},
		{"mix 100 L NaCN 0.5 %, pH 12 + 10 L H2O2 35 %", mixOutcome{phMin: 9.5, atLeast: map[string]float64{"OCN-": 9.5}, atMost: map[string]float64{"HCN|CN-": 0.1}}},
		{"mix 100 L NaCN 0.5 %, pH 11 + 5 L H2O2 10 %", mixOutcome{phMin: 10, atLeast: map[string]float64{"OCN-": 9.5}, atMost: map[string]float64{"HCN|CN-": 0.1}}},
	}
	for _, c := range cases {
		t.Run(c.req, func(t *testing.T) { checkOutcome(t, c.req, c.want) })
	}
}

// TestHotMixStreamsStayCold: the temperature a mix reaches by its own heat
// undoes locks in the mix, never in a stream alone before it is poured.
func TestHotMixStreamsStayCold(t *testing.T) {
	r := ask(t, "mix 100 L Na2S 2 % + 20 L H2O2 35 %")
	for _, s := range r.Species {
		if s.Text == "O2(g)" && s.Mol > 0 {
			t.Errorf("the mix as combined already holds %.3g mol O2(g): the peroxide stream decomposed by itself", s.Mol)
		}
	}
}

// TestProductsAtFinalPH: products that cannot stand at the mix's pH or do
// not form in a tank: aluminate, not aluminium hydroxide, in strong caustic
// (Pourbaix, Atlas of Electrochemical Equilibria 1974, aluminium); tin(II),
// not cassiterite, from tin in hydrochloric acid (Vogel, tin); sulfur, not
// sulfate, from sulfide with iron(III) (Vogel, sulfides); all from memory.
func TestProductsAtFinalPH(t *testing.T) {
	cases := []struct {
		req  string
		want mixOutcome
	}{
		{"mix 1 kg Al + 20 L NaOH 20 %", mixOutcome{atLeast: map[string]float64{"Al(OH)4-": 36}, atMost: map[string]float64{"Al(OH)3(s)": 0.01}}},
		// 1 kg Sn is 8.4 mol: at most 8.4 mol H2. Hot: in cold dilute acid
		// tin dissolves only slowly and its hydrogen is held back (lock
		// hydrogen-slow-metals).
		{"mix 1 kg Sn + 20 L HCl 10 %, 70 C", mixOutcome{atLeast: map[string]float64{"Sn^2+|SnOH+": 8}, atMost: map[string]float64{"SnO2(s)": 0, "H2(g)": 8.6}}},
		{"mix 100 L Na2S 5 % + 100 L FeCl3 40 %", mixOutcome{atLeast: map[string]float64{"S(s)": 50}, atMost: map[string]float64{"SO4^2-|HSO4-|NaSO4-|H2SO3|HSO3-|S4O6^2-|S2O3^2-": 0.01}}},
		// A strong oxidizing agent still takes sulfide to sulfate.
		{"mix 100 L Na2S 2 % + 20 L H2O2 35 %", mixOutcome{atLeast: map[string]float64{"SO4^2-|HSO4-|NaSO4-": 20}}},
	}
	for _, c := range cases {
		t.Run(c.req, func(t *testing.T) { checkOutcome(t, c.req, c.want) })
	}
}

// TestThiosulfateWithHalogens: chlorine, bromine and hypochlorite take
// thiosulfate to sulfate (S2O3^2- + 4 Br2 + 5 H2O → 2 SO4^2- + 8 Br- +
// 10 H+), and the acid then breaks down the thiosulfate left over into
// sulfur and sulfur dioxide or bisulfite (S2O3^2- + 2 H+ → S + SO2 + H2O),
// so sulfur dioxide is given off; iodine, iron(III) and copper(II) stop at
// tetrathionate and make no acid (Vogel's Textbook of Quantitative Chemical
// Analysis, iodometry; White's Handbook of Chlorination, dechlorination
// with thiosulfate; both from memory). Hypochlorite dechlorinated with a
// small excess of thiosulfate in alkaline or bicarbonate-buffered water
// gives no sulfur dioxide.
func TestThiosulfateWithHalogens(t *testing.T) {
	cases := []struct {
		req   string
		want  mixOutcome
		so2   bool   // more than a millimole of sulfur dioxide is given off
		inEqn string // the headline equation holds this species
	}{
		// 19.5 mol Br2 take 4.9 mol thiosulfate to 9.8 mol sulfate and
		// 39 mol H+; most of the acid then takes excess thiosulfate to sulfur.
		{"mix 1 L bromine + 100 L Na2S2O3 10 %", mixOutcome{
			atLeast: map[string]float64{"SO4^2-|HSO4-|NaSO4-": 9.5, "S(s)": 15, "H2SO3|HSO3-|SO2(g)": 15},
			atMost:  map[string]float64{"S4O6^2-": 0.01}}, true, "SO4"},
		{"mix 10 L Cl2 0.5 % + 10 L Na2S2O3 10 %", mixOutcome{
			atLeast: map[string]float64{"S(s)": 0.3},
			atMost:  map[string]float64{"S4O6^2-": 0.01}}, true, "SO4"},
		{"mix 1 L iodine 0.05 M + 2 L Na2S2O3 0.1 M", mixOutcome{
			atLeast: map[string]float64{"S4O6^2-": 0.045},
			atMost:  map[string]float64{"SO4^2-|HSO4-|NaSO4-": 1e-4, "S(s)": 1e-4, "H2SO3|HSO3-|SO2(g)": 1e-4}}, false, "S4O6"},
		{"mix 10 L I2 1 %, KI 10 % + 10 L Na2S2O3 10 %", mixOutcome{
			atLeast: map[string]float64{"S4O6^2-": 0.03},
			atMost:  map[string]float64{"SO4^2-|HSO4-|NaSO4-": 1e-4, "H2SO3|HSO3-|SO2(g)": 1e-4}}, false, "S4O6"},
		{"mix 10 L FeCl3 10 % + 10 L Na2S2O3 10 %", mixOutcome{
			atLeast: map[string]float64{"S4O6^2-": 1},
			atMost:  map[string]float64{"SO4^2-|HSO4-|NaSO4-": 1e-3, "H2SO3|HSO3-|SO2(g)": 1e-3}}, false, "S4O6"},
		{"mix 1000 L NaOCl 50 ppm, NaHCO3 1 g/L + 1 L Na2S2O3 10 %", mixOutcome{
			atLeast: map[string]float64{"SO4^2-|HSO4-|NaSO4-": 0.3},
			atMost:  map[string]float64{"S(s)": 1e-4, "S4O6^2-": 1e-4, "OCl-|HOCl": 1e-4}}, false, "SO4"},
		{"mix 1000 L NaOCl 50 ppm, NaOH 0.01 % + 1 L Na2S2O3 10 %", mixOutcome{
			atLeast: map[string]float64{"SO4^2-|HSO4-|NaSO4-": 0.3},
			atMost:  map[string]float64{"S(s)": 1e-4, "S4O6^2-": 1e-4}}, false, "SO4"},
	}
	for _, c := range cases {
		t.Run(c.req, func(t *testing.T) {
			checkOutcome(t, c.req, c.want)
			r := ask(t, c.req)
			gas := false
			for _, g := range r.Gases {
				gas = gas || g.Text == "SO2(g)" && g.Mol > 1e-3
			}
			if gas != c.so2 {
				t.Errorf("sulfur dioxide given off %v, want %v (gases %+v)", gas, c.so2, r.Gases)
			}
			if r.Reaction == nil || !strings.Contains(r.Reaction.Text, c.inEqn) {
				t.Errorf("headline %v, want one with %s", r.Reaction, c.inEqn)
			}
		})
	}
}

// TestPermanganateStopsAtDioxide: permanganate in neutral or alkaline
// solution takes three electrons and stops at manganese dioxide; in clearly
// acid solution it goes on to manganese(II) (Vogel's Textbook of
// Quantitative Chemical Analysis, potassium permanganate, from memory).
// 100 L of 5 % KMnO4 holds about 32.7 mol (5.18 kg at 1.035 kg/L).
func TestPermanganateStopsAtDioxide(t *testing.T) {
	low := "Mn(OH)2(s)|Mn^2+|MnOH+|Mn(s)"
	cases := []struct {
		req  string
		want mixOutcome
	}{
		{"mix 100 L KMnO4 5 % + 10 L ethanol", mixOutcome{
			atLeast: map[string]float64{"MnO2(s)": 30},
			atMost:  map[string]float64{low: 0.01}}},
		{"mix 100 L KMnO4 5 % + 30 L isopropanol", mixOutcome{
			atLeast: map[string]float64{"MnO2(s)": 30},
			atMost:  map[string]float64{low: 0.01}}},
		{"mix 100 L KMnO4 5 % + 20 L sodium sulfite 10 %", mixOutcome{
			atMost: map[string]float64{low: 0.01}}},
		// Sulfuric acid: five electrons, manganese(II).
		{"mix 100 L KMnO4 5 % + 100 L H2SO4 20 % + 1 L ethanol", mixOutcome{
			atLeast: map[string]float64{"Mn^2+|MnSO4": 10}}},
	}
	for _, c := range cases {
		t.Run(c.req, func(t *testing.T) { checkOutcome(t, c.req, c.want) })
	}
}

// TestPermanganateInStrongAcid: in strong acid held in excess permanganate is
// reduced to manganese(II), chloride included (the laboratory preparation of
// chlorine: 2 MnO4- + 16 H+ + 10 Cl- → 2 Mn2+ + 5 Cl2 + 8 H2O), and no
// manganese dioxide stays (Vogel's Textbook of Quantitative Chemical
// Analysis, potassium permanganate, from memory); with the acid short, or in
// neutral and alkaline mixes, it stops at manganese dioxide. The thresholds
// of the lock (pH below 1 as combined, 10 H+ of free acid per MnO4-) are
// common practice, no source. 100 L of 5 % KMnO4 hold about 32.7 mol
// (1.035 kg/L); 50 L of 32 % HCl about 509 mol (1.16 kg/L), 15.6 per MnO4-;
// 50 L of 10 % HCl about 144 mol, 4.4 per MnO4- (short of the 8 the
// reduction to Mn2+ takes).
func TestPermanganateInStrongAcid(t *testing.T) {
	low := "Mn^2+|MnCl+|MnSO4|MnOH+"
	high := "MnO2(s)|Mn2O3(s)|Mn3O4(s)|MnOOH(s)"
	cases := []struct {
		req  string
		want mixOutcome
	}{
		// Chloride in excess strong acid: Mn2+ and 5/2 Cl2 per MnO4-,
		// 81.7 mol Cl2 in gas and liquid (hand: 32.7 × 2.5).
		{"mix 100 L KMnO4 5 % + 50 L HCl 32 %", mixOutcome{
			atLeast: map[string]float64{low: 32, "Cl2(g)|Cl2": 80},
			atMost:  map[string]float64{high: 0.01},
			held:    []string{"permanganate-acid-to-manganese-ii"}}},
		{"mix 100 L KMnO4 5 % + 200 L HCl 10 %", mixOutcome{
			atLeast: map[string]float64{low: 32, "Cl2(g)|Cl2": 80},
			atMost:  map[string]float64{high: 0.01}}},
		// Acid short of 8 H+ per MnO4-: the dioxide comes down.
		{"mix 100 L KMnO4 5 % + 50 L HCl 10 %", mixOutcome{
			atLeast: map[string]float64{"MnO2(s)": 20},
			notHeld: []string{"permanganate-acid-to-manganese-ii"}}},
		// Iron(II), peroxide and ethanol in sulfuric acid: manganese(II).
		{"mix 10 L KMnO4 2 % + 100 L FeSO4 10 % + 50 L H2SO4 20 %", mixOutcome{
			atLeast: map[string]float64{low: 1.2},
			atMost:  map[string]float64{high: 0.001}}},
		{"mix 10 L KMnO4 2 % + 20 L H2O2 3 % + 50 L H2SO4 20 %", mixOutcome{
			atLeast: map[string]float64{low: 1.2},
			atMost:  map[string]float64{high: 0.001}}},
		// Neutral and alkaline: the dioxide, the new lock not applied.
		{"mix 100 L KMnO4 2 % + 10 L C2H5OH 10 %", mixOutcome{
			atLeast: map[string]float64{"MnO2(s)": 10},
			notHeld: []string{"permanganate-acid-to-manganese-ii"}}},
		{"mix 100 L KMnO4 2 % + 10 L Na2SO3 10 % + 10 L NaOH 5 %", mixOutcome{
			atLeast: map[string]float64{"MnO2(s)": 5},
			atMost:  map[string]float64{low: 0.01}}},
		{"mix 10 L KMnO4 2 % + 20 L H2O2 3 %", mixOutcome{
			atLeast: map[string]float64{"MnO2(s)": 1}}},
	}
	for _, c := range cases {
		t.Run(c.req, func(t *testing.T) { checkOutcome(t, c.req, c.want) })
	}
}
