package advice_test

import (
	"strings"
	"testing"

	"mixward/data"
	"mixward/engine"
	"mixward/engine/advice"
)

func mustAdvisor(t testing.TB) *advice.Advisor {
	t.Helper()
	e, err := engine.New(data.FS)
	if err != nil {
		t.Fatal(err)
	}
	a, err := advice.New(e, data.FS)
	if err != nil {
		t.Fatal(err)
	}
	return a
}

func ask(t testing.TB, a *advice.Advisor, req string) *engine.Result {
	t.Helper()
	r, err := a.Ask(req, engine.AskOptions{})
	if err != nil {
		t.Fatalf("Ask(%q): %v", req, err)
	}
	return r
}

func hazardOf(r *engine.Result, code string) (engine.Hazard, bool) {
	for _, h := range r.Hazards {
		if h.Code == code {
			return h, true
		}
	}
	return engine.Hazard{}, false
}

// TestHazardsAdded: each hazard the judgement adds, on an invented-plant
// request, with the source of the rule beside it.
func TestHazardsAdded(t *testing.T) {
	a := mustAdvisor(t)
	for _, tc := range []struct {
		name, req, code string
		sev             engine.Severity
		source          string // where the rule comes from (also in the hazard's Source)
	}{
		{"bleach with acetic acid", "mix 1 L NaOCl 5 % + 1 L acetic acid 5 %", "chlorine-release", engine.Danger,
			"Cl2 hydrolysis constant, Connick and Chia 1959; NIOSH IDLH chlorine 10 ppm; Sander 2015"},
		{"bleach with citric acid", "mix 1 L NaOCl 5 % + 1 L citric acid 5 %", "chlorine-release", engine.Danger,
			"Cl2 hydrolysis constant, Connick and Chia 1959; NIOSH IDLH chlorine 10 ppm"},
		{"borohydride into acid", "mix 1 L NaBH4 10 %, NaOH 1 % + 1 L HCl 10 %", "hydrogen-release", engine.Danger,
			"Bretherick's Handbook, sodium tetrahydroborate; US Bureau of Mines LFL 4 %"},
		{"dithionite into acid", "mix 1 kg Na2S2O4 + 10 L H2SO4 10 %", "so2-release", engine.Danger,
			"Bretherick's Handbook, sodium dithionite; NIOSH IDLH sulfur dioxide 100 ppm"},
		{"dithionite self-heating", "mix 1 kg Na2S2O4 + 10 L H2SO4 10 %", "self-heating", engine.Warning,
			"Bretherick's Handbook, sodium dithionite"},
		// Diluting 40 % acid for a pickle is routine with HF precautions
		// (common practice, no source); heated concentrated acid fumes.
		{"hydrofluoric acid", "mix 1 L HF 40 % + 1 L water", "hf-burns", engine.Warning,
			"NIOSH Pocket Guide, hydrogen fluoride IDLH 30 ppm"},
		{"hydrofluoric acid heated", "mix 50 L HF 40 % + 50 L H2SO4 98 %", "hf-burns", engine.Danger,
			"NIOSH Pocket Guide, hydrogen fluoride IDLH 30 ppm"},
		{"aqua regia", "mix 3 L HCl 37 % + 1 L HNO3 65 %", "chlorine-release", engine.Danger,
			"CRC Handbook and Bretherick's Handbook, aqua regia"},
		{"chlorate with hydrochloric acid", "mix 1 L NaClO3 30 % + 1 L HCl 37 %", "clo2-release", engine.Danger,
			"Bretherick's Handbook, sodium chlorate; NIOSH IDLH chlorine dioxide 5 ppm"},
		{"silver with ammonia", "mix 1 L AgNO3 5 % + 1 L NH3 10 %", "explosive-residue", engine.Danger,
			"Bretherick's Handbook, silver nitrate with ammonia"},
		{"hypochlorite with copper", "mix 1 L NaOCl 12.5 % + 1 L CuSO4 5 %", "oxygen-surge", engine.Warning,
			"Bretherick's Handbook, sodium hypochlorite with metal salts"},
		{"hypochlorite with nickel", "mix 1 L NiCl2 5 % + 1 L NaOCl 12.5 %", "oxygen-surge", engine.Warning,
			"Bretherick's Handbook, sodium hypochlorite with metal salts"},
		{"hypochlorite with cobalt", "mix 1 L CoSO4 5 % + 1 L NaOCl 12.5 %", "oxygen-surge", engine.Warning,
			"Bretherick's Handbook, sodium hypochlorite with metal salts"},
		{"hypochlorite with manganese", "mix 100 L NaOCl 12.5 % + 100 L MnSO4 0.2 M", "oxygen-surge", engine.Warning,
			"Bretherick's Handbook, sodium hypochlorite with metal salts (manganese dioxide)"},
		{"hypochlorite with urea in acid", "mix 1 L NaOCl 5 % + 1 L urea 5 %, H2SO4 5 %", "nitrogen-trichloride", engine.Danger,
			"Bretherick's Handbook, nitrogen trichloride; White's Handbook of Chlorination"},
		{"hypochlorite with ammonium in acid", "mix 1 L NaOCl 5 % + 1 L NH4Cl 5 %, HCl 5 %", "nitrogen-trichloride", engine.Danger,
			"Bretherick's Handbook, nitrogen trichloride"},
		{"hypochlorite with ammonia", "mix 1 L NH3 1 M + 1 L NaOCl 5 %, NaOH 1 M", "chloramine-release", engine.Danger,
			"White's Handbook of Chlorination"},
		{"cyanide with hypochlorite below pH 10", "mix 1 L NaCN 0.1 M + 1 L NaOCl 1 % at pH 8", "cyanogen-chloride-release", engine.Danger,
			"alkaline chlorination at pH 10 or more: common practice; ACGIH ceiling 0.3 ppm"},
		{"bromate with bromide in acid", "mix 1 L KBrO3 5 % + 1 L KBr 10 %, H2SO4 10 %", "bromine-release", engine.Danger,
			"Bretherick's Handbook, potassium bromate; NIOSH IDLH bromine 3 ppm"},
		{"sodium with water", "mix 100 g Na + 10 L water", "alkali-metal-fire", engine.Danger,
			"Bretherick's Handbook, sodium"},
		{"concentrated ammonia with concentrated acid", "mix 1 L NH3 28 % + 1 L HCl 37 %", "ammonium-salt-fumes", engine.Warning,
			"common practice, no source"},
		{"cyanide into acid, in numbers", "mix 600 L CuCN 22 g/L, NaCN 30 g/L, NaOH 5 g/L + 1500 L HCl 10 %", "hcn-release", engine.Danger,
			"NIOSH IDLH hydrogen cyanide 50 ppm; Sander 2015"},
		{"chlorine dioxide in numbers", "mix 1 L NaClO3 30 % + 1 L HCl 37 %", "clo2-release", engine.Danger,
			"NIOSH IDLH chlorine dioxide 5 ppm"},
		{"hypochlorite with urea", "mix 100 L NaOCl 12.5 % + 100 L urea 10 %", "n-chloro-compounds", engine.Danger,
			"Bretherick's Handbook, sodium hypochlorite with urea"},
		{"hypochlorite with ethanolamine", "mix 100 L monoethanolamine 20 % + 100 L NaOCl 12.5 %", "n-chloro-compounds", engine.Danger,
			"Bretherick's Handbook, sodium hypochlorite with amines"},
		{"concentrated nitric acid with triethanolamine", "mix 10 L triethanolamine 10 % + 10 L HNO3 68 %", "nitric-organic-runaway", engine.Danger,
			"Bretherick's Handbook, nitric acid with organic compounds"},
		{"warm ammonium with nitrite", "mix 10 L NaNO2 20 % + 10 L NH4Cl 20 % at 60 C", "ammonium-nitrite-runaway", engine.Danger,
			"Bretherick's Handbook, ammonium nitrite; NBS Tables 1982"},
		{"permanganate into concentrated sulfuric acid", "mix 1 kg KMnO4 + 1 L H2SO4 98 %", "manganese-heptoxide", engine.Danger,
			"Bretherick's Handbook, potassium permanganate with sulfuric acid"},
		{"concentrated sulfuric with hydrochloric acid", "mix 100 L HCl 36 % + 100 L H2SO4 98 %", "acid-fumes", engine.Danger,
			"Vogel, chlorides with concentrated sulfuric acid"},
		{"calcium hypochlorite granules into water", "mix 10 kg calcium hypochlorite + 100 L water", "solid-oxidizer-heating", engine.Warning,
			"Bretherick's Handbook, calcium hypochlorite; White's Handbook of Chlorination"},
		// 15 % peracid (about 2 mol/L) meets 12.5 % bleach (about 2 mol/L): about 1 mol O2 per litre of mix,
		// above the 0.5 mol/L from which a fast oxygen surge is do-not-mix in one go (hazard.SurgeMolPerL).
		{"peracetic acid with hypochlorite", "mix 10 L peracetic acid 15 % + 10 L NaOCl 12.5 %", "oxygen-surge", engine.Danger,
			"Bretherick's Handbook, peroxyacetic acid; 0.5 mol O2 per litre: common practice, no source"},
		// 1 % peracid, 10 L into 100 L of 1 % bleach, read as the diluted 5 % product (data/products.txt:
		// 4.4 % H2O2, 13 mol): the peroxide takes the hypochlorite (13.4 mol) to about 13 mol O2 in 110 L
		// (0.12 mol/L), which the state gives off: a precaution for the oxygen.
		{"dilute peracetic acid with dilute hypochlorite", "mix 10 L peracetic acid 1 % + 100 L NaOCl 1 %", "oxygen-release", engine.Warning,
			"Bretherick's Handbook, peroxyacetic acid and hydrogen peroxide with sodium hypochlorite; 0.5 mol O2 per litre: common practice, no source"},
		{"magnesium in water", "mix 1 kg Mg + 20 L water", "slow-hydrogen", engine.Warning,
			"Bretherick's Handbook, magnesium"},
		{"peroxide into alkaline cyanide", "mix 100 L NaCN 0.5 %, pH 12 + 10 L H2O2 35 %", "cyanide-oxidation", engine.Warning,
			"alkaline cyanide treatment: common practice, no source"},
		{"bicarbonate turns alkaline cyanide into hydrogen cyanide", "mix 100 L NaCN 1 %, pH 10.5 + 100 L NaHCO3 5 %", "hcn-release", engine.Danger,
			"pKa HCN 9.2 and HCO3- 10.3, CRC Handbook, Dissociation Constants; NIOSH IDLH hydrogen cyanide 50 ppm"},
		{"strong caustic with strong acid in one go", "mix 100 L KOH 30 % + 100 L HCl 25 %", "near-boiling", engine.Danger,
			"NBS Tables 1982 neutralisation heat; Bretherick's Handbook, acids with bases"},
		{"aqua regia gives nitrosyl chloride", "mix 3 L HCl 37 % + 1 L HNO3 65 %", "nocl-release", engine.Danger,
			"Vogel, aqua regia; no published limit recalled: chlorine's NIOSH IDLH 10 ppm as a stand-in"},
		{"zinc in very dilute nitric acid", "mix 1 kg Zn + 100 L HNO3 2 %", "nitrous-fumes", engine.Warning,
			"Vogel, nitric acid with zinc"},
		{"silver cyanide bath into acid", "mix 10 L KAg(CN)2 5 % + 10 L HCl 10 %", "hcn-release", engine.Danger,
			"Bretherick's Handbook, cyanides with acids; NIOSH IDLH hydrogen cyanide 50 ppm"},
		{"ferrocyanide with acid", "mix 10 L K4Fe(CN)6 5 % + 10 L HCl 10 %", "cyanide-complex-acid", engine.Warning,
			"Vogel, hexacyanoferrates with dilute acid (hydrogen cyanide on warming); safety data sheets, EUH032"},
		{"cyanide bound by ferrous sulfate", "mix 100 L NaCN 1 %, pH 11 + 100 L FeSO4 0.5 M", "cyanide-complexed", engine.Warning,
			"Vogel, cyanide with iron(II); Smith & Martell, ferrocyanide log β6 35"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r := ask(t, a, tc.req)
			h, ok := hazardOf(r, tc.code)
			if !ok {
				t.Fatalf("%s: no %s among %v (source: %s)", tc.req, tc.code, codesOf(r), tc.source)
			}
			if h.Severity != tc.sev {
				t.Errorf("%s: %s is %s, want %s", tc.req, tc.code, h.Severity, tc.sev)
			}
			if h.Source == "" || h.Title == "" || h.Action == "" {
				t.Errorf("%s: %s lacks a source, title or action: %+v", tc.req, tc.code, h)
			}
			if g := h.Gas; g != nil && !(g.Mol > 0 && g.HeadspacePPM > 0 && g.LimitPPM > 0) {
				t.Errorf("%s: gas hazard without numbers: %+v", tc.req, g)
			}
		})
	}
}

