package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
)

// TestOrganicAzideChlorinatorFamilies: each family fires on the pour a
// plant chemist's review found unsafe (tried as a new user would) and stays
// silent on a routine neighbour, with the source of the rule beside it.
func TestOrganicAzideChlorinatorFamilies(t *testing.T) {
	a := mustAdvisor(t)
	for _, tc := range []struct {
		name, req, code string
		sev             engine.Severity
		quiet           string // a routine neighbour that must not raise code
		source          string // a phrase of the hazard's source
	}{
		// Bretherick's Handbook, hydrogen peroxide with ketones (from memory).
		{"ketone peroxide", "mix 100 L acetone + 100 L H2O2 35 % + 1 L H2SO4 98 %", "organic-peroxides", engine.Danger,
			"mix 1000 L water + 1 L acetone + 1 L H2O2 35 %", "Bretherick"},
		// Vogel, carbon monoxide from formic acid and sulfuric acid; NIOSH IDLH 1200 ppm.
		{"carbon monoxide", "mix 100 L HCOOH 85 % + 100 L H2SO4 98 %", "co-release", engine.Danger,
			"mix 100 L HCOOH 10 % + 10 L H2SO4 10 %", "carbon monoxide, IDLH 1200 ppm"},
		// Bretherick's Handbook, perchloric acid with alcohols (from memory).
		{"perchlorate esters", "mix 10 L HClO4 70 % + 10 L ethanol", "perchlorate-esters", engine.Danger,
			"mix 100 L HClO4 0.5 M + 1 L ethanol", "perchloric acid with alcohols"},
		// Bretherick's Handbook, potassium permanganate with glycerol (from memory).
		{"permanganate on glycerol", "mix 1 kg KMnO4 + 1 L glycerol", "oxidizer-organic-fire", engine.Danger,
			"mix 1000 L water + 1 kg KMnO4", "potassium permanganate with glycerol"},
		// Bretherick's Handbook, calcium hypochlorite with alcohols (from memory).
		{"cal hypo on isopropanol", "mix 100 L isopropanol + 10 kg Ca(OCl)2", "oxidizer-organic-fire", engine.Danger,
			"mix 1000 L water + 10 L ethanol + 1 L NaOCl 12.5 %", "calcium hypochlorite with alcohols"},
		// NIOSH Pocket Guide and OSHA 29 CFR 1910.1008, bis(chloromethyl) ether.
		{"bis(chloromethyl) ether", "mix 100 L HCHO 37 % + 100 L HCl 36 %", "bis-chloromethyl-ether", engine.Danger,
			"mix 1000 L HCl 1 % + 1 L HCHO 37 %", "1910.1008"},
		// Bretherick's Handbook, formaldehyde with alkalis (from memory).
		{"Cannizzaro", "mix 100 L HCHO 37 % + 100 L NaOH 50 %", "formaldehyde-caustic-heat", engine.Danger,
			"mix 1000 L NaOH 2 % + 1 L HCHO 37 %", "formaldehyde with alkalis"},
		// Bretherick's Handbook, formaldehyde with ammonia; Vogel, hexamine (from memory).
		{"hexamine", "mix 100 L HCHO 37 % + 100 L ammonia 25 %", "formaldehyde-ammonia-heat", engine.Danger,
			"mix 1000 L water + 1 L HCHO 37 % + 1 L ammonia 25 %", "hexamine"},
		// Bretherick's Handbook, sodium hypochlorite with formaldehyde (from memory).
		{"formaldehyde with bleach", "mix 100 L HCHO 37 % + 100 L NaOCl 12.5 %", "formaldehyde-oxidation", engine.Danger,
			"mix 1000 L water + 1 L HCHO 37 % + 1 L NaOCl 12.5 %", "sodium hypochlorite with formaldehyde"},
		// Bretherick's Handbook, sodium hypochlorite with acetone; Vogel, haloform reaction (from memory).
		{"haloform", "mix 100 L acetone + 100 L NaOCl 12.5 %", "chloroform-formation", engine.Danger,
			"mix 1000 L water + 1 L acetone + 1 L NaOCl 12.5 %", "haloform"},
		// NIOSH Pocket Guide, sodium azide: REL ceiling 0.1 ppm as HN3 (from memory).
		{"hydrazoic acid", "mix 1 kg NaN3 + 100 L HCl 10 %", "hn3-release", engine.Danger,
			"mix 100 L NaN3 0.1 % + 100 L NaOH 1 %", "REL ceiling 0.1 ppm"},
		// Bretherick's Handbook, sodium azide with heavy metals (from memory).
		{"copper azide", "mix 1 kg NaN3 + 100 L CuSO4 0.5 M", "heavy-metal-azide", engine.Danger,
			"mix 100 L NaN3 0.1 % + 100 L NaCl 1 %", "sodium azide with heavy metals"},
		// Bretherick's Handbook, calcium hypochlorite with trichloroisocyanuric acid (from memory).
		{"two chlorinators", "mix 10 kg TCCA + 10 kg Ca(OCl)2", "mixed-chlorinators", engine.Danger,
			"mix 100 L water + 10 kg Ca(OCl)2", "trichloroisocyanuric acid"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r := ask(t, a, tc.req)
			h, ok := hazardOf(r, tc.code)
			if !ok {
				t.Fatalf("%q: no %s among %v", tc.req, tc.code, codesOf(r))
			}
			if h.Severity != tc.sev {
				t.Errorf("%q: %s is %s, want %s", tc.req, tc.code, h.Severity, tc.sev)
			}
			if !strings.Contains(h.Source, tc.source) {
				t.Errorf("%q: source %q does not name %q", tc.req, h.Source, tc.source)
			}
			if r.Decision.Level != engine.DoNotMix {
				t.Errorf("%q: decision %s, want do-not-mix", tc.req, r.Decision.Level)
			}
			if strings.Contains(r.Addition.Advice, "nothing of concern appears along that sequence") || strings.Contains(r.Addition.Advice, "either way") {
				t.Errorf("%q: pour advice %q", tc.req, r.Addition.Advice)
			}
			q := ask(t, a, tc.quiet)
			if _, ok := hazardOf(q, tc.code); ok {
				t.Errorf("routine %q raised %s", tc.quiet, tc.code)
			}
		})
	}
}

