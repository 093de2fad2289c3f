package bot_test

import (
	"context"
	"encoding/json"
	"fmt"
	"net/http"
	"net/url"
	"strings"
	"testing"
	"time"

	"mixward/bot"
	"mixward/store"
)

// interactiveBody is an interaction as Slack posts it over HTTP.
func interactiveBody(payload any) []byte {
	b, _ := json.Marshal(payload)
	return []byte(url.Values{"payload": {string(b)}}.Encode())
}

func TestButtonsOverHTTPAndForgedPressRefused(t *testing.T) {
	e := newEnv(t)
	ctx := context.Background()
	h := e.sl.HTTPHandler(bot.NewVerifier(e.secret, e.clock.Now))
	body, _ := json.Marshal(mentionPayload("Ev7", "CPLANT", "UOP", "1700000300.000100", "mix 200 L NaOCl 12.5 % + 50 L HCl 10 %"))
	if w := postEvents(t, h, signedRequest(t, "POST", "/slack/events", "application/json", body, e.secret, e.clock.Now())); w.Code != 200 {
		t.Fatalf("event answered %d", w.Code)
	}
	answer := e.slack.waitPosts(1)[0]
	e.drain()
	q := e.queries()[0]

	// A press signed with another secret, or not signed at all: 401, nothing done.
	forged := interactiveBody(buttonPayload(bot.ActionDetails, fmt.Sprint(q.ID), "CPLANT", answer.ThreadTS, answer.TS, "UOP", "1.1"))
	for name, r := range map[string]*httptestRequest{
		"wrong secret": {signedRequest(t, "POST", "/slack/interactive", "application/x-www-form-urlencoded", forged, "not-the-secret", e.clock.Now())},
		"stale":        {signedRequest(t, "POST", "/slack/interactive", "application/x-www-form-urlencoded", forged, e.secret, e.clock.Now().Add(-10*time.Minute))},
	} {
		if w := postEvents(t, h, r.Request); w.Code != 401 {
			t.Errorf("%s press answered %d, want 401", name, w.Code)
		}
	}
	unsigned := signedRequest(t, "POST", "/slack/interactive", "application/x-www-form-urlencoded", forged, e.secret, e.clock.Now())
	unsigned.Header.Del("X-Slack-Signature")
	if w := postEvents(t, h, unsigned); w.Code != 401 {
		t.Errorf("unsigned press answered %d, want 401", w.Code)
	}
	e.drain()
	if ps, _ := e.db.Presses(ctx, q.ID); len(ps) != 0 {
		t.Errorf("forged presses recorded: %+v", ps)
	}
	if n := len(e.slack.postsNow()); n != 1 {
		t.Errorf("%d posts after forged presses, want only the answer", n)
	}

	// The real press: the pour order in the thread, recorded.
	pour := interactiveBody(buttonPayload(bot.ActionPour, fmt.Sprint(q.ID), "CPLANT", answer.ThreadTS, answer.TS, "UOP", "1.2"))
	if w := postEvents(t, h, signedRequest(t, "POST", "/slack/interactive", "application/x-www-form-urlencoded", pour, e.secret, e.clock.Now())); w.Code != 200 || w.Body.Len() != 0 {
		t.Fatalf("press answered %d %q, want an empty 200", w.Code, w.Body.String())
	}
	posts := e.slack.waitPosts(2)
	e.drain()
	if posts[1].ThreadTS != answer.ThreadTS || !strings.Contains(posts[1].Text, "pour") {
		t.Errorf("pour order = %+v, want it in the answer's thread", posts[1])
	}
	if ps, _ := e.db.Presses(ctx, q.ID); len(ps) != 1 || ps[0].Action != store.PressPour || ps[0].Transport != "http" {
		t.Errorf("presses = %+v, want one pour over http", ps)
	}

	// A press on an answer given in another channel shows nothing of it.
	other := interactiveBody(buttonPayload(bot.ActionDetails, fmt.Sprint(q.ID), "COTHER", "9.9", "9.9", "UOP", "1.3"))
	postEvents(t, h, signedRequest(t, "POST", "/slack/interactive", "application/x-www-form-urlencoded", other, e.secret, e.clock.Now()))
	e.drain()
	eph := e.slack.ephemeralsNow()
	if len(e.slack.postsNow()) != 2 || len(eph) != 1 || !strings.Contains(eph[0].Text, "another conversation") {
		t.Errorf("press from another channel: posts %d, ephemerals %+v", len(e.slack.postsNow()), eph)
	}
}

type httptestRequest struct{ *http.Request }

