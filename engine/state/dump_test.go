package state

import (
	"encoding/json"
	"os"
	"path/filepath"
	"testing"

	"mixward/engine/equilibrium"
)

// TestDumpProblems writes equilibrium problems built from real feeds to
// MIXWARD_DUMP_PROBLEMS (a directory), for working on the solver.
func TestDumpProblems(t *testing.T) {
	dir := os.Getenv("MIXWARD_DUMP_PROBLEMS")
	if dir == "" {
		t.Skip("set MIXWARD_DUMP_PROBLEMS to a directory to write solver problems")
	}
	dump = func(name string, p equilibrium.Problem) {
		b, _ := json.MarshalIndent(p, "", " ")
		os.WriteFile(filepath.Join(dir, name+".json"), b, 0o644)
	}
	defer func() { dump = nil }()
	m, err := NewModel(loadDB(t), dataFS())
	if err != nil {
		t.Fatal(err)
	}
	for name, f := range sampleFeeds(t, m) {
		dumpPrefix = name
		_, err := m.Solve(f)
		t.Logf("%s: %v", name, err)
	}
}
