package main

import (
	"bytes"
	"context"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
)

// roChildEnv names the arguments the child process of
// TestReadOnlyDirectory runs (separated by newlines).
const roChildEnv = "MIXWARD_TEST_RO_CHILD"

// TestReadOnlyDirChild is the child of TestReadOnlyDirectory: it runs one
// mixward command and exits with its code.
func TestReadOnlyDirChild(t *testing.T) {
	args := os.Getenv(roChildEnv)
	if args == "" {
		t.Skip("helper process for TestReadOnlyDirectory")
	}
	os.Exit(run(context.Background(), strings.Split(args, "\n"), os.Getenv, strings.NewReader(""), os.Stdout, os.Stderr))
}

// TestReadOnlyDirectory runs the read-only commands on a log in a
// directory the process may not write to, as a service account reading
// the bot's log would: they work and create nothing. Run as root, the
// commands run in a child process as user nobody (root may write anywhere).
func TestReadOnlyDirectory(t *testing.T) {
	dir, err := os.MkdirTemp("", "mixward-rodir-")
	if err != nil {
		t.Fatal(err)
	}
	defer os.RemoveAll(dir)
	path := filepath.Join(dir, "mixward.db")
	seedLog(t, path)
	os.Chmod(path, 0o644)
	os.Chmod(dir, 0o555)
	defer os.Chmod(dir, 0o755)
	runAs := func(args ...string) (int, string) {
		if os.Geteuid() != 0 {
			var out bytes.Buffer
			code := run(context.Background(), args, func(string) string { return "" }, strings.NewReader(""), &out, &out)
			return code, out.String()
		}
		return runAsNobody(t, args)
	}
	for _, args := range [][]string{
		{"log", "verify", "--db", path},
		{"log", "search", "--db", path, "NaOCl"},
		{"log", "show", "--db", path, "1"},
		{"log", "export", "--db", path},
		{"digest", "--db", path, "--since", "2026-12-01", "--until", "2026-12-02"},
		{"streams", "list", "--db", path},
	} {
		code, out := runAs(args...)
		if code != 0 {
			t.Errorf("%v in a read-only directory: exit %d\n%s", args, code, out)
		}
	}
	if got := dirFiles(t, dir); len(got) != 1 {
		t.Errorf("files beside the database after the read-only commands: %v", got)
	}
}

// runAsNobody runs the test binary, copied where user nobody can execute
// it, as nobody, with the child test running args.
func runAsNobody(t *testing.T, args []string) (int, string) {
	t.Helper()
	binDir, err := os.MkdirTemp("", "mixward-rodir-bin-")
	if err != nil {
		t.Fatal(err)
	}
	defer os.RemoveAll(binDir)
	os.Chmod(binDir, 0o755)
	bin := filepath.Join(binDir, "mixward.test")
	src, err := os.Open(os.Args[0])
	if err != nil {
		t.Fatal(err)
	}
	dst, err := os.OpenFile(bin, os.O_CREATE|os.O_WRONLY, 0o755)
	if err != nil {
		t.Fatal(err)
	}
	io.Copy(dst, src)
	src.Close()
	dst.Close()
	cmd := exec.Command(bin, "-test.run=^TestReadOnlyDirChild$")
	cmd.Env = []string{roChildEnv + "=" + strings.Join(args, "\n"), "PATH=/usr/bin:/bin", "HOME=/"}
	cmd.Dir = "/"
	cmd.SysProcAttr = &syscall.SysProcAttr{Credential: &syscall.Credential{Uid: 65534, Gid: 65534}}
	out, err := cmd.CombinedOutput()
	if ee, ok := err.(*exec.ExitError); ok {
		return ee.ExitCode(), string(out)
	}
	if err != nil {
		t.Fatalf("run as nobody: %v", err)
	}
	return 0, string(out)
}
