package advice_test

import (
	"fmt"
	"slices"
	"strings"
	"testing"

	"mixward/engine"
	"mixward/engine/advice"
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

// TestAcidChloriteCountsItsChlorineDioxide: chlorite with hydrochloric
// acid is the acid–chlorite generator (5 ClO2- + 4 H+ → 4 ClO2 + Cl- +
// 2 H2O; White's Handbook of Chlorination, chlorine dioxide, from memory).
// With chlorite in excess it runs until the acid is spent, so at the end
// its E cell is near zero: the change is judged by the medium it starts in
// and counts as proceeding, not as a pair within the table's uncertainty.
// Most of the chlorine dioxide stays dissolved in the saturated liquid
// (Henry constant about 1 mol/(L·bar), Sander 2015): the answer names it.
func TestAcidChloriteCountsItsChlorineDioxide(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 200 L sodium chlorite 25 % + 50 L hydrochloric acid 15 %")
	if r.ECell == nil || *r.ECell < 0.05 || r.Reaction == nil || !strings.Contains(r.Reaction.Text, "ClO2-") {
		t.Fatalf("headline %v, E cell %v: want the chlorite reaction counted as proceeding", r.Reaction, r.ECell)
	}
	h, ok := hazardOf(r, "clo2-release")
	if !ok || h.Gas == nil {
		t.Fatalf("no chlorine dioxide hazard: %v", hazardCodes(r))
	}
	// About 220 mol HCl (50 L of 15 % at 1.07 kg/L) makes at most 220 mol
	// ClO2 by the equation; given off and dissolved together come near it.
	if tot := h.Gas.Mol + h.Gas.DissolvedMol; tot < 150 || tot > 225 {
		t.Errorf("ClO2 given off %g + dissolved %g mol, want about 150–220 together", h.Gas.Mol, h.Gas.DissolvedMol)
	}
	if !strings.Contains(h.Message, "stays dissolved") { // saturated or nearly so
		t.Errorf("message does not name the dissolved chlorine dioxide: %s", h.Message)
	}
}

// TestHeatWithAGibbsStandIn: permanganate oxidizing glycerol makes
// glycolate, which has ΔfG° but no ΔfH° on record; the heat is counted
// with glycolate at its ΔfG° and said so, not dropped (which read "no
// concern" beside a reaction at +1.6 V). Hand check: about −450 kJ per mol
// MnO4- reduced to MnO2 oxidizing an alcohol (NBS Tables 1982 ΔfH°, from
// memory): 39 mol MnO4- in 200 L of 3 % → about 17.5 MJ.
func TestHeatWithAGibbsStandIn(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 200 L KMnO4 3 % + 50 L glycerol")
	h := r.Heat
	if h == nil || h.HeatReleasedkJ == nil || len(h.GibbsStandIn) == 0 {
		t.Fatalf("heat %+v: want a figure with a ΔfG° stand-in", h)
	}
	if q := *h.HeatReleasedkJ; q < 12000 || q > 22000 {
		t.Errorf("heat %g kJ, want about 17500", q)
	}
	if r.Decision.Level == engine.NoConcern {
		t.Errorf("decision no-concern beside a reaction that warms the mix by 14 K")
	}
}

// TestAlumIsTheHydrate: the water-treatment trade's solid aluminium
// sulfate ("alum", 17 % Al2O3) is the nominal 14-hydrate (common practice,
// no source), which dissolves with far less heat than the anhydrous salt
// (18-hydrate −56 kJ/mol, anhydrous −350 kJ/mol from NBS 1982 ΔfH°, from
// memory). Tried as a new user would: 50 kg of alum in 1000 L read as the
// anhydrous salt, 49.6 MJ, "never water into it". The anhydrous form is
// still there by name.
func TestAlumIsTheHydrate(t *testing.T) {
	a := mustAdvisor(t)
	for _, req := range []string{"mix 1000 L water + 50 kg alum", "mix 1000 L water pH 6.5 + 50 kg aluminium sulfate"} {
		r := ask(t, a, req)
		if r.Heat == nil || r.Heat.HeatReleasedkJ == nil || *r.Heat.HeatReleasedkJ > 15000 || r.Decision.Level != engine.NoConcern {
			t.Errorf("%s: heat %+v, %s; want the 14-hydrate's 10 MJ or so, no concern", req, r.Heat, r.Decision.Level)
		}
	}
	r := ask(t, a, "mix 1000 L water + 50 kg anhydrous aluminium sulfate")
	if r.Heat == nil || r.Heat.HeatReleasedkJ == nil || *r.Heat.HeatReleasedkJ < 40000 {
		t.Errorf("anhydrous: heat %+v, want about 50 MJ", r.Heat)
	}
}

// TestStrongEDTAIsTheSodiumSalt: EDTA dissolves only about 0.5 g/L as the
// free acid (CRC Handbook, from memory); a "40 % EDTA" product is the
// tetrasodium salt (common practice, no source). Tried as a new user
// would: read as 40 % of the free acid, it "warmed noticeably" with
// caustic. A strength the acid can reach stays the acid.
func TestStrongEDTAIsTheSodiumSalt(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 300 L EDTA 40 % + 300 L NaOH 10 %")
	if r.Decision.Level != engine.NoConcern || !strings.Contains(strings.Join(r.Notes, " "), "read as Na4C10H12N2O8 40 %") {
		t.Errorf("EDTA 40 %%: %s, notes %q", r.Decision.Level, r.Notes)
	}
	r = ask(t, a, "mix 1000 L water + 1000 L EDTA 0.2 g/L")
	if strings.Contains(strings.Join(r.Notes, " "), "cannot be the free acid") {
		t.Errorf("EDTA 0.2 g/L read as the salt: %q", r.Notes)
	}
}

// TestChromiumUnderdosed: a chromium(VI) reduction that runs out of
// reducing agent leaves chromium(VI) that must not go on as treated
// (common practice, no source): 400 L of 5 % dichromate (68 mol, 408 mol
// of electrons) with 100 L of 20 % FeSO4 (about 160 mol Fe2+) leaves about
// 85 mol Cr as Cr(VI). The action says so, once; a full dose does not.
func TestChromiumUnderdosed(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 400 L potassium dichromate 5 % + 100 L H2SO4 20 % + 100 L ferrous sulfate 20 %")
	acts := strings.Join(r.Decision.Actions, "\n")
	if !strings.Contains(acts, "Chromium(VI) is not all reduced") {
		t.Errorf("underdosed: actions %q", acts)
	}
	// Counted as chromium atoms: about 140 mol Cr in, 160 mol Fe2+
	// reduces 53 of them, about 85 mol Cr stay.
	var left float64
	if _, err := fmt.Sscanf(acts[strings.Index(acts, "reduced (")+len("reduced ("):], "%g mol Cr", &left); err != nil || left < 70 || left > 95 {
		t.Errorf("chromium left %g (%v), want about 85 mol Cr", left, err)
	}
	seen := map[string]bool{}
	for _, sentence := range strings.SplitAfter(acts, ".") {
		sentence = strings.TrimSpace(sentence)
		if strings.Contains(sentence, "meet the same hazards") && seen[sentence] {
			t.Errorf("the same pour advice twice: %q in %q", sentence, acts)
		}
		seen[sentence] = true
	}
	r = ask(t, a, "mix 400 L potassium dichromate 5 % + 100 L H2SO4 20 % + 400 L ferrous sulfate 20 %")
	if strings.Contains(strings.Join(r.Decision.Actions, "\n"), "not all reduced") {
		t.Errorf("full dose read as underdosed")
	}
}

// TestCyanogenChlorideIsAnIntermediate: between pH 7 and 10 hypochlorite
// takes cyanide on through cyanogen chloride to cyanate and, in excess, to
// nitrogen (White's Handbook of Chlorination, cyanide, from memory); the
// cyanogen chloride is the worst case of that path, not a product beside
// the nitrogen. Tried as a new user would: the Forms line listed both as if
// the cyanide were counted twice.
func TestCyanogenChlorideIsAnIntermediate(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 400 L NaCN 2 g/L pH 8 + 60 L NaOCl 12.5 %")
	h, ok := hazardOf(r, "cyanogen-chloride-release")
	if !ok || h.Gas == nil || h.Gas.Forerunner != "cyanate" || r.Decision.Level != engine.DoNotMix {
		t.Fatalf("cyanogen chloride %+v, %s", h.Gas, r.Decision.Level)
	}
}

// TestBaseNamedWithAPH: "NaOH pH 11" in a stream is the caustic that holds
// the stream at pH 11 (the way cyanide rinses are written on a plant:
// common practice, no source), not 1 mol/L of caustic beside a pH the
// answer then ignores as conflicting.
func TestBaseNamedWithAPH(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 400 L NaCN 2 g/L, NaOH pH 11 + 60 L NaOCl 12.5 %")
	notes := strings.Join(r.Notes, " ")
	if strings.Contains(notes, "conflicts") || !strings.Contains(notes, "brings the stream to that pH") {
		t.Errorf("notes %q", notes)
	}
	if ph := r.Conditions.PH; ph > 11.5 {
		t.Errorf("pH as combined %g, want about 11 (not 1 M caustic)", ph)
	}
}

// TestHydrazineWithNitrite: nitrous acid turns hydrazine into hydrazoic
// acid, N2H5+ + HNO2 → HN3 + H+ + 2 H2O (Bretherick's Handbook of Reactive
// Chemical Hazards, hydrazine with nitrous acid, from memory). Tried as a
// new user would: the alkaline pair read "no concern" (the lock's partner
// list left hydrazine out), and with excess acid only nitric oxide was
// named. Hand check: 20 L of 10 % NaNO2 hold 31 mol nitrite, hydrazine is in
// excess: up to 31 mol HN3.
func TestHydrazineWithNitrite(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 100 L hydrazine 15 % + 100 L sodium nitrite 10 %")
	if _, ok := hazardOf(r, "azide-forming"); !ok || r.Decision.Level == engine.NoConcern {
		t.Errorf("alkaline: %s %v", r.Decision.Level, hazardCodes(r))
	}
	r = ask(t, a, "mix 20 L hydrazine 15 % + 20 L sodium nitrite 10 % + 100 L HCl 10 %")
	h, ok := hazardOf(r, "hn3-release")
	if !ok || h.Gas == nil || h.Gas.Mol < 25 || h.Gas.Mol > 35 || r.Decision.Level != engine.DoNotMix {
		t.Errorf("acid: %s %v %+v", r.Decision.Level, hazardCodes(r), h.Gas)
	}
	if r := ask(t, a, "mix 100 L hydrazine 15 % + 100 L water"); r.Decision.Level != engine.NoConcern {
		t.Errorf("hydrazine with water: %s", r.Decision.Level)
	}
}

// TestPersulfateQuench: persulfate is reduced at its peroxo oxygen to
// sulfate, S2O8^2- + 2 S2O3^2- → 2 SO4^2- + S4O6^2- (E° S2O8^2-/SO4^2-
// +2.01 V, CRC Handbook, Electrochemical Series; from memory), not to the
// thiosulfate that carries most sulfur in the mix. Tried as a new user
// would: the half-reaction took persulfate to thiosulfate (10 electrons)
// and 2 mL of sulfur dioxide raised a warning.
func TestPersulfateQuench(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 50 L potassium persulfate 5 % + 50 L sodium thiosulfate 20 %")
	if r.Reaction == nil || r.Reaction.Text != "S2O8^2- + 2 S2O3^2- → 2 SO4^2- + S4O6^2-" {
		t.Errorf("headline %v", r.Reaction)
	}
	if r.Decision.Level != engine.NoConcern {
		t.Errorf("%s %v, want no-concern (a 8 K warming)", r.Decision.Level, hazardCodes(r))
	}
}

// TestWorstGasAlongThePour: bleach run into acid gives chlorine from the
// first litre though the final mix ends near neutral. 200 L of 12.5 %
// NaOCl hold about 400 mol hypochlorite and 50 L of 10 % HCl about 144 mol
// acid: OCl- + Cl- + 2 H+ → Cl2 + H2O gives at most 72 mol Cl2 while the
// acid lasts (White's Handbook of Chlorination, from memory). The short
// answer names the worst point's amount beside the final one.
func TestWorstGasAlongThePour(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 200 L NaOCl 12.5 % + 50 L HCl 10 %")
	var most float64
	for _, o := range r.Addition.Orders {
		for _, h := range o.Hazards {
			if h.GasFormula == "Cl2" {
				most = max(most, h.GasMol)
			}
		}
	}
	if most < 40 || most > 75 {
		t.Errorf("worst chlorine along the pour %g mol, want 40–72", most)
	}
	if s := advice.RenderShort(r); !strings.Contains(s, "along the pour (NaOCl 12.5 % into HCl 10 %") {
		t.Errorf("short answer does not name it:\n%s", s)
	}
}

// TestNChloroHeatNamedAsMissing: hypochlorite chlorinating an amine or
// urea gives off heat the state cannot count (no species data for the
// N-chloro compounds); the heat figure says so rather than reading as
// the whole (tried as a new user would: "1.7 kJ taken up" beside 99 mol of
// N-chloro compounds).
func TestNChloroHeatNamedAsMissing(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 200 L monoethanolamine 20 % + 50 L NaOCl 12.5 %")
	if s := advice.RenderShort(r); !strings.Contains(s, "N-chloro compounds not counted") {
		t.Errorf("short answer:\n%s", s)
	}
	if s := advice.RenderShort(ask(t, a, "mix 200 L NaOH 5 % + 50 L NaOCl 12.5 %")); strings.Contains(s, "N-chloro") {
		t.Errorf("caustic with bleach names N-chloro heat:\n%s", s)
	}
}

// TestFastPeroxideCatalysts: chromium(VI) breaks peroxide down within
// seconds through peroxochromium species (Bretherick's Handbook, hydrogen
// peroxide with chromates, from memory), as fast as hypochlorite does: the
// same oxygen surge per litre reads the same. Tried as a new user would:
// dichromate with 35 % peroxide (1 mol O2 per litre) read "with
// precautions" where hypochlorite with it read "do not mix".
func TestFastPeroxideCatalysts(t *testing.T) {
	a := mustAdvisor(t)
	for _, req := range []string{"mix 100 L potassium dichromate 5 % + 20 L H2O2 35 %", "mix 200 L NaOCl 12.5 % + 20 L H2O2 35 %"} {
		if r := ask(t, a, req); r.Decision.Level != engine.DoNotMix {
			t.Errorf("%s: %s %v", req, r.Decision.Level, hazardCodes(r))
		}
	}
}
