package main

import (
	"bufio"
	"bytes"
	"context"
	"database/sql"
	"encoding/json"
	"fmt"
	"io"
	"net"
	"net/http"
	"net/http/httptest"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"

	"mixward/bot"
)

// loopSlack is a fake Slack Web API on loopback for tests that run the
// real binary: it records every chat.postMessage with its thread and
// metadata, answers conversations.replies from what was posted (so a
// restarted bot can look for an answer it may have posted), and takes file
// uploads. delay slows every post, so that work is in flight when a test
// stops the bot.
type loopSlack struct {
	srv   *httptest.Server
	delay time.Duration

	mu      sync.Mutex
	posts   []loopPost
	uploads int
	lookups int // conversations.replies calls
}

type loopPost struct {
	Channel, Thread, TS, Text string
	EventID                   string // from the metadata
	Part                      int
}

func newLoopSlack(t testing.TB) *loopSlack {
	s := &loopSlack{}
	// Assigned before the server starts, so that the handler's read of
	// s.srv (the upload URL) happens after the write.
	s.srv = httptest.NewUnstartedServer(http.HandlerFunc(s.serve))
	s.srv.Start()
	t.Cleanup(s.srv.Close)
	return s
}

func (s *loopSlack) serve(w http.ResponseWriter, r *http.Request) {
	if r.URL.Path == "/upload" {
		io.Copy(io.Discard, r.Body)
		io.WriteString(w, "OK")
		return
	}
	r.ParseMultipartForm(1 << 20)
	w.Header().Set("Content-Type", "application/json")
	switch strings.TrimPrefix(r.URL.Path, "/api/") {
	case "auth.test":
		io.WriteString(w, `{"ok":true,"user_id":"UBOT","bot_id":"BBOT"}`)
	case "chat.postMessage":
		time.Sleep(s.delay)
		p := loopPost{Channel: r.PostForm.Get("channel"), Thread: r.PostForm.Get("thread_ts"), Text: r.PostForm.Get("text")}
		var meta struct {
			EventType    string `json:"event_type"`
			EventPayload struct {
				EventID string `json:"event_id"`
				Part    int    `json:"part"`
			} `json:"event_payload"`
		}
		if m := r.PostForm.Get("metadata"); m != "" && json.Unmarshal([]byte(m), &meta) == nil && meta.EventType == "mixward_answer" {
			p.EventID, p.Part = meta.EventPayload.EventID, meta.EventPayload.Part
		}
		s.mu.Lock()
		p.TS = fmt.Sprintf("1800000000.%06d", len(s.posts)+1)
		s.posts = append(s.posts, p)
		s.mu.Unlock()
		fmt.Fprintf(w, `{"ok":true,"channel":%q,"ts":%q}`, p.Channel, p.TS)
	case "conversations.replies":
		var msgs []map[string]any
		s.mu.Lock()
		s.lookups++
		for _, p := range s.posts {
			if p.Channel == r.PostForm.Get("channel") && p.Thread == r.PostForm.Get("ts") && p.EventID != "" {
				msgs = append(msgs, map[string]any{"type": "message", "ts": p.TS, "thread_ts": p.Thread, "bot_id": "BBOT",
					"metadata": map[string]any{"event_type": "mixward_answer", "event_payload": map[string]any{"event_id": p.EventID, "part": p.Part}}})
			}
		}
		s.mu.Unlock()
		json.NewEncoder(w).Encode(map[string]any{"ok": true, "messages": msgs, "has_more": false})
	case "files.getUploadURLExternal":
		fmt.Fprintf(w, `{"ok":true,"upload_url":%q,"file_id":"F1"}`, s.srv.URL+"/upload")
	case "files.completeUploadExternal":
		s.mu.Lock()
		s.uploads++
		s.mu.Unlock()
		io.WriteString(w, `{"ok":true,"files":[{"id":"F1"}]}`)
	default:
		io.WriteString(w, `{"ok":false,"error":"unknown_method"}`)
	}
}

