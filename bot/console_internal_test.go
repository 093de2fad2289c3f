package bot

import (
	"context"
	"strings"
	"testing"
)

// FuzzReadLines: the console's line reader gives the lines of its input as
// a newline split would (a trailing CR dropped, no empty line after a final
// newline), whatever the bytes.
func FuzzReadLines(f *testing.F) {
	for _, s := range []string{"", "help\n", "a\r\nb", "\n\n\n", "mix 1 L HCl 10 %\r\n\r\nstreams", "x\ry\n"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, in string) {
		out := make(chan consoleLine)
		errc := make(chan error, 1)
		go func() { errc <- readLines(context.Background(), strings.NewReader(in), out); close(out) }()
		var got []string
		for l := range out {
			if l.full != 0 {
				t.Fatalf("line of %d bytes reported as cut", len(l.text))
			}
			got = append(got, l.text)
		}
		if err := <-errc; err != nil {
			t.Fatal(err)
		}
		// Every line ended by a newline loses one CR before it; a last
		// line without a newline is kept as it is, an empty one dropped.
		parts := strings.Split(in, "\n")
		var want []string
		for i, p := range parts {
			if i < len(parts)-1 {
				want = append(want, strings.TrimSuffix(p, "\r"))
			} else if p != "" {
				want = append(want, p)
			}
		}
		if strings.Join(got, "\x00") != strings.Join(want, "\x00") || len(got) != len(want) {
			t.Errorf("readLines(%q) = %q, want %q", in, got, want)
		}
	})
}
