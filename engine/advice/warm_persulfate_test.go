package advice_test

import (
	"slices"
	"strings"
	"testing"
)

// TestWarmPersulfate: persulfate kept at 60 °C or more breaks down within a
// shift, giving off oxygen (half-life about a day at 60 °C, hours at
// 70–80 °C; Kolthoff and Miller 1951, from memory) and, in strong acid,
// Caro's acid. Tried as a new user would: 25 kg of sodium persulfate in 50 %
// sulfuric acid at 70 °C read "no gas of concern" with no word of it. Cold
// persulfate stays quiet.
func TestWarmPersulfate(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 25 kg sodium persulfate + 100 L sulfuric acid 50 % at 70 C")
	h, ok := hazardOf(r, "warm-persulfate")
	if !ok {
		t.Fatalf("hot persulfate in acid: codes %v, want warm-persulfate", hazardCodes(r))
	}
	// 25 kg / 238.1 g/mol = 105 mol persulfate: up to about 52 mol O2.
	if !strings.Contains(h.Message, "up to 52") || !strings.Contains(h.Message, "(Caro's) acid") {
		t.Errorf("hot persulfate in acid: %q, want up to about 52 mol oxygen and Caro's acid", h.Message)
	}
	for _, req := range []string{"mix 5 kg sodium persulfate + 100 L water", "mix 5 kg sodium persulfate + 100 L H2SO4 10 %"} {
		if r := ask(t, a, req); slices.Contains(hazardCodes(r), "warm-persulfate") {
			t.Errorf("%s: warm-persulfate on a cold mix", req)
		}
	}
}
