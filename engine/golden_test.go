package engine_test

import (
	"encoding/json"
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"mixward/engine"
)

var update = flag.Bool("update", false, "rewrite the golden answers in ../testdata/golden")

// TestGoldenAnswers renders the full text and JSON answers of the demo
// requests and compares them with the files in testdata/golden. Run
// `go test ./engine -run Golden -update` after a deliberate change, and read
// the diff before committing it.
func TestGoldenAnswers(t *testing.T) {
	dir := filepath.Join("..", "testdata", "golden")
	b, err := os.ReadFile(filepath.Join(dir, "requests.txt"))
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	for _, line := range strings.Split(string(b), "\n") {
		line = strings.TrimSpace(line)
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		name, req, ok := strings.Cut(line, " | ")
		if !ok {
			t.Fatalf("requests.txt: %q is not \"name | request\"", line)
		}
		n++
		t.Run(name, func(t *testing.T) {
			r := ask(t, req)
			js, err := json.MarshalIndent(r, "", "  ")
			if err != nil {
				t.Fatal(err)
			}
			compareGolden(t, filepath.Join(dir, name+".txt"), engine.RenderText(r))
			compareGolden(t, filepath.Join(dir, name+".json"), string(js)+"\n")
		})
	}
	if n < 10 {
		t.Errorf("only %d golden requests", n)
	}
}

func compareGolden(t *testing.T, path, got string) {
	t.Helper()
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
		t.Errorf("%s differs from the golden file; run `go test ./engine -run Golden -update` if the change is intended.\n--- got\n%s", path, got)
	}
}
