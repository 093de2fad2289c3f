package bot

import (
	"encoding/json"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/slack-go/slack"

	"mixward/engine"
)

var update = flag.Bool("update", false, "rewrite testdata/*.golden")

func fp(v float64) *float64 { return &v }

// goldenResult is a hand-made answer with every part filled in; the
// numbers exercise rendering only and are not chemistry checks.
func goldenResult() *engine.Result {
	lim := "HCl"
	return &engine.Result{
		Request: "mix T-102 + 50 L HCl 10 %",
		Streams: []engine.StreamOut{{Text: "200 L NaOCl 12.5 %", Tag: "T-102"}, {Text: "50 L HCl 10 %"}},
		Species: []engine.SpeciesInfo{
			{Text: "HOCl", Roles: []engine.Role{engine.OxidizerRole, engine.ReducerRole}, Molar: 0.233},
			{Text: "Cl-", Roles: []engine.Role{engine.ReducerRole}, Molar: 2.54},
			{Text: "Na+", Spectator: true, Molar: 0.233},
			{Text: "H2O(l)", Roles: []engine.Role{engine.ReducerRole}, Excess: true},
		},
		Oxidizer:      &engine.Couple{Species: "HOCl", HalfReaction: "2 HOCl + 2 H+ + 2 e- → Cl2(g) + 2 H2O(l)", EStandard: 1.611, E: 1.595},
		Reducer:       &engine.Couple{Species: "Cl-", HalfReaction: "2 Cl- → Cl2(g) + 2 e-", EStandard: 1.358, E: 1.334},
		Reaction:      &engine.Reaction{Text: "HOCl + H+ + Cl- → Cl2(g) + H2O(l)", Electrons: 1},
		ECellStandard: fp(0.253),
		ECell:         fp(0.261),
		Verdict:       engine.Spontaneous,
		DeltaGkJ:      fp(-25.1),
		Log10K:        fp(4.3),
		Alternatives: []engine.Alternative{{Oxidizer: &engine.Couple{Species: "HOCl"}, Reducer: &engine.Couple{Species: "H2O(l)"},
			Reaction: &engine.Reaction{Text: "4 HOCl → 2 H2O(l) + 2 Cl2(g) + O2(g)"}, ECell: 0.345, Note: "kinetically slow here"}},
		Allowance: &engine.Allowance{ID: "o2-evolution", Volts: 0.5, Reason: "oxygen evolution needs an overpotential"},
		Hazards: []engine.Hazard{
			{Code: "oxygen-enrichment", Severity: engine.Warning, Message: "Oxygen gas will be released."},
			{Code: "toxic-gas", Severity: engine.Danger, Message: "Chlorine gas will be released. Do not mix."},
			{Code: "corrosive", Severity: engine.Info, Message: "The mix is corrosive & <acidic>."},
		},
		Cautions: []string{"Advisory only, not a permit to mix. Confirm with the safety data sheets."},
		Amounts: &engine.Amounts{Limiting: &lim, ExtentMol: 137,
			Consumed: []engine.AmountOf{{Text: "HOCl", Mol: 137}}, Formed: []engine.AmountOf{{Text: "Cl2(g)", Mol: 137}}},
		Gases:      []engine.GasRelease{{Text: "Cl2(g)", Mol: 396, VolumeL: 9696, VolumeM3: 9.7}},
		Heat:       &engine.Heat{HeatReleasedkJ: fp(950), TemperatureRiseC: fp(0.13), NeutralisationkJ: 400, Assumption: "heat capacity of water"},
		Caveats:    []string{"close competitors react almost as readily"},
		Notes:      []string{"hypochlorite % read as % NaOCl by weight"},
		Conditions: engine.Conditions{PH: -0.36, TemperatureC: 25, VolumeL: 250, Medium: engine.Acid},
	}
}

func golden(t *testing.T, name string, got []byte) {
	t.Helper()
	path := filepath.Join("testdata", name)
	if *update {
		if err := os.MkdirAll("testdata", 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, got, 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test ./bot -run %s -update to create it)", err, t.Name())
	}
	if string(got) != string(want) {
		t.Errorf("%s differs from the golden file; run with -update if the change is intended\n got:\n%s", path, got)
	}
}

func TestResultBlocksGolden(t *testing.T) {
	bl := ResultBlocks(goldenResult(), 42)
	js, err := json.MarshalIndent(bl, "", "  ")
	if err != nil {
		t.Fatal(err)
	}
	golden(t, "result_blocks.golden", append(js, '\n'))
	if err := checkLimits(SplitMessages(engine.RenderText(goldenResult()), bl)); err != nil {
		t.Error(err)
	}
}

