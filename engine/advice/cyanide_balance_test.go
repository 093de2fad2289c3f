package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
)

// judgedGas is the largest amount the hazards count of a gas: a gas
// hazard's figure or a count under "Forms".
func judgedGas(r *engine.Result, formula string) float64 {
	n := 0.0
	for _, h := range r.Hazards {
		if h.Gas != nil && h.Gas.Formula == formula && h.Gas.Mol > n {
			n = h.Gas.Mol
		}
		for _, c := range h.Counts {
			if c.Formula == formula && c.Mol > n {
				n = c.Mol
			}
		}
	}
	return n
}

// finalMol sums the mixed state's amounts of the listed species.
func finalMol(r *engine.Result, texts ...string) float64 {
	n := 0.0
	for _, a := range r.FinalComposition {
		for _, t := range texts {
			if a.Text == t {
				n += a.Mol
			}
		}
	}
	return n
}

// combinedMol sums the amounts of the listed species in the mix as
// combined, before any reaction.
func combinedMol(r *engine.Result, texts ...string) float64 {
	n := 0.0
	for _, s := range r.Species {
		for _, t := range texts {
			if s.Text == t {
				n += s.Mol
			}
		}
	}
	return n
}

// combinedCyanide is the cyanide carbon of the mix as combined, free or in
// metal complexes (Zn(CN)4^2- counts four).
func combinedCyanide(r *engine.Result) float64 {
	n := 0.0
	for _, s := range r.Species {
		a, err := engine.ParseFormula(s.Formula)
		if err == nil && a["C"] > 0 && a["N"] == a["C"] && a["O"] == 0 && a["S"] == 0 {
			n += s.Mol * float64(a["C"])
		}
	}
	return n
}

// co2Forms are the species of the mixed state that carbon dioxide's figure
// is made from.
var co2Forms = []string{"CO2(g)", "H2CO3", "HCO3-", "CO3^2-"}

// TestCyanideHypochloriteBalance: the hazards and the mixed state never
// spend the same hypochlorite or the same cyanide twice. In acid
// hypochlorous acid takes cyanide to cyanogen chloride and stops there;
// from about pH 7 the hypochlorite ion takes it on to cyanate (and below
// pH 10 on to carbon dioxide and nitrogen), through cyanogen chloride that
// escapes in part below pH 10 (White's Handbook of
// Chlorination, cyanide destruction; Vogel's Textbook, cyanides; from
// memory). Carbon:
// the gases the hazards count plus the carbon the state holds elsewhere
// never exceed the cyanide poured in. Chlorine: cyanogen chloride and
// chlorine counted beyond the state never exceed the hypochlorite the state
// leaves unspent.
func TestCyanideHypochloriteBalance(t *testing.T) {
	a := mustAdvisor(t)
	for _, tc := range []struct {
		name, req string
		cncl      bool // a cyanogen chloride hazard is expected
		acid      bool // the mix as combined is acid: the state itself stops at cyanogen chloride
		headline  bool // the headline is HOCl + HCN → CNCl (not chlorine from excess hypochlorite)
	}{
		{"T19 hydrochloric acid, bleach, cyanide", "mix 50 L HCl 32 % + 50 L NaOCl 12.5 % + 50 L NaCN 10 % + 500 L water", true, true, true},
		{"r10-S11 sulfuric acid, bleach, cyanide", "mix 50 L H2SO4 98 % + 10 L NaOCl 12.5 % + 10 L NaCN 30 % + 100 L water", true, true, true},
		{"cyanide short of hypochlorite in acid", "mix 100 L NaCN 5 % + 20 L NaOCl 12.5 % + 50 L HCl 10 %", true, true, true},
		{"hypochlorite in excess in acid", "mix 20 L NaCN 5 % + 100 L NaOCl 12.5 % + 50 L HCl 32 %", true, true, false},
		{"cyanide liquor held at pH 8", "mix 100 L NaCN 1 %, pH 8 + 10 L NaOCl 12.5 %", true, false, false},
		{"alkaline cyanide destruction", "mix 1000 L NaCN 1 g/L, NaOH 0.1 M + 50 L NaOCl 12.5 %", false, false, false},
		{"zinc cyanide plating rinse with bleach", "mix 100 L Zn(CN)2 0.3 M, NaCN 0.5 M + 100 L NaOCl 12.5 %", true, false, false},
		{"alkaline, hypochlorite in excess", "mix 100 L NaCN 5 % + 200 L NaOCl 12.5 %", false, false, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r := ask(t, a, tc.req)
			if _, ok := hazardOf(r, "cyanogen-chloride-release"); ok != tc.cncl {
				t.Errorf("cyanogen chloride hazard %v, want %v", ok, tc.cncl)
			}
			cyanide := combinedCyanide(r)
			if !(cyanide > 0) {
				t.Fatalf("no cyanide in the mix as combined")
			}
			// Carbon: cyanogen chloride is the forerunner of the cyanate,
			// carbon dioxide and nitrogen the state forms (CN- → CNCl →
			// OCN- → CO2 + N2, one path): the hazards' figure may stand
			// for that part of the cyanide, not add to it.
			cyanate := finalMol(r, "OCN-", "HOCN") - combinedMol(r, "OCN-", "HOCN")
			co2 := finalMol(r, co2Forms...) - combinedMol(r, co2Forms...)
			path := finalMol(r, "CNCl(g)") + cyanate + co2
			carbon := max(judgedGas(r, "CNCl"), path) + max(0, judgedGas(r, "CO2")-finalMol(r, co2Forms...)) +
				max(judgedGas(r, "HCN"), finalMol(r, "HCN", "HCN(g)", "CN-"))
			if carbon > cyanide*(1+1e-3) {
				t.Errorf("carbon counted %.4g mol from %.4g mol cyanide: spent twice", carbon, cyanide)
			}
			// Chlorine: what the hazards count beyond the state's own path
			// comes out of the hypochlorite the state leaves.
			left := finalMol(r, "HOCl", "OCl-") + 2*finalMol(r, "Cl2", "Cl2(g)")
			beyond := max(0, judgedGas(r, "CNCl")-path) +
				max(0, judgedGas(r, "Cl2")-finalMol(r, "Cl2", "Cl2(g)"))
			// (amounts are rounded to a few digits in the answer)
			if beyond > left*(1+1e-3)+1e-5*combinedMol(r, "HOCl", "OCl-") {
				t.Errorf("hazards count %.4g mol of hypochlorite beyond the state, which leaves %.4g: spent twice", beyond, left)
			}
			if !tc.acid {
				if cyanate+co2 < 0.5*cyanide && finalMol(r, "OCl-", "HOCl") > 0 {
					t.Errorf("pH 7 or more: cyanate and carbon dioxide %.4g mol from %.4g cyanide, want the cyanide oxidized", cyanate+co2, cyanide)
				}
				return
			}
			if co2 > 1e-6*cyanide {
				t.Errorf("acid: %.4g mol carbon dioxide from cyanide, want none (cyanogen chloride stops there)", co2)
			}
			if n2 := finalMol(r, "N2", "N2(g)"); n2 > 1e-6*cyanide {
				t.Errorf("acid: %.4g mol nitrogen from cyanide, want none", n2)
			}
			// The headline is the change the state runs, written out.
			if tc.headline && (r.Reaction == nil || !strings.Contains(r.Reaction.Text, "CNCl")) {
				t.Errorf("headline %v, want hypochlorous acid taking cyanide to cyanogen chloride", r.Reaction)
			}
		})
	}
}
