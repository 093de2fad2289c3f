package engine_test

import (
	"testing"

	"mixward/engine"
)

// BenchmarkAsk parses and predicts a typical three-stream request.
func BenchmarkAsk(b *testing.B) {
	e := mustEngine(b)
	const req = "mix 200 L NaOCl 12.5 % + 50 L HCl 10 % + 100 L water at 20 C"
	b.ReportAllocs()
	for b.Loop() {
		if _, err := e.Ask(req, engine.AskOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkAskWithAmounts is a five-stream request whose headline reaction
// is followed by follow-on reactions on what is left.
func BenchmarkAskWithAmounts(b *testing.B) {
	e := mustEngine(b)
	const req = "mix 100 L KMnO4 0.05 M + 200 L FeSO4 0.2 M + 50 L H2SO4 20 % + 20 kg Zn + 100 L CuSO4 0.1 M"
	r, err := e.Ask(req, engine.AskOptions{})
	if err != nil {
		b.Fatal(err)
	}
	if len(r.Steps) == 0 {
		b.Fatalf("the benchmark request has no follow-on reactions: %s", r.Reaction.Text)
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := e.Ask(req, engine.AskOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkAskEightStreams is an eight-stream request: the solve must not
// grow worse than quadratically with the species it brings.
func BenchmarkAskEightStreams(b *testing.B) {
	e := mustEngine(b)
	const req = "mix 100 L NaOH 5 % + 50 L HCl 10 % + 20 L FeCl3 10 % + 30 L CuSO4 5 % + 10 L H2O2 3 % + 40 L Na2CO3 5 % + 25 L NiSO4 5 % + 100 L water"
	b.ReportAllocs()
	for b.Loop() {
		if _, err := e.Ask(req, engine.AskOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkParseRequest measures the parser alone.
func BenchmarkParseRequest(b *testing.B) {
	e := mustEngine(b)
	const req = "mix 200 L NaOCl 12.5 % + 50 L hydrochloric acid 10 % + 100 L water, NaOH 2 %, pH 12 at 20 C"
	b.ReportAllocs()
	for b.Loop() {
		if _, err := engine.ParseRequest(req, e.Tables, nil); err != nil {
			b.Fatal(err)
		}
	}
}
