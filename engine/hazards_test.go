package engine

import (
	"os"
	"reflect"
	"strings"
	"testing"
	"testing/fstest"
)

func loadTestHazardRules(t testing.TB) []*HazardRule {
	t.Helper()
	rules, err := LoadHazardRules(os.DirFS("../data"))
	if err != nil {
		t.Fatalf("LoadHazardRules(../data): %v", err)
	}
	return rules
}

func hzSpecies(t testing.TB, text string) Species {
	t.Helper()
	s, err := ParseSpecies(text)
	if err != nil {
		t.Fatalf("ParseSpecies(%q): %v", text, err)
	}
	return s
}

func hzPresent(t testing.TB, texts ...string) []SpeciesAmount {
	t.Helper()
	var out []SpeciesAmount
	for _, x := range texts {
		out = append(out, SpeciesAmount{Species: hzSpecies(t, x), Mol: 1, Molar: 0.1})
	}
	return out
}

// hzEq builds a reaction from "coef species" terms, e.g. hzEq(t, "2 H+|1 Zn(s)", "1 Zn^2+|1 H2(g)").
func hzEq(t testing.TB, reactants, products string) *Reaction {
	t.Helper()
	side := func(s string) []EqTerm {
		var out []EqTerm
		for _, part := range strings.Split(s, "|") {
			f := strings.Fields(part)
			if len(f) != 2 {
				t.Fatalf("bad term %q", part)
			}
			x := hzSpecies(t, f[1])
			n := 0
			for _, c := range f[0] {
				n = n*10 + int(c-'0')
			}
			out = append(out, EqTerm{Formula: x.Formula, Charge: x.Charge, Phase: x.Phase, Coef: n, Text: x.Text()})
		}
		return out
	}
	return &Reaction{Reactants: side(reactants), Products: side(products)}
}

func hzF(v float64) *float64 { return &v }

// findRule returns the rule with the given code whose `gas` terms include formula.
func findGasRule(t *testing.T, rules []*HazardRule, code, formula string) *HazardRule {
	t.Helper()
	for _, r := range rules {
		if r.Code != code {
			continue
		}
		for _, g := range r.Gases() {
			if g == formula {
				return r
			}
		}
	}
	t.Fatalf("no %s rule for gas %s in data/hazards.txt", code, formula)
	return nil
}

// TestHazardLimits checks the limits quoted by the gas rules against the
// published values, and that each message actually states its limit.
func TestHazardLimits(t *testing.T) {
	rules := loadTestHazardRules(t)
	tests := []struct {
		code, gas string
		limit     string
		want      float64
		unit      string
		source    string // where the expected value comes from
	}{
		{"toxic-gas", "Cl2", "IDLH", 10, "ppm", "NIOSH IDLH documentation, chlorine, as revised 1994 (from memory)"},
		{"toxic-gas", "H2S", "IDLH", 100, "ppm", "NIOSH IDLH documentation, hydrogen sulfide, as revised 1994 (from memory)"},
		{"toxic-gas", "HCN", "IDLH", 50, "ppm", "NIOSH IDLH documentation, hydrogen cyanide, as revised 1994 (from memory)"},
		{"toxic-gas", "SO2", "IDLH", 100, "ppm", "NIOSH IDLH documentation, sulfur dioxide, as revised 1994 (from memory)"},
		{"toxic-gas", "NH3", "IDLH", 300, "ppm", "NIOSH IDLH documentation, ammonia, as revised 1994 (from memory)"},
		{"toxic-gas", "NO2", "IDLH", 13, "ppm", "NIOSH IDLH documentation, nitrogen dioxide, as revised 1994 (from memory)"},
		{"toxic-gas", "NO", "IDLH", 100, "ppm", "NIOSH IDLH documentation, nitric oxide, as revised 1994 (from memory)"},
		{"toxic-gas", "ClO2", "IDLH", 5, "ppm", "NIOSH IDLH documentation, chlorine dioxide, as revised 1994 (from memory)"},
		{"flammable-gas", "H2", "LFL", 4, "%", "US Bureau of Mines, hydrogen 4-75 % in air (from memory)"},
		{"flammable-gas", "H2", "UFL", 75, "%", "US Bureau of Mines, hydrogen 4-75 % in air (from memory)"},
		{"oxygen-enrichment", "O2", "O2", 23.5, "%", "OSHA 29 CFR 1910.146, oxygen-enriched above 23.5 % (from memory)"},
	}
	for _, tc := range tests {
		t.Run(tc.gas+"/"+tc.limit, func(t *testing.T) {
			r := findGasRule(t, rules, tc.code, tc.gas)
			l, ok := r.Limit(tc.limit)
			if !ok {
				t.Fatalf("rule %s has no %s limit", r.ID, tc.limit)
			}
			if l.Value != tc.want || l.Unit != tc.unit {
				t.Errorf("rule %s: %s = %v %s, want %v %s (%s)", r.ID, tc.limit, l.Value, l.Unit, tc.want, tc.unit, tc.source)
			}
			hs := EvaluateHazards([]*HazardRule{r}, HazardInput{PH: 7, TemperatureC: 20,
				Gases: []GasRelease{{Text: tc.gas + "(g)", Mol: 1, VolumeL: 24, VolumeM3: 0.024}}})
			if len(hs) != 1 {
				t.Fatalf("rule %s did not fire for released %s: %+v", r.ID, tc.gas, hs)
			}
			if !strings.Contains(hs[0].Message, l.String()) {
				t.Errorf("message of %s does not state %s %s: %q", r.ID, tc.limit, l, hs[0].Message)
			}
			if !strings.Contains(hs[0].Message, "(about 1 mol, 24 L)") {
				t.Errorf("message of %s does not give the amount: %q", r.ID, hs[0].Message)
			}
		})
	}
}

