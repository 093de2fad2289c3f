package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
)

// TestReview22CopperEtch: a sulfuric–peroxide copper etch oxidizes the
// copper once and keeps the rest of its peroxide. Hand figures: 5 kg Cu is
// 78.7 mol (63.55 g/mol, IUPAC); 50 L of 35 % peroxide at 1.13 g/mL is
// about 580 mol, so copper is limiting. Cu + H2O2 + 2 H+ → Cu2+ + 2 H2O:
// with ΔfH° Cu2+ +64.8, H2O2(aq) −191.2, H2O(l) −285.83 kJ/mol (NBS
// Tables 1982, from memory), ΔH = 64.8 − 571.66 + 191.2 = −315.7 kJ/mol,
// × 78.7 mol = 24.8 MJ; over about 400 kg of liquid (342 kg of 20 % acid
// at 1.14 kg/L and 57 kg of peroxide) at 4.18 J/(g·K) about +15 °C from
// 45 °C: about 60 °C. Copper(II) in acid is a weak catalyst of peroxide breakdown: such
// etches run for hours at 30–50 °C (common practice, no source), so no
// oxygen at once and no boiling. In neutral water copper does break
// peroxide down at once (Bretherick's Handbook of Reactive Chemical
// Hazards, hydrogen peroxide with metals, from memory).
func TestReview22CopperEtch(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 300 L sulfuric acid 20 % + 50 L H2O2 35 % + 5 kg copper at 45 C")
	if r.Decision == nil || r.Decision.Level != engine.WithPrecautions {
		t.Fatalf("copper etch: decision %+v, want with-precautions", r.Decision)
	}
	if _, ok := hazardOf(r, "oxygen-release"); ok {
		t.Errorf("copper etch: oxygen released at once: %v", hazardCodes(r))
	}
	if _, ok := hazardOf(r, "peroxide-slow-oxygen"); !ok {
		t.Errorf("copper etch: no note of the slow oxygen of the peroxide left: %v", hazardCodes(r))
	}
	if r.Heat == nil || r.Heat.HeatReleasedkJ == nil || *r.Heat.HeatReleasedkJ < 22e3 || *r.Heat.HeatReleasedkJ > 29e3 {
		t.Errorf("copper etch: heat %+v, want about 25 MJ (hand 24.8 MJ plus dilution)", r.Heat)
	}
	if r.Oxidizer == nil || r.Oxidizer.Species != "H2O2" || r.Reducer == nil || r.Reducer.Species != "Cu(s)" {
		t.Errorf("copper etch: headline %+v / %+v, want H2O2 oxidizing Cu(s)", r.Oxidizer, r.Reducer)
	}
	// Controls: copper with neutral peroxide, and copper sulfate with
	// peroxide (pH about 4), still break the peroxide down at once.
	for _, req := range []string{"mix 50 L H2O2 35 % + 1 kg copper", "mix 100 L H2O2 10 % + 10 L copper sulfate 10 %"} {
		if _, ok := hazardOf(ask(t, a, req), "oxygen-release"); !ok {
			t.Errorf("%s: no oxygen-release, want the copper-catalysed breakdown", req)
		}
	}
}

// TestReview22Breakpoint: 100 L of 12 % bleach (about 190 mol NaOCl) with
// 5 L of 25 % ammonia (about 67 mol NH3) is 2.9 hypochlorite per ammonia,
// past breakpoint (1.5:1 molar, 7.6:1 Cl2:N by weight): the answer names
// nitrogen, dichloramine and nitrogen trichloride (White's Handbook of
// Chlorination, the breakpoint curve, from memory). Below 5:1 by weight it
// names none of them.
func TestReview22Breakpoint(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 100 L sodium hypochlorite 12 % + 5 L ammonia 25 % at headspace 1 m3")
	h, ok := hazardOf(r, "chloramine-release")
	if !ok {
		t.Fatalf("no chloramine-release among %v", hazardCodes(r))
	}
	for _, want := range []string{"past breakpoint", "nitrogen gas", "NHCl2", "NCl3"} {
		if !strings.Contains(h.Message, want) {
			t.Errorf("chloramine-release does not name %q: %s", want, h.Message)
		}
	}
	// 10 L bleach 12 % (about 19 mol) with 5 L ammonia 25 % (67 mol): far
	// below one hypochlorite per ammonia, monochloramine only.
	r = ask(t, a, "mix 10 L sodium hypochlorite 12 % + 5 L ammonia 25 %")
	if h, ok := hazardOf(r, "chloramine-release"); !ok || strings.Contains(h.Message, "breakpoint") || strings.Contains(h.Message, "NCl3") {
		t.Errorf("ammonia in excess: %v %s, want chloramines without breakpoint", ok, h.Message)
	}
}