func codesOf(r *engine.Result) []string {
	var cs []string
	for _, h := range r.Hazards {
		cs = append(cs, h.Code+":"+string(h.Severity))
	}
	return cs
}

// TestFalseAlarmsRemoved: each false alarm that taught operators to ignore
// warnings, with the codes it must no longer raise.
func TestFalseAlarmsRemoved(t *testing.T) {
	a := mustAdvisor(t)
	for _, tc := range []struct {
		name, req string
		not       []string // codes that must not appear (new names)
		why       string
	}{
		{"diluting 50 % peroxide does not boil", "mix 10 L H2O2 50 % + 10 L water", []string{"boils", "scalding-heat", "oxygen-release"},
			"peroxide does not decompose without a catalyst (held back)"},
		{"caustic into bleach gives no oxygen", "mix 200 L NaOCl 12.5 % + 50 L NaOH 50 %", []string{"oxygen-release", "oxygen-surge"},
			"hypochlorite does not decompose without a catalyst; caustic is how bleach is stabilised"},
		{"no chlorine from alkaline ammonia with bleach", "mix 1 L NH3 1 M + 1 L NaOCl 5 %, NaOH 1 M", []string{"chlorine-release"},
			"chlorine does not persist above pH 5"},
		{"no chlorine from alkaline cyanide destruction", "mix 1 L NaCN 1 g/L, NaOH 1 g/L + 1 L NaOCl 1 %", []string{"chlorine-release", "cyanogen-chloride-release", "hcn-release"},
			"pH 12: chlorine hydrolysed, cyanogen chloride hydrolysed, cyanide held as CN-"},
		{"no hydrogen from copper in hydrochloric acid", "mix 1 kg Cu + 1 L HCl 37 %", []string{"hydrogen-release"},
			"copper with hydrochloric acid is not spontaneous"},
		{"dilute CIP nitric acid with citric acid is no runaway", "mix 1000 L HNO3 1.5 % + 100 L citric acid 10 %", []string{"nitric-organic-runaway"},
			"nitric acid below about 2 mol/L does not run away with organic acids (common practice, no source)"},
		{"sulfuric acid 10 % with salt gives no fumes", "mix 100 L H2SO4 10 % + 100 L NaCl 10 %", []string{"acid-fumes"},
			"only concentrated sulfuric acid drives hydrogen chloride out (Vogel)"},
		{"bleach solution poured into water is not a solid", "mix 10 L NaOCl 12.5 % + 100 L water", []string{"solid-oxidizer-heating", "n-chloro-compounds"},
			"the solid-handling rule is for granules and tablets (common practice, no source)"},
		{"warm caustic into water does not spit", "mix 100 L NaOH 2 % + 100 L water at 85 C", []string{"near-boiling", "boils"},
			"a stated temperature alone raises no heat hazard"},
		{"no boiling from a stated bath temperature", "mix 1 L HCl 10 % + 1 L water at 90 C", []string{"boils", "scalding-heat", "warms"},
			"a stated temperature alone never raises a heat hazard"},
		{"no acid-cyanide alarm when peroxide destroys cyanide at pH 10.6, no acid present",
			"mix 600 L CuCN 22 g/L, NaCN 30 g/L, NaOH 5 g/L + 1000 L H2O2 3 %", []string{"hcn-release"},
			"the cyanide is oxidised to cyanate; no acid is present (copper does catalyse the decomposition of the excess peroxide, so oxygen is expected here)"},
		{"no oxygen alarm when peroxide destroys cyanide without a catalyst",
			"mix 600 L NaCN 30 g/L, NaOH 5 g/L + 1000 L H2O2 3 %", []string{"hcn-release", "oxygen-release"},
			"the cyanide is oxidised to cyanate; peroxide does not decompose without a catalyst"},
		{"no acid-cyanide alarm in alkaline cyanide without acid", "mix 10 L NaCN 0.01 M, NaOH 0.01 M + 10 L water", []string{"hcn-release"},
			"pH above 11: a trace of HCN in the headspace, below a tenth of the IDLH"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r := ask(t, a, tc.req)
			for _, c := range tc.not {
				if h, ok := hazardOf(r, c); ok {
					t.Errorf("%s raised %s (%s): %s", tc.req, c, tc.why, h.Message)
				}
			}
		})
	}
}

