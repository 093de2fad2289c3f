package bot_test

import (
	"encoding/json"
	"fmt"
	"io"
	"net/http"
	"net/http/httptest"
	"net/url"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/gorilla/websocket"
)

// fakeSlack is a local stand-in for Slack: it answers the Web API calls the
// bot makes (chat.postMessage, the three-step file upload,
// usergroups.users.list, auth.test, apps.connections.open) and speaks the
// Socket Mode envelope protocol on /ws.
type fakeSlack struct {
	responses  []map[string]any // bodies posted to /respond/ (slash-command response URLs)
	ephemerals []fakePost       // chat.postEphemeral calls
	t          *testing.T
	srv        *httptest.Server

	mu      sync.Mutex
	posts   []fakePost
	uploads []fakeUpload
	calls   map[string]int
	nextTS  int
	groups  map[string][]string
	views   []fakeView                            // views.open and views.update calls, in order
	users   map[string]string                     // users.info: id → display name
	chans   map[string]string                     // conversations.info: id → name
	fault   func(method string, n int) *fakeFault // n counts calls of method, from 1
	postHit chan fakePost                         // each stored post, if not nil

	// Socket Mode
	conns    int
	conn     *websocket.Conn
	connCh   chan int // connection count after each new connection
	acks     chan fakeAck
	wsMu     sync.Mutex // serialises writes to conn
	upgrader websocket.Upgrader
}

type fakePost struct {
	Channel  string
	ThreadTS string
	Text     string
	Blocks   []map[string]any
	TS       string
	User     string // chat.postEphemeral: who alone sees it
	At       time.Time
	Meta     map[string]any // message metadata, as posted
}

// blockText is every text of the post's blocks, one per line.
func (p fakePost) blockText() string {
	var b strings.Builder
	var walk func(v any)
	walk = func(v any) {
		switch x := v.(type) {
		case map[string]any:
			if s, ok := x["text"].(string); ok {
				b.WriteString(s + "\n")
			}
			for _, k := range []string{"text", "elements", "fields"} {
				if _, isString := x[k].(string); !isString {
					walk(x[k])
				}
			}
		case []any:
			for _, y := range x {
				walk(y)
			}
		}
	}
	for _, bl := range p.Blocks {
		walk(map[string]any(bl))
	}
	return b.String()
}

// fakeView is one views.open or views.update call.
type fakeView struct {
	Method    string
	TriggerID string
	ViewID    string
	View      map[string]any
}

type fakeUpload struct {
	Channel, ThreadTS, Title, Filename string
	Size                               int
}

type fakeAck struct {
	EnvelopeID string          `json:"envelope_id"`
	Payload    json.RawMessage `json:"payload"`
}

// fakeFault is an injected failure for one call.
type fakeFault struct {
	Status     int    // HTTP status; 0 means 200 with Error
	RetryAfter string // Retry-After header for 429
	Error      string // Slack error code for an ok:false reply
}

func newFakeSlack(t *testing.T) *fakeSlack {
	f := &fakeSlack{
		t:        t,
		calls:    map[string]int{},
		groups:   map[string][]string{},
		users:    map[string]string{},
		chans:    map[string]string{},
		connCh:   make(chan int, 16),
		acks:     make(chan fakeAck, 1024),
		upgrader: websocket.Upgrader{CheckOrigin: func(*http.Request) bool { return true }},
	}
	f.srv = httptest.NewServer(http.HandlerFunc(f.serve))
	t.Cleanup(func() {
		f.mu.Lock()
		if f.conn != nil {
			f.conn.Close()
		}
		f.mu.Unlock()
		f.srv.CloseClientConnections()
		f.srv.Close()
	})
	return f
}

// apiURL is the base URL for slack.OptionAPIURL.
func (f *fakeSlack) apiURL() string { return f.srv.URL + "/api/" }

func (f *fakeSlack) reply(w http.ResponseWriter, v any) {
	w.Header().Set("Content-Type", "application/json")
	_ = json.NewEncoder(w).Encode(v)
}

