package bot

import (
	"crypto/hmac"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"net/http"
	"strconv"
	"strings"
	"time"
)

// SignatureWindow is how far a request's X-Slack-Request-Timestamp may be
// from the bot's clock before the request is refused as stale.
const SignatureWindow = 5 * time.Minute

// Errors of request verification. They are logged, never shown to callers
// (who get a bare 401).
var (
	ErrUnsigned      = errors.New("request is not signed (X-Slack-Signature or X-Slack-Request-Timestamp missing)")
	ErrBadSignature  = errors.New("request signature does not match the signing secret")
	ErrStaleRequest  = errors.New("request timestamp is outside the 5-minute window")
	ErrNoSigningKey  = errors.New("no signing secret configured")
	ErrBadTimestamp  = errors.New("request timestamp is not a Unix time in seconds")
	ErrBadSigVersion = errors.New(`request signature does not start with "v0="`)
)

// Verifier checks Slack's v0 request signatures: an HMAC-SHA256 of
// "v0:<timestamp>:<body>" keyed with the app's signing secret, compared in
// constant time, with the timestamp within SignatureWindow of Now.
type Verifier struct {
	secret []byte
	now    func() time.Time
}

// NewVerifier returns a verifier for secret. now is the clock the timestamp
// window is measured against (time.Now in production).
func NewVerifier(secret string, now func() time.Time) *Verifier {
	if now == nil {
		now = time.Now
	}
	return &Verifier{secret: []byte(secret), now: now}
}

// Verify checks the signature headers of a request against its raw body.
func (v *Verifier) Verify(h http.Header, body []byte) error {
	if len(v.secret) == 0 {
		return ErrNoSigningKey
	}
	sig := h.Get("X-Slack-Signature")
	ts := h.Get("X-Slack-Request-Timestamp")
	if sig == "" || ts == "" {
		return ErrUnsigned
	}
	hexSig, ok := strings.CutPrefix(sig, "v0=")
	if !ok {
		return ErrBadSigVersion
	}
	got, err := hex.DecodeString(hexSig)
	if err != nil || len(got) != sha256.Size {
		return ErrBadSignature
	}
	sec, err := strconv.ParseInt(ts, 10, 64)
	if err != nil {
		return ErrBadTimestamp
	}
	if d := v.now().Sub(time.Unix(sec, 0)); d > SignatureWindow || d < -SignatureWindow {
		return fmt.Errorf("%w (off by %s)", ErrStaleRequest, d.Round(time.Second))
	}
	if !hmac.Equal(got, Sign(v.secret, ts, body)) {
		return ErrBadSignature
	}
	return nil
}

// Sign returns the raw v0 HMAC of a request body: what a correct
// X-Slack-Signature carries after "v0=", hex-encoded.
func Sign(secret []byte, timestamp string, body []byte) []byte {
	m := hmac.New(sha256.New, secret)
	m.Write([]byte("v0:" + timestamp + ":"))
	m.Write(body)
	return m.Sum(nil)
}

// SignatureHeader is the X-Slack-Signature value for a body signed at
// timestamp; tests and fakes use it to sign requests as Slack does.
func SignatureHeader(secret, timestamp string, body []byte) string {
	return "v0=" + hex.EncodeToString(Sign([]byte(secret), timestamp, body))
}