func TestRequestFormOverHTTP(t *testing.T) {
	e := newEnv(t)
	ctx := context.Background()
	if err := e.db.SetStream(ctx, "T-102", "200 L NaOCl 12.5 %", "", "USUP"); err != nil {
		t.Fatal(err)
	}
	h := e.sl.HTTPHandler(bot.NewVerifier(e.secret, e.clock.Now))
	post := func(path string, body []byte) (int, string) {
		w := postEvents(t, h, signedRequest(t, "POST", path, "application/x-www-form-urlencoded", body, e.secret, e.clock.Now()))
		return w.Code, w.Body.String()
	}
	// /mixward alone opens the form: views.open, then views.update with the tags.
	if code, body := post("/slack/commands", []byte(slashForm("CPLANT", "UOP", "", "trig-form").Encode())); code != 200 || body != "" {
		t.Fatalf("/mixward alone answered %d %q, want an empty 200 (the form is the answer)", code, body)
	}
	vs := e.slack.viewsNow()
	if len(vs) != 2 || vs[0].Method != "views.open" || vs[0].TriggerID != "trig-form" || vs[1].Method != "views.update" || vs[1].ViewID != "V001" {
		t.Fatalf("views calls = %+v, want views.open with the trigger then views.update of that view", vs)
	}
	form, _ := json.Marshal(vs[1].View)
	for _, want := range []string{`"callback_id":"mixward_form"`, `"T-102"`, `"block_id":"streams"`, `"block_id":"temperature"`} {
		if !strings.Contains(string(form), want) {
			t.Errorf("form lacks %s:\n%s", want, form)
		}
	}
	meta, _ := vs[1].View["private_metadata"].(string)

	// Field errors come back on the form, nothing is logged or posted.
	for _, tc := range []struct {
		values map[string]string
		field  string
	}{
		{map[string]string{"temperature": "warm"}, "streams"}, // no stream at all
		{map[string]string{"streams": "50 L HCl 10 %", "temperature": "warm"}, "temperature"},
		{map[string]string{"tags": "T-102", "amounts": "200 L, 50 L"}, "amounts"},
		{map[string]string{"tags": "T-102", "streams": "2 L bad acid"}, "streams"}, // the engine's parse error
	} {
		code, body := post("/slack/interactive", interactiveBody(formPayload("V001", "UOP", meta, tc.values)))
		var resp struct {
			Action string            `json:"response_action"`
			Errors map[string]string `json:"errors"`
		}
		if code != 200 || json.Unmarshal([]byte(body), &resp) != nil || resp.Action != "errors" || resp.Errors[tc.field] == "" {
			t.Errorf("submit %v answered %d %s, want errors on %q", tc.values, code, body, tc.field)
		}
	}
	if n := len(e.queries()); n != 0 {
		t.Errorf("%d queries logged from forms with errors, want 0", n)
	}
	// Corrected: the form closes and the answer comes in the channel.
	code, body := post("/slack/interactive", interactiveBody(formPayload("V001", "UOP", meta,
		map[string]string{"tags": "T-102", "streams": "50 L HCl 10 %", "temperature": "30", "ph": ""})))
	if code != 200 || body != "" {
		t.Fatalf("correct submit answered %d %q, want an empty 200", code, body)
	}
	posts := e.slack.waitPosts(2)
	e.drain()
	if posts[0].Channel != "CPLANT" || !strings.Contains(posts[0].Text, "mix T-102 + 50 L HCl 10 % at 30 C") || posts[1].ThreadTS != posts[0].TS {
		t.Errorf("form answer posts = %+v", posts)
	}
	if qs := e.queries(); len(qs) != 1 || qs[0].Request != "mix T-102 + 50 L HCl 10 % at 30 C" || qs[0].EventID != "view:V001" {
		t.Errorf("queries = %+v", qs)
	}
}