func (f *fakeSlack) serve(w http.ResponseWriter, r *http.Request) {
	if r.URL.Path == "/ws" {
		f.serveWS(w, r)
		return
	}
	if strings.HasPrefix(r.URL.Path, "/upload/") {
		io.Copy(io.Discard, r.Body)
		w.Write([]byte("OK - 1"))
		return
	}
	if strings.HasPrefix(r.URL.Path, "/respond/") {
		// A slash command's response URL: JSON in, "ok" out.
		var msg map[string]any
		if err := json.NewDecoder(r.Body).Decode(&msg); err != nil {
			http.Error(w, err.Error(), 400)
			return
		}
		f.mu.Lock()
		f.responses = append(f.responses, msg)
		f.mu.Unlock()
		f.reply(w, map[string]any{"ok": true})
		return
	}
	method := strings.TrimPrefix(r.URL.Path, "/api/")
	if err := r.ParseMultipartForm(1 << 20); err != nil && err != http.ErrNotMultipart {
		http.Error(w, err.Error(), 400)
		return
	}
	f.mu.Lock()
	f.calls[method]++
	n := f.calls[method]
	fault := f.fault
	f.mu.Unlock()
	if fault != nil {
		if ff := fault(method, n); ff != nil {
			if ff.RetryAfter != "" {
				w.Header().Set("Retry-After", ff.RetryAfter)
			}
			if ff.Status != 0 && ff.Status != 200 {
				w.WriteHeader(ff.Status)
				return
			}
			f.reply(w, map[string]any{"ok": false, "error": ff.Error})
			return
		}
	}
	switch method {
	case "auth.test":
		f.reply(w, map[string]any{"ok": true, "user_id": "UBOT", "bot_id": "BBOT", "user": "mixward"})
	case "apps.connections.open":
		u := "ws" + strings.TrimPrefix(f.srv.URL, "http") + "/ws"
		f.reply(w, map[string]any{"ok": true, "url": u})
	case "chat.postMessage":
		p := fakePost{Channel: r.Form.Get("channel"), ThreadTS: r.Form.Get("thread_ts"), Text: r.Form.Get("text"), At: time.Now()}
		if m := r.Form.Get("metadata"); m != "" {
			if err := json.Unmarshal([]byte(m), &p.Meta); err != nil {
				f.reply(w, map[string]any{"ok": false, "error": "invalid_metadata"})
				return
			}
		}
		if b := r.Form.Get("blocks"); b != "" {
			if err := json.Unmarshal([]byte(b), &p.Blocks); err != nil {
				f.reply(w, map[string]any{"ok": false, "error": "invalid_blocks"})
				return
			}
			if msg := checkBlocks(p.Blocks); msg != "" {
				f.t.Errorf("chat.postMessage: %s", msg)
				f.reply(w, map[string]any{"ok": false, "error": "invalid_blocks"})
				return
			}
		}
		if p.Channel == "CGONE" {
			f.reply(w, map[string]any{"ok": false, "error": "channel_not_found"})
			return
		}
		if p.Channel == "COUTSIDE" {
			f.reply(w, map[string]any{"ok": false, "error": "not_in_channel"})
			return
		}
		f.mu.Lock()
		f.nextTS++
		p.TS = fmt.Sprintf("1700000000.%06d", f.nextTS)
		f.posts = append(f.posts, p)
		hit := f.postHit
		f.mu.Unlock()
		if hit != nil {
			hit <- p
		}
		f.reply(w, map[string]any{"ok": true, "channel": p.Channel, "ts": p.TS})
	case "conversations.replies", "conversations.history":
		// The bot's own posts in the thread (replies) or at the top of
		// the channel (history), with their metadata; one page.
		var msgs []map[string]any
		f.mu.Lock()
		for _, p := range f.posts {
			if p.Channel != r.Form.Get("channel") {
				continue
			}
			inThread := method == "conversations.replies" && (p.ThreadTS == r.Form.Get("ts") || p.TS == r.Form.Get("ts"))
			if inThread || (method == "conversations.history" && p.ThreadTS == "") {
				m := map[string]any{"type": "message", "ts": p.TS, "thread_ts": p.ThreadTS, "text": p.Text, "bot_id": "BBOT"}
				if p.Meta != nil {
					m["metadata"] = p.Meta
				}
				msgs = append(msgs, m)
			}
		}
		f.mu.Unlock()
		f.reply(w, map[string]any{"ok": true, "messages": msgs, "has_more": false})
	case "chat.postEphemeral":
		p := fakePost{Channel: r.Form.Get("channel"), ThreadTS: r.Form.Get("thread_ts"), Text: r.Form.Get("text"), User: r.Form.Get("user")}
		if b := r.Form.Get("blocks"); b != "" {
			_ = json.Unmarshal([]byte(b), &p.Blocks)
		}
		f.mu.Lock()
		f.ephemerals = append(f.ephemerals, p)
		f.mu.Unlock()
		f.reply(w, map[string]any{"ok": true, "message_ts": "1700000000.999999"})
	case "files.getUploadURLExternal":
		f.reply(w, map[string]any{"ok": true, "upload_url": f.srv.URL + "/upload/F1", "file_id": "F1"})
	case "files.completeUploadExternal":
		var files []map[string]any
		_ = json.Unmarshal([]byte(r.Form.Get("files")), &files)
		title := ""
		if len(files) > 0 {
			title, _ = files[0]["title"].(string)
		}
		f.mu.Lock()
		f.uploads = append(f.uploads, fakeUpload{Channel: r.Form.Get("channel_id"), ThreadTS: r.Form.Get("thread_ts"), Title: title})
		f.mu.Unlock()
		f.reply(w, map[string]any{"ok": true, "files": []map[string]any{{"id": "F1", "title": title}}})
	case "views.open", "views.update":
		// slack-go posts these as JSON.
		var req struct {
			TriggerID string         `json:"trigger_id"`
			ViewID    string         `json:"view_id"`
			Hash      string         `json:"hash"`
			View      map[string]any `json:"view"`
		}
		if err := json.NewDecoder(r.Body).Decode(&req); err != nil || req.View == nil {
			f.reply(w, map[string]any{"ok": false, "error": "invalid_arguments"})
			return
		}
		if method == "views.open" && req.TriggerID == "" {
			f.reply(w, map[string]any{"ok": false, "error": "invalid_trigger_id"})
			return
		}
		if method == "views.update" && req.Hash != "h-"+req.ViewID {
			f.reply(w, map[string]any{"ok": false, "error": "hash_conflict"})
			return
		}
		view := req.View
		f.mu.Lock()
		id := req.ViewID
		if id == "" {
			id = fmt.Sprintf("V%03d", len(f.views)+1)
		}
		f.views = append(f.views, fakeView{Method: method, TriggerID: req.TriggerID, ViewID: id, View: view})
		f.mu.Unlock()
		view["id"], view["hash"] = id, "h-"+id
		f.reply(w, map[string]any{"ok": true, "view": view})
	case "users.info":
		f.mu.Lock()
		name, ok := f.users[r.Form.Get("user")]
		f.mu.Unlock()
		if !ok {
			f.reply(w, map[string]any{"ok": false, "error": "user_not_found"})
			return
		}
		f.reply(w, map[string]any{"ok": true, "user": map[string]any{"id": r.Form.Get("user"), "name": strings.ToLower(name),
			"profile": map[string]any{"display_name": name, "real_name": name + " (real)"}}})
	case "conversations.info":
		f.mu.Lock()
		name, ok := f.chans[r.Form.Get("channel")]
		f.mu.Unlock()
		if !ok {
			f.reply(w, map[string]any{"ok": false, "error": "channel_not_found"})
			return
		}
		f.reply(w, map[string]any{"ok": true, "channel": map[string]any{"id": r.Form.Get("channel"), "name": name, "is_channel": true}})
	case "usergroups.users.list":
		f.mu.Lock()
		users, ok := f.groups[r.Form.Get("usergroup")]
		f.mu.Unlock()
		if !ok {
			f.reply(w, map[string]any{"ok": false, "error": "no_such_subteam"})
			return
		}
		f.reply(w, map[string]any{"ok": true, "users": users})
	default:
		f.reply(w, map[string]any{"ok": false, "error": "unknown_method"})
	}
}

