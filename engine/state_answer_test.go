package engine_test

import (
	"errors"
	"testing"

	"mixward/engine"
)

// TestWithheldChemical: a chemical known by name but without species data is
// refused with a clear message, never answered as if it were absent.
func TestWithheldChemical(t *testing.T) {
	e := mustEngine(t)
	_, err := e.Ask("mix 1 L carbohydrazide 10 % + 1 L NaOCl 5 %", engine.AskOptions{})
	var pe *engine.ParseError
	if !errors.As(err, &pe) || pe.Code != "withheld" {
		t.Fatalf("Ask = %v, want a withheld error", err)
	}
	if pe.Token != "carbohydrazide" || pe.Position != 9 {
		t.Errorf("withheld error points at %q (position %d), want the chemical's name at 9", pe.Token, pe.Position)
	}
}
