package main

import (
	"bytes"
	"testing"

	"mixward/engine"
	"mixward/engine/eph"
)

// curvesFake gives two straight couples, as the engine will for a result.
type curvesFake struct{ ok bool }

func (c curvesFake) Curves(r *engine.Result) (ox, red eph.Curve, ok bool) {
	// Illustrative lines only (slopes from the Nernst factor, not data).
	return eph.NernstLine("HOCl/Cl2", 1.6, 0, 1, 1, 298.15), eph.NernstLine("Cl2/Cl-", 1.36, 0, 0, 1, 298.15), c.ok
}

func TestEPHPlotter(t *testing.T) {
	r := &engine.Result{Request: "mix 200 L NaOCl 12.5 % + 50 L HCl 10 %", Conditions: engine.Conditions{PH: 1.2}}
	png, ok, err := ephPlotter{curvesFake{ok: true}}.Plot(r)
	if err != nil || !ok || !bytes.HasPrefix(png, []byte("\x89PNG\r\n\x1a\n")) {
		t.Fatalf("Plot = %d bytes, ok %v, err %v; want a PNG", len(png), ok, err)
	}
	if _, ok, err := (ephPlotter{curvesFake{ok: false}}).Plot(r); ok || err != nil {
		t.Errorf("no curves: ok %v err %v, want nothing drawn", ok, err)
	}
}
