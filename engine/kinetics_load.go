package engine

import (
	"errors"
	"fmt"
	"io/fs"
	"strconv"
	"strings"
)

// loadKinetics reads data/kinetics.txt.
func loadKinetics(fsys fs.FS) ([]*KineticRule, error) {
	const name = "kinetics.txt"
	b, err := fs.ReadFile(fsys, name)
	if err != nil {
		return nil, fmt.Errorf("data/%s: %w", name, err)
	}
	var out []*KineticRule
	var errs []error
	seen := map[string]bool{}
	for n, line := range strings.Split(string(b), "\n") {
		line = strings.TrimSpace(line)
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		bad := func(format string, args ...any) {
			errs = append(errs, fmt.Errorf("data/%s:%d: %s", name, n+1, fmt.Sprintf(format, args...)))
		}
		f := strings.Split(line, "|")
		if len(f) != 7 {
			bad("want 7 fields (id | side | selector | volts | when | reason | source), got %d", len(f))
			continue
		}
		for i := range f {
			f[i] = strings.TrimSpace(f[i])
		}
		r := &KineticRule{ID: f[0], Side: Role(f[1]), Reason: f[5], Source: f[6], When: f[4]}
		if r.ID == "" || seen[r.ID] {
			bad("id %q is empty or used twice", r.ID)
			continue
		}
		seen[r.ID] = true
		if r.Side != OxidizerRole && r.Side != ReducerRole && r.Side != PairRole {
			bad("side %q must be oxidizer, reducer or pair", f[1])
			continue
		}
		if r.Side == PairRole {
			ox, red, ok := strings.Cut(strings.TrimPrefix(f[2], "species "), "/")
			if !strings.HasPrefix(f[2], "species ") || !ok {
				bad("a pair allowance is written \"species OX, ... / RED, ...\", not %q", f[2])
				continue
			}
			var err error
			if r.Species, err = ionList(ox); err == nil {
				r.Reducers, err = ionList(red)
			}
			if err != nil {
				bad("%v", err)
				continue
			}
			f[2] = "pair"
		}
		kind, rest, _ := strings.Cut(f[2], " ")
		switch kind {
		case "couple":
			for _, c := range strings.Split(rest, ",") {
				c = strings.TrimSpace(c)
				if !strings.Contains(c, "/") {
					bad("couple %q must be written OX/RED", c)
					continue
				}
				r.Couples = append(r.Couples, c)
			}
		case "pair":
		case "species":
			var err error
			if r.Species, err = ionList(rest); err != nil {
				bad("%v", err)
				continue
			}
		default:
			bad("selector %q must start with \"couple\" or \"species\"", f[2])
			continue
		}
		v, err := strconv.ParseFloat(f[3], 64)
		if err != nil || v < 0 || v > 3 {
			bad("volts %q must be a number from 0 to 3", f[3])
			continue
		}
		r.Volts = v
		if r.when, err = parseWhen(r.When); err != nil {
			bad("when %q: %v", r.When, err)
			continue
		}
		if r.Reason == "" || r.Source == "" {
			bad("every allowance needs a reason and a source")
			continue
		}
		out = append(out, r)
	}
	return out, errors.Join(errs...)
}

type cond struct {
	v  string // ph, t, conc
	ge bool
	x  float64
}

// parseWhen reads "always" or conditions joined by "and" or by "or". It
// returns the conditions and whether they are joined by "or".
func parseWhen(s string) (func(ph, tC, conc float64) bool, error) {
	if s == "always" {
		return func(float64, float64, float64) bool { return true }, nil
	}
	joiner := " and "
	if strings.Contains(s, " or ") {
		if strings.Contains(s, " and ") {
			return nil, fmt.Errorf("mix of \"and\" and \"or\"; use one")
		}
		joiner = " or "
	}
	var cs []cond
	for _, part := range strings.Split(s, joiner) {
		part = strings.TrimSpace(part)
		var c cond
		var num string
		switch {
		case strings.Contains(part, ">="):
			c.v, num, _ = strings.Cut(part, ">=")
			c.ge = true
		case strings.Contains(part, "<"):
			c.v, num, _ = strings.Cut(part, "<")
		default:
			return nil, fmt.Errorf("condition %q must be like ph<6, t>=60 or conc<10", part)
		}
		c.v = strings.TrimSpace(c.v)
		if c.v != "ph" && c.v != "t" && c.v != "conc" {
			return nil, fmt.Errorf("condition %q: the variable must be ph, t or conc", part)
		}
		x, err := strconv.ParseFloat(strings.TrimSpace(num), 64)
		if err != nil {
			return nil, fmt.Errorf("condition %q: %q is not a number", part, num)
		}
		c.x = x
		cs = append(cs, c)
	}
	or := joiner == " or "
	return func(ph, tC, conc float64) bool {
		for _, c := range cs {
			val := ph
			switch c.v {
			case "t":
				val = tC
			case "conc":
				val = conc
			}
			ok := val < c.x
			if c.ge {
				ok = val >= c.x
			}
			if or && ok {
				return true
			}
			if !or && !ok {
				return false
			}
		}
		return !or
	}, nil
}

// signature writes a half-reaction's couple as OX/RED without water, H+ and
// OH- ("O2/H2O" for both forms of the oxygen couple).
func signature(h *HalfReaction) string {
	form := func(ts []Term) string {
		var parts []string
		for _, t := range ts {
			if !isSolvent(t.Species) {
				parts = append(parts, t.Species.Ion())
			}
		}
		if len(parts) == 0 {
			return "H2O"
		}
		return strings.Join(parts, "+")
	}
	return form(h.Reactants) + "/" + form(h.Products)
}

// ionList reads "A, B, C" as species in their Ion form.
func ionList(s string) ([]string, error) {
	var out []string
	for _, x := range strings.Split(s, ",") {
		sp, err := ParseSpecies(x)
		if err != nil {
			return nil, err
		}
		out = append(out, sp.Ion())
	}
	return out, nil
}