// TestHydrogenMargin: a pair within ProceedMarginV of zero raises nothing.
func TestHydrogenMargin(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 1 L NaCN 1 g/L, NaOH 1 g/L + 1 L NaOCl 1 %")
	for _, alt := range r.Alternatives {
		if alt.ECell > 0 && alt.ECell <= 0.05 && strings.Contains(alt.Reaction.Text, "H2(g)") {
			if _, ok := hazardOf(r, "hydrogen-release"); ok {
				t.Errorf("hydrogen from a pair at %+.3f V", alt.ECell)
			}
		}
	}
	for _, h := range r.Decision.Held {
		if !strings.Contains(h, ": ") || strings.HasSuffix(h, ": ") {
			t.Errorf("held-back reaction does not say why: %q", h)
		}
	}
}

// TestDecisionNotFromVerdict: the decision follows the hazards, never the
// redox verdict alone.
func TestDecisionNotFromVerdict(t *testing.T) {
	a := mustAdvisor(t)
	for _, tc := range []struct {
		req     string
		verdict engine.Verdict
		level   engine.Level
	}{
		// Spontaneous but harmless: permanganate titration-strength with ferrous.
		{"mix 1 L KMnO4 0.02 M, H2SO4 1 M + 1 L FeSO4 0.1 M", engine.Spontaneous, engine.NoConcern},
		// Lethal and not redox: cyanide with acid, hypochlorite with acid.
		{"mix 1 L NaCN 5 % + 1 L HCl 10 %", "", engine.DoNotMix},
		{"mix 1 L HCl 10 % + 1 L NaOCl 5 %", "", engine.DoNotMix},
	} {
		r := ask(t, a, tc.req)
		if tc.verdict != "" && r.Verdict != tc.verdict {
			t.Errorf("%s: verdict %s, want %s", tc.req, r.Verdict, tc.verdict)
		}
		if r.Decision == nil || r.Decision.Level != tc.level {
			t.Errorf("%s: decision %+v, want %s", tc.req, r.Decision, tc.level)
		}
	}
	r := ask(t, a, "mix 1 L NaCN 5 % + 1 L HCl 10 %")
	if r.Verdict == engine.Spontaneous && r.Reaction != nil && strings.Contains(r.Reaction.Text, "HCN") {
		t.Errorf("cyanide with acid dressed as redox: %s", r.Reaction.Text)
	}
	if r.Decision.Title != "releases hydrogen cyanide" {
		t.Errorf("title %q", r.Decision.Title)
	}
}

