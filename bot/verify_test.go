package bot

import (
	"errors"
	"net/http"
	"strconv"
	"strings"
	"testing"
	"time"
)

func TestVerifier(t *testing.T) {
	const secret = "8f742231b10e8888abcd99yyyzzz85a5"
	now := time.Date(2026, 11, 30, 9, 0, 0, 0, time.UTC)
	v := NewVerifier(secret, func() time.Time { return now })
	body := []byte("token=x&team_id=T1&command=%2Fmixward&text=help")
	ts := func(d time.Duration) string { return strconv.FormatInt(now.Add(d).Unix(), 10) }
	header := func(sig, ts string) http.Header {
		h := http.Header{}
		if sig != "" {
			h.Set("X-Slack-Signature", sig)
		}
		if ts != "" {
			h.Set("X-Slack-Request-Timestamp", ts)
		}
		return h
	}
	good := SignatureHeader(secret, ts(0), body)
	for _, tc := range []struct {
		name string
		h    http.Header
		body []byte
		want error
	}{
		{"valid", header(good, ts(0)), body, nil},
		{"valid 4m59s old", header(SignatureHeader(secret, ts(-299*time.Second), body), ts(-299*time.Second)), body, nil},
		{"valid 4m59s ahead", header(SignatureHeader(secret, ts(299*time.Second), body), ts(299*time.Second)), body, nil},
		{"no headers", header("", ""), body, ErrUnsigned},
		{"no timestamp", header(good, ""), body, ErrUnsigned},
		{"no signature", header("", ts(0)), body, ErrUnsigned},
		{"wrong version", header("v1="+good[3:], ts(0)), body, ErrBadSigVersion},
		{"not hex", header("v0=zz", ts(0)), body, ErrBadSignature},
		{"short", header(good[:20], ts(0)), body, ErrBadSignature},
		{"wrong secret", header(SignatureHeader("other", ts(0), body), ts(0)), body, ErrBadSignature},
		{"body changed", header(good, ts(0)), append([]byte(nil), append(body, ' ')...), ErrBadSignature},
		{"timestamp changed", header(good, ts(time.Second)), body, ErrBadSignature},
		{"stale", header(SignatureHeader(secret, ts(-301*time.Second), body), ts(-301*time.Second)), body, ErrStaleRequest},
		{"future", header(SignatureHeader(secret, ts(301*time.Second), body), ts(301*time.Second)), body, ErrStaleRequest},
		{"timestamp not a number", header(good, "yesterday"), body, ErrBadTimestamp},
	} {
		t.Run(tc.name, func(t *testing.T) {
			err := v.Verify(tc.h, tc.body)
			if !errors.Is(err, tc.want) || (tc.want == nil) != (err == nil) {
				t.Errorf("Verify = %v, want %v", err, tc.want)
			}
		})
	}
	if err := NewVerifier("", nil).Verify(header(good, ts(0)), body); !errors.Is(err, ErrNoSigningKey) {
		t.Errorf("empty secret: %v, want ErrNoSigningKey", err)
	}
}

// The signature scheme matches Slack's published example (Slack API
// documentation, "Verifying requests from Slack"; values from memory).
func TestSignatureMatchesSlackExample(t *testing.T) {
	body := "token=xyzz0WbapA4vBCDEFasx0q6G&team_id=T1DC2JH3J&team_domain=testteamnow&channel_id=G8PSS9T3V&channel_name=foobar&user_id=U2CERLKJA&user_name=roadrunner&command=%2Fwebhook-collect&text=&response_url=https%3A%2F%2Fhooks.slack.com%2Fcommands%2FT1DC2JH3J%2F397700885554%2F96rGlfmibIGlgcZRskXaIFfN&trigger_id=398738663015.47445629121.803a0bc887a14d10d2c447fce8b6703c"
	got := SignatureHeader("8f742231b10e8888abcd99yyyzzz85a5", "1531420618", []byte(body))
	const want = "v0=a2114d57b48eac39b9ad189dd8316235a7b4a8d21a10bd27519666489c69b503"
	if got != want {
		t.Errorf("SignatureHeader = %s, want %s", got, want)
	}
}

func FuzzVerify(f *testing.F) {
	now := time.Unix(1700000000, 0)
	v := NewVerifier("secret", func() time.Time { return now })
	f.Add("v0=00", "1700000000", []byte("{}"))
	f.Add(SignatureHeader("secret", "1700000000", []byte("{}")), "1700000000", []byte("{}"))
	f.Fuzz(func(t *testing.T, sig, ts string, body []byte) {
		h := http.Header{}
		h.Set("X-Slack-Signature", sig)
		h.Set("X-Slack-Request-Timestamp", ts)
		err := v.Verify(h, body)
		// Hex digits in either case spell the same HMAC; anything else
		// accepted would be a forgery.
		if err == nil && !strings.EqualFold(sig, SignatureHeader("secret", ts, body)) {
			t.Errorf("accepted a signature %q that is not the HMAC of the body", sig)
		}
	})
}