func TestRequestFormOverSocketAndShortcut(t *testing.T) {
	e := newEnv(t)
	e.runSocket()
	e.slack.waitConn(1)
	// The global shortcut knows no channel: the form asks where to answer.
	e.slack.send(interactiveEnvelope("env-sc", map[string]any{"type": "shortcut", "callback_id": bot.ActionNewMix,
		"trigger_id": "trig-sc", "user": map[string]any{"id": "UOP"}}))
	e.slack.waitAck("env-sc")
	vs := e.slack.viewsNow()
	if len(vs) != 2 {
		t.Fatalf("views calls = %+v, want open and update", vs)
	}
	if form, _ := json.Marshal(vs[1].View); !strings.Contains(string(form), `"block_id":"channel"`) {
		t.Errorf("shortcut form has no channel field:\n%s", form)
	}
	meta, _ := vs[1].View["private_metadata"].(string)
	e.slack.send(interactiveEnvelope("env-bad", formPayload("V001", "UOP", meta, map[string]string{"streams": "1 L NaOCl 12.5 %", "ph": "acid", "channel": "CLAB"})))
	if a := e.slack.waitAck("env-bad"); !strings.Contains(string(a.Payload), `"response_action":"errors"`) || !strings.Contains(string(a.Payload), `"ph"`) {
		t.Errorf("ack of a bad form = %s, want errors on ph", a.Payload)
	}
	e.slack.send(interactiveEnvelope("env-ok", formPayload("V001", "UOP", meta, map[string]string{"streams": "1 L NaOCl 12.5 %\n1 L HCl 10 %", "ph": "3", "channel": "CLAB"})))
	e.slack.waitAck("env-ok")
	posts := e.slack.waitPosts(2)
	e.drain()
	if posts[0].Channel != "CLAB" || posts[1].ThreadTS != posts[0].TS || !strings.Contains(posts[0].Text, "at pH 3") {
		t.Errorf("answer of the shortcut form = %+v", posts)
	}
	// New mix under an answer opens the form for that channel.
	e.slack.send(interactiveEnvelope("env-new", buttonPayload(bot.ActionNewMix, "new", "CLAB", posts[1].ThreadTS, posts[1].TS, "UOP", "2.1")))
	e.slack.waitAck("env-new")
	if vs := e.slack.viewsNow(); len(vs) != 4 || vs[2].TriggerID != "trig-2.1" || !strings.Contains(fmt.Sprint(vs[3].View["private_metadata"]), "CLAB") {
		t.Errorf("New mix views = %+v", vs[2:])
	}
}

func TestNamesInLogAndDigest(t *testing.T) {
	e := newEnv(t, withNames)
	e.slack.users["UOP"] = "Olga K."
	e.slack.chans["CPLANT"] = "finishing"
	e.sl.DigestChannel = "CSUP"
	ctx := context.Background()
	h := e.sl.HTTPHandler(bot.NewVerifier(e.secret, e.clock.Now))
	for i, text := range []string{"mix 1 L NaOCl 12.5 % + 1 L HCl 10 %", "mix 1 L NaOCl 12.5 % + 1 L HCl 10 %"} {
		body, _ := json.Marshal(mentionPayload(fmt.Sprintf("EvN%d", i), "CPLANT", "UOP", fmt.Sprintf("1700000400.00010%d", i), text))
		postEvents(t, h, signedRequest(t, "POST", "/slack/events", "application/json", body, e.secret, e.clock.Now()))
		e.slack.waitPosts(i + 1)
		e.drain()
		// The name is looked up in the background; the next record carries it.
		for end := time.Now().Add(10 * time.Second); time.Now().Before(end); time.Sleep(5 * time.Millisecond) {
			if n, _ := e.db.NameAt(ctx, "UOP", e.clock.Now()); n != "" {
				break
			}
		}
	}
	// A slash command carries the handle; the same person is one person.
	postEvents(t, h, signedRequest(t, "POST", "/slack/commands", "application/x-www-form-urlencoded",
		[]byte(slashForm("CPLANT", "UOP", "mix 1 L NaOCl 12.5 % + 1 L HCl 10 %", "trig-n").Encode()), e.secret, e.clock.Now()))
	e.slack.waitPosts(4)
	e.drain()
	qs := e.queries()
	// Names are looked up off the answer's path: the first record may
	// carry no name yet, the later ones carry the name seen.
	if len(qs) != 3 || qs[0].UserID != "UOP" || qs[1].UserName != "Olga K." || qs[2].UserName != "Olga K." {
		t.Errorf("logged users = %+v, want the id with the display name", qs)
	}
	var chName string
	for end := time.Now().Add(10 * time.Second); chName == "" && time.Now().Before(end); time.Sleep(5 * time.Millisecond) {
		chName, _ = e.db.NameAt(ctx, "CPLANT", e.clock.Now()) // noted in the background
	}
	if chName != "#finishing" {
		t.Errorf("channel name noted = %q, want #finishing", chName)
	}
	if c := e.slack.callCount("users.info"); c != 1 {
		t.Errorf("users.info called %d times, want 1 (cached)", c)
	}
	d, err := e.db.Digest(ctx, e.clock.Now().Add(-time.Hour), e.clock.Now().Add(time.Second))
	if err != nil {
		t.Fatal(err)
	}
	if err := e.sl.PublishDigest(ctx, d); err != nil {
		t.Fatal(err)
	}
	posts := e.slack.postsNow()
	sum := posts[len(posts)-1]
	ups := e.slack.uploadsNow()
	if sum.Channel != "CSUP" || !strings.Contains(sum.blockText(), "3 queries from 1 person") || !strings.Contains(sum.blockText(), "×3") ||
		!strings.Contains(sum.blockText(), d.HeadHash) || strings.Contains(sum.blockText(), "UOP") {
		t.Errorf("digest summary:\n%s", sum.blockText())
	}
	if len(ups) != 1 || ups[0].Channel != "CSUP" || ups[0].ThreadTS != sum.TS || !strings.HasPrefix(ups[0].Title, "Shift digest") {
		t.Errorf("digest file uploads = %+v, want one in the summary's thread", ups)
	}
	if !strings.Contains(d.Text(), "Olga K.") {
		t.Errorf("digest text does not name the asker:\n%s", d.Text())
	}
}

