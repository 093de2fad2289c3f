// Package state finds the state of a tank: the chemical equilibrium of
// everything the streams bring, under the kinetic locks of data/locks.txt.
// Every number of an answer is derived from the states it returns: each
// stream alone, the mix as combined before any redox change, and the mix at
// equilibrium. It is pure computation.
package state

import (
	"errors"
	"fmt"
	"io/fs"
	"maps"
	"math"
	"slices"
	"sort"
	"strings"

	lru "github.com/hashicorp/golang-lru/v2"

	"mixward/engine/chem"
	"mixward/engine/equilibrium"
	"mixward/engine/thermo"
)

// Item is one species a stream brings, as the chemical dictionary gives it.
type Item struct {
	Species *thermo.Species
	Mol     float64
	Excess  bool // a solid present in excess: whatever reacts, some is left
}

// Stream is one stream of a mix.
type Stream struct {
	Label    string
	Items    []Item
	WaterMol float64  // liquid water the stream brings
	VolumeL  float64  // liquid volume; 0 for a solid
	PH       *float64 // a measured pH stated for the stream
	// Strong is the mol of H+ or OH- of the strong acids and bases the
	// stream names (HCl, NaOH): they fix its pH, and a stated pH that
	// conflicts with them is not met (fitPH).
	Strong float64
	// TempK is the stream's own temperature, as it stands before it is
	// poured (a drum at 25 °C, a hot caustic tank): the stream alone is
	// solved and its locks judged at it, so that what the stock holds as
	// stored is not confused with what the mix makes of it. 0: the feed's
	// temperature.
	TempK float64
}

// Feed is everything poured into the tank.
type Feed struct {
	Streams     []Stream
	TempK       float64
	PressureBar float64
	PH          *float64 // a pH stated for the whole mix as combined
	// ReachedC, when set, is the temperature (°C) the mix reaches by its
	// own heat, found from an earlier solve: lock conditions on "reach"
	// are judged against it (peroxide that a hot mix decomposes).
	ReachedC *float64
}

// Model holds the species data and the locks. It is safe for concurrent use.
type Model struct {
	DB    *thermo.DB
	Locks []Lock

	streams *streamCache // each stream alone per litre (see streamCache)
	// species are the candidate species of a feed by its elements
	// (candidates); a few kilobytes each.
	species *lru.Cache[string, *speciesSet]
}

// NewModel reads data/locks.txt from fsys.
func NewModel(db *thermo.DB, fsys fs.FS) (*Model, error) {
	b, err := fs.ReadFile(fsys, "locks.txt")
	if err != nil {
		return nil, fmt.Errorf("state: %w", err)
	}
	locks, err := parseLocks("locks.txt", b)
	if err != nil {
		return nil, err
	}
	els := elementsOf(db)
	for i := range locks {
		if err := checkGroups(&locks[i], db, els); err != nil {
			return nil, err
		}
	}
	species, err := lru.New[string, *speciesSet](speciesCacheSize)
	if err != nil {
		return nil, err
	}
	return &Model{DB: db, Locks: locks, streams: newStreamCache(), species: species}, nil
}

// State is one solved state.
type State struct {
	Amount  []float64 // mol, per species of the Mix
	LnA     []float64 // ln activity per species; NaN where the species is absent
	Eq      equilibrium.State
	PH      float64
	VolumeL float64
	Applied []*Lock // locks whose conditions held
	Held    []*Lock // locks that held something back (active at the solution)
	// Undecided are locks that kept a whole element in one range of
	// oxidation states (all chromium as chromium(VI)) where the state's
	// potentials cannot tell whether they held anything back; a caller
	// that lists what was held back lifts each (Model.Without) to see.
	Undecided []*Lock
	// Shut are the species a lock kept from forming at all (no O2 where
	// oxygen evolution is locked, no iodate from iodine).
	Shut map[*thermo.Species]bool

	combined *State   // the same amounts as combined, before any redox change
	maybe    []string // names of the rules behind Undecided
}

// Mix is the solved tank.
type Mix struct {
	Species  []*thermo.Species
	Initial  []float64 // what the streams' states bring together, mol per species
	Notes    []string  // assumptions the solve made (a stated pH out of reach, a solid counted in part)
	Streams  []*State  // each stream alone (nil for a solid stream)
	Combined *State    // the mix as combined: acid–base, complexes and solids, no redox change
	Final    *State    // the mix at equilibrium under the locks
	VolumeL  float64
	TempK    float64
	Pressure float64  // bar
	ReachedC *float64 // the temperature the mix reaches by its own heat, when given (Feed.ReachedC)

	weights    *weights    // lock group weights per species (shared by the mixes of one species list)
	titrations *titrations // the titrations of this mix's amounts, for solving it again
}