// answers counts, per event id, the first parts of answers posted.
func (s *loopSlack) answers() map[string]int {
	s.mu.Lock()
	defer s.mu.Unlock()
	n := map[string]int{}
	for _, p := range s.posts {
		if p.Part == 1 {
			n[p.EventID]++
		}
	}
	return n
}

// order lists the event ids answered in each thread, in posting order.
func (s *loopSlack) order() map[string][]string {
	s.mu.Lock()
	defer s.mu.Unlock()
	o := map[string][]string{}
	for _, p := range s.posts {
		if p.Part == 1 {
			o[p.Channel+"/"+p.Thread] = append(o[p.Channel+"/"+p.Thread], p.EventID)
		}
	}
	return o
}

// mixwardBinary builds the binary into the test's temporary directory
// (the build cache makes all but the first build a link).
func mixwardBinary(t testing.TB) string {
	t.Helper()
	if testing.Short() {
		t.Skip("builds and runs the binary; skipped with -short")
	}
	bin := filepath.Join(t.TempDir(), "mixward")
	if out, err := exec.Command("go", "build", "-o", bin, ".").CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	return bin
}

// proc is a running `mixward serve` process.
type proc struct {
	cmd    *exec.Cmd
	events string // base URL of the Events API
	done   chan error
	stderr *syncBuffer
}

// freeAddr returns a loopback address with a port nobody listens on now.
func freeAddr(t testing.TB) string {
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	defer ln.Close()
	return ln.Addr().String()
}

// startProc runs the binary with env on addr and waits until it listens.
func startProc(t testing.TB, bin, addr string, env map[string]string, args ...string) *proc {
	t.Helper()
	cmd := exec.Command(bin, append([]string{"serve", "--http", addr, "--admin-addr", "off"}, args...)...)
	cmd.Env = []string{"PATH=" + os.Getenv("PATH"), "HOME=" + os.Getenv("HOME")}
	for k, v := range env {
		cmd.Env = append(cmd.Env, k+"="+v)
	}
	pr, pw := io.Pipe()
	cmd.Stderr = pw
	p := &proc{cmd: cmd, events: "http://" + addr, done: make(chan error, 1), stderr: &syncBuffer{}}
	listening := make(chan struct{})
	go func() {
		sc := bufio.NewScanner(pr)
		sc.Buffer(make([]byte, 1<<20), 1<<20)
		once := sync.Once{}
		for sc.Scan() {
			p.stderr.Write(append(sc.Bytes(), '\n'))
			if bytes.Contains(sc.Bytes(), []byte(`"events API listening"`)) {
				once.Do(func() { close(listening) })
			}
		}
		io.Copy(io.Discard, pr)
	}()
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	go func() { p.done <- cmd.Wait(); pw.Close() }()
	t.Cleanup(func() {
		if cmd.ProcessState == nil {
			cmd.Process.Kill()
			<-p.done
		}
	})
	select {
	case <-listening:
	case err := <-p.done:
		t.Fatalf("mixward exited before listening: %v\n%s", err, p.stderr.String())
	case <-time.After(30 * time.Second):
		t.Fatalf("mixward did not listen within 30 s:\n%s", p.stderr.String())
	}
	return p
}

// peakRSS is the process's peak resident set (VmHWM), in bytes.
func (p *proc) peakRSS() int64 {
	b, err := os.ReadFile(fmt.Sprintf("/proc/%d/status", p.cmd.Process.Pid))
	if err != nil {
		return -1
	}
	for _, line := range strings.Split(string(b), "\n") {
		if f := strings.Fields(line); len(f) >= 2 && f[0] == "VmHWM:" {
			kb, _ := strconv.ParseInt(f[1], 10, 64)
			return kb * 1024
		}
	}
	return -1
}