// TestStreamsOwnHazards: a hazard a stream carries alone is not blamed on
// the mix unless mixing makes it worse; heat, hydrofluoric acid and
// hexavalent chromium always count. A toxic gas still above its limit over
// the mix is a warning with the stream's own precautions, never a danger
// blamed on the mix and never "no concern" beside the gas line: 10 % ammonia
// diluted to 5 % holds about 2.9 mol/L NH3, over 1 bar / 59 mol/(L·bar)
// (Sander 2015, from memory) far above the IDLH of 300 ppm (NIOSH Pocket
// Guide) in a closed headspace; 0.01 % ammonia is below a tenth of it.
func TestStreamsOwnHazards(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 10 L NH3 10 % + 10 L water")
	if h, ok := hazardOf(r, "ammonia-release"); !ok || h.Severity != engine.Warning || !strings.Contains(h.Title, "as over NH3 10 % alone") {
		t.Errorf("diluting ammonia solution: %v %+v", ok, h)
	}
	if r.Decision.Level != engine.WithPrecautions {
		t.Errorf("diluting ammonia solution: %s (%s)", r.Decision.Level, r.Decision.Title)
	}
	r = ask(t, a, "mix 10 L NH3 0.01 % + 10 L water")
	if r.Decision.Level != engine.NoConcern {
		t.Errorf("diluting 0.01 %% ammonia: %s (%s)", r.Decision.Level, r.Decision.Title)
	}
	// Acid makes the cyanide stream's own trace of HCN far worse: it counts.
	r = ask(t, a, "mix 1 L NaCN 5 %, NaOH 1 % + 1 L HCl 10 %")
	if h, ok := hazardOf(r, "hcn-release"); !ok || h.Severity != engine.Danger {
		t.Errorf("cyanide with acid: %v", codesOf(r))
	}
	r = ask(t, a, "mix 1 L HF 40 % + 1 L water")
	if h, ok := hazardOf(r, "hf-burns"); !ok || h.Severity == engine.Info {
		t.Errorf("hydrofluoric acid demoted: %v", codesOf(r))
	}
}