func TestHazardTableRulesComplete(t *testing.T) {
	for _, r := range loadTestHazardRules(t) {
		if r.Source == "" || r.Message == "" || r.When == "" {
			t.Errorf("rule %s (line %d) lacks source, message or condition", r.ID, r.Line)
		}
		if strings.Contains(r.Source, "NIOSH") && !strings.Contains(r.Source, "from memory") {
			t.Errorf("rule %s quotes NIOSH without saying the value is from memory", r.ID)
		}
	}
}

type wantHazard struct {
	code     string
	severity Severity
	contains string // a word the message must contain ("" for any)
}

func TestEvaluateHazards(t *testing.T) {
	rules := loadTestHazardRules(t)
	cl2 := hzEq(t, "1 OCl-|1 Cl-|2 H+", "1 Cl2(g)|1 H2O(l)")
	o2 := hzEq(t, "2 OCl-", "2 Cl-|1 O2(g)")
	h2 := hzEq(t, "2 H+|1 Zn(s)", "1 Zn^2+|1 H2(g)")
	tests := []struct {
		name   string
		in     HazardInput
		want   []wantHazard
		absent []string // codes that must not appear
	}{
		{
			name: "acid with cyanide",
			in:   HazardInput{Present: hzPresent(t, "HCN", "Cl-", "Na+"), Chemicals: []string{"NaCN", "HCl"}, PH: 1.5, StrongAcidMol: 2},
			want: []wantHazard{{"acid-cyanide", Danger, "hydrogen cyanide"}, {"toxic-gas", Danger, "50 ppm"}},
		},
		{
			name:   "cyanide kept alkaline",
			in:     HazardInput{Present: hzPresent(t, "CN-", "Na+", "OH-"), PH: 12},
			want:   []wantHazard{{"cyanide-present", Info, "alkaline"}},
			absent: []string{"acid-cyanide", "toxic-gas"},
		},
		{
			name:   "cyanide at pH 9.8",
			in:     HazardInput{Present: hzPresent(t, "CN-", "HCN", "Na+"), PH: 9.8},
			want:   []wantHazard{{"acid-cyanide", Danger, ""}},
			absent: []string{"cyanide-present"},
		},
		{
			name: "acid with sulfide",
			in:   HazardInput{Present: hzPresent(t, "S^2-", "Na+", "H+", "Cl-"), PH: 11, StrongAcidMol: 1},
			want: []wantHazard{{"acid-sulfide", Danger, "hydrogen sulfide"}, {"toxic-gas", Danger, "100 ppm"}},
		},
		{
			name: "acid with bisulfite",
			in:   HazardInput{Present: hzPresent(t, "H2SO3", "Na+", "Cl-"), PH: 1, StrongAcidMol: 1},
			want: []wantHazard{{"acid-sulfite", Danger, "sulfur dioxide"}, {"toxic-gas", Danger, "Sulfur dioxide"}},
		},
		{
			name:   "hypochlorite with ammonia",
			in:     HazardInput{Present: hzPresent(t, "OCl-", "Na+", "NH3", "NH4+"), PH: 9.5},
			want:   []wantHazard{{"hypochlorite-ammonia", Danger, "chloramines"}},
			absent: []string{"hypochlorite-acid"},
		},
		{
			name: "hypochlorite with acid releases chlorine",
			in:   HazardInput{Present: hzPresent(t, "HOCl", "Cl-", "H+"), PH: 1, StrongAcidMol: 0.5},
			want: []wantHazard{{"hypochlorite-acid", Danger, "chlorine"}, {"toxic-gas", Danger, "Chlorine gas"}},
		},
		{
			name: "acid with carbonate",
			in:   HazardInput{Present: hzPresent(t, "H2CO3", "Na+", "Cl-"), PH: 3, StrongAcidMol: 1},
			want: []wantHazard{{"acid-carbonate", Warning, "pressure"}, {"toxic-gas", Warning, "Carbon dioxide"}},
		},
		{
			name:   "strong acid with strong base",
			in:     HazardInput{Present: hzPresent(t, "Na+", "Cl-"), PH: 7, StrongAcidMol: 1, StrongBaseMol: 1, TemperatureC: 20, TemperatureRiseC: hzF(13.4)},
			want:   []wantHazard{{"neutralisation-heat", Warning, "56 kJ"}, {"temperature-rise", Warning, "13 °C"}},
			absent: []string{"toxic-gas"},
		},
		{
			name: "chlorine from the headline",
			in: HazardInput{Present: hzPresent(t, "OCl-", "Cl-", "H+"), PH: 2,
				Reactions: []ReactionCase{{Label: "headline", Reaction: cl2, ECell: 0.3}}},
			want: []wantHazard{{"toxic-gas", Danger, "10 ppm"}},
		},
		{
			name: "chlorine from an alternative when oxygen wins",
			in: HazardInput{Present: hzPresent(t, "OCl-", "Cl-"), PH: 6,
				Reactions: []ReactionCase{{Label: "headline", Reaction: o2, ECell: 0.5}, {Label: "alternative", Reaction: cl2, ECell: 0.1}}},
			want: []wantHazard{{"toxic-gas", Danger, "Chlorine"}, {"oxygen-enrichment", Warning, "23.5 %"}},
		},
		{
			name: "chlorine from a follow-on step",
			in: HazardInput{PH: 2, Reactions: []ReactionCase{
				{Label: "headline", Reaction: h2, ECell: 0.76}, {Label: "step 2", Reaction: cl2, ECell: 0.2}}},
			want: []wantHazard{{"toxic-gas", Danger, "Chlorine"}, {"flammable-gas", Danger, "4 %"}},
		},
		{
			name: "hydrogen released with amount",
			in: HazardInput{PH: 1, Reactions: []ReactionCase{{Label: "headline", Reaction: h2, ECell: 0.76}},
				Gases: []GasRelease{{Text: "H2(g)", Mol: 0.5, VolumeL: 12.2, VolumeM3: 0.0122}}},
			want: []wantHazard{{"flammable-gas", Danger, "(about 0.5 mol, 12.2 L)"}, {"flammable-gas", Danger, "75 %"}},
		},
		{
			name: "large gas volume in cubic metres",
			in:   HazardInput{Gases: []GasRelease{{Text: "O2(g)", Mol: 100, VolumeL: 2446, VolumeM3: 2.446}}},
			want: []wantHazard{{"oxygen-enrichment", Warning, "2446 L = 2.45 m³"}},
		},
		{
			name:   "non-spontaneous chlorine is not released",
			in:     HazardInput{PH: 2, Reactions: []ReactionCase{{Label: "headline", Reaction: cl2, ECell: -0.4}}},
			absent: []string{"toxic-gas"},
		},
		{
			name: "chlorine within the uncertain band counts",
			in:   HazardInput{PH: 2, Reactions: []ReactionCase{{Label: "headline", Reaction: cl2, ECell: -0.05}}},
			want: []wantHazard{{"toxic-gas", Danger, "Chlorine"}},
		},
		{
			name: "dichromate named as a chemical",
			in:   HazardInput{Chemicals: []string{"K2Cr2O7", "H2SO4"}, PH: 1},
			want: []wantHazard{{"carcinogen-cr6", Danger, "cancer"}},
		},
		{
			name: "chromate present",
			in:   HazardInput{Present: hzPresent(t, "CrO4^2-", "Na+"), PH: 9},
			want: []wantHazard{{"carcinogen-cr6", Danger, "5 ug/m3"}},
		},
		{
			name: "chromium(VI) formed from chromium(III)",
			in: HazardInput{PH: 12, Reactions: []ReactionCase{{Label: "headline", ECell: 0.7,
				Reaction: hzEq(t, "2 Cr^3+|3 OCl-|10 OH-", "2 CrO4^2-|3 Cl-|5 H2O(l)")}}},
			want: []wantHazard{{"carcinogen-cr6", Danger, ""}},
		},
		{
			name:   "strong heat",
			in:     HazardInput{TemperatureC: 20, TemperatureRiseC: hzF(48)},
			want:   []wantHazard{{"strong-heat", Danger, "68 °C"}},
			absent: []string{"temperature-rise", "boiling"},
		},
		{
			name:   "boiling",
			in:     HazardInput{TemperatureC: 25, TemperatureRiseC: hzF(80)},
			want:   []wantHazard{{"boiling", Danger, "105 °C"}},
			absent: []string{"temperature-rise", "strong-heat"},
		},
		{
			name:   "no heat estimate",
			in:     HazardInput{TemperatureC: 25},
			absent: []string{"temperature-rise", "strong-heat", "boiling"},
		},
		{
			name:   "water alone",
			in:     HazardInput{Present: hzPresent(t, "H2O(l)", "H+", "OH-"), PH: 7, TemperatureC: 20, TemperatureRiseC: hzF(0)},
			absent: []string{"toxic-gas", "flammable-gas", "oxygen-enrichment", "neutralisation-heat", "temperature-rise"},
		},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := EvaluateHazards(rules, tc.in)
			for _, w := range tc.want {
				found := false
				for _, h := range got {
					if h.Code == w.code && h.Severity == w.severity && strings.Contains(h.Message, w.contains) {
						found = true
					}
				}
				if !found {
					t.Errorf("missing %s %s containing %q; got %s", w.severity, w.code, w.contains, hazardSummary(got))
				}
			}
			for _, code := range tc.absent {
				for _, h := range got {
					if h.Code == code {
						t.Errorf("unexpected %s: %q", code, h.Message)
					}
				}
			}
			for _, h := range got {
				if strings.ContainsAny(h.Message, "{}") {
					t.Errorf("placeholder left in %s message: %q", h.Code, h.Message)
				}
				if h.Source == "" {
					t.Errorf("%s hazard has no source", h.Code)
				}
			}
		})
	}
}

