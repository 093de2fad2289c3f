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

// TestThiosulfateKillMadeAlkaline: a halogen killed with plain thiosulfate
// makes its own acid, which drives sulfur dioxide off the rest of the
// thiosulfate; kill liquors are made alkaline first with soda ash or
// bicarbonate (common practice, no source). The action says so; with soda
// ash in the liquor the kill is no longer refused for sulfur dioxide.
func TestThiosulfateKillMadeAlkaline(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 1 L bromine + 100 L Na2S2O3 10 %")
	h, ok := hazardOf(r, "so2-release")
	if !ok || !strings.Contains(h.Action, "Make the thiosulfate alkaline first") {
		t.Errorf("bromine kill: so2 hazard %+v, want the soda-ash action", h)
	}
	r = ask(t, a, "mix 1 L bromine + 100 L Na2S2O3 10 %, Na2CO3 5 %")
	if slices.Contains(hazardCodes(r), "so2-release") {
		t.Errorf("bromine kill with soda ash: codes %v", hazardCodes(r))
	}
	r = ask(t, a, "mix 200 L Na2S2O3 20 % + 20 L HCl 32 %")
	if h, ok := hazardOf(r, "so2-release"); !ok || strings.Contains(h.Action, "alkaline first") {
		t.Errorf("thiosulfate with acid: %+v; the acid stream is the cause, not the reaction", h)
	}
}

// TestCyanideOxidationNamesCyanogenChloride: alkaline chlorination of
// cyanide is safe only above about pH 10; below it hypochlorite stops at
// cyanogen chloride (White's Handbook of Chlorination, from memory). The
// warning says so with hypochlorite, and not with peroxide.
func TestCyanideOxidationNamesCyanogenChloride(t *testing.T) {
	a := mustAdvisor(t)
	h, ok := hazardOf(ask(t, a, "mix 100 L NaCN 5 % + 100 L NaOCl 12.5 %"), "cyanide-oxidation")
	if !ok || !strings.Contains(h.Message, "cyanogen chloride") {
		t.Errorf("cyanide with hypochlorite: %+v", h)
	}
	h, ok = hazardOf(ask(t, a, "mix 1000 L NaCN 1 g/L, NaOH 0.1 M + 10 L H2O2 35 %"), "cyanide-oxidation")
	if !ok || strings.Contains(h.Message, "cyanogen chloride") {
		t.Errorf("cyanide with peroxide: %+v", h)
	}
}
