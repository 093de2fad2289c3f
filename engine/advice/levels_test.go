package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
	"mixward/engine/advice"
)

// TestOneRulePerHazard: a hazard gets the same decision level whichever
// chemicals give it, from its numbers.
func TestOneRulePerHazard(t *testing.T) {
	a := mustAdvisor(t)
	cases := []struct {
		name, req string
		level     engine.Level
		code      string // a hazard the answer must carry ("" for none)
		short     string // text the short answer must hold ("" for none)
		source    string
	}{
		// OCl- + H2O2 → Cl- + H2O + O2: 12.5 % bleach (1.98 mol/L at 1.18 g/mL) with 35 % peroxide
		// gives about 198 mol O2 in 200 L, 0.99 mol/L, above hazard.SurgeMolPerL (0.5).
		{"hypochlorite with peroxide", "mix 100 L NaOCl 12.5 % + 100 L H2O2 35 %", engine.DoNotMix, "oxygen-surge", "Do not mix in one go",
			"Bretherick's Handbook, hydrogen peroxide with sodium hypochlorite; 0.5 mol O2 per litre: common practice, no source"},
		// The same surge from 15 % peracetic acid with the same bleach: judged alike.
		{"hypochlorite with peracid", "mix 100 L peracetic acid 15 % + 100 L NaOCl 12.5 %", engine.DoNotMix, "oxygen-surge", "Do not mix in one go",
			"Bretherick's Handbook, peroxyacetic acid"},
		// 3 % peroxide, 10 L into 100 L of 1 % bleach: about 8.8 mol O2 in 110 L, 0.08 mol/L: a precaution.
		{"dilute peroxide into dilute bleach", "mix 100 L NaOCl 1 % + 10 L H2O2 3 %", engine.WithPrecautions, "oxygen-release", "",
			"Bretherick's Handbook; OSHA 29 CFR 1910.146, 23.5 % O2"},
		// Peracetic acid in alkali (pKa 8.2) destroys itself with oxygen and heat. The 1 % product (the 5 %
		// grade diluted, data/products.txt) carries 2 % acetic acid, which 2 % caustic outweighs: pH about 10.
		{"peracid into caustic", "mix 100 L peracetic acid 1 % + 100 L NaOH 2 %", engine.WithPrecautions, "oxygen-surge", "rinse with water between caustic and peracid steps",
			"Bretherick's Handbook, peroxyacids; pKa 8.2, suppliers' data (from memory)"},
		{"peroxide with acetic acid", "mix 100 L H2O2 35 % + 100 L acetic acid 80 %", engine.WithPrecautions, "peracid-forming", "vented containers",
			"Bretherick's Handbook, hydrogen peroxide with acetic acid (from memory)"},
		// Bleach at 60 °C: the chlorate/time note must reach the short answer.
		{"bleach diluted hot", "mix 100 L NaOCl 12.5 % + 100 L water at 60 C", engine.WithPrecautions, "warm-bleach", "keep bleach stock below about 30 °C",
			"White's Handbook of Chlorination, hypochlorite stability (from memory)"},
		{"bleach diluted cold", "mix 100 L NaOCl 12.5 % + 100 L water", engine.NoConcern, "", "",
			"White's Handbook of Chlorination, hypochlorite stability (from memory)"},
		// Dechlorination of 200 mg/L hypochlorite (2.7 mmol/L) with thiosulfate: no acid stream.
		{"dechlorination", "mix 100 L Na2S2O3 10 % + 1000 L NaOCl 200 ppm", engine.NoConcern, "", "",
			"White's Handbook of Chlorination, dechlorination (from memory); Cl2 hydrolysis constant, Connick and Chia 1959"},
		// The same dilute hypochlorite with a strong acid still releases chlorine, in numbers.
		{"dilute hypochlorite with acid", "mix 1000 L NaOCl 200 ppm + 1 L HCl 30 %", engine.DoNotMix, "chlorine-release", "",
			"NIOSH IDLH chlorine 10 ppm; Sander 2015"},
		{"chlorate with sulfite", "mix 100 L NaClO3 40 % + 100 L Na2SO3 10 %", engine.NoConcern, "chlorate-reducer-acid", "Never acidify",
			"common practice, no source; Vogel, chlorates"},
		{"chromate with sulfite at pH 10", "mix 100 L Na2Cr2O7 0.1 M, pH 9 + 100 L Na2SO3 10 %", engine.WithPrecautions, "chromium-vi-not-reduced", "Reduce at pH 2–3 under ORP control",
			"common practice, no source; Pourbaix Atlas, chromium"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			r := ask(t, a, tc.req)
			if r.Decision == nil || r.Decision.Level != tc.level {
				t.Fatalf("%s: decision %+v, want %s (source: %s)", tc.req, r.Decision, tc.level, tc.source)
			}
			if tc.code != "" {
				if _, ok := hazardOf(r, tc.code); !ok {
					t.Errorf("%s: no %s among %v", tc.req, tc.code, codesOf(r))
				}
			}
			if sh := advice.RenderShort(r); tc.short != "" && !strings.Contains(sh, tc.short) {
				t.Errorf("%s: short answer lacks %q:\n%s", tc.req, tc.short, sh)
			}
		})
	}
}

// TestSequenceNeutralisesFirst: with bleach, caustic and acid, the acid and
// the caustic meet first and the bleach goes in last; acid is never run into
// a tank holding hypochlorite, and the advice does not also say that no
// order is safe (common practice, no source: never add acid to a tank
// containing hypochlorite; White's Handbook of Chlorination, from memory).
func TestSequenceNeutralisesFirst(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 100 L NaOCl 12.5 % + 100 L NaOH 10 % + 50 L HCl 10 %")
	add := r.Addition
	if add == nil || len(add.Sequences) == 0 {
		t.Fatal("no sequences")
	}
	best := add.Sequences[0]
	if best.Streams[len(best.Streams)-1] != "NaOCl 12.5 %" {
		t.Errorf("best sequence %v does not end with the bleach", best.Streams)
	}
	for _, s := range add.Sequences {
		if s.Streams[2] == "HCl 10 %" && s.Worst != engine.Danger {
			t.Errorf("sequence %v runs the acid last, into bleach, and meets %q; want danger", s.Streams, s.Worst)
		}
	}
	if strings.Contains(add.Advice, "Neither order is safe") || !strings.Contains(add.Advice, "then add NaOCl 12.5 %") {
		t.Errorf("advice %q", add.Advice)
	}
	if r.Decision.Level != engine.WithPrecautions {
		t.Errorf("level %s, want with-precautions", r.Decision.Level)
	}
}
