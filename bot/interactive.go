package bot

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"net/url"
	"strconv"
	"time"

	"github.com/slack-go/slack"

	"mixward/engine"
	"mixward/engine/advice"
	"mixward/store"
)

// ViewsAPI opens and updates modals. *slack.Client implements it.
type ViewsAPI interface {
	OpenViewContext(ctx context.Context, triggerID string, view slack.ModalViewRequest) (*slack.ViewResponse, error)
	UpdateViewContext(ctx context.Context, view slack.ModalViewRequest, externalID, hash, viewID string) (*slack.ViewResponse, error)
}

// queryReader reads a logged query (store.DB has it).
type queryReader interface {
	Get(ctx context.Context, id int64) (*store.Query, error)
}

// pressLog records button presses against their query (store.DB has it).
type pressLog interface {
	RecordPress(ctx context.Context, p store.Press) error
}

// ErrNotInteraction is returned by ParseInteraction for a body that is not
// an interactive payload.
var ErrNotInteraction = errors.New("not a Slack interactive payload")

// ParseInteraction reads the body of a POST to the interactivity URL: a
// form whose field "payload" holds the JSON interaction.
func ParseInteraction(body []byte) (slack.InteractionCallback, error) {
	var cb slack.InteractionCallback
	form, err := url.ParseQuery(string(body))
	if err != nil {
		return cb, fmt.Errorf("%w: body is not form-encoded: %v", ErrNotInteraction, err)
	}
	p := form.Get("payload")
	if p == "" {
		return cb, fmt.Errorf("%w: no payload field", ErrNotInteraction)
	}
	if err := json.Unmarshal([]byte(p), &cb); err != nil {
		return cb, fmt.Errorf("%w: payload is not JSON: %v", ErrNotInteraction, err)
	}
	if cb.Type == "" {
		return cb, fmt.Errorf("%w: payload has no type", ErrNotInteraction)
	}
	return cb, nil
}

// Interact handles one interaction from either transport and returns what
// to answer Slack with at once: nil, or a view-submission response with
// field errors. Button presses are queued and answered after; forms are
// opened at once (a trigger is good for about 3 s).
func (s *Slack) Interact(ctx context.Context, cb slack.InteractionCallback, transport string) any {
	switch cb.Type {
	case slack.InteractionTypeBlockActions:
		for _, a := range cb.ActionCallback.BlockActions {
			s.blockAction(ctx, cb, a, transport)
		}
	case slack.InteractionTypeShortcut, slack.InteractionTypeMessageAction:
		if cb.CallbackID == ActionNewMix {
			ch := orDefault(cb.Channel.ID, cb.Container.ChannelID)
			s.openFormLogged(ctx, cb.TriggerID, formMeta{Channel: ch}, ch == "")
		}
	case slack.InteractionTypeViewSubmission:
		if cb.View.CallbackID == FormCallback {
			return s.submitForm(ctx, cb, transport)
		}
	}
	return nil
}

func (s *Slack) blockAction(ctx context.Context, cb slack.InteractionCallback, a *slack.BlockAction, transport string) {
	channel := orDefault(cb.Channel.ID, cb.Container.ChannelID)
	if a.ActionID == ActionNewMix {
		s.openFormLogged(ctx, cb.TriggerID, formMeta{Channel: channel}, channel == "")
		return
	}
	action := map[string]string{ActionDetails: store.PressDetails, ActionPicture: store.PressPicture, ActionPour: store.PressPour}[a.ActionID]
	id, err := strconv.ParseInt(a.Value, 10, 64)
	if action == "" || err != nil || id <= 0 {
		s.logger().Debug("interaction ignored", "action_id", a.ActionID, "value", a.Value)
		return
	}
	p := press{
		Press: store.Press{QueryID: id, Action: action, UserID: cb.User.ID, UserName: cb.User.Name, Channel: channel,
			Transport: transport, Key: cb.User.ID + "/" + orDefault(a.ActionTs, cb.ActionTs)},
		thread:      orDefault(cb.Container.ThreadTs, orDefault(cb.Message.ThreadTimestamp, cb.Container.MessageTs)),
		ephemeral:   cb.Container.IsEphemeral,
		responseURL: cb.ResponseURL,
	}
	if !s.seen.claim("press:"+p.Key, s.now()) {
		return // a redelivery of a press being answered
	}
	key := channel + "/" + p.thread
	if err := s.Queue.Submit(ctx, key, func(ctx context.Context) { s.answerPress(ctx, p) }); err != nil {
		s.seen.release("press:" + p.Key)
		s.logger().Warn("button press not queued", "query_id", id, "action", action, "err", err)
	}
}