func TestChatManners(t *testing.T) {
	e := newEnv(t)
	e.runSocket()
	e.slack.waitConn(1)
	ctx := context.Background()
	// Help in a channel is shown to the asker alone, with the New mix button.
	e.slack.send(mentionEnvelope("env-h", "EvH", "CPLANT", "UOP", "1700000500.000100", "help", 0))
	e.slack.waitAck("env-h")
	deadline := time.Now().Add(20 * time.Second)
	for len(e.slack.ephemeralsNow()) == 0 && time.Now().Before(deadline) {
		time.Sleep(5 * time.Millisecond)
	}
	e.drain()
	eph := e.slack.ephemeralsNow()
	if len(eph) != 1 || eph[0].User != "UOP" || !strings.Contains(eph[0].blockText(), "New mix") || len(e.slack.postsNow()) != 0 {
		t.Errorf("help: ephemerals %+v, posts %d; want help shown to UOP alone", eph, len(e.slack.postsNow()))
	}
	// The refusal names the roles allowed, privately.
	r := e.bot.Answer(ctx, bot.Incoming{Channel: "CPLANT", UserID: "UOP", Text: "digest"})
	if !r.Private || !strings.Contains(r.Text, "supervisors and reviewers") {
		t.Errorf("digest refusal = %+v", r)
	}
	// A mention typed into a bad request never pings, in blocks or fallback.
	e.slack.send(mentionEnvelope("env-x", "EvX", "CPLANT", "UOP", "1700000501.000100", "mix 2 L bad <!here> + <!channel>", 0))
	e.slack.waitAck("env-x")
	p := e.slack.waitPosts(1)[0]
	e.drain()
	for name, s := range map[string]string{"fallback": p.Text, "blocks": p.blockText()} {
		if strings.Contains(s, "<!here>") || strings.Contains(s, "<!channel>") || !strings.Contains(s, "&lt;!here&gt;") {
			t.Errorf("%s of a parse error is not escaped: %q", name, s)
		}
	}
	// Quoted stream texts are taken as the stream.
	r = e.bot.Answer(ctx, bot.Incoming{Channel: "CPLANT", UserID: "USUP", Text: `streams set T-102 "200 L NaOCl 12.5 %" note: "weekly"`})
	if st, err := e.db.Stream(ctx, "T-102"); err != nil || st.Stream != "200 L NaOCl 12.5 %" || st.Note != "weekly" {
		t.Errorf("quoted streams set: %q; stored %+v, %v", r.Text, st, err)
	}
}

func TestCommandAckSaysWhereTheAnswerGoes(t *testing.T) {
	e := newEnv(t)
	h := e.sl.HTTPHandler(bot.NewVerifier(e.secret, e.clock.Now))
	for _, tc := range []struct{ channel, text, want string }{
		{"CPLANT", "mix 1 L NaOCl 12.5 % + 1 L HCl 10 %", "in its thread"},
		{"CPLANT", "help", "only you will see"},
		{"CPLANT", "search chlorine", "only you will see"},
		{"DOP", "mix 1 L NaOCl 12.5 % + 1 L HCl 10 %", "here in a moment"},
		{"CPLANT", "digest", "only you will see my reply"},
	} {
		body := []byte(slashForm(tc.channel, "UOP", tc.text, "trig-"+tc.text+tc.channel).Encode())
		w := postEvents(t, h, signedRequest(t, "POST", "/slack/commands", "application/x-www-form-urlencoded", body, e.secret, e.clock.Now()))
		if !strings.Contains(w.Body.String(), tc.want) {
			t.Errorf("ack of %q in %s = %s, want %q", tc.text, tc.channel, w.Body.String(), tc.want)
		}
	}
	e.drain()
}

func FuzzParseInteraction(f *testing.F) {
	f.Add(interactiveBody(buttonPayload(bot.ActionDetails, "12", "C1", "1.1", "1.2", "U1", "1.3")))
	f.Add(interactiveBody(formPayload("V1", "U1", `{"c":"C1"}`, map[string]string{"tags": "T-1,T-2", "ph": "3"})))
	f.Add([]byte("payload=%7B%7D"))
	f.Add([]byte("payload=%7B%22type%22%3A1%7D&payload=x"))
	f.Fuzz(func(t *testing.T, body []byte) {
		cb, err := bot.ParseInteraction(body)
		if err != nil {
			return
		}
		if cb.Type == "" {
			t.Errorf("ParseInteraction accepted a payload without a type")
		}
		_ = bot.FormInputFromState(cb.View.State)
	})
}
