package eph_test

import (
	"bytes"
	"image/png"
	"testing"

	"mixward/data"
	"mixward/engine"
	"mixward/engine/eph"
)

func TestPlotResult(t *testing.T) {
	e, err := engine.New(data.FS)
	if err != nil {
		t.Fatal(err)
	}
	r, err := e.Ask("Zn + CuSO4 1 M", engine.AskOptions{})
	if err != nil {
		t.Fatal(err)
	}
	ox, red, ok := eph.ForResult(e.Tables, r)
	if !ok {
		t.Fatalf("ForResult found no curves for %s", r.Reaction.Text)
	}
	// At the mix pH the curves pass through the couples' Nernst potentials.
	pH := r.Conditions.PH
	if d := ox.E(pH) - r.Oxidizer.E; d*d > 1e-12 {
		t.Errorf("oxidizer curve at mix pH = %g, want %g", ox.E(pH), r.Oxidizer.E)
	}
	if d := red.E(pH) - r.Reducer.E; d*d > 1e-12 {
		t.Errorf("reducer curve at mix pH = %g, want %g", red.E(pH), r.Reducer.E)
	}
	b, ok, err := eph.Plotter{Tables: e.Tables}.Plot(r)
	if err != nil || !ok {
		t.Fatalf("Plot: ok=%v err=%v", ok, err)
	}
	if _, err := png.Decode(bytes.NewReader(b)); err != nil {
		t.Fatalf("Plot gave no PNG: %v", err)
	}
	none, err := e.Ask("200 L water", engine.AskOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if _, ok, err := (eph.Plotter{Tables: e.Tables}).Plot(none); ok || err != nil {
		t.Errorf("Plot(no reaction) = ok %v, err %v; want no picture and no error", ok, err)
	}
}