// speciesCacheSize bounds the element sets whose candidate species are kept.
const speciesCacheSize = 1024

// ErrNoLiquid is returned for a feed with no water at all: nothing dissolves.
var ErrNoLiquid = errors.New("state: no liquid in the mix")

// Solve finds the states of a feed.
func (m *Model) Solve(f Feed) (*Mix, error) {
	if f.TempK <= 0 || f.PressureBar <= 0 {
		return nil, fmt.Errorf("state: temperature %g K and pressure %g bar must be positive", f.TempK, f.PressureBar)
	}
	// Each stream alone stays at the starting temperature: only the mix
	// is judged at the temperature its own heat takes it to.
	mx := &Mix{TempK: f.TempK, Pressure: f.PressureBar, titrations: &titrations{}}
	set := m.candidates(f)
	mx.Species, mx.weights = set.list, &set.w
	index := map[*thermo.Species]int{}
	for i, sp := range mx.Species {
		index[sp] = i
	}
	water := 0.0
	for _, st := range f.Streams {
		water += st.WaterMol
		mx.VolumeL += st.VolumeL
	}
	if water <= 0 {
		return nil, ErrNoLiquid
	}
	// A solid in excess is counted as ten times what everything else could
	// take from it, but never as more than a fifth of the water in mol, so
	// that a metal reacting with water itself cannot use the solvent up.
	excess, anyExcess := 10.0, false
	for _, st := range f.Streams {
		for _, it := range st.Items {
			excess += 10 * it.Mol * float64(atomCount(it.Species))
			anyExcess = anyExcess || it.Excess
		}
	}
	if excess > water/5 {
		excess = water / 5
	}
	if anyExcess && excess == water/5 {
		mx.Notes = append(mx.Notes, fmt.Sprintf("a solid in excess is counted as %.3g mol (a fifth of the water), enough for anything else in the mix to react with", excess))
	}
	mx.Initial = make([]float64, len(mx.Species))
	mx.Streams = make([]*State, len(f.Streams))
	for si, st := range f.Streams {
		if st.WaterMol <= 0 {
			addTo(mx.Initial, m.feedVector(mx, index, st, excess))
			continue
		}
		s, err := m.streamAlone(mx, index, st, excess)
		if err != nil {
			return nil, fmt.Errorf("stream %d (%s): %w", si+1, st.Label, err)
		}
		mx.Streams[si] = s
		addTo(mx.Initial, s.Amount)
	}
	mx.ReachedC = f.ReachedC
	if f.PH != nil {
		strong := 0.0
		for _, st := range f.Streams {
			strong += st.Strong
		}
		n, err := m.fitPH(mx, mx.Initial, mx.VolumeL, *f.PH, strong)
		if err != nil {
			return nil, fmt.Errorf("the mix: %w", err)
		}
		mx.Initial = n
	}
	final, err := m.solveLocked(mx, mx.Initial, mx.VolumeL)
	if err != nil {
		return nil, fmt.Errorf("the mix: %w", err)
	}
	mx.Final = final
	mx.Combined = final.combined
	return mx, nil
}

// streamAlone is a stream's own state, fitted to its stated pH, from the
// cache when the same stream per litre was solved before. It is solved at
// the stream's own temperature (Stream.TempK), under the locks as they stand
// there: what the stock holds as stored, not what the mix makes of it.
//
// A stream that can be kept is always solved for one litre and scaled, so
// that its state does not depend on which volume of it was asked first.
func (m *Model) streamAlone(mx *Mix, index map[*thermo.Species]int, st Stream, excess float64) (*State, error) {
	at := mx.streamAt(st)
	key, unit := "", st
	if st.VolumeL > 0 {
		unit = st.perLitre()
		key = m.streams.key(at, unit)
	}
	if s, notes, ok := m.streams.get(key, st.VolumeL); ok {
		mx.Notes = append(mx.Notes, notes...)
		return s, nil
	}
	vol, n0 := 1.0, m.feedVector(mx, index, unit, excess)
	if key == "" {
		vol, n0 = st.VolumeL, m.feedVector(mx, index, st, excess)
	}
	s, err := m.solveStream(at, n0, vol, st, key != "")
	mx.Notes = append(mx.Notes, at.Notes...)
	if err != nil || key == "" {
		return s, err
	}
	m.streams.put(key, s, 1, at.Notes)
	return s.scaled(st.VolumeL), nil
}