// press is one button press being answered.
type press struct {
	store.Press
	thread      string
	ephemeral   bool // pressed under a message only the presser sees
	responseURL string
}

// answerPress records a press against its query and posts what it asks
// for: the full answer or the pour order in the thread, or the picture.
func (s *Slack) answerPress(ctx context.Context, p press) {
	if n := s.Names.Known(p.UserID); n != "" {
		p.UserName = n
	}
	s.Names.Refresh(p.UserID, true)
	r, err := s.pressedResult(ctx, p)
	if err != nil {
		s.tellPresser(ctx, p, err.Error())
		return
	}
	if pl, ok := s.Bot.Log.(pressLog); ok {
		err := pl.RecordPress(ctx, p.Press)
		if errors.Is(err, store.ErrDuplicate) {
			return
		}
		if err != nil {
			s.Metrics.failed("log")
			s.logger().Error("press not recorded; not answering it", "query_id", p.QueryID, "err", err)
			s.tellPresser(ctx, p, "I could not record this press in the query log, so I am not answering it; please try again in a minute.")
			return
		}
	}
	var msg Message
	switch p.Action {
	case store.PressPicture:
		if !s.pictures().Offer(p.Channel, p.thread, p.QueryID, r) {
			s.tellPresser(ctx, p, "I cannot draw an E–pH picture for this answer: it has no oxidizing and reducing agent pair, or pictures are off or busy just now.")
		}
		return
	case store.PressPour:
		msg = Message{Text: PourText(r), Blocks: PourBlocks(r)}
		if msg.Blocks == nil {
			msg.Blocks = TextBlocks(esc(msg.Text))
		}
	default:
		msg = Message{Text: advice.RenderDetails(r), Blocks: DetailsBlocks(r, p.QueryID)}
	}
	s.postPressed(ctx, p, msg)
}

// pressedResult reads the answer a press is about; its error is the text
// for the presser.
func (s *Slack) pressedResult(ctx context.Context, p press) (*engine.Result, error) {
	qr, ok := s.Bot.Log.(queryReader)
	if !ok {
		return nil, errors.New("The query log cannot be read here.")
	}
	q, err := qr.Get(ctx, p.QueryID)
	if errors.Is(err, store.ErrNotFound) {
		return nil, fmt.Errorf("Query #%d is not in the query log.", p.QueryID)
	}
	if err != nil {
		s.logger().Error("query not read for a press", "query_id", p.QueryID, "err", err)
		return nil, errors.New("I could not read the query log just now; please try again in a minute.")
	}
	if q.Channel != p.Channel {
		return nil, fmt.Errorf("Query #%d was answered in another conversation; press the button there.", p.QueryID)
	}
	var r engine.Result
	if len(q.Result) == 0 || json.Unmarshal(q.Result, &r) != nil {
		return nil, fmt.Errorf("Query #%d has no answer on record to show.", p.QueryID)
	}
	return &r, nil
}

// postPressed posts msg in the press's thread, or privately when the
// button was under a message only the presser sees.
func (s *Slack) postPressed(ctx context.Context, p press, msg Message) {
	msgs := SplitMessages(msg.Text, msg.Blocks)
	for i, m := range msgs {
		var err error
		switch {
		case p.ephemeral && p.responseURL != "":
			err = s.Poster.Respond(ctx, p.Channel, p.responseURL, m)
		case p.ephemeral:
			err = s.Poster.Ephemeral(ctx, p.Channel, p.UserID, p.thread, m)
		default:
			_, err = s.Poster.Post(ctx, p.Channel, p.thread, m)
		}
		if err != nil {
			s.Metrics.failed("post")
			s.logger().Warn("answer to a press not posted", "query_id", p.QueryID, "action", p.Action, "part", i+1, "err", err)
			return
		}
	}
	s.logger().Info("press answered", "query_id", p.QueryID, "action", p.Action, "user", p.UserID, "transport", p.Transport)
}

