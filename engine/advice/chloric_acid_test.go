package advice_test

import (
	"slices"
	"strings"
	"testing"
)

// TestChloricAcid: chlorate in strong acid without chloride is chloric
// acid, a strong oxidizer that gives chlorine dioxide when warm and fires
// organic matter (Bretherick's Handbook of Reactive Chemical Hazards,
// chloric acid, from memory). Tried as a new user would: 40 % chlorate
// with 68 % nitric acid read only "warms noticeably". Dilute nitric acid,
// dilute bromic acid and chlorate with hydrochloric acid (its own chlorine
// rule) do not raise it.
func TestChloricAcid(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 50 L NaClO3 40 % + 50 L HNO3 68 %")
	if !slices.Contains(hazardCodes(r), "chloric-acid") || !strings.Contains(r.Decision.Title, "chloric acid") {
		t.Errorf("chlorate in 68 %% nitric acid: %s, codes %v", r.Decision.Title, hazardCodes(r))
	}
	for _, req := range []string{
		"mix 50 L NaClO3 40 % + 500 L HNO3 5 %",
		"mix 10 kg NaBrO3 + 50 L H2SO4 20 %",
		"mix 100 L NaClO3 40 % + 20 L HCl 32 %",
	} {
		if r := ask(t, a, req); slices.Contains(hazardCodes(r), "chloric-acid") {
			t.Errorf("%s: chloric-acid raised", req)
		}
	}
}
