package main

import (
	"context"
	"os"
	"testing"

	"github.com/rogpeppe/go-internal/testscript"
)

// TestMain lets the scripts in testdata/script run `mixward` as a real
// command: the test binary re-executes itself as mixward.
func TestMain(m *testing.M) {
	testscript.Main(m, map[string]func(){
		"mixward": func() {
			restrictUmask()
			os.Exit(run(context.Background(), os.Args[1:], os.Getenv, os.Stdin, os.Stdout, os.Stderr))
		},
	})
}

// TestScripts runs the command-line contract tests in testdata/script: the
// subcommands, flags, exit codes and JSON fields that integrations rely on.
func TestScripts(t *testing.T) {
	testscript.Run(t, testscript.Params{
		Dir: "testdata/script",
		Setup: func(env *testscript.Env) error {
			env.Setenv("MIXWARD_DB", env.WorkDir+"/mixward.db")
			env.Setenv("USER", "script-operator")
			return nil
		},
	})
}

func TestCSVText(t *testing.T) {
	for in, want := range map[string]string{
		"=HYPERLINK(\"x\")": "'=HYPERLINK(\"x\")", "+1": "'+1", "-5 L NaOCl": "'-5 L NaOCl", "@SUM(A1)": "'@SUM(A1)",
		"\tx": `'\tx`, "\x1b[2J=1": `\x1b[2J=1`, "=\x1b]0;x\x07": `'=\x1b]0;x\x07`, "mix T-102 + T-204": "mix T-102 + T-204", "": "",
	} {
		if got := csvText(in); got != want {
			t.Errorf("csvText(%q) = %q, want %q", in, got, want)
		}
	}
}
