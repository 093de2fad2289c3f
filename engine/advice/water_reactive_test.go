package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
	"mixward/engine/advice"
)

// TestWaterReactiveSolids: anhydrous aluminium and iron(III) chloride and
// liquid tin(IV) chloride give off most of their heat on meeting water
// (heats of solution −329 and −151 kJ/mol, CRC Handbook, Enthalpy of
// solution of electrolytes, from memory; SnCl4(l) −511.3 kJ/mol with Sn^4+ and
// Cl-, NBS Tables 1982, from memory). Tried as a new user would, 50 kg of
// aluminium chloride into 100 L of water read "no concern, 25.6 kJ taken up"
// (hand ≈ −123 MJ into ≈ 150 kg: boils, Bretherick's Handbook, aluminium
// chloride: water, from memory): a solid without a formation enthalpy lost
// its heat of dissolving, and an ionising liquid's ions were never looked up.
func TestWaterReactiveSolids(t *testing.T) {
	a := mustAdvisor(t)
	cases := []struct {
		req      string
		level    engine.Level
		minMJ    float64 // heat released at least
		boils    bool
		intoText string // the order of addition the actions must name
	}{
		{"mix 100 L water + 50 kg AlCl3", engine.DoNotMix, 110, true, ""},
		{"mix 1000 L water + 50 kg AlCl3", engine.WithPrecautions, 110, false, "AlCl3 into H2O"},
		{"mix 100 L water + 20 kg FeCl3", engine.WithPrecautions, 15, false, "FeCl3 into H2O"},
		{"mix 100 L water + 20 kg SnCl4", engine.WithPrecautions, 8, false, "SnCl4 into H2O"},
	}
	for _, c := range cases {
		r := ask(t, a, c.req)
		if r.Decision.Level != c.level {
			t.Errorf("%s: level %s (%s), want %s", c.req, r.Decision.Level, r.Decision.Title, c.level)
		}
		h := r.Heat
		if h == nil || h.HeatReleasedkJ == nil || *h.HeatReleasedkJ < c.minMJ*1000 {
			t.Errorf("%s: heat %+v, want at least %g MJ released", c.req, h, c.minMJ)
			continue
		}
		if h.Boils != c.boils {
			t.Errorf("%s: boils %v, want %v", c.req, h.Boils, c.boils)
		}
		if len(h.NotDissolvedCounted) > 0 {
			t.Errorf("%s: heat of dissolving left out for %v", c.req, h.NotDissolvedCounted)
		}
		if c.intoText != "" && !strings.Contains(strings.Join(r.Decision.Actions, " "), c.intoText) {
			t.Errorf("%s: actions %q, want them to name %q", c.req, r.Decision.Actions, c.intoText)
		}
	}
}

// TestHeatLineNamesUncountedDissolving: when a salt's heat of dissolving is
// not on record, the short answer says so beside the figure instead of
// presenting a part as the whole.
func TestHeatLineNamesUncountedDissolving(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 100 L water + 1 kg KHSO5")
	if r.Heat == nil || len(r.Heat.NotDissolvedCounted) != 1 || r.Heat.NotDissolvedCounted[0] != "KHSO5" {
		t.Fatalf("KHSO5 into water: not counted %v, want [KHSO5]", r.Heat)
	}
	if s := advice.RenderShort(r); !strings.Contains(s, "heat of dissolving KHSO5 not counted") {
		t.Errorf("short answer does not name the heat left out:\n%s", s)
	}
	r = ask(t, a, "mix 100 L water + 10 L ethanol")
	if r.Heat != nil && len(r.Heat.NotDissolvedCounted) > 0 {
		t.Errorf("ethanol into water: not counted %v; a molecular liquid's heat of mixing is left out by design", r.Heat.NotDissolvedCounted)
	}
}

// TestHydrateOfCommerce: plating shops make up nickel baths with the
// hexahydrates, which dissolve with about +5 kJ/mol (nickel sulfate) where
// the anhydrous salt gives off about 90 (NBS Tables 1982, from memory).
// Tried as a new user would, a Watts bath make-up named "nickel sulfate"
// read "do not mix: gets near boiling" because the name meant the anhydrous
// salt, unsaid. The trade name now reads as the hydrate sold and says so;
// the formula NiSO4 keeps the anhydrous salt and says which form it read.
func TestHydrateOfCommerce(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 100 L water + 25 kg nickel sulfate + 5 kg nickel chloride + 5 kg boric acid at 55 C")
	if r.Decision.Level != engine.NoConcern {
		t.Errorf("Watts make-up by trade names: %s (%s), want no-concern", r.Decision.Level, r.Decision.Title)
	}
	if s := advice.RenderShort(r); !strings.Contains(s, "nickel sulfate read as NiSO4.6H2O") {
		t.Errorf("short answer does not say the hydrate was read:\n%s", s)
	}
	r = ask(t, a, "mix 100 L water + 25 kg NiSO4 at 55 C")
	if r.Heat == nil || r.Heat.HeatReleasedkJ == nil || *r.Heat.HeatReleasedkJ < 12000 {
		t.Errorf("anhydrous NiSO4: heat %+v, want about 14.6 MJ released", r.Heat)
	}
	if s := advice.RenderShort(r); !strings.Contains(s, "NiSO4 read as the anhydrous form; if it is the hydrate, write NiSO4.6H2O") {
		t.Errorf("short answer does not say the anhydrous salt was read:\n%s", s)
	}
}

// TestSequenceStartsWithLiquid: a bath made up from dry salts and water is
// started with the water and the salts dissolved into it; among equally safe
// sequences the one starting with a liquid is named. Tried as a new user
// would: a zinc chloride bath make-up said "start with ZnCl2, then KCl, then
// H3BO3, then run in H2O" and in the next sentence "add ZnCl2 into H2O".
func TestSequenceStartsWithLiquid(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 10 kg zinc chloride + 25 kg potassium chloride + 3 kg boric acid + 100 L water")
	if !strings.HasPrefix(r.Addition.Advice, "In sequence: start with H2O,") {
		t.Errorf("advice %q, want the sequence to start with the water", r.Addition.Advice)
	}
}
