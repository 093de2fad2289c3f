package advice_test

import (
	"flag"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"mixward/engine"
	"mixward/engine/advice"
)

var update = flag.Bool("update", false, "rewrite the golden answers in ../../testdata/golden/decision")

// TestGoldenDecisions answers each invented-plant request as written and
// with its two streams swapped, compares the short answer and the pour with
// testdata/golden/decision, and checks that the decision does not depend on
// the order the streams are listed in. Run with -update after a deliberate
// change and read the diff.
func TestGoldenDecisions(t *testing.T) {
	a := mustAdvisor(t)
	dir := filepath.Join("..", "..", "testdata", "golden", "decision")
	b, err := os.ReadFile(filepath.Join(dir, "requests.txt"))
	if err != nil {
		t.Fatal(err)
	}
	for _, line := range strings.Split(string(b), "\n") {
		line = strings.TrimSpace(line)
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		name, req, ok := strings.Cut(line, " | ")
		if !ok {
			t.Fatalf("requests.txt: %q is not \"name | request\"", line)
		}
		t.Run(name, func(t *testing.T) {
			ab := ask(t, a, req)
			ba := ask(t, a, swapped(req))
			if ab.Decision == nil || ba.Decision == nil {
				t.Fatal("no decision")
			}
			if ab.Decision.Level != ba.Decision.Level {
				t.Errorf("decision %s as written, %s with the streams swapped", ab.Decision.Level, ba.Decision.Level)
			}
			got := goldenText(ab) + "\n--- streams swapped: " + swapped(req) + "\n" + goldenText(ba)
			path := filepath.Join(dir, name+".txt")
			if *update {
				if err := os.WriteFile(path, []byte(got), 0o644); err != nil {
					t.Fatal(err)
				}
				return
			}
			want, err := os.ReadFile(path)
			if err != nil {
				t.Fatalf("%v (run with -update to create it)", err)
			}
			if got != string(want) {
				t.Errorf("answer differs from %s (run with -update and read the diff)\ngot:\n%s", path, got)
			}
		})
	}
}

// swapped writes "mix B + A [conditions]" for "mix A + B [conditions]".
func swapped(req string) string {
	body := strings.TrimPrefix(req, "mix ")
	cond := ""
	if i := strings.Index(body, " at "); i >= 0 {
		body, cond = body[:i], body[i:]
	}
	x, y, _ := strings.Cut(body, " + ")
	return "mix " + y + " + " + x + cond
}

func goldenText(r *engine.Result) string {
	var b strings.Builder
	b.WriteString(advice.RenderShort(r))
	b.WriteString("level: " + string(r.Decision.Level) + "\n")
	for _, o := range r.Addition.Orders {
		b.WriteString("pour " + o.Added + " into " + o.Into + ":")
		if len(o.Hazards) == 0 {
			b.WriteString(" nothing of concern")
		}
		for _, h := range o.Hazards {
			b.WriteString(" " + h.Code + " " + string(h.Worst) + " " + trimF(h.FromFraction) + "–" + trimF(h.ToFraction) + ";")
		}
		b.WriteString("\n")
	}
	b.WriteString("advice: " + r.Addition.Advice + "\n")
	return b.String()
}

func trimF(f float64) string {
	s := strings.TrimRight(strings.TrimRight(strconvF(f), "0"), ".")
	if s == "" {
		return "0"
	}
	return s
}

func strconvF(f float64) string { return strconv.FormatFloat(f, 'f', 4, 64) }
