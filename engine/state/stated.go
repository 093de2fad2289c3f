package state

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"sync"

	"mixward/engine/chem"
	"mixward/engine/thermo"
)

// A stated pH (of a stream, or of the whole mix) stands for acid or base the
// request does not name: a strong acid or base of a stand-in ion is added
// until the solution as combined shows that pH. The stand-in ions are their
// own components, so they never react; they are not listed in answers.
var (
	standInAnion  = standIn("Xa", -1)
	standInCation = standIn("Xc", 1)
)

func standIn(el string, z int) *thermo.Species {
	sp := chem.Species{Formula: el, Charge: z, Phase: chem.Aqueous}
	return &thermo.Species{Species: sp, Text: "(stand-in " + sp.Ion() + ")", Atoms: chem.Atoms{el: 1},
		HasDfH: true, Ox: map[string]float64{el: float64(z)}, Inert: true, Minor: true,
		Source: "stand-in for the acid or base behind a stated pH"}
}

// IsStandIn reports whether a species is a stand-in ion of a stated pH.
func IsStandIn(sp *thermo.Species) bool { return sp == standInAnion || sp == standInCation }

// fitPH adds to n0 the stand-in strong acid (x > 0 mol) or base (x < 0) that
// brings the solution as combined to pH target.
// A pH beyond what 20 mol/L of acid or base gives (with activities capped
// where the Davies equation stops) is taken at that end, and the mix's notes
// say so.
//
// strong is the mol of H+ or OH- of the strong acids and bases named in
// n0: a stated pH that needs more than conflictShare of it (either way) is
// not met; the composition is kept and the notes say so.
func (m *Model) fitPH(mx *Mix, n0 []float64, volL, target, strong float64) ([]float64, error) {
	x, err := m.titrate(mx, n0, volL, target)
	if errors.Is(err, errUnreachable) {
		limit := 20 * volL
		if target > 7 {
			limit = -limit
		}
		n := m.withAcid(mx, n0, limit)
		if s, err := m.solveCombined(mx, n, volL); err == nil {
			mx.Notes = append(mx.Notes, fmt.Sprintf("the stated pH %g is beyond what the model reaches with 20 mol/L of acid or base: pH %.2f is used", target, s.PH))
		}
		return n, nil
	}
	if err != nil {
		return nil, err
	}
	if strong/volL >= statedPHNote && math.Abs(x)/volL >= statedPHNote && math.Abs(x) > conflictShare*strong {
		// The stream names its strong acid or base, which fixes its pH: a
		// stated pH that needs much more (or the opposite) would add ions
		// that are not there. Keep the composition and say so.
		if s, err := m.solveCombined(mx, n0, volL); err == nil {
			mx.Notes = append(mx.Notes, fmt.Sprintf("the stated pH %g conflicts with the composition, which gives pH %.2f at %.0f °C (water's pKw depends on temperature): the composition is kept and the stated pH ignored; check the pH or the concentration", target, s.PH, mx.TempK-273.15))
			return n0, nil
		}
	}
	if c := math.Abs(x) / volL; c >= statedPHNote {
		what := "strong acid"
		if x < 0 {
			what = "strong base"
		}
		mx.Notes = append(mx.Notes, fmt.Sprintf("the stated pH %g stands for about %.2g mol/L of %s that the request does not name: check the pH, or name the acid or base", target, c, what))
	}
	return m.withAcid(mx, n0, x), nil
}

// conflictShare is the share of a named strong acid or base beyond which the
// acid or base a stated pH stands for conflicts with the composition: a
// stream of 2 % caustic said to be at pH 13 at 75 °C (where its own pH is
// about 12.4, pKw 12.7: CRC Handbook, ionization constant of water, from
// memory) would need four times the caustic it names.
const conflictShare = 0.25

// statedPHNote (mol/L) is the stand-in acid or base above which the answer
// says that a stated pH adds what the request does not name.
const statedPHNote = 0.01

// errUnreachable is a pH outside what 20 mol/L of acid or base gives.
var errUnreachable = errors.New("pH cannot be reached with up to 20 mol/L of acid or base")

// withAcid is n0 with x mol of the stand-in strong acid (x > 0) or base
// (x < 0) added.
func (m *Model) withAcid(mx *Mix, n0 []float64, x float64) []float64 {
	n := append([]float64(nil), n0...)
	for i, sp := range mx.Species {
		switch {
		case x > 0 && (sp.Text == "H+" || sp == standInAnion):
			n[i] += x
		case x < 0 && (sp.Text == "OH-" || sp == standInCation):
			n[i] -= x
		}
	}
	return n
}

// titrate finds the mol of stand-in strong acid (> 0) or base (< 0) that
// brings the solution as combined to pH target: a bracketing secant
// (Illinois) on u = asinh(x), where the pH is smooth and monotone.
func (m *Model) titrate(mx *Mix, n0 []float64, volL, target float64) (float64, error) {
	return m.titrateUpTo(mx, n0, volL, target, 20*volL)
}

// titrateUpTo is titrate with up to limit mol of acid or base.
func (m *Model) titrateUpTo(mx *Mix, n0 []float64, volL, target, limit float64) (float64, error) {
	key := titrationKey(n0, volL, target, mx.TempK, mx.reachC()) + strconv.FormatFloat(limit, 'g', -1, 64)
	if x, err, ok := mx.titrations.get(key); ok {
		return x, err
	}
	x, err := m.titrateOnce(mx, n0, volL, target, limit)
	mx.titrations.put(key, x, err)
	return x, err
}

