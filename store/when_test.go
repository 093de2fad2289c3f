package store

import (
	"errors"
	"testing"
	"time"
)

func TestParseWhen(t *testing.T) {
	ldn := london(t)
	now := time.Date(2026, 12, 1, 12, 0, 0, 0, time.UTC)
	for _, tc := range []struct {
		in   string
		want time.Time
	}{
		{"2026-12-01", time.Date(2026, 12, 1, 0, 0, 0, 0, ldn)},
		{"2026-07-01", time.Date(2026, 7, 1, 0, 0, 0, 0, ldn)}, // BST: 23:00 UTC the day before
		{"2026-12-01T06:00", time.Date(2026, 12, 1, 6, 0, 0, 0, ldn)},
		{"2026-12-01 06:00", time.Date(2026, 12, 1, 6, 0, 0, 0, ldn)},
		{"2026-12-01T06:00:30", time.Date(2026, 12, 1, 6, 0, 30, 0, ldn)},
		{"2026-12-01T06:00:00Z", time.Date(2026, 12, 1, 6, 0, 0, 0, time.UTC)},
		{"2026-12-01T06:00:00.5+01:00", time.Date(2026, 12, 1, 5, 0, 0, 5e8, time.UTC)},
		{"2026-12-01T06:00Z", time.Date(2026, 12, 1, 6, 0, 0, 0, time.UTC)},
		{"now", now},
		{" 24h ", now.Add(-24 * time.Hour)},
		{"90m", now.Add(-90 * time.Minute)},
		{"1h30m", now.Add(-90 * time.Minute)},
		{"7d", now.Add(-7 * 24 * time.Hour)},
		{"1.5d", now.Add(-36 * time.Hour)},
		{"2w", now.Add(-14 * 24 * time.Hour)},
	} {
		got, err := ParseWhen(tc.in, now, ldn)
		if err != nil || !got.Equal(tc.want) {
			t.Errorf("ParseWhen(%q) = %v, %v; want %v", tc.in, got, err, tc.want)
		}
	}
	for _, bad := range []string{"NaNd", "Infd", "", "yesterday", "2026-13-01", "01/12/2026", "-24h", "-3d", "3x", "d", "1e9d", "2026-12-01T25:00"} {
		if _, err := ParseWhen(bad, now, ldn); !errors.Is(err, ErrInvalid) {
			t.Errorf("ParseWhen(%q) = %v, want ErrInvalid", bad, err)
		}
	}
}

func FuzzParseWhen(f *testing.F) {
	for _, s := range []string{"2026-12-01", "24h", "7d", "now", "2026-12-01T06:00:00Z", "1.5w", "NaNd", "Infd"} {
		f.Add(s)
	}
	now := time.Date(2026, 12, 1, 12, 0, 0, 0, time.UTC)
	f.Fuzz(func(t *testing.T, s string) {
		got, err := ParseWhen(s, now, time.UTC)
		if err != nil {
			if !errors.Is(err, ErrInvalid) {
				t.Errorf("ParseWhen(%q) error %v does not wrap ErrInvalid", s, err)
			}
			return
		}
		if got.IsZero() {
			t.Errorf("ParseWhen(%q) = zero time without error", s)
		}
	})
}
