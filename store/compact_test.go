package store

import (
	"errors"
	"testing"
)

func TestCompactResult(t *testing.T) {
	for _, tc := range []struct {
		name    string
		in      string
		trusted bool
		want    string
		err     bool
	}{
		{"compact kept", `{"request":"mix 200 L NaOCl 12.5 %","n":[1,2]}`, false, `{"request":"mix 200 L NaOCl 12.5 %","n":[1,2]}`, false},
		{"spaces compacted", "{ \"a\" : [1, 2],\n\t\"b\":\"x y\" }", false, `{"a":[1,2],"b":"x y"}`, false},
		{"escaped quote in string", `{"a":"say \"x\" y"}`, false, `{"a":"say \"x\" y"}`, false},
		{"escaped backslash then space outside", `{"a":"\\" , "b":1}`, false, `{"a":"\\","b":1}`, false},
		{"invalid refused", `{"a":`, false, "", true},
		{"trusted as is", `{"a": 1}`, true, `{"a": 1}`, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			got, err := compactResult([]byte(tc.in), tc.trusted)
			if tc.err {
				if !errors.Is(err, ErrInvalid) {
					t.Errorf("compactResult(%q) = %q, %v; want ErrInvalid", tc.in, got, err)
				}
				return
			}
			if err != nil || string(got) != tc.want {
				t.Errorf("compactResult(%q) = %q, %v; want %q", tc.in, got, err, tc.want)
			}
		})
	}
}