// titrateCapacity titrates as titrate does and, where the pH is beyond what
// 20 mol/L of acid or base reaches, once more with as much as the streams
// could hold (capacity): a lock allowance counts all the acid of a
// near-anhydrous acid (1 L of 98 % sulfuric acid holds about 37 mol of
// protons; CRC Handbook, density of sulfuric acid 1.84 g/mL, from memory),
// where a stated pH stops at 20 mol/L.
func (m *Model) titrateCapacity(mx *Mix, n0 []float64, volL, target float64) (float64, error) {
	x, err := m.titrate(mx, n0, volL, target)
	if !errors.Is(err, errUnreachable) {
		return x, err
	}
	if c := capacity(mx, n0); c > 20*volL {
		return m.titrateUpTo(mx, n0, volL, target, c)
	}
	return x, err
}

// capacity bounds the mol of strong acid or base that the amounts n0 could
// take up or give: the hydrogen and the charges of every species but water,
// counted generously (the titration only needs a bracket).
func capacity(mx *Mix, n0 []float64) float64 {
	var c float64
	for i, sp := range mx.Species {
		if i >= len(n0) || sp.Text == "H2O" || sp.Text == "H2O(l)" {
			continue
		}
		c += n0[i] * (float64(sp.Atoms["H"]) + 2*math.Abs(float64(sp.Charge)) + 1)
	}
	return 1.1 * c
}

// titrations keeps the titrations of one mix: the held-back changes solve
// the mix again with one lock lifted, and titrate the same amounts to the
// same pH for the lock allowances as the mix's own solve did.
type titrations struct {
	mu   sync.Mutex
	done map[string]titration
}

type titration struct {
	x   float64
	err error
}

// titrationKey names a titration by its exact inputs: the amounts, the
// volume, the pH, the temperature it is solved at (a stream alone is solved
// at its own) and the temperature the formation locks are judged at (the
// species are those of the mix).
func titrationKey(n0 []float64, volL, target, tempK, reachC float64) string {
	b := make([]byte, 0, 24*(len(n0)+4))
	for _, v := range append([]float64{volL, target, tempK, reachC}, n0...) {
		b = strconv.AppendFloat(b, v, 'g', -1, 64)
		b = append(b, '|')
	}
	return string(b)
}

func (t *titrations) get(key string) (float64, error, bool) {
	if t == nil {
		return 0, nil, false
	}
	t.mu.Lock()
	defer t.mu.Unlock()
	r, ok := t.done[key]
	return r.x, r.err, ok
}

func (t *titrations) put(key string, x float64, err error) {
	if t == nil {
		return
	}
	t.mu.Lock()
	defer t.mu.Unlock()
	if t.done == nil {
		t.done = map[string]titration{}
	}
	t.done[key] = titration{x, err}
}

// titrateOnce is titrate without the memory.
func (m *Model) titrateOnce(mx *Mix, n0 []float64, volL, target, limitMol float64) (float64, error) {
	f := func(u float64) (float64, error) {
		// The same solve as the mix as combined, with the locks that keep
		// listed species from forming: without them cyanide "hydrolyses" to
		// carbon monoxide and ammonia here and the fit adds a mole of acid
		// per mole of cyanide.
		// Each point starts cold, from the dominant species the linear
		// program finds: a start from the amounts as poured, acid or base
		// added, is often far from the point (a mol of zinc beside 20 mol/L
		// of base took 215 Newton steps from there, 7 cold).
		n := m.withAcid(mx, n0, math.Sinh(u))
		s, err := m.solve(mx, n, true, m.formationRules(mx, n, volL), volL, nil, nil)
		if err != nil {
			return 0, fmt.Errorf("fitting pH %g: %w", target, err)
		}
		return s.PH - target, nil
	}
	limit := math.Asinh(limitMol) // up to limitMol of acid or base (20 mol/L for a stated pH)
	lo, hi := -limit, limit       // f falls as u rises
	// The two ends of the bracket are independent solves (each as slow as
	// a few steps of the secant together): they run side by side.
	var (
		fhi   float64
		errHi error
		ends  sync.WaitGroup
	)
	ends.Go(func() { fhi, errHi = f(hi) })
	flo, err := f(lo)
	ends.Wait()
	if err != nil {
		return 0, err
	}
	if err = errHi; err != nil {
		return 0, err
	}
	if flo < 0 || fhi > 0 {
		return 0, fmt.Errorf("pH %g: %w", target, errUnreachable)
	}
	side := 0
	for it := 0; it < 60; it++ {
		u := (lo*fhi - hi*flo) / (fhi - flo)
		if !(u > lo && u < hi) {
			u = (lo + hi) / 2
		}
		fu, err := f(u)
		if err != nil {
			return 0, err
		}
		if math.Abs(fu) < 0.01 || hi-lo < 1e-9 {
			return math.Sinh(u), nil
		}
		if fu > 0 {
			lo, flo = u, fu
			if side == -1 {
				fhi /= 2
			}
			side = -1
		} else {
			hi, fhi = u, fu
			if side == 1 {
				flo /= 2
			}
			side = 1
		}
	}
	return 0, fmt.Errorf("fitting pH %g: no convergence", target)
}
