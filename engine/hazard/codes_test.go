package hazard

import (
	"os"
	"strings"
	"testing"
)

// The README's table of hazard codes is the operators' and reviewers' list:
// every code the judgement can raise is in it with its title and aliases.
func TestREADMEListsEveryCode(t *testing.T) {
	b, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	readme := string(b)
	for _, c := range Codes() {
		row := "| `" + c.Code + "` | " + c.Title + " |"
		if !strings.Contains(readme, row) {
			t.Errorf("README.md has no row %q", row)
		}
	}
}
