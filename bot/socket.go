package bot

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"strings"

	"github.com/slack-go/slack"
	"github.com/slack-go/slack/slackevents"
	"github.com/slack-go/slack/socketmode"
)

// RunSocket serves Slack over Socket Mode until ctx ends. It acknowledges
// every envelope at once and queues the messages; slack-go reconnects by
// itself after a dropped socket, and Slack redelivers what was not
// acknowledged (answered once, see Submit). It returns nil when ctx ends
// and an error when Slack refuses the tokens.
func (s *Slack) RunSocket(ctx context.Context, sm *socketmode.Client) error {
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	runErr := make(chan error, 1)
	go func() { runErr <- sm.RunContext(ctx) }()
	for {
		select {
		case err := <-runErr:
			if ctx.Err() != nil {
				return nil
			}
			return fmt.Errorf("socket mode stopped: %w (check SLACK_APP_TOKEN and SLACK_BOT_TOKEN)", err)
		case <-ctx.Done():
			<-runErr
			return nil
		case ev := <-sm.Events:
			if err := s.socketEvent(ctx, sm, ev); err != nil {
				return err
			}
		}
	}
}

func (s *Slack) socketState(state string) {
	if s.Health != nil {
		s.Health.SetSocket(state)
	}
}

func (s *Slack) socketEvent(ctx context.Context, sm *socketmode.Client, ev socketmode.Event) error {
	log := s.logger()
	switch ev.Type {
	case socketmode.EventTypeConnecting:
		s.socketState("connecting")
		log.Info("socket mode connecting")
	case socketmode.EventTypeConnected:
		s.socketState("connected")
		log.Info("socket mode connected")
	case socketmode.EventTypeHello:
		s.socketState("connected")
	case socketmode.EventTypeConnectionError:
		s.socketState("reconnecting")
		if e, ok := ev.Data.(*slack.ConnectionErrorEvent); ok {
			log.Warn("socket mode connection failed; retrying", "attempt", e.Attempt, "backoff", e.Backoff, "err", e.ErrorObj)
		}
	case socketmode.EventTypeIncomingError:
		log.Warn("socket mode read failed; reconnecting")
	case socketmode.EventTypeDisconnect:
		s.socketState("reconnecting")
		log.Info("socket mode disconnect requested by Slack; reconnecting")
	case socketmode.EventTypeInvalidAuth:
		s.socketState("invalid auth")
		return errors.New("socket mode: Slack refused the app token (invalid_auth)")
	case socketmode.EventTypeErrorBadMessage:
		// An envelope slack-go could not parse (e.g. an event type it does
		// not know) still needs its ack, or Slack sends it again and again.
		if e, ok := ev.Data.(*socketmode.ErrorBadMessage); ok {
			var env struct {
				EnvelopeID string `json:"envelope_id"`
			}
			if json.Unmarshal(e.Message, &env) == nil && env.EnvelopeID != "" {
				_ = sm.AckCtx(ctx, env.EnvelopeID, nil)
			}
			log.Debug("socket mode message not understood", "err", e.Cause)
		}
	case socketmode.EventTypeEventsAPI:
		if ev.Request == nil {
			return nil
		}
		eapi, _ := ev.Data.(slackevents.EventsAPIEvent)
		in, ok := s.FromEvent(eapi, "socket", ev.Request.RetryAttempt)
		if !ok {
			s.ack(ctx, sm, ev.Request, nil)
			return nil
		}
		if ev.Request.RetryAttempt > 0 {
			log.Info("Slack redelivery", "event_id", in.EventID, "retry", ev.Request.RetryAttempt, "reason", ev.Request.RetryReason)
		}
		if s.submitBlocking(ctx, in) {
			s.ack(ctx, sm, ev.Request, nil)
		}
	case socketmode.EventTypeSlashCommand:
		if ev.Request == nil {
			return nil
		}
		c, ok := ev.Data.(slack.SlashCommand)
		if !ok {
			s.ack(ctx, sm, ev.Request, nil)
			return nil
		}
		if strings.TrimSpace(c.Text) == "" && s.openFormLogged(ctx, c.TriggerID, formMeta{Channel: c.ChannelID}, false) {
			s.ack(ctx, sm, ev.Request, nil) // the form is the answer
			return nil
		}
		in := s.FromCommand(c, "socket")
		if s.submitBlocking(ctx, in) {
			s.ack(ctx, sm, ev.Request, commandAck(in))
		}
	case socketmode.EventTypeInteractive:
		if ev.Request == nil {
			return nil
		}
		cb, ok := ev.Data.(slack.InteractionCallback)
		var resp any
		if ok {
			actx, cancel := context.WithTimeout(ctx, s.ackWait())
			resp = s.Interact(actx, cb, "socket")
			cancel()
		}
		s.ack(ctx, sm, ev.Request, resp)
	}
	return nil
}

// submitBlocking queues in, waiting as long as the queue is full: reading
// from the socket pauses meanwhile (backpressure), nothing is dropped. It
// reports whether in was queued; if not, it is left unacknowledged so that
// Slack delivers it again.
func (s *Slack) submitBlocking(ctx context.Context, in Incoming) bool {
	if err := s.Submit(ctx, in); err != nil {
		s.logger().Warn("message not queued before shutdown; Slack will redeliver it", "event_id", in.EventID, "err", err)
		return false
	}
	return true
}

func (s *Slack) ack(ctx context.Context, sm *socketmode.Client, req *socketmode.Request, payload any) {
	if err := sm.AckCtx(ctx, req.EnvelopeID, payload); err != nil {
		s.logger().Warn("socket mode ack failed", "envelope_id", req.EnvelopeID, "err", err)
	}
}