// checkBlocks enforces the Block Kit limits the bot promises to respect.
func checkBlocks(bl []map[string]any) string {
	if len(bl) > 50 {
		return fmt.Sprintf("%d blocks in one message, Slack allows 50", len(bl))
	}
	for i, b := range bl {
		text, _ := b["text"].(map[string]any)
		t, _ := text["text"].(string)
		switch b["type"] {
		case "header":
			if n := len([]rune(t)); n > 150 {
				return fmt.Sprintf("block %d: header of %d characters, Slack allows 150", i, n)
			}
		case "section":
			if n := len([]rune(t)); n > 3000 || n == 0 {
				return fmt.Sprintf("block %d: section text of %d characters, Slack allows 1 to 3000", i, n)
			}
		}
	}
	return ""
}

func (f *fakeSlack) serveWS(w http.ResponseWriter, r *http.Request) {
	c, err := f.upgrader.Upgrade(w, r, nil)
	if err != nil {
		return
	}
	f.mu.Lock()
	f.conns++
	n := f.conns
	f.conn = c
	f.mu.Unlock()
	f.write(c, `{"type":"hello","num_connections":1,"connection_info":{"app_id":"A1"}}`)
	f.connCh <- n
	go func() {
		for {
			_, msg, err := c.ReadMessage()
			if err != nil {
				return
			}
			var a fakeAck
			if json.Unmarshal(msg, &a) == nil && a.EnvelopeID != "" {
				f.acks <- a
			}
		}
	}()
}

