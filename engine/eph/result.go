package eph

import (
	"bytes"
	"fmt"
	"io"

	"mixward/engine"
)

// ForResult builds the curves of a result's headline couples from the
// half-reaction table. ok is false when the result has no oxidizer–reducer
// pair (a no-reaction verdict) or names a couple the table lacks.
func ForResult(t *engine.Tables, r *engine.Result) (ox, red Curve, ok bool) {
	if r == nil || r.Oxidizer == nil || r.Reducer == nil {
		return Curve{}, Curve{}, false
	}
	var ho, hr *engine.HalfReaction
	for _, h := range t.Half {
		if h.ID == r.Oxidizer.ID {
			ho = h
		}
		if h.ID == r.Reducer.ID {
			hr = h
		}
	}
	if ho == nil || hr == nil {
		return Curve{}, Curve{}, false
	}
	T := r.Conditions.TemperatureK
	ox = FromHalfReaction(ho, r.Oxidizer.E, r.Conditions.PH, T)
	red = FromHalfReaction(hr, r.Reducer.E, r.Conditions.PH, T)
	ox.Label = r.Oxidizer.Species + " (" + ox.Label + ")"
	red.Label = r.Reducer.Species + " (" + red.Label + ")"
	return ox, red, true
}

// DrawResult writes the E–pH picture of a result's headline pair as PNG.
func DrawResult(w io.Writer, t *engine.Tables, r *engine.Result) error {
	ox, red, ok := ForResult(t, r)
	if !ok {
		return fmt.Errorf("eph: %s has no oxidizer–reducer pair to draw", r.Verdict)
	}
	title := fmt.Sprintf("%s with %s at %.0f °C", r.Oxidizer.Species, r.Reducer.Species, r.Conditions.TemperatureC)
	return Draw(w, ox, red, r.Conditions.PH, title)
}

// Plotter draws results from one set of tables; it satisfies the bot's
// plotter interface.
type Plotter struct{ Tables *engine.Tables }

// Plot returns the PNG of r's headline pair; ok is false when there is none.
func (p Plotter) Plot(r *engine.Result) (png []byte, ok bool, err error) {
	if _, _, ok := ForResult(p.Tables, r); !ok {
		return nil, false, nil
	}
	var b bytes.Buffer
	if err := DrawResult(&b, p.Tables, r); err != nil {
		return nil, false, err
	}
	return b.Bytes(), true, nil
}