// tellPresser shows text to the presser alone.
func (s *Slack) tellPresser(ctx context.Context, p press, text string) {
	m := Message{Text: text, Blocks: TextBlocks(esc(text))}
	if err := s.Poster.Ephemeral(ctx, p.Channel, p.UserID, p.thread, m); err != nil {
		s.logger().Warn("note to a presser not shown", "query_id", p.QueryID, "err", err)
	}
}

// openFormLogged opens the request form, logging a failure.
func (s *Slack) openFormLogged(ctx context.Context, trigger string, meta formMeta, askChannel bool) bool {
	if err := s.OpenForm(ctx, trigger, meta.Channel, meta.Thread, askChannel); err != nil {
		s.logger().Warn("request form not opened", "err", err)
		return false
	}
	return true
}

// OpenForm opens the request form for trigger (from a slash command, a
// button or a shortcut): at once a modal saying the catalogue is being
// read, then (views.update) the form with the catalogue's tags to pick.
// The answer goes to channel (thread, when given); askChannel adds a
// field for where to answer.
func (s *Slack) OpenForm(ctx context.Context, trigger, channel, thread string, askChannel bool) error {
	if s.Views == nil || trigger == "" {
		return errors.New("no trigger to open a form with, or no views API")
	}
	meta := formMeta{Channel: channel, Thread: thread}
	ctx, cancel := context.WithTimeout(ctx, 3*time.Second)
	defer cancel()
	v, err := s.Views.OpenViewContext(ctx, trigger, loadingView(meta))
	if err != nil {
		return fmt.Errorf("views.open: %w", err)
	}
	var streams []store.Stream
	if s.Bot.Catalogue != nil {
		if streams, err = s.Bot.Catalogue.Streams(ctx); err != nil {
			s.logger().Warn("catalogue not read for the form; typed streams only", "err", err)
		}
	}
	if _, err := s.Views.UpdateViewContext(ctx, FormView(streams, meta, askChannel), "", v.Hash, v.ID); err != nil {
		return fmt.Errorf("views.update: %w", err)
	}
	return nil
}

// submitForm checks a submitted form and, when it reads, queues its
// request for an answer in the channel the form was opened from. It
// returns the field errors to show on the form, or nil to close it.
func (s *Slack) submitForm(ctx context.Context, cb slack.InteractionCallback, transport string) any {
	f := FormInputFromState(cb.View.State)
	var meta formMeta
	_ = json.Unmarshal([]byte(cb.View.PrivateMetadata), &meta)
	if f.Channel != "" {
		meta.Channel = f.Channel
	}
	text, parts, errs := f.Request()
	if meta.Channel == "" && len(errs) == 0 {
		errs[FieldStreams] = "I do not know where to answer: open the form with /mixward in a channel."
	}
	if len(errs) == 0 {
		if pe := s.Bot.checkRequest(ctx, text); pe != nil {
			errs = FormErrors(parts, pe)
		}
	}
	if len(errs) > 0 {
		return slack.NewErrorsViewSubmissionResponse(errs)
	}
	in := Incoming{Transport: transport, EventID: "view:" + cb.View.ID, Channel: meta.Channel, ThreadTS: meta.Thread,
		UserID: cb.User.ID, UserName: cb.User.Name, Text: text, Command: "/mixward form", Received: s.now()}
	if err := s.Submit(ctx, in); err != nil {
		return slack.NewErrorsViewSubmissionResponse(map[string]string{FieldStreams: "I am too busy to take this just now; please submit again in a minute."})
	}
	return nil
}
