package state

import "sync"

// weights caches, for one list of species, the weight of each lock group in each of its
// species (Group.Weight per species of Mix.Species): lock conditions and
// constraints read them for every solve of the mix (the mix, its streams,
// the titrations of a stated pH, the held-back changes), and Weight looks
// species texts and atoms up in maps.
type weights struct {
	mu  sync.Mutex
	set map[string][]float64 // group text → weight per species

	// rows are the component rows of the species (components), one list
	// per frozen/organicLocked combination, built once: every solve of
	// the mix reads them.
	rows [4]struct {
		once sync.Once
		list []map[string]float64
	}
}

// componentRows returns the component row of each species of mx for a
// solve frozen or not, with organic carbon locked or not (read only).
func (mx *Mix) componentRows(frozen, organicLocked bool) []map[string]float64 {
	build := func() []map[string]float64 {
		rows := make([]map[string]float64, len(mx.Species))
		for i, sp := range mx.Species {
			rows[i] = components(sp, frozen, organicLocked)
		}
		return rows
	}
	if mx.weights == nil {
		return build()
	}
	k := 0
	if frozen {
		k |= 1
	}
	if organicLocked {
		k |= 2
	}
	r := &mx.weights.rows[k]
	r.once.Do(func() { r.list = build() })
	return r.list
}

// weightsOf returns the weight of g in each species of mx (read only).
func (mx *Mix) weightsOf(g Group) []float64 {
	c := mx.weights
	if c == nil || g.text == "" {
		return groupWeights(mx, g)
	}
	c.mu.Lock()
	defer c.mu.Unlock()
	if w, ok := c.set[g.text]; ok {
		return w
	}
	w := groupWeights(mx, g)
	if c.set == nil {
		c.set = map[string][]float64{}
	}
	c.set[g.text] = w
	return w
}

func groupWeights(mx *Mix, g Group) []float64 {
	w := make([]float64, len(mx.Species))
	for i, sp := range mx.Species {
		w[i] = g.Weight(sp)
	}
	return w
}
