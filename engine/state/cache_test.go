package state

import (
	"math"
	"reflect"
	"testing"

	"mixward/engine/equilibrium"
)

// TestCandidatesKept: feeds of the same elements share one candidate list,
// the same the data gives uncached, and a caller appending to it cannot
// write into the shared list.
func TestCandidatesKept(t *testing.T) {
	m, err := NewModel(loadDB(t), dataFS())
	if err != nil {
		t.Fatal(err)
	}
	feeds := sampleFeeds(t, m)
	a, b := m.candidates(feeds["ferrous-permanganate"]), m.candidates(feeds["ferrous-permanganate"])
	if a != b {
		t.Error("two feeds of the same elements did not share their candidate species")
	}
	els := map[string]bool{"H": true, "O": true, "Fe": true, "S": true, "K": true, "Mn": true}
	if !reflect.DeepEqual(a.list, m.within(els)) {
		t.Error("the kept candidate species differ from the species data's")
	}
	if len(a.list) != cap(a.list) {
		t.Errorf("the shared list has room to append in place (len %d, cap %d)", len(a.list), cap(a.list))
	}
	if c := m.candidates(feeds["copper-sulfate"]); c == a || reflect.DeepEqual(c.list, a.list) {
		t.Error("feeds of other elements got the same candidate species")
	}
}

// TestGroupWeightsKept: the weights a mix reads are Group.Weight of each of
// its species, whether read the first time or from the cache.
func TestGroupWeightsKept(t *testing.T) {
	m, err := NewModel(loadDB(t), dataFS())
	if err != nil {
		t.Fatal(err)
	}
	mx, err := m.Solve(sampleFeeds(t, m)["ferrous-permanganate"])
	if err != nil {
		t.Fatal(err)
	}
	for _, l := range m.Locks {
		for _, r := range l.Rules {
			for pass := 0; pass < 2; pass++ {
				w := mx.weightsOf(r.Group)
				for i, sp := range mx.Species {
					if w[i] != r.Group.Weight(sp) {
						t.Fatalf("lock %s, group %s, %s: weight %g, Group.Weight %g", l.ID, r.Group, sp.Text, w[i], r.Group.Weight(sp))
					}
				}
			}
		}
	}
}

// TestTitrationRemembered: titrating a mix's amounts to a pH a second time
// (as the held-back changes do) gives the same amount of acid or base
// without solving anything again; another pH is titrated afresh.
func TestTitrationRemembered(t *testing.T) {
	m, err := NewModel(loadDB(t), dataFS())
	if err != nil {
		t.Fatal(err)
	}
	mx, err := m.Solve(sampleFeeds(t, m)["copper-sulfate"])
	if err != nil {
		t.Fatal(err)
	}
	solves := 0
	dump = func(string, equilibrium.Problem) { solves++ }
	defer func() { dump = nil }()
	x1, err := m.titrate(mx, mx.Initial, mx.VolumeL, 3)
	if err != nil {
		t.Fatal(err)
	}
	first := solves
	x2, err := m.titrate(mx, mx.Initial, mx.VolumeL, 3)
	if err != nil {
		t.Fatal(err)
	}
	if first == 0 || solves != first {
		t.Errorf("the first titration solved %d problems, the second %d; want some, then none", first, solves-first)
	}
	if x1 != x2 || math.IsNaN(x1) {
		t.Errorf("titrations of the same amounts: %g then %g", x1, x2)
	}
	if _, err := m.titrate(mx, mx.Initial, mx.VolumeL, 4); err != nil {
		t.Fatal(err)
	}
	if solves == first {
		t.Error("another pH was not titrated afresh")
	}
}