// TestPourGasInTankHeadspace: a point of a pour gives its gas to the
// headspace of the tank sized for the whole mix. Water run onto sodium
// percarbonate granules gives no headspace-filling carbon dioxide in either
// order (it dissolves to carbonate and peroxide at about pH 10.5; common
// practice, no source), while bleach run into acid still releases chlorine
// from the first litres (White's Handbook of Chlorination, from memory).
func TestPourGasInTankHeadspace(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 10 kg sodium percarbonate + 100 L water")
	for _, o := range r.Addition.Orders {
		for _, h := range o.Hazards {
			if h.Code == "co2-release" {
				t.Errorf("%s into %s: %s from %g to %g", o.Added, o.Into, h.Code, h.FromFraction, h.ToFraction)
			}
		}
	}
	r = ask(t, a, "mix 200 L NaOCl 12.5 % + 50 L HCl 10 %")
	for _, o := range r.Addition.Orders {
		if !strings.HasPrefix(o.Added, "NaOCl") {
			continue
		}
		found := false
		for _, h := range o.Hazards {
			found = found || h.Code == "chlorine-release" && h.FromFraction <= 0.01 && h.Worst == engine.Danger
		}
		if !found {
			t.Errorf("bleach into acid: no chlorine danger from the first litres: %+v", o.Hazards)
		}
	}
}

