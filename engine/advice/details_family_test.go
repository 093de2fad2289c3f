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
		"mix 50 L CrO3 30 % + 10 L ethanol",
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