func (f *fakeSlack) write(c *websocket.Conn, msg string) error {
	f.wsMu.Lock()
	defer f.wsMu.Unlock()
	return c.WriteMessage(websocket.TextMessage, []byte(msg))
}

// send writes an envelope to the current Socket Mode connection.
func (f *fakeSlack) send(msg string) {
	f.t.Helper()
	f.mu.Lock()
	c := f.conn
	f.mu.Unlock()
	if c == nil {
		f.t.Fatal("fake slack: no socket connection to send on")
	}
	if err := f.write(c, msg); err != nil {
		f.t.Fatalf("fake slack: send: %v", err)
	}
}

// drop closes the current socket abruptly, as a network failure would.
func (f *fakeSlack) drop() {
	f.mu.Lock()
	c := f.conn
	f.conn = nil
	f.mu.Unlock()
	if c != nil {
		c.UnderlyingConn().Close()
	}
}

// waitConn waits for connection number n.
func (f *fakeSlack) waitConn(n int) {
	f.t.Helper()
	deadline := time.After(10 * time.Second)
	for {
		select {
		case got := <-f.connCh:
			if got >= n {
				return
			}
		case <-deadline:
			f.t.Fatalf("fake slack: socket connection %d never came", n)
		}
	}
}

// waitAck waits for the ack of envelope id and returns it.
func (f *fakeSlack) waitAck(id string) fakeAck {
	f.t.Helper()
	deadline := time.After(10 * time.Second)
	for {
		select {
		case a := <-f.acks:
			if a.EnvelopeID == id {
				return a
			}
		case <-deadline:
			f.t.Fatalf("fake slack: envelope %s never acknowledged", id)
		}
	}
}

// waitPosts waits until at least n messages were posted and returns them.
// The minute allows for -race on a busy machine.
func (f *fakeSlack) waitPosts(n int) []fakePost {
	f.t.Helper()
	deadline := time.Now().Add(60 * time.Second)
	for {
		f.mu.Lock()
		got := append([]fakePost(nil), f.posts...)
		f.mu.Unlock()
		if len(got) >= n {
			return got
		}
		if time.Now().After(deadline) {
			f.t.Fatalf("fake slack: %d messages posted, want %d", len(got), n)
		}
		time.Sleep(5 * time.Millisecond)
	}
}

func (f *fakeSlack) postsNow() []fakePost {
	f.mu.Lock()
	defer f.mu.Unlock()
	return append([]fakePost(nil), f.posts...)
}

func (f *fakeSlack) uploadsNow() []fakeUpload {
	f.mu.Lock()
	defer f.mu.Unlock()
	return append([]fakeUpload(nil), f.uploads...)
}

// waitUploads waits until at least n files were uploaded and returns them.
func (f *fakeSlack) waitUploads(n int) []fakeUpload {
	f.t.Helper()
	deadline := time.Now().Add(20 * time.Second)
	for {
		if got := f.uploadsNow(); len(got) >= n {
			return got
		}
		if time.Now().After(deadline) {
			f.t.Fatalf("fake slack: %d files uploaded, want %d", len(f.uploadsNow()), n)
		}
		time.Sleep(5 * time.Millisecond)
	}
}

func (f *fakeSlack) viewsNow() []fakeView {
	f.mu.Lock()
	defer f.mu.Unlock()
	return append([]fakeView(nil), f.views...)
}

func (f *fakeSlack) ephemeralsNow() []fakePost {
	f.mu.Lock()
	defer f.mu.Unlock()
	return append([]fakePost(nil), f.ephemerals...)
}