// TestConcentrateIntoWater: a concentrated acid or caustic always goes into
// the water, whatever the volumes: water run onto it boils where it lands
// (common practice, no source; Bretherick's Handbook of Reactive Chemical
// Hazards, sulfuric acid, from memory). With too little water neither order
// is safe and the answer says to use more water.
func TestConcentrateIntoWater(t *testing.T) {
	a := mustAdvisor(t)
	for _, tc := range []struct {
		req, want string
	}{
		{"mix 10 L water + 1 L H2SO4 98 %", "Add H2SO4 98 % into H2O"},
		{"mix 2 L water + 10 L NaOH 50 %", "Add NaOH 50 % into H2O"},
		{"mix 100 L water + 10 L HCl 36 %", "Add HCl 36 % into H2O"},
		{"mix 1 L water + 10 L H2SO4 98 %", "use more water"},
	} {
		r := ask(t, a, tc.req)
		adv := r.Addition.Advice
		if !strings.Contains(adv, tc.want) {
			t.Errorf("%s: advice %q lacks %q", tc.req, adv, tc.want)
		}
		if strings.Contains(adv, "Add H2O into") {
			t.Errorf("%s: advice %q runs water into the concentrate", tc.req, adv)
		}
		for _, o := range r.Addition.Orders {
			if o.Added != "H2O" {
				continue
			}
			if len(o.Hazards) == 0 || o.Hazards[0].FromFraction > 0.001 {
				t.Errorf("%s: water into %s meets nothing from the first drop: %+v", tc.req, o.Into, o.Hazards)
			}
		}
	}
}
