package bot

import (
	"encoding/json"
	"fmt"
	"strings"
	"testing"
	"time"

	"github.com/slack-go/slack"

	"mixward/engine"
	"mixward/store"
)

// decidedResult is goldenResult with the operator's decision and the pour
// filled in, as the advisor answers (hand-made; rendering only).
func decidedResult() *engine.Result {
	r := goldenResult()
	r.Decision = &engine.Decision{Level: engine.DoNotMix, Title: "releases chlorine gas",
		Reasons:    []string{"Cl2 396 mol (9,700 L), headspace 4e+06 ppm = 4e+06× IDLH 10 ppm"},
		Actions:    []string{"Do not combine these streams.", "Keep NaOCl and acids apart: separate drains and bunds.", "If mixed by accident: leave the area, ventilate, call the site emergency number.", "Check the SDS of both streams."},
		Heat:       &engine.HeatJudged{ReleasedkJ: 950, ReachedC: 25.9},
		HeadspaceL: 250,
		Held:       []string{},
		Gases:      []engine.GasRelease{{Text: "Cl2(g)", Mol: 396, VolumeL: 9696}},
	}
	r.Addition = &engine.Addition{Points: 18, Advice: "Neither order avoids the chlorine: do not combine.",
		Orders: []engine.PourOrder{
			{Added: "HCl 10 %", Into: "T-102", Hazards: []engine.PourHazard{{Code: "toxic-gas", FromFraction: 0.01, ToFraction: 1, Worst: engine.Danger}}},
			{Added: "T-102", Into: "HCl 10 %", Hazards: []engine.PourHazard{{Code: "toxic-gas", FromFraction: 0.001, ToFraction: 1, Worst: engine.Danger}}},
		}}
	return r
}

// checkShort holds a short answer to its size on a phone and Slack's limits.
func checkShort(t *testing.T, bl []slack.Block) {
	t.Helper()
	if len(bl) > ShortMaxBlocks {
		t.Errorf("short answer has %d blocks, want at most %d", len(bl), ShortMaxBlocks)
	}
	if n := BlockChars(bl); n > ShortMaxChars {
		t.Errorf("short answer has %d characters, want at most %d", n, ShortMaxChars)
	}
	if err := checkLimits(SplitMessages("fallback", bl)); err != nil {
		t.Error(err)
	}
}

func TestShortBlocksGolden(t *testing.T) {
	r := decidedResult()
	bl := ShortBlocks(r, 42)
	js, err := json.MarshalIndent(bl, "", "  ")
	if err != nil {
		t.Fatal(err)
	}
	golden(t, "short_blocks.golden", append(js, '\n'))
	checkShort(t, bl)
	h := bl[0].(*slack.HeaderBlock)
	if h.Text.Text != ":red_circle: DO NOT MIX: releases chlorine gas" {
		t.Errorf("header %q, want the decision with its marker", h.Text.Text)
	}
	a, ok := bl[len(bl)-1].(*slack.ActionBlock)
	if !ok || len(a.Elements.ElementSet) != 4 {
		t.Fatalf("last block is not the four buttons: %#v", bl[len(bl)-1])
	}
	for i, want := range []string{ActionDetails, ActionPicture, ActionPour, ActionNewMix} {
		if b := a.Elements.ElementSet[i].(*slack.ButtonBlockElement); b.ActionID != want {
			t.Errorf("button %d is %s, want %s", i, b.ActionID, want)
		}
	}
	all := string(js)
	for _, want := range []string{"Forms:", "Heat:", "Do not combine these streams.", "Net:", "HOCl + H+ + Cl- → Cl2(g) + H2O(l)", "Query #42", "(1 more under Details)"} {
		if !strings.Contains(all, want) {
			t.Errorf("short answer lacks %q", want)
		}
	}
	// Not logged: no buttons (a press is recorded against its query).
	if bl := ShortBlocks(r, 0); bl[len(bl)-1].BlockType() == slack.MBTAction {
		t.Errorf("an unlogged answer has buttons")
	}
}

func TestDetailsAndPourGolden(t *testing.T) {
	r := decidedResult()
	det := DetailsBlocks(r, 42)
	if err := checkLimits(SplitMessages("fallback", det)); err != nil {
		t.Error(err)
	}
	js, _ := json.MarshalIndent(det, "", "  ")
	for _, want := range []string{"*Why*", "IDLH", "Species present", "Half-reactions", "*Pour order*", "HCl 10 % into T-102"} {
		if !strings.Contains(string(js), want) {
			t.Errorf("details lack %q", want)
		}
	}
	golden(t, "pour.golden", []byte(PourText(r)+"\n"))
}

