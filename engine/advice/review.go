package advice

import (
	"runtime"
	"sort"
	"strconv"
	"strings"
	"sync"

	"mixward/engine"
)

// Tagged is one stream of the site catalogue.
type Tagged struct {
	Tag    string
	Stream string
}

// Pair is the judgement of two catalogue streams combined.
type Pair struct {
	A       string       `json:"a"`
	B       string       `json:"b"`
	Level   engine.Level `json:"level"`
	Title   string       `json:"title"`
	Reasons []string     `json:"reasons"`
	Codes   []string     `json:"codes"`       // hazard codes, final mix and pour
	Order   string       `json:"safer_order"` // the pour advice
	Error   string       `json:"error,omitempty"`
}

// Review judges every pair of the streams, worst first: must not be
// combined, then with precautions, then no concern; within a level in tag
// order.
func (a *Advisor) Review(streams []Tagged) []Pair {
	byTag := map[string]string{}
	for _, s := range streams {
		byTag[strings.ToUpper(s.Tag)] = s.Stream
	}
	resolve := func(tag string) (string, bool) {
		s, ok := byTag[strings.ToUpper(tag)]
		return s, ok
	}
	var pairs [][2]string
	for i := range streams {
		for j := i + 1; j < len(streams); j++ {
			pairs = append(pairs, [2]string{streams[i].Tag, streams[j].Tag})
		}
	}
	// Each pair is a full answer with its pour (about fifty mixes): the pairs
	// are judged side by side, one per processor.
	out := make([]Pair, len(pairs))
	sem := make(chan struct{}, runtime.GOMAXPROCS(0))
	var wg sync.WaitGroup
	for k, xy := range pairs {
		sem <- struct{}{}
		wg.Go(func() {
			defer func() { <-sem }()
			out[k] = a.pair(xy[0], xy[1], resolve)
		})
	}
	wg.Wait()
	sort.SliceStable(out, func(i, j int) bool {
		if li, lj := levelRank(out[i].Level), levelRank(out[j].Level); li != lj {
			return li > lj
		}
		return out[i].A+out[i].B < out[j].A+out[j].B
	})
	return out
}

func (a *Advisor) pair(x, y string, resolve engine.Resolver) Pair {
	p := Pair{A: x, B: y, Reasons: []string{}, Codes: []string{}}
	r, err := a.Ask("mix "+x+" + "+y, engine.AskOptions{Resolve: resolve})
	if err != nil {
		p.Error = err.Error()
		p.Title = "could not be judged: " + err.Error()
		return p
	}
	d := r.Decision
	p.Level, p.Title, p.Reasons = d.Level, d.Title, d.Reasons
	seen := map[string]bool{}
	add := func(c string) {
		if !seen[c] {
			seen[c] = true
			p.Codes = append(p.Codes, c)
		}
	}
	for _, h := range r.Hazards {
		if h.Severity != engine.Info {
			add(h.Code)
		}
	}
	if r.Addition != nil {
		for _, o := range r.Addition.Orders {
			for _, h := range o.Hazards {
				add(h.Code)
			}
		}
		p.Order = r.Addition.Advice
	}
	return p
}

func levelRank(l engine.Level) int {
	switch l {
	case engine.DoNotMix:
		return 3
	case engine.WithPrecautions:
		return 2
	case engine.NoConcern:
		return 1
	}
	return 0
}

// RenderReview writes the review as text, worst first.
func RenderReview(ps []Pair) string {
	var b strings.Builder
	n := map[engine.Level]int{}
	for _, p := range ps {
		n[p.Level]++
	}
	b.WriteString("Every pair of the site's tagged streams, worst first: ")
	b.WriteString(itoa(len(ps)) + " pairs, " + itoa(n[engine.DoNotMix]) + " must not be combined, " +
		itoa(n[engine.WithPrecautions]) + " need precautions, " + itoa(n[engine.NoConcern]) + " of no concern.\n")
	for _, p := range ps {
		b.WriteString(LevelText(p.Level) + "  " + p.A + " + " + p.B + ": " + p.Title + "\n")
		if p.Level != engine.NoConcern && p.Order != "" {
			b.WriteString("    order: " + p.Order + "\n")
		}
	}
	b.WriteString(shortCaution + "\n")
	return b.String()
}

func itoa(n int) string { return strconv.Itoa(n) }