// stop sends sig and waits for the process to end.
func (p *proc) stop(t testing.TB, sig syscall.Signal) {
	t.Helper()
	p.cmd.Process.Signal(sig)
	select {
	case <-p.done:
	case <-time.After(60 * time.Second):
		p.cmd.Process.Kill()
		t.Fatalf("mixward did not stop within 60 s of %v", sig)
	}
}

// slackClient delivers signed events the way Slack does: an event not
// answered with 200 (a 503, a refused connection while the bot restarts)
// is sent again until it is, or until ctx ends.
type slackClient struct {
	addr   func() string // current Events API base URL
	acked  sync.Map      // event id → true once answered 200
	hc     *http.Client
	tries  atomicCounter
	refuse atomicCounter // 503 answers
}

type atomicCounter struct {
	mu sync.Mutex
	n  int
}

func (c *atomicCounter) add() { c.mu.Lock(); c.n++; c.mu.Unlock() }
func (c *atomicCounter) get() int {
	c.mu.Lock()
	defer c.mu.Unlock()
	return c.n
}

func (c *slackClient) deliver(ctx context.Context, eventID string, body []byte) error {
	for {
		if ctx.Err() != nil {
			return fmt.Errorf("event %s never acknowledged: %w", eventID, ctx.Err())
		}
		c.tries.add()
		req, _ := http.NewRequestWithContext(ctx, "POST", c.addr()+"/slack/events", bytes.NewReader(body))
		req.Header.Set("Content-Type", "application/json")
		ts := strconv.FormatInt(time.Now().Unix(), 10)
		req.Header.Set("X-Slack-Request-Timestamp", ts)
		req.Header.Set("X-Slack-Signature", bot.SignatureHeader(testSecret, ts, body))
		resp, err := c.hc.Do(req)
		if err == nil {
			io.Copy(io.Discard, resp.Body)
			resp.Body.Close()
			if resp.StatusCode == 200 {
				c.acked.Store(eventID, true)
				return nil
			}
			if resp.StatusCode == 503 {
				c.refuse.add()
			}
		}
		time.Sleep(50 * time.Millisecond)
	}
}

// countLogged counts the logged queries per event id in the database file.
func countLogged(t testing.TB, path string) map[string]int {
	t.Helper()
	db, err := sql.Open("sqlite3", path+"?mode=ro")
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	rows, err := db.Query(`SELECT event_id, count(*) FROM queries WHERE kind = 'query' GROUP BY event_id`)
	if err != nil {
		t.Fatal(err)
	}
	defer rows.Close()
	n := map[string]int{}
	for rows.Next() {
		var id string
		var c int
		rows.Scan(&id, &c)
		n[id] = c
	}
	return n
}

func pendingInbox(t testing.TB, path string) int {
	t.Helper()
	db, err := sql.Open("sqlite3", path+"?mode=ro")
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	var n int
	if err := db.QueryRow(`SELECT count(*) FROM inbox WHERE state = 'pending'`).Scan(&n); err != nil {
		t.Fatal(err)
	}
	return n
}

// waitAnswered waits until every event in ids has an answer posted.
func waitAnswered(t testing.TB, s *loopSlack, ids []string, within time.Duration) map[string]int {
	t.Helper()
	deadline := time.Now().Add(within)
	for {
		got := s.answers()
		missing := 0
		for _, id := range ids {
			if got[id] == 0 {
				missing++
			}
		}
		if missing == 0 {
			return got
		}
		if time.Now().After(deadline) {
			t.Fatalf("%d of %d events still unanswered after %v", missing, len(ids), within)
		}
		time.Sleep(20 * time.Millisecond)
	}
}

// mixEvent is a signed-event body: an app_mention in channel/thread asking
// mix number n (numbered by the litres of hypochlorite, so that answers
// can be told apart).
func mixEvent(eventID, channel, thread string, n int) []byte {
	return mentionBody(eventID, channel, thread, fmt.Sprintf("<@UBOT> mix %d L NaOCl 12.5 %% + 50 L HCl 10 %%", n))
}