func TestParseErrorReplyGolden(t *testing.T) {
	pe := &engine.ParseError{Code: "unknown-chemical", Message: `"NaOCL" is not a chemical mixward knows`, Position: 11, Token: "NaOCL", Suggestions: []string{"NaOCl", "NaOH"}}
	r := parseErrorReply("mix 200 L NaOCL 12.5 % + 50 L HCl 10 %", pe, 7)
	js, _ := json.MarshalIndent(r.Blocks, "", "  ")
	golden(t, "parse_error.golden", []byte(r.Text+"\n----\n"+string(js)+"\n"))
}

func TestHazardsDangerFirst(t *testing.T) {
	got := SortHazards(goldenResult().Hazards)
	var order []string
	for _, h := range got {
		order = append(order, string(h.Severity))
	}
	if strings.Join(order, ",") != "danger,warning,info" {
		t.Errorf("hazard order = %v", order)
	}
}

// checkLimits applies Slack's Block Kit limits to messages.
func checkLimits(msgs []Message) error {
	for i, m := range msgs {
		if len(m.Blocks) > MaxBlocks {
			return fmt.Errorf("message %d has %d blocks", i, len(m.Blocks))
		}
		if len(m.Text) > MaxFallback || !utf8.ValidString(m.Text) {
			return fmt.Errorf("message %d fallback is %d bytes or not UTF-8", i, len(m.Text))
		}
		for j, b := range m.Blocks {
			switch b := b.(type) {
			case *slack.HeaderBlock:
				if n := utf8.RuneCountInString(b.Text.Text); n > MaxHeaderChars {
					return fmt.Errorf("message %d block %d: header of %d characters", i, j, n)
				}
			case *slack.SectionBlock:
				if n := utf8.RuneCountInString(b.Text.Text); n > MaxSectionText || n == 0 || !utf8.ValidString(b.Text.Text) {
					return fmt.Errorf("message %d block %d: section text of %d characters", i, j, n)
				}
			case *slack.ContextBlock:
				for _, e := range b.ContextElements.Elements {
					if tx, ok := e.(*slack.TextBlockObject); ok && utf8.RuneCountInString(tx.Text) > MaxContextText {
						return fmt.Errorf("message %d block %d: context text too long", i, j)
					}
				}
			}
		}
	}
	return nil
}

func TestHugeResultIsSplitWithinLimits(t *testing.T) {
	r := goldenResult()
	r.Request = strings.Repeat("mix 1 L NaOCl 12.5 % + ", 40) + "1 L HCl"
	for i := range 400 {
		r.Species = append(r.Species, engine.SpeciesInfo{Text: fmt.Sprintf("Species-%03d with a long descriptive name ∑", i), Molar: 0.1})
	}
	for i := range 300 {
		r.Hazards = append(r.Hazards, engine.Hazard{Code: fmt.Sprint("h", i), Severity: engine.Warning, Message: strings.Repeat("careful ", 30)})
	}
	r.Caveats = append(r.Caveats, strings.Repeat("x", 7000)) // one line longer than a section
	bl := ResultBlocks(r, 1)
	msgs := SplitMessages(engine.RenderText(r), bl)
	if len(msgs) < 2 {
		t.Errorf("%d blocks went into %d message(s); expected a continuation", len(bl), len(msgs))
	}
	if err := checkLimits(msgs); err != nil {
		t.Error(err)
	}
	if msgs[0].Blocks[0].BlockType() != slack.MBTHeader {
		t.Errorf("first block is %s, want the header", msgs[0].Blocks[0].BlockType())
	}
	if !strings.Contains(msgs[1].Text, "continued") {
		t.Errorf("continuation fallback = %q", msgs[1].Text)
	}
	// Nothing is lost: every species and hazard appears somewhere.
	var all strings.Builder
	for _, m := range msgs {
		js, _ := json.Marshal(m.Blocks)
		all.Write(js)
	}
	for _, want := range []string{"Species-000", "Species-399", "h0)", "h299)"} {
		if !strings.Contains(all.String(), want) {
			t.Errorf("split messages lost %q", want)
		}
	}
}

func TestSplitText(t *testing.T) {
	for _, tc := range []struct {
		in    string
		limit int
		want  []string
	}{
		{"short", 10, []string{"short"}},
		{"", 10, []string{""}},
		{"line one\nline two\nline three", 18, []string{"line one\nline two", "line three"}},
		{"aaaa bbbb cccc", 9, []string{"aaaa bbbb", "cccc"}},
		{"abcdefghij", 4, []string{"abcd", "efgh", "ij"}},
		{"ééééé", 5, []string{"éé", "éé", "é"}}, // never cut inside a rune
	} {
		got := splitText(tc.in, tc.limit)
		if strings.Join(got, "|") != strings.Join(tc.want, "|") {
			t.Errorf("splitText(%q, %d) = %q, want %q", tc.in, tc.limit, got, tc.want)
		}
	}
}