func TestDigestSummaryWithinLimits(t *testing.T) {
	d := &store.Digest{Since: time.Date(2026, 12, 1, 6, 0, 0, 0, time.UTC), Until: time.Date(2026, 12, 1, 18, 0, 0, 0, time.UTC),
		Queries: 40, HeadID: 77, HeadHash: strings.Repeat("ab", 32)}
	for i := range 30 {
		d.Mixes = append(d.Mixes, store.MixLine{Level: store.LevelDoNotMix, Mix: fmt.Sprintf("T-%d <!here> + %s", i, strings.Repeat("x", 200)),
			Count: i + 1, People: 2, Codes: []string{"toxic-gas"}, QueryIDs: []int64{1, 9}})
	}
	r := DigestReply(d)
	msgs := SplitMessages(r.Fallback, r.Blocks)
	if len(msgs) != 1 {
		t.Fatalf("digest summary is %d messages, want 1", len(msgs))
	}
	if err := checkLimits(msgs); err != nil {
		t.Error(err)
	}
	js, _ := json.Marshal(r.Blocks)
	if strings.Contains(string(js), "<!here>") || !strings.Contains(string(js), "22 more in the attached file") || !strings.Contains(string(js), d.HeadHash) {
		t.Errorf("summary blocks: %s", js)
	}
	if r.File == nil || !strings.Contains(string(r.File.Content), "T-29") || !strings.HasSuffix(r.File.Name, ".txt") {
		t.Errorf("digest file = %+v, want the whole digest as text", r.File)
	}
}

func TestFormRequest(t *testing.T) {
	for _, tc := range []struct {
		name string
		in   FormInput
		want string
		errs []string
	}{
		{"tags and typed", FormInput{Tags: []string{"T-102"}, Streams: "50 L HCl 10 %"}, "mix T-102 + 50 L HCl 10 %", nil},
		{"amounts for tags", FormInput{Tags: []string{"T-102", "T-204"}, Amounts: "200 L; 50 L"}, "mix 200 L T-102 + 50 L T-204", nil},
		{"conditions", FormInput{Streams: "1 L NaOCl 12.5 %\n\n 1 L  HCl 10 % ", Temp: "40 °C", PH: "3"}, "mix 1 L NaOCl 12.5 % + 1 L HCl 10 % at 40 C at pH 3", nil},
		{"a whole request typed", FormInput{Streams: "mix 1 L A + 1 L B"}, "mix 1 L A + 1 L B", nil},
		{"empty", FormInput{}, "mix ", []string{FieldStreams}},
		{"amounts do not match", FormInput{Tags: []string{"T-1"}, Amounts: "1 L, 2 L"}, "mix T-1", []string{FieldAmounts}},
		{"bad numbers", FormInput{Streams: "1 L A", Temp: "hot", PH: "99"}, "mix 1 L A", []string{FieldTemp, FieldPH}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			got, _, errs := tc.in.Request()
			if got != tc.want {
				t.Errorf("Request() = %q, want %q", got, tc.want)
			}
			if len(errs) != len(tc.errs) {
				t.Errorf("errors = %v, want on %v", errs, tc.errs)
			}
			for _, f := range tc.errs {
				if errs[f] == "" {
					t.Errorf("no error on %s: %v", f, errs)
				}
			}
		})
	}
	// A parse error lands on the field its character came from.
	text, parts, _ := FormInput{Tags: []string{"T-102"}, Streams: "2 L bad", Temp: "30"}.Request()
	for pos, field := range map[int]string{5: FieldTags, strings.Index(text, "bad") + 1: FieldStreams, len([]rune(text)): FieldTemp} {
		if got := FormErrors(parts, &engine.ParseError{Message: "x", Position: pos}); got[field] == "" {
			t.Errorf("error at %d of %q went to %v, want %s", pos, text, got, field)
		}
	}
}

func FuzzFormRequest(f *testing.F) {
	f.Add("T-102,T-204", "200 L, 50 L", "1 L NaOCl 12.5 %\n1 L HCl 10 %", "40", "3", 7)
	f.Add("", "", "mix 1 L A + ", "°C", "-", 0)
	f.Fuzz(func(t *testing.T, tags, amounts, streams, temp, ph string, pos int) {
		in := FormInput{Tags: splitList(tags), Amounts: amounts, Streams: streams, Temp: temp, PH: ph}
		text, parts, errs := in.Request()
		if len(errs) == 0 && !strings.HasPrefix(text, "mix ") {
			t.Errorf("Request() = %q without errors, want a mix request", text)
		}
		n := len([]rune(text))
		for _, p := range parts {
			if p.start < 0 || p.end > n || p.start > p.end {
				t.Errorf("part %+v outside %q", p, text)
			}
		}
		if e := FormErrors(parts, &engine.ParseError{Message: "m", Position: pos}); len(e) != 1 {
			t.Errorf("FormErrors gave %v, want one field", e)
		}
	})
}
