package advice_test

import "testing"

// BenchmarkAskTwoStreams is a whole answer with the pour: 2 orders × 23
// points, each a full prediction judged through the Outcome.
func BenchmarkAskTwoStreams(b *testing.B) {
	a := mustAdvisor(b)
	b.ReportAllocs()
	for b.Loop() {
		ask(b, a, "mix 200 L NaOCl 12.5 % + 1500 L HCl 0.1 %")
	}
}

// BenchmarkAskThreeStreams: three pairs, both orders each (138 points).
func BenchmarkAskThreeStreams(b *testing.B) {
	a := mustAdvisor(b)
	b.ReportAllocs()
	for b.Loop() {
		ask(b, a, "mix 200 L NaOCl 12.5 % + 50 L HCl 10 % + 100 L water at 20 C")
	}
}
