package main

import (
	"testing"
	"time"
)

// serve drains on its own after SIGTERM (--drain-timeout) and must not be
// cut short; every other command stops a few seconds after the signal even
// when it is busy in a computation that does not watch the context.
func TestSignalGrace(t *testing.T) {
	for _, tc := range []struct {
		args []string
		want time.Duration
	}{
		{[]string{"serve", "--http", ":0"}, 0},
		{[]string{"ask", "mix Zn + HCl 1 M"}, 5 * time.Second},
		{[]string{"log", "verify"}, 5 * time.Second},
		{nil, 5 * time.Second},
	} {
		if got := signalGrace(tc.args); got != tc.want {
			t.Errorf("signalGrace(%q) = %v, want %v", tc.args, got, tc.want)
		}
	}
}