func hazardSummary(hs []Hazard) string {
	var b strings.Builder
	for _, h := range hs {
		b.WriteString("\n  " + string(h.Severity) + " " + h.Code + ": " + h.Message)
	}
	return b.String()
}

func TestEvaluateHazardsOrderAndDuplicates(t *testing.T) {
	rules := loadTestHazardRules(t)
	in := HazardInput{
		Present:          hzPresent(t, "HOCl", "Cl-", "NH4+", "HCN", "H2S", "Cr2O7^2-"),
		PH:               1,
		StrongAcidMol:    1,
		StrongBaseMol:    0.5,
		TemperatureC:     20,
		TemperatureRiseC: hzF(15),
		Gases:            []GasRelease{{Text: "Cl2(g)", Mol: 1}, {Text: "Cl2(g)", Mol: 1}, {Text: "O2(g)", Mol: 0.1}},
		Reactions: []ReactionCase{
			{Label: "headline", Reaction: hzEq(t, "1 OCl-|1 Cl-|2 H+", "1 Cl2(g)|1 H2O(l)"), ECell: 0.3},
			{Label: "alternative", Reaction: hzEq(t, "1 OCl-|1 Cl-|2 H+", "1 Cl2(g)|1 H2O(l)"), ECell: 0.3},
		},
	}
	got := EvaluateHazards(rules, in)
	if len(got) == 0 {
		t.Fatal("no hazards")
	}
	seen := map[string]bool{}
	for i, h := range got {
		if i > 0 && severityRank(got[i-1].Severity) < severityRank(h.Severity) {
			t.Errorf("hazard %d (%s %s) comes after a less severe one (%s)", i, h.Severity, h.Code, got[i-1].Severity)
		}
		k := h.Code + h.Message
		if seen[k] {
			t.Errorf("duplicate hazard %s: %q", h.Code, h.Message)
		}
		seen[k] = true
	}
	if !strings.Contains(hazardSummary(got), "(about 2 mol") {
		t.Errorf("chlorine listed twice should add up to 2 mol: %s", hazardSummary(got))
	}
	again := EvaluateHazards(rules, in)
	if !reflect.DeepEqual(got, again) {
		t.Errorf("EvaluateHazards is not deterministic")
	}
}

