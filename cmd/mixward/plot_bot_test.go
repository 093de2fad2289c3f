package main

import (
	"bytes"
	"testing"

	"mixward/engine"
)

// TestPlotterWired: serve hands the bot a plotter that draws the headline
// couples of a real answer, and nothing for a mix without a pair.
func TestPlotterWired(t *testing.T) {
	eng, err := loadEngine()
	if err != nil {
		t.Fatal(err)
	}
	p := plotterFor(eng)
	r, err := eng.Ask("mix 50 L NaOCl 12.5 % + 200 L HCl 10 %", engine.AskOptions{})
	if err != nil {
		t.Fatal(err)
	}
	png, ok, err := p.Plot(r)
	if err != nil || !ok || !bytes.HasPrefix(png, []byte("\x89PNG\r\n\x1a\n")) {
		t.Fatalf("Plot = %d bytes, ok %v, err %v; want a PNG", len(png), ok, err)
	}
	none, err := eng.Ask("200 L water", engine.AskOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if _, ok, err := p.Plot(none); ok || err != nil {
		t.Errorf("no pair: ok %v err %v, want nothing drawn", ok, err)
	}
}
