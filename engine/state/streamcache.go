package state

import (
	"hash/fnv"
	"sort"
	"strconv"
	"strings"

	lru "github.com/hashicorp/golang-lru/v2"
)

// A stream alone scales with its amount: a pour judged at fifty points
// solves the same two streams fifty times over at other volumes, and a
// stated pH costs a titration of a score of solves each time. streamCache
// keeps each stream's state per litre, keyed by what it holds per litre and
// the conditions, so each is solved once. Streams with a solid in excess are
// not kept (the excess is not proportional to the volume).
type streamCache struct {
	c *lru.Cache[string, streamEntry]
}

// streamEntry is a stream's state for one litre, with the notes its solve
// made.
type streamEntry struct {
	perL  *State
	notes []string
}

// streamCacheSize bounds the entries (a few kilobytes each).
const streamCacheSize = 4096

func newStreamCache() *streamCache {
	c, err := lru.New[string, streamEntry](streamCacheSize)
	if err != nil {
		panic(err) // only for a size below 1
	}
	return &streamCache{c: c}
}

// key names a stream of one litre (Stream.perLitre) in a mix of the given
// species and conditions; "" when it cannot be kept.
func (sc *streamCache) key(mx *Mix, st Stream) string {
	if sc == nil || st.VolumeL <= 0 {
		return ""
	}
	var b strings.Builder
	// Exact values: equal keys are equal inputs, so an answer never
	// depends on which stream was solved first.
	g := func(x float64) { b.WriteString(strconv.FormatFloat(x, 'g', -1, 64)); b.WriteByte('|') }
	g(mx.TempK)
	g(mx.Pressure)
	// The amounts are per species of the mix: the species list must be the
	// same one, not one of the same length.
	h := fnv.New64a()
	for _, sp := range mx.Species {
		h.Write([]byte(sp.Text))
		h.Write([]byte{0})
	}
	b.WriteString(strconv.FormatUint(h.Sum64(), 16))
	b.WriteString(strconv.Itoa(len(mx.Species)))
	b.WriteByte('|')
	g(st.WaterMol)
	if st.PH != nil {
		b.WriteString("pH")
		g(*st.PH)
	}
	items := make([]string, 0, len(st.Items))
	for _, it := range st.Items {
		if it.Excess {
			return ""
		}
		items = append(items, it.Species.Text+"="+strconv.FormatFloat(it.Mol, 'g', -1, 64))
	}
	sort.Strings(items)
	b.WriteString(strings.Join(items, ","))
	return b.String()
}

func (sc *streamCache) get(key string, volL float64) (*State, []string, bool) {
	if key == "" {
		return nil, nil, false
	}
	e, ok := sc.c.Get(key)
	if !ok {
		return nil, nil, false
	}
	return e.perL.scaled(volL), e.notes, true
}

func (sc *streamCache) put(key string, s *State, volL float64, notes []string) {
	if key == "" || volL <= 0 {
		return
	}
	sc.c.Add(key, streamEntry{perL: s.scaled(1 / volL), notes: append([]string(nil), notes...)})
}

// scaled is the state times k: amounts, the volume and the gas phase
// scale; activities, molalities, partial pressures and the pH do not.
func (s *State) scaled(k float64) *State {
	if s == nil {
		return nil
	}
	out := *s
	out.Amount = scaleAll(s.Amount, k)
	out.VolumeL = s.VolumeL * k
	out.Eq.Amount = scaleAll(s.Eq.Amount, k)
	out.Eq.GasMoles = s.Eq.GasMoles * k
	out.Eq.G = s.Eq.G * k
	out.combined = s.combined.scaled(k)
	return &out
}

func scaleAll(xs []float64, k float64) []float64 {
	if xs == nil {
		return nil
	}
	out := make([]float64, len(xs))
	for i, x := range xs {
		out[i] = x * k
	}
	return out
}
