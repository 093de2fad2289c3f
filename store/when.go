package store

import (
	"fmt"
	"strconv"
	"strings"
	"time"
)

// ParseWhen reads a date or time given on the command line: "2026-12-01"
// (midnight), "2026-12-01T06:00", "2026-12-01 06:00", "2026-12-01T06:00:30"
// (all in loc, the site time zone), RFC 3339 with its own offset
// ("2026-12-01T06:00:00Z", seconds optional: "2026-12-01T06:00+01:00"), "now", or a duration back from now: "90m",
// "24h", "7d", "2w".
func ParseWhen(s string, now time.Time, loc *time.Location) (time.Time, error) {
	if loc == nil {
		loc = time.UTC
	}
	s = strings.TrimSpace(s)
	if s == "" {
		return time.Time{}, fmt.Errorf("%w: empty date", ErrInvalid)
	}
	if s == "now" {
		return now, nil
	}
	if d, ok := parseAgo(s); ok {
		return now.Add(-d), nil
	}
	for _, layout := range []string{time.RFC3339Nano, "2006-01-02T15:04Z07:00"} {
		if t, err := time.Parse(layout, s); err == nil {
			return inRange(s, t)
		}
	}
	for _, layout := range []string{"2006-01-02", "2006-01-02T15:04", "2006-01-02 15:04", "2006-01-02T15:04:05", "2006-01-02 15:04:05"} {
		if t, err := time.ParseInLocation(layout, s, loc); err == nil {
			return inRange(s, t)
		}
	}
	return time.Time{}, fmt.Errorf("%w: date %q: use 2026-12-01, 2026-12-01T06:00 (site time, %s), "+
		"RFC 3339 such as 2026-12-01T06:00:00Z, or a span back from now such as 24h or 7d", ErrInvalid, s, loc)
}

// inRange refuses dates no log can hold: before 1970 (a zero time would read
// as "no limit") or after 9999.
func inRange(s string, t time.Time) (time.Time, error) {
	if t.Year() < 1970 || t.Year() > 9999 {
		return time.Time{}, fmt.Errorf("%w: date %q is outside 1970–9999", ErrInvalid, s)
	}
	return t, nil
}

// parseAgo reads "90m", "24h", "7d", "2w" and Go durations like "1h30m".
func parseAgo(s string) (time.Duration, bool) {
	if n := len(s); n >= 2 && (s[n-1] == 'd' || s[n-1] == 'w') {
		v, err := strconv.ParseFloat(s[:n-1], 64)
		if err != nil || !(v >= 0 && v <= 100*366) { // also refuses NaN
			return 0, false
		}
		day := 24 * time.Hour
		if s[n-1] == 'w' {
			day *= 7
		}
		return time.Duration(v * float64(day)), true
	}
	d, err := time.ParseDuration(s)
	if err != nil || d < 0 {
		return 0, false
	}
	return d, true
}
