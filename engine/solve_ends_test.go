package engine_test

import (
	"testing"
	"time"

	"mixward/engine"
)

// TestSolvesEnd: requests whose solve once ran for ever (a Newton loop that
// kept refreshing an activity coefficient that moved by a hair at every
// pass: a trace of aluminium in strong potassium hydroxide, the first point
// of pouring the metal into the lye) end, with an answer or an error, well
// within a minute.
func TestSolvesEnd(t *testing.T) {
	e := mustEngine(t)
	for _, q := range []string{
		"mix 100 L KOH 20 % + 5 g Al",
		"mix 100 L KOH 20 % + 5 kg Al",
		"mix 100 L H2SO4 10 % + 5 kg Cr",
	} {
		done := make(chan error, 1)
		go func() {
			_, err := e.Ask(q, engine.AskOptions{})
			done <- err
		}()
		select {
		case err := <-done:
			if err != nil {
				t.Logf("%s: %v", q, err)
			}
		case <-time.After(60 * time.Second):
			t.Fatalf("%s: no answer after a minute", q)
		}
	}
}