func TestLoadHazardRulesErrors(t *testing.T) {
	const good = "rule a\n  code toxic-gas\n  severity danger\n  when gas Cl2\n  message Chlorine.\n  source common practice, no source\n"
	tests := []struct {
		name, text, want string
	}{
		{"empty", "# nothing\n", "no rules"},
		{"field before rule", "  code x\n", "hazards.txt:1"},
		{"not a rule", "code x\n", "hazards.txt:1: \"code x\": a rule starts with `rule NAME`"},
		{"duplicate rule", good + good, "hazards.txt:7: rule a is already defined at line 1"},
		{"bad severity", strings.Replace(good, "danger", "grave", 1), "hazards.txt:1: rule a: severity \"grave\""},
		{"missing source", strings.Replace(good, "  source common practice, no source\n", "", 1), "missing `source`"},
		{"missing when", strings.Replace(good, "  when gas Cl2\n", "", 1), "missing `when`"},
		{"missing message", strings.Replace(good, "  message Chlorine.\n", "", 1), "missing `message`"},
		{"bad code", strings.Replace(good, "toxic-gas", "Toxic Gas", 1), "code \"Toxic Gas\""},
		{"unknown field", good + "  colour red\n", "hazards.txt:7: rule a: unknown field \"colour\""},
		{"twice", good + "  code other\n", "hazards.txt:7: field \"code\" appears twice"},
		{"bad term", strings.Replace(good, "gas Cl2", "smells bad", 1), "hazards.txt:4: rule a: when: condition \"smells bad\": unknown term \"smells\""},
		{"bad species", strings.Replace(good, "gas Cl2", "present Fe^3", 1), "hazards.txt:4"},
		{"ion as gas", strings.Replace(good, "gas Cl2", "gas Cl-", 1), "a gas is neutral"},
		{"dangling and", strings.Replace(good, "gas Cl2", "gas Cl2 and", 1), "ends where a term is expected"},
		{"missing joiner", strings.Replace(good, "gas Cl2", "gas Cl2 ph<3", 1), "expected `and` or `or`"},
		{"bad number", strings.Replace(good, "gas Cl2", "ph<low", 1), "\"low\" is not a number"},
		{"bad operator", strings.Replace(good, "gas Cl2", "ph=3", 1), "compare with <"},
		{"empty list", strings.Replace(good, "gas Cl2", "gas", 1), "needs a comma-separated list"},
		{"unknown placeholder", strings.Replace(good, "Chlorine.", "Chlorine {colour}.", 1), "placeholder {colour} is unknown"},
		{"missing limit", strings.Replace(good, "Chlorine.", "Chlorine {limit:IDLH}.", 1), "no `limit IDLH VALUE UNIT` line"},
		{"bad limit", good + "  limit IDLH ten ppm\n", "hazards.txt:7: rule a: limit \"IDLH ten ppm\""},
		{"unmatched brace", strings.Replace(good, "Chlorine.", "Chlorine }{.", 1), "unmatched brace"},
		{"bad releases", good + "  releases Cl-\n", "hazards.txt:7: rule a: releases"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := LoadHazardRules(fstest.MapFS{HazardFile: {Data: []byte(tc.text)}})
			if err == nil {
				t.Fatalf("LoadHazardRules accepted %q", tc.text)
			}
			if !strings.Contains(err.Error(), tc.want) {
				t.Errorf("error %q does not contain %q", err, tc.want)
			}
		})
	}
	if _, err := LoadHazardRules(fstest.MapFS{}); err == nil || !strings.Contains(err.Error(), "hazards.txt") {
		t.Errorf("missing file: error %v should name hazards.txt", err)
	}
	rules, err := LoadHazardRules(fstest.MapFS{HazardFile: {Data: []byte(good + "  message More.\n  limit IDLH 10 ppm\n")}})
	if err != nil {
		t.Fatalf("good rule rejected: %v", err)
	}
	if rules[0].Message != "Chlorine. More." {
		t.Errorf("message lines joined as %q", rules[0].Message)
	}
}

