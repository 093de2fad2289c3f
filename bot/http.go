package bot

import (
	"context"
	"encoding/json"
	"errors"
	"io"
	"net/http"
	"net/url"
	"strconv"
	"strings"
	"time"

	"github.com/slack-go/slack"
	"github.com/slack-go/slack/slackevents"
)

// maxBody bounds a Slack request body; Slack's own are a few KB.
const maxBody = 1 << 20

// HTTPHandler serves the Slack HTTP Events API (POST /slack/events), the
// slash command (POST /slack/commands) and interactivity (POST
// /slack/interactive: buttons, the request form, the shortcut), plus GET
// /healthz. Every Slack
// request must carry a valid signature (v); an unsigned, forged or stale
// request gets 401 and is neither processed nor logged. Requests are
// answered as soon as they are queued; the answer is posted later.
func (s *Slack) HTTPHandler(v *Verifier) http.Handler {
	mux := http.NewServeMux()
	mux.HandleFunc("POST /slack/events", func(w http.ResponseWriter, r *http.Request) { s.serveEvents(w, r, v) })
	mux.HandleFunc("POST /slack/commands", func(w http.ResponseWriter, r *http.Request) { s.serveCommand(w, r, v) })
	mux.HandleFunc("POST /slack/interactive", func(w http.ResponseWriter, r *http.Request) { s.serveInteractive(w, r, v) })
	if s.Health != nil {
		mux.Handle("GET /healthz", s.Health)
	}
	return mux
}

// readVerified reads the body and checks its signature, answering 401 (or
// 413/400) itself when it fails.
func (s *Slack) readVerified(w http.ResponseWriter, r *http.Request, v *Verifier) ([]byte, bool) {
	body, err := io.ReadAll(http.MaxBytesReader(w, r.Body, maxBody))
	if err != nil {
		var tooBig *http.MaxBytesError
		if errors.As(err, &tooBig) {
			http.Error(w, "request body too large", http.StatusRequestEntityTooLarge)
		} else {
			http.Error(w, "could not read request body", http.StatusBadRequest)
		}
		return nil, false
	}
	if err := v.Verify(r.Header, body); err != nil {
		s.Metrics.failed("verify")
		s.logger().Warn("refused unverified Slack request", "path", r.URL.Path, "remote", r.RemoteAddr, "reason", err)
		http.Error(w, "invalid or missing Slack signature", http.StatusUnauthorized)
		return nil, false
	}
	return body, true
}

func (s *Slack) ackWait() time.Duration {
	if s.AckWait > 0 {
		return s.AckWait
	}
	return 2 * time.Second
}

func (s *Slack) serveEvents(w http.ResponseWriter, r *http.Request, v *Verifier) {
	body, ok := s.readVerified(w, r, v)
	if !ok {
		return
	}
	var outer struct {
		Type      string `json:"type"`
		Challenge string `json:"challenge"`
	}
	if err := json.Unmarshal(body, &outer); err != nil {
		http.Error(w, "body is not a JSON Events API payload", http.StatusBadRequest)
		return
	}
	switch outer.Type {
	case slackevents.URLVerification:
		w.Header().Set("Content-Type", "application/json")
		_ = json.NewEncoder(w).Encode(map[string]string{"challenge": outer.Challenge})
		return
	case slackevents.CallbackEvent:
	default:
		w.WriteHeader(http.StatusOK) // app_rate_limited and the like: nothing to do
		return
	}
	ev, err := slackevents.ParseEvent(json.RawMessage(body), slackevents.OptionNoVerifyToken())
	if err != nil {
		// An inner event type the bot does not subscribe to.
		s.logger().Debug("ignored Events API callback", "err", err)
		w.WriteHeader(http.StatusOK)
		return
	}
	retry, _ := strconv.Atoi(r.Header.Get("X-Slack-Retry-Num"))
	in, ok := s.FromEvent(ev, "http", retry)
	if !ok {
		w.WriteHeader(http.StatusOK)
		return
	}
	if retry > 0 {
		s.logger().Info("Slack redelivery", "event_id", in.EventID, "retry", retry, "reason", r.Header.Get("X-Slack-Retry-Reason"))
	}
	s.accept(w, r, in, nil)
}

func (s *Slack) serveCommand(w http.ResponseWriter, r *http.Request, v *Verifier) {
	body, ok := s.readVerified(w, r, v)
	if !ok {
		return
	}
	form, err := url.ParseQuery(string(body))
	if err != nil {
		http.Error(w, "body is not a form-encoded slash command", http.StatusBadRequest)
		return
	}
	c := slack.SlashCommand{
		TeamID:      form.Get("team_id"),
		ChannelID:   form.Get("channel_id"),
		ChannelName: form.Get("channel_name"),
		UserID:      form.Get("user_id"),
		UserName:    form.Get("user_name"),
		Command:     form.Get("command"),
		Text:        form.Get("text"),
		ResponseURL: form.Get("response_url"),
		TriggerID:   form.Get("trigger_id"),
	}
	if c.ChannelID == "" || c.UserID == "" {
		http.Error(w, "slash command without channel_id or user_id", http.StatusBadRequest)
		return
	}
	if strings.TrimSpace(c.Text) == "" && s.openFormLogged(r.Context(), c.TriggerID, formMeta{Channel: c.ChannelID}, false) {
		w.WriteHeader(http.StatusOK) // the form is the answer
		return
	}
	in := s.FromCommand(c, "http")
	ack := commandAck(in)
	s.accept(w, r, in, ack)
}

// serveInteractive takes a button press, a form submission or a shortcut.
// Field errors of a form go back in the response body; everything else is
// answered with an empty 200 and handled after.
func (s *Slack) serveInteractive(w http.ResponseWriter, r *http.Request, v *Verifier) {
	body, ok := s.readVerified(w, r, v)
	if !ok {
		return
	}
	cb, err := ParseInteraction(body)
	if err != nil {
		http.Error(w, err.Error(), http.StatusBadRequest)
		return
	}
	ctx, cancel := context.WithTimeout(r.Context(), s.ackWait())
	defer cancel()
	resp := s.Interact(ctx, cb, "http")
	if resp == nil {
		w.WriteHeader(http.StatusOK)
		return
	}
	w.Header().Set("Content-Type", "application/json")
	_ = json.NewEncoder(w).Encode(resp)
}

// accept queues in and acknowledges the request; if the queue stays full
// past AckWait it answers 503 so that Slack delivers the event again
// instead of it being lost.
func (s *Slack) accept(w http.ResponseWriter, r *http.Request, in Incoming, ack any) {
	ctx, cancel := context.WithTimeout(r.Context(), s.ackWait())
	defer cancel()
	if err := s.Submit(ctx, in); err != nil {
		s.logger().Warn("could not queue message; asking Slack to redeliver", "event_id", in.EventID, "err", err)
		w.Header().Set("Retry-After", "5")
		http.Error(w, "busy, retry later", http.StatusServiceUnavailable)
		return
	}
	if ack == nil {
		w.WriteHeader(http.StatusOK)
		return
	}
	w.Header().Set("Content-Type", "application/json")
	_ = json.NewEncoder(w).Encode(ack)
}
