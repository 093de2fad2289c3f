package advice_test

import (
	"fmt"
	"strings"
	"testing"

	"mixward/engine/advice"
)

// TestDetailsAgreeWithShortOnFamilies: when the decision counts a reaction
// judged as a family (an oxidizer burning an alcohol, nitric acid with
// formic acid), the full answer leads its Heat line with the same figure as
// the short answer and its Verdict line names the family, instead of the
// mixed state's figure alone ("0.2 kJ taken up") and "no oxidizing and
// reducing agent pair present". Tried as a new user would: the details
// contradicted the short answer for chromic acid with ethanol, hypochlorite
// with methanol and nitric acid with formic acid.
func TestDetailsAgreeWithShortOnFamilies(t *testing.T) {
	a := mustAdvisor(t)
	for _, req := range []string{
		"mix 100 L NaOCl 12.5 % + 10 L isopropanol",
		"mix 100 L NaOCl 12.5 % + 10 L methanol",
		"mix 50 L HNO3 68 % + 5 L formic acid 85 %",
	} {
		r := ask(t, a, req)
		if r.Decision == nil || r.Decision.Heat == nil || len(r.Decision.Heat.Reactions) == 0 {
			t.Fatalf("%s: no family heat counted: %+v", req, r.Decision)
		}
		d := advice.RenderDetails(r)
		want := fmt.Sprintf("\nHeat: %.0f kJ released in all", r.Decision.Heat.ReleasedkJ)
		if !strings.Contains(d, want) {
			t.Errorf("%s: details lack %q:\n%s", req, want, d)
		}
		if strings.Contains(d, "\nHeat: none estimated") || strings.Contains(d, "Verdict: NO REACTION") || strings.Contains(d, "Verdict: NOT SPONTANEOUS") {
			t.Errorf("%s: details contradict the counted family:\n%s", req, d)
		}
		if !strings.Contains(d, "judged as a reaction family") {
			t.Errorf("%s: details do not name the family", req)
		}
	}
}

// TestDecisionGasesAgreeWithForms: a gas the mix's own heat drives off
// (bisulfite with hypochlorite warms to about 86 °C: SO2 121 mol against
// 5.65 mol held at 25 °C; Henry constant moved by van 't Hoff, Sander 2015)
// is counted in decision.gases with the hazard's figure, as the short
// answer's Forms line has it, and the full answer names it beside the 25 °C
// table. Tried as a new user would: the JSON decision said 5.65 mol.
func TestDecisionGasesAgreeWithForms(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 100 L NaHSO3 38 % + 100 L NaOCl 12.5 %")
	var so2 float64
	for _, g := range r.Decision.Gases {
		if g.Text == "SO2(g)" {
			so2 = g.Mol
			if g.Kind != "driven-off" {
				t.Errorf("SO2 kind %q, want driven-off", g.Kind)
			}
		}
	}
	if so2 < 80 {
		t.Errorf("decision SO2 %.1f mol, want the warmed figure (about 120)", so2)
	}
	if d := advice.RenderDetails(r); !strings.Contains(d, "counted by the decision: driven off") {
		t.Errorf("details do not name the driven-off figure")
	}
}