func TestHazardConditionLogic(t *testing.T) {
	mk := func(when string) []*HazardRule {
		text := "rule r\n  code c\n  severity info\n  when " + when + "\n  message m\n  source s\n"
		rules, err := LoadHazardRules(fstest.MapFS{HazardFile: {Data: []byte(text)}})
		if err != nil {
			t.Fatalf("when %q: %v", when, err)
		}
		return rules
	}
	in := HazardInput{Present: hzPresent(t, "Fe^3+", "Cl-", "Cu(s)"), Chemicals: []string{"FeCl3"}, PH: 2, TemperatureC: 30}
	tests := []struct {
		when string
		want bool
	}{
		{"present Fe^3+", true},
		{"present Fe^2+", false},
		{"present Cu", true},
		{"present Cu(s)", true},
		{"present Cu(aq)", false},
		{"present Fe^3+ and ph<3", true},
		{"present Fe^3+ and ph>=3", false},
		{"present Fe^2+ or ph<=2", true},
		{"not present Fe^2+", true},
		{"not ph<3 or chemical FeCl3", true},
		{"chemical FeCl2", false},
		{"temp>25 and temp<=30", true},
		{"rise>=0", false},
		{"not rise>=0", true},
		{"strong-acid", false},
		{"not strong-base", true},
		{"gas Cl2", false},
	}
	for _, tc := range tests {
		got := len(EvaluateHazards(mk(tc.when), in)) == 1
		if got != tc.want {
			t.Errorf("when %q = %v, want %v", tc.when, got, tc.want)
		}
	}
}