// TestReview22NoActiveMetalOnPaper: sodium metal never forms in water
// (Pourbaix, Atlas of Electrochemical Equilibria, sodium, from memory), so
// acidified azide lists no held-back change that makes it.
func TestReview22NoActiveMetalOnPaper(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 1 L sodium azide 5 % + 5 L hydrochloric acid 10 %")
	for _, h := range r.HeldBack {
		if h.Reaction != nil {
			for _, p := range h.Reaction.Products {
				if p.Text == "Na(s)" || p.Text == "K(s)" {
					t.Errorf("held back %q makes %s", h.Reaction.Text, p.Text)
				}
			}
		}
	}
	if _, ok := hazardOf(r, "hn3-release"); !ok {
		t.Errorf("no hn3-release among %v", hazardCodes(r))
	}
}

// TestReview22Dichlor: sodium dichloroisocyanurate in hydrochloric acid
// gives chlorine from its hypochlorous acid, HOCl + H+ + Cl- → Cl2 + H2O;
// trichloroisocyanuric acid does not precipitate first (common practice,
// no source), and the cyanuric acid left is not an organic fuel (White's
// Handbook of Chlorination, chlorinated isocyanurates, from memory). 2 kg
// of NaC3Cl2N3O3 (219.95 g/mol) is 9.09 mol, 18.2 mol HOCl, 18.2 mol Cl2.
func TestReview22Dichlor(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 2 kg sodium dichloroisocyanurate + 10 L hydrochloric acid 31 %")
	if r.Oxidizer == nil || r.Oxidizer.Species != "HOCl" {
		t.Errorf("dichlor in HCl: oxidizer %+v, want HOCl", r.Oxidizer)
	}
	if r.Reaction != nil && strings.Contains(r.Reaction.Text, "C3Cl3N3O3") {
		t.Errorf("dichlor in HCl written for trichlor: %s", r.Reaction.Text)
	}
	if _, ok := hazardOf(r, "oxidizer-organic-fire"); ok {
		t.Errorf("cyanuric acid counted as organic fuel: %v", hazardCodes(r))
	}
	if _, ok := hazardOf(r, "chlorine-release"); !ok || r.Decision == nil || r.Decision.Level != engine.DoNotMix {
		t.Errorf("dichlor in HCl: %v, want chlorine-release, do not mix", hazardCodes(r))
	}
	// Trichlor brought as the solid stays the oxidizing agent.
	r = ask(t, a, "mix 2 kg trichlor + 10 L hydrochloric acid 31 %")
	if r.Oxidizer == nil || r.Oxidizer.Species != "C3Cl3N3O3(s)" {
		t.Errorf("trichlor in HCl: oxidizer %+v, want C3Cl3N3O3(s)", r.Oxidizer)
	}
}

// TestReview22Flammable: water solutions of alcohols stay flammable
// liquids: about 52 % isopropanol flashes near 22–25 °C, 20 % ethanol near
// 36 °C, neat methanol with a little caustic near 11–18 °C (published
// flash-point tables, from memory); 2.4 % ethanol (10 L in 400 L water) is
// not a flammable liquid. A note or a warning, never a refusal.
func TestReview22Flammable(t *testing.T) {
	a := mustAdvisor(t)
	for _, tc := range []struct {
		req  string
		want bool
	}{
		{"mix 300 L isopropanol 70 % + 100 L water", true},
		{"mix 100 L methanol + 20 L NaOH 50 %", true},
		{"mix 10 L KMnO4 3 % + 10 L ethanol at 40 C", true},
		{"mix 10 L ethanol + 40 L water", true},
		{"mix 10 L ethanol + 400 L water", false},
	} {
		r := ask(t, a, tc.req)
		h, ok := hazardOf(r, "flammable-liquid")
		if ok != tc.want {
			t.Errorf("%s: flammable-liquid %v, want %v (%v)", tc.req, ok, tc.want, hazardCodes(r))
			continue
		}
		if ok && !strings.Contains(h.Message, "flash point") {
			t.Errorf("%s: %s", tc.req, h.Message)
		}
		if ok && r.Decision != nil && r.Decision.Level == engine.DoNotMix && !strings.Contains(tc.req, "KMnO4") {
			t.Errorf("%s: refused for being flammable", tc.req)
		}
	}
}
