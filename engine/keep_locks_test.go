package engine_test

import (
	"testing"
)

// TestMetastableReagentsKept: plant reagents that are downhill on paper
// towards other products of their own elements stay as they are until a
// partner acts on them, and when one does, the products are the ones a
// chemist expects, not the next sink on the table (azide, hydrogen sulfide,
// methane, ferrate, nickel metal). Each case names its source; amounts follow
// from the request (hydrazine 35 % read at 1.00 g/mL, as the answer notes).
func TestMetastableReagentsKept(t *testing.T) {
	cases := []struct {
		name, req, source string
		want              mixOutcome
	}{
		{"hydrazine into water", "mix 100 L hydrazine 35 % + 100 L water",
			"Bretherick's Handbook of Reactive Chemical Hazards, hydrazine (solutions keep), from memory",
			mixOutcome{atLeast: map[string]float64{"N2H4|N2H5+": 1090},
				atMost: map[string]float64{"N3-|HN3": 1e-9, "NH3|NH4+|NH3(g)": 1e-6, "N2|N2(g)": 1e-6}}},
		{"hydrazine with hypochlorite (BC01)", "mix 100 L N2H4 35 % + 100 L NaOCl 12.5 %",
			"N2H4 + 2 OCl- → N2 + 2 Cl- + 2 H2O, hypochlorite limiting (198 mol): 99 mol N2; Bretherick, hydrazine: hypochlorites, from memory",
			mixOutcome{atLeast: map[string]float64{"N2|N2(g)": 95, "N2H4|N2H5+": 980},
				atMost: map[string]float64{"N2|N2(g)": 103, "N3-|HN3": 1e-9, "NH3|NH4+|NH3(g)": 1e-3}}},
		{"hydrazine with peroxide (BC02)", "mix 100 L hydrazine 35 % + 10 L H2O2 35 %",
			"N2H4 + 2 H2O2 → N2 + 4 H2O, peroxide limiting (116 mol): 58 mol N2; Bretherick, hydrazine: hydrogen peroxide, from memory",
			mixOutcome{atLeast: map[string]float64{"N2|N2(g)": 56},
				atMost: map[string]float64{"N2|N2(g)": 60, "N3-|HN3": 1e-9, "NH3|NH4+|NH3(g)": 1e-3, "O2|O2(g)": 1e-6}}},
		{"hydroxylamine into water (CB18)", "mix 100 L hydroxylamine 50 % + 100 L water",
			"Bretherick's Handbook of Reactive Chemical Hazards, hydroxylamine, from memory",
			mixOutcome{atLeast: map[string]float64{"NH2OH|NH3OH+": 1500},
				atMost: map[string]float64{"N3-|HN3": 1e-9, "NH3|NH4+|NH3(g)": 1e-6, "N2|N2(g)": 1e-6}}},
		{"thiocyanate into water", "mix 100 L NaSCN 10 % + 100 L water",
			"common practice, no source (thiocyanate solutions keep for years)",
			mixOutcome{atLeast: map[string]float64{"SCN-": 123},
				atMost: map[string]float64{"H2S|HS-|H2S(g)|S^2-": 1e-9, "NH4+|NH3": 1e-9}}},
		{"thiocyanate with hypochlorite (CB17)", "mix 100 L NaSCN 10 % + 100 L NaOCl 12.5 %",
			"Bretherick, thiocyanates: oxidants, from memory: hypochlorite takes thiocyanate to sulfate, never to hydrogen sulfide",
			mixOutcome{atMost: map[string]float64{"H2S|HS-|H2S(g)|S^2-": 1e-9, "S2^2-|S3^2-|S4^2-|S5^2-|S(s)": 1e-9}}},
		{"nitrite into water", "mix 100 L NaNO2 10 % + 100 L water",
			"Vogel's Textbook of Macro and Semimicro Qualitative Inorganic Analysis, nitrites (stable in neutral and alkaline solution), from memory",
			mixOutcome{atLeast: map[string]float64{"NO2-|HNO2": 144.5}, atMost: map[string]float64{"NO|NO(g)|NO3-": 1e-9}}},
		{"molybdate with nitrite (BC10)", "mix 100 L Na2MoO4 10 % + 100 L NaNO2 10 %",
			"common practice, no source (closed-loop nitrite–molybdate inhibitor blends)",
			mixOutcome{atLeast: map[string]float64{"NO2-|HNO2": 144.5, "MoO4^2-": 48}, atMost: map[string]float64{"NO|NO(g)|NO3-": 1e-9}}},
		{"nitrite into acid still gives nitric oxide (BC07)", "mix 100 L NaNO2 40 % + 100 L H2SO4 10 %",
			"Vogel, nitrous acid (3 HNO2 → 2 NO + HNO3 + H2O), from memory; acid-limited, as signed in the fourth review",
			mixOutcome{atLeast: map[string]float64{"NO|NO(g)": 200}}},
		{"sulfite into hot water (BC09)", "mix 100 L Na2SO3 10 % + 100 L water at 90 C",
			"common practice, no source (sulfite is dosed into deaerators at 100–110 °C)",
			mixOutcome{atLeast: map[string]float64{"SO3^2-|HSO3-": 79},
				atMost: map[string]float64{"S(s)|SO4^2-|S2O3^2-|HS-": 1e-9}, held: []string{"sulfite-keeps-hot"}}},
		{"electroless nickel bath pH adjustment, cold (MF23)", "mix 100 L NiSO4 0.1 M, NaH2PO2 0.3 M + 10 L NaOH 10 %",
			"common practice, no source (electroless nickel needs about 85–90 °C and a catalytic surface)",
			mixOutcome{atLeast: map[string]float64{"H2PO2-|H3PO2": 29.9}, atMost: map[string]float64{"Ni(s)": 1e-9},
				held: []string{"hypophosphite-cold"}}},
		{"electroless nickel bath, hot", "mix 100 L NiSO4 0.1 M, NaH2PO2 0.3 M at 90 C",
			"common practice, no source (a hot bath plates nickel; crashed, all of it, with hydrogen)",
			mixOutcome{atLeast: map[string]float64{"Ni(s)": 9.9}}},
		{"excess oxalic acid beside permanganate (CB21)", "mix 100 L oxalic acid 5 % + 100 L KMnO4 0.2 M, H2SO4 1 M",
			"Vogel, oxalates (permanganate titration), from memory: the excess oxalic acid stays",
			mixOutcome{atLeast: map[string]float64{"H2C2O4|HC2O4-|C2O4^2-": 5}, atMost: map[string]float64{"CH4|CH4(g)": 1e-12}}},
		{"bleach last into ferric and lime (WT14)", "mix 1000 L water + 50 L FeCl3 40 % + 30 kg Ca(OH)2 + 10 L NaOCl 12.5 %",
			"Pourbaix, Atlas of Electrochemical Equilibria (1974), iron; Greenwood & Earnshaw, iron(VI), from memory",
			mixOutcome{atLeast: map[string]float64{"OCl-|HOCl": 19, "Fe(OH)3(s)": 170}, atMost: map[string]float64{"FeO4^2-": 1e-12}}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			t.Logf("source: %s", c.source)
			checkOutcome(t, c.req, c.want)
		})
	}
}

// TestNoGasFromHeldBackChanges: a gas in the answer comes from the state
// that is counted. A change the answer lists as held back does not put its
// gas in the gas figures (the fourth review found nitric oxide at 505× its
// limit beside a nitrite disproportionation marked "held back").
func TestNoGasFromHeldBackChanges(t *testing.T) {
	for _, req := range []string{
		"mix 100 L Na2MoO4 10 % + 100 L NaNO2 10 %",
		"mix 100 L NaNO2 10 % + 100 L water",
		"mix 100 L hydrazine 35 % + 100 L water",
		"mix 100 L NaSCN 10 % + 100 L water",
		"mix 100 L Na2SO3 10 % + 100 L water at 90 C",
		"mix 100 L hydroxylamine 50 % + 100 L water",
	} {
		r := ask(t, req)
		for _, g := range r.Gases {
			if finalMol(r, g.Text) <= 0 {
				t.Errorf("%s: gas %s %.3g mol is not in the final composition", req, g.Text, g.Mol)
			}
			if g.Mol > 1e-6 {
				t.Errorf("%s: gives off %s %.3g mol; a stream poured into water gives off nothing", req, g.Text, g.Mol)
			}
		}
	}
}