func FuzzLoadHazardRules(f *testing.F) {
	if b, err := os.ReadFile("../data/hazards.txt"); err == nil {
		f.Add(b)
	}
	f.Add([]byte("rule a\n  code toxic-gas\n  severity danger\n  when gas Cl2 or present CN- and ph<9.2\n  message {gas} {limit:IDLH}\n  limit IDLH 10 ppm\n  source s\n"))
	f.Add([]byte("rule a\n  when not\n"))
	f.Add([]byte("rule b\n  message {\n"))
	f.Fuzz(func(t *testing.T, b []byte) {
		rules, err := LoadHazardRules(fstest.MapFS{HazardFile: {Data: b}})
		if err != nil {
			if rules != nil {
				t.Fatalf("rules returned with error %v", err)
			}
			return
		}
		for _, r := range rules {
			if r.Code == "" || r.Message == "" || r.Source == "" || r.cond == nil {
				t.Fatalf("accepted incomplete rule %+v", r)
			}
		}
		in := HazardInput{Present: hzPresent(t, "CN-", "Cl-"), PH: 3, StrongAcidMol: 1, TemperatureRiseC: hzF(5),
			Gases: []GasRelease{{Text: "Cl2(g)", Mol: 1, VolumeL: 24}}}
		for _, h := range EvaluateHazards(rules, in) {
			if h.Code == "" || h.Message == "" {
				t.Fatalf("empty hazard %+v", h)
			}
		}
	})
}

func BenchmarkEvaluateHazards(b *testing.B) {
	rules := loadTestHazardRules(b)
	in := HazardInput{
		Present:          hzPresent(b, "HOCl", "Cl-", "H+", "Na+", "NH4+", "SO4^2-", "HSO4-", "Fe^3+", "H2O(l)"),
		Chemicals:        []string{"NaOCl", "HCl", "NH4Cl", "H2SO4"},
		PH:               1.2,
		TemperatureC:     20,
		TemperatureRiseC: hzF(12),
		StrongAcidMol:    5,
		Gases:            []GasRelease{{Text: "Cl2(g)", Mol: 2, VolumeL: 48.9, VolumeM3: 0.0489}},
		Reactions: []ReactionCase{
			{Label: "headline", Reaction: hzEq(b, "1 OCl-|1 Cl-|2 H+", "1 Cl2(g)|1 H2O(l)"), ECell: 0.3},
			{Label: "alternative", Reaction: hzEq(b, "2 OCl-", "2 Cl-|1 O2(g)"), ECell: 0.2},
		},
	}
	b.ReportAllocs()
	for b.Loop() {
		EvaluateHazards(rules, in)
	}
}