// interactiveEnvelope is a Socket Mode envelope carrying an interaction.
func interactiveEnvelope(envID string, payload any) string {
	b, _ := json.Marshal(map[string]any{"type": "interactive", "envelope_id": envID, "accepts_response_payload": true, "payload": payload})
	return string(b)
}

// buttonPayload is a block_actions interaction: user pressed the button
// actionID (value) under the message ts in thread of channel.
func buttonPayload(actionID, value, channel, thread, ts, user, actionTS string) map[string]any {
	return map[string]any{
		"type": "block_actions", "trigger_id": "trig-" + actionTS, "api_app_id": "A1",
		"user":      map[string]any{"id": user, "name": "op"},
		"channel":   map[string]any{"id": channel},
		"container": map[string]any{"type": "message", "message_ts": ts, "channel_id": channel, "thread_ts": thread},
		"message":   map[string]any{"ts": ts, "thread_ts": thread},
		"actions":   []any{map[string]any{"action_id": actionID, "block_id": "mixward_answer", "value": value, "type": "button", "action_ts": actionTS}},
	}
}

// formPayload is a view_submission of the request form with the given
// values (block id → value; "tags" takes a comma-separated list).
func formPayload(viewID, user, meta string, values map[string]string) map[string]any {
	state := map[string]any{}
	for k, v := range values {
		var action map[string]any
		switch k {
		case "tags":
			var opts []any
			for _, t := range strings.Split(v, ",") {
				opts = append(opts, map[string]any{"value": t, "text": map[string]any{"type": "plain_text", "text": t}})
			}
			action = map[string]any{"type": "multi_static_select", "selected_options": opts}
		case "channel":
			action = map[string]any{"type": "conversations_select", "selected_conversation": v}
		default:
			action = map[string]any{"type": "plain_text_input", "value": v}
		}
		state[k] = map[string]any{k: action}
	}
	return map[string]any{
		"type": "view_submission", "api_app_id": "A1", "user": map[string]any{"id": user, "name": "op"},
		"view": map[string]any{"id": viewID, "callback_id": "mixward_form", "private_metadata": meta, "state": map[string]any{"values": state}},
	}
}

func (f *fakeSlack) callCount(method string) int {
	f.mu.Lock()
	defer f.mu.Unlock()
	return f.calls[method]
}

// mentionEnvelope is a Socket Mode events_api envelope with an app_mention.
func mentionEnvelope(envID, eventID, channel, user, ts, text string, retry int) string {
	ev := map[string]any{
		"type": "events_api", "envelope_id": envID, "accepts_response_payload": false,
		"retry_attempt": retry, "retry_reason": map[bool]string{true: "timeout"}[retry > 0],
		"payload": mentionPayload(eventID, channel, user, ts, text),
	}
	b, _ := json.Marshal(ev)
	return string(b)
}

// mentionPayload is an Events API event_callback carrying an app_mention.
func mentionPayload(eventID, channel, user, ts, text string) map[string]any {
	return map[string]any{
		"token": "legacy-token", "team_id": "T1", "api_app_id": "A1", "type": "event_callback",
		"event_id": eventID, "event_time": 1700000000,
		"event": map[string]any{
			"type": "app_mention", "user": user, "text": text, "ts": ts, "channel": channel, "event_ts": ts,
		},
	}
}

// slashForm is a slash command as Slack posts it.
func slashForm(channel, user, text, trigger string) url.Values {
	return url.Values{
		"token": {"legacy-token"}, "team_id": {"T1"}, "channel_id": {channel}, "channel_name": {"finishing"},
		"user_id": {user}, "user_name": {"tester"}, "command": {"/mixward"}, "text": {text},
		"response_url": {"https://hooks.example.invalid/commands/1"}, "trigger_id": {trigger},
	}
}

// signedRequest builds a request signed with secret at time at.
func signedRequest(t *testing.T, method, target, contentType string, body []byte, secret string, at time.Time) *http.Request {
	t.Helper()
	r := httptest.NewRequest(method, target, strings.NewReader(string(body)))
	r.Header.Set("Content-Type", contentType)
	ts := strconv.FormatInt(at.Unix(), 10)
	r.Header.Set("X-Slack-Request-Timestamp", ts)
	r.Header.Set("X-Slack-Signature", signature(secret, ts, body))
	return r
}
