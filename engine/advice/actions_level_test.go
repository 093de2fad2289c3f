package advice_test

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"mixward/engine"
)

// TestActionsAgreeWithLevel is a property test over the golden requests:
// an answer that may be combined (with precautions, or of no concern)
// never tells the operator "Do not combine" or "Do not mix", and a
// do-not-mix answer whose reason holds at every rate of addition never
// suggests a rate or an order that would make the mix safely (the heat
// hazards' "run it in slowly with cooling").
func TestActionsAgreeWithLevel(t *testing.T) {
	a := mustAdvisor(t)
	b, err := os.ReadFile(filepath.Join("..", "..", "testdata", "golden", "decision", "requests.txt"))
	if err != nil {
		t.Fatal(err)
	}
	for _, line := range strings.Split(string(b), "\n") {
		name, req, ok := strings.Cut(strings.TrimSpace(line), " | ")
		if !ok || strings.HasPrefix(name, "#") {
			continue
		}
		for _, q := range []string{req, swapped(req)} {
			d := ask(t, a, q).Decision
			anyRate := false
			for _, x := range d.Actions {
				anyRate = anyRate || strings.HasPrefix(x, "Do not combine.") || strings.HasPrefix(x, "Do not combine, at any rate")
			}
			for _, x := range d.Actions {
				if d.Level != engine.DoNotMix && (strings.HasPrefix(x, "Do not combine") || strings.HasPrefix(x, "Do not mix")) {
					t.Errorf("%s (%s): level %s but the action says %q", name, q, d.Level, x)
				}
				if anyRate && strings.Contains(x, "run the concentrated liquid slowly into the water") {
					t.Errorf("%s (%s): a reason holds at any rate, yet the action says %q", name, q, x)
				}
			}
		}
	}
}