func FuzzSplitText(f *testing.F) {
	f.Add("line one\nline two", 5)
	f.Add("ééé ∑∑∑ abc", 3)
	f.Fuzz(func(t *testing.T, s string, limit int) {
		if limit < 4 || limit > 5000 || !utf8.ValidString(s) {
			return
		}
		parts := splitText(s, limit)
		kept := 0
		for _, p := range parts {
			if len(p) > limit {
				t.Fatalf("part of %d bytes > limit %d", len(p), limit)
			}
			if !utf8.ValidString(p) {
				t.Fatalf("part %q is not UTF-8", p)
			}
			kept += len(strings.Join(strings.Fields(p), ""))
		}
		if want := len(strings.Join(strings.Fields(s), "")); kept != want {
			t.Fatalf("split kept %d non-space bytes of %d", kept, want)
		}
	})
}

func TestTruncate(t *testing.T) {
	if got := truncate("ééé", 5); got != "é…" {
		t.Errorf("truncate = %q", got)
	}
	if got := truncate("abc", 3); got != "abc" {
		t.Errorf("truncate = %q", got)
	}
}

func TestAlternativesCapped(t *testing.T) {
	r := goldenResult()
	for i := range 6 {
		r.Alternatives = append(r.Alternatives, engine.Alternative{Oxidizer: &engine.Couple{Species: fmt.Sprint("Ox", i)}, Reducer: &engine.Couple{Species: "R"}, Note: strings.Repeat("slow ", 60)})
	}
	lines := potentialLines(r)
	text := strings.Join(lines, "\n")
	if n := strings.Count(text, "Also possible"); n != maxAlternatives {
		t.Errorf("%d alternatives listed, want %d", n, maxAlternatives)
	}
	if !strings.Contains(text, "and 4 more pairs") {
		t.Errorf("no count of the rest:\n%s", text)
	}
}

// TestDecisionIsTheFirstBlock: an answer with a decision leads with it
// (level and reason), then what to do; the redox verdict stays beside the
// request.
func TestDecisionIsTheFirstBlock(t *testing.T) {
	r := &engine.Result{
		Request: "mix 1 L NaCN 5 % + 1 L HCl 10 %",
		Verdict: engine.NonSpontaneous,
		Hazards: []engine.Hazard{{Code: "hcn-release", Severity: engine.Danger, Message: "Hydrogen cyanide ..."}},
		Decision: &engine.Decision{Level: engine.DoNotMix, Title: "releases hydrogen cyanide",
			Actions: []string{"Do not combine."}},
	}
	bl := ResultBlocks(r, 7)
	h, ok := bl[0].(*slack.HeaderBlock)
	if !ok {
		t.Fatalf("first block is %s, want the decision header", bl[0].BlockType())
	}
	if got := h.Text.Text; got != ":red_circle: DO NOT MIX: releases hydrogen cyanide" {
		t.Errorf("first block %q", got)
	}
	s, ok := bl[1].(*slack.SectionBlock)
	if !ok || !strings.Contains(s.Text.Text, "What to do") || !strings.Contains(s.Text.Text, "Do not combine.") {
		t.Errorf("second block is not the actions: %#v", bl[1])
	}
	c, ok := bl[2].(*slack.ContextBlock)
	if !ok || len(c.ContextElements.Elements) == 0 || !strings.Contains(c.ContextElements.Elements[0].(*slack.TextBlockObject).Text, "NOT SPONTANEOUS") {
		t.Errorf("the redox verdict is not beside the request: %#v", bl[2])
	}
	for _, lv := range []struct {
		level engine.Level
		mark  string
	}{{engine.WithPrecautions, ":large_orange_circle: MIX ONLY WITH PRECAUTIONS"}, {engine.NoConcern, ":large_green_circle: NO CONCERN"}} {
		r.Decision.Level = lv.level
		if got := VerdictTitle(r); !strings.HasPrefix(got, lv.mark) {
			t.Errorf("VerdictTitle = %q, want prefix %q", got, lv.mark)
		}
	}
}

// TestEscapeControls: control, escape and bidi characters in user text are
// shown escaped in chat, and mrkdwn specials cannot ping a channel.
func TestEscapeControls(t *testing.T) {
	got := esc("mix \x1b[2J<!here> & \u202eevil")
	for _, bad := range []string{"\x1b", "<!here>", "\u202e"} {
		if strings.Contains(got, bad) {
			t.Errorf("esc left %q in %q", bad, got)
		}
	}
	if !strings.Contains(got, `\x1b`) || !strings.Contains(got, "&lt;!here&gt;") {
		t.Errorf("esc = %q, want the escape shown and the mention escaped", got)
	}
}

func TestChatTextKeepsLines(t *testing.T) {
	got := chatText("Request: mix \x1b[31mX\nnext line\u202e")
	if got != "Request: mix \\x1b[31mX\nnext line\\u202e" {
		t.Errorf("chatText = %q", got)
	}
}