// streamAt is the frame a stream alone is solved in: the mix's species at
// the stream's own temperature, with notes of its own, and never at a
// temperature the mix reaches by its own heat.
func (mx *Mix) streamAt(st Stream) *Mix {
	t := st.TempK
	if t <= 0 {
		t = mx.TempK
	}
	return &Mix{Species: mx.Species, weights: mx.weights, titrations: mx.titrations, TempK: t, Pressure: mx.Pressure}
}

// solveStream solves a stream's amounts n0 (per litre when perL) in its
// frame at, fitted to its stated pH.
func (m *Model) solveStream(at *Mix, n0 []float64, vol float64, st Stream, perL bool) (*State, error) {
	if st.PH != nil {
		var err error
		strong := st.Strong
		if perL && st.VolumeL > 0 {
			strong /= st.VolumeL // solved for one litre
		}
		if n0, err = m.fitPH(at, n0, vol, *st.PH, strong); err != nil {
			return nil, err
		}
	}
	return m.solveLocked(at, n0, vol)
}

// perLitre is the stream scaled to one litre: the key of the cache and the
// input of its solve are made from the same numbers.
func (st Stream) perLitre() Stream {
	u := st
	u.VolumeL, u.WaterMol = 1, st.WaterMol/st.VolumeL
	u.Items = make([]Item, len(st.Items))
	for i, it := range st.Items {
		it.Mol /= st.VolumeL
		u.Items[i] = it
	}
	return u
}

func addTo(dst, src []float64) {
	for i, v := range src {
		dst[i] += v
	}
}

// candidates are the species made only of the elements the feed brings,
// from the model's cache when a feed of the same elements was solved before
// (the points of a pour, the held-back changes and every repeat of a
// request). The slice is shared: it must not be written.
func (m *Model) candidates(f Feed) *speciesSet {
	els := map[string]bool{"H": true, "O": true}
	for _, st := range f.Streams {
		for _, it := range st.Items {
			for el := range it.Species.Atoms {
				els[el] = true
			}
		}
	}
	key := strings.Join(slices.Sorted(maps.Keys(els)), " ")
	if m.species != nil {
		if set, ok := m.species.Get(key); ok {
			return set
		}
	}
	set := &speciesSet{list: m.within(els)}
	if m.species != nil {
		m.species.Add(key, set)
	}
	return set
}

// speciesSet is the candidate species of an element set, with the weights
// of the lock groups in them (filled as read, shared by every mix of the
// set).
type speciesSet struct {
	list []*thermo.Species
	w    weights
}

// within lists the species of the data made only of els, in the order of
// their texts, the stand-in ions last.
func (m *Model) within(els map[string]bool) []*thermo.Species {
	var out []*thermo.Species
	for _, sp := range m.DB.Within(els) {
		// Water vapour is the solvent's own (boiling is judged from the
		// heat); a pure liquid of a compound (H2SO4(l), SO3(l)) is the
		// concentrated reagent itself, not a phase that separates from water.
		if sp.Text == "H2O(g)" || sp.Phase == chem.Liquid && len(sp.Atoms) > 1 && sp.Text != "H2O" {
			continue
		}
		out = append(out, sp)
	}
	sort.SliceStable(out, func(i, j int) bool { return out[i].Text < out[j].Text })
	return slices.Clip(append(out, standInAnion, standInCation))
}

// feedVector is the as-given composition of a stream, per species of mx. A
// solid in excess is given excess mol, well beyond what can react with it.
func (m *Model) feedVector(mx *Mix, index map[*thermo.Species]int, st Stream, excess float64) []float64 {
	n := make([]float64, len(mx.Species))
	for _, it := range st.Items {
		mol := it.Mol
		if it.Excess {
			mol = math.Max(mol, excess)
		}
		n[index[it.Species]] += mol
	}
	if w, ok := m.DB.Get("H2O"); ok {
		n[index[w]] += st.WaterMol
	}
	return n
}

func atomCount(sp *thermo.Species) int {
	n := 0
	for _, c := range sp.Atoms {
		n += c
	}
	return n
}
