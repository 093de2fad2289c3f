package store

import (
	"bufio"
	"context"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"
)

// crashChildEnv names the database file the child process writes to.
const crashChildEnv = "MIXWARD_STORE_CRASH_CHILD_DB"

// TestCrashChild is the child process of TestCrashSafety: four writers log
// queries as fast as they can and print "ack <n> <id>" once LogQuery has
// returned, until the parent kills the process.
func TestCrashChild(t *testing.T) {
	path := os.Getenv(crashChildEnv)
	if path == "" {
		t.Skip("helper process for TestCrashSafety")
	}
	db, err := Open(context.Background(), path, Options{})
	if err != nil {
		fmt.Println("error", err)
		os.Exit(3)
	}
	var mu sync.Mutex
	var wg sync.WaitGroup
	for w := 0; w < 4; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := 0; ; i++ {
				n := fmt.Sprintf("%d-%d-%d", os.Getpid(), w, i)
				q := demoQuery()
				q.Request = "crash load " + n
				q.EventID = "crash-" + n
				id, err := db.LogQuery(context.Background(), q)
				if err != nil {
					fmt.Println("error", err)
					os.Exit(3)
				}
				mu.Lock()
				fmt.Printf("ack %s %d\n", n, id) // os.Stdout is unbuffered
				mu.Unlock()
			}
		}()
	}
	wg.Wait()
}

// TestCrashSafety kills a process mid-load with SIGKILL and checks that
// every query it acknowledged is in the log and the chain verifies.
func TestCrashSafety(t *testing.T) {
	if testing.Short() {
		t.Skip("starts a child process")
	}
	path := filepath.Join(t.TempDir(), "crash.db")
	for round := 0; round < 3; round++ { // the same file, killed three times
		acked := runAndKill(t, path, 300+round*200)
		db, err := Open(context.Background(), path, Options{})
		if err != nil {
			t.Fatalf("round %d: Open after SIGKILL: %v", round, err)
		}
		rep, err := db.Verify(context.Background())
		if err != nil || !rep.OK {
			t.Fatalf("round %d: Verify after SIGKILL = %+v, %v", round, rep, err)
		}
		for n, id := range acked {
			q, err := db.Get(context.Background(), id)
			if err != nil || q.Request != "crash load "+n {
				t.Errorf("round %d: acknowledged query %s (id %d): %v, %v", round, n, id, q, err)
			}
		}
		t.Logf("round %d: %d acknowledged, %d in the log", round, len(acked), rep.Queries)
		db.Close()
	}
}

// runAndKill runs the child on path, kills it after at least minAcks
// acknowledgements and returns them (request number → id).
func runAndKill(t *testing.T, path string, minAcks int) map[string]int64 {
	t.Helper()
	cmd := exec.Command(os.Args[0], "-test.run=^TestCrashChild$", "-test.count=1")
	cmd.Env = append(os.Environ(), crashChildEnv+"="+path)
	out, err := cmd.StdoutPipe()
	if err != nil {
		t.Fatal(err)
	}
	cmd.Stderr = os.Stderr
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	acked := map[string]int64{}
	deadline := time.AfterFunc(60*time.Second, func() { cmd.Process.Kill() })
	defer deadline.Stop()
	sc := bufio.NewScanner(out)
	killed := false
	for sc.Scan() {
		line := sc.Text()
		if strings.HasPrefix(line, "error") {
			t.Errorf("child: %s", line)
		}
		var n string
		var id int64
		if _, err := fmt.Sscanf(line, "ack %s %d", &n, &id); err == nil {
			acked[n] = id
		}
		if !killed && len(acked) >= minAcks {
			cmd.Process.Kill() // SIGKILL: no chance to clean up
			killed = true
		}
	}
	cmd.Wait()
	if !killed {
		t.Fatalf("child stopped after %d acknowledgements, before it was killed", len(acked))
	}
	return acked
}