// TestChlorinatorDissolved: a chlorinating product dissolved in water is
// the ordinary stabilised-chlorine equilibrium (its own cyanuric acid or
// dimethylhydantoin meeting its own hypochlorous acid), not N-chloro
// compounds: with precautions (solid into plenty of water), with the part
// that stays undissolved named (TCCA about 12 g/L, BCDMH about 1.5 g/L,
// from memory). White's Handbook of Chlorination (from memory).
func TestChlorinatorDissolved(t *testing.T) {
	a := mustAdvisor(t)
	for _, tc := range []struct{ req, kg string }{
		{"mix 10 kg TCCA + 100 L water", "1.2 kg"},
		{"mix 10 kg BCDMH + 100 L water", "0.15 kg"},
	} {
		r := ask(t, a, tc.req)
		if r.Decision.Level != engine.WithPrecautions {
			t.Errorf("%q: decision %s, want with-precautions", tc.req, r.Decision.Level)
		}
		if _, ok := hazardOf(r, "n-chloro-compounds"); ok {
			t.Errorf("%q: n-chloro-compounds on the product's own hydrolysis", tc.req)
		}
		h, ok := hazardOf(r, "solid-oxidizer-heating")
		if !ok || !strings.Contains(h.Message, "Only about "+tc.kg) || !strings.Contains(h.Action, "feeder") {
			t.Errorf("%q: solid hazard %+v lacks the undissolved share %s or the feeder", tc.req, h, tc.kg)
		}
		if strings.Contains(r.Addition.Advice, "either way") {
			t.Errorf("%q: pour advice %q", tc.req, r.Addition.Advice)
		}
	}
	// Bleach stabilised with cyanuric acid is routine: no N-chloro hazard.
	if r := ask(t, a, "mix 1000 L water + 1 kg cyanuric acid + 10 L NaOCl 12.5 %"); func() bool { _, ok := hazardOf(r, "n-chloro-compounds"); return ok }() {
		t.Error("stabilised bleach raised n-chloro-compounds")
	}
}
