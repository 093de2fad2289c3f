package main

import (
	"testing"

	"mixward/bot"
	"mixward/data"
	"mixward/engine"
	"mixward/engine/advice"
)

// TestShortAnswerSize holds the short answer of real two-stream mixes to
// one phone screen: at most bot.ShortMaxBlocks blocks and
// bot.ShortMaxChars characters, within Block Kit's limits. (The blocks of
// hand-made answers are golden files in bot/testdata; the engine's own
// wording changes with its tables, so only the size is held here.)
func TestShortAnswerSize(t *testing.T) {
	eng, err := loadEngine()
	if err != nil {
		t.Fatal(err)
	}
	adv, err := advice.New(eng, data.FS)
	if err != nil {
		t.Fatal(err)
	}
	for name, req := range map[string]string{
		"hypochlorite_acid": "mix 200 L NaOCl 12.5 % + 50 L HCl 10 %",
		"cyanide_acid":      "mix 100 L NaCN 5 % + 20 L HCl 10 %",
		"caustic_water":     "mix 50 L NaOH 1 M + 50 L water",
	} {
		t.Run(name, func(t *testing.T) {
			r, err := adv.Ask(req, engine.AskOptions{})
			if err != nil {
				t.Fatal(err)
			}
			bl := bot.ShortBlocks(r, 1234)
			n := bot.BlockChars(bl)
			t.Logf("%s: %d blocks, %d characters", req, len(bl), n)
			if len(bl) > bot.ShortMaxBlocks || n > bot.ShortMaxChars {
				t.Errorf("short answer to %q: %d blocks and %d characters, want at most %d and %d", req, len(bl), n, bot.ShortMaxBlocks, bot.ShortMaxChars)
			}
			for _, m := range bot.SplitMessages(advice.RenderShort(r), bl) {
				if len(m.Blocks) > bot.MaxBlocks || len(m.Text) > bot.MaxFallback {
					t.Errorf("message of %d blocks, fallback %d bytes", len(m.Blocks), len(m.Text))
				}
			}
		})
	}
}
