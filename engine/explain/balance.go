package explain

import (
	"fmt"
	"math"
	"sort"
	"strconv"

	lru "github.com/hashicorp/golang-lru/v2"
	"gonum.org/v1/gonum/mat"

	"mixward/engine/thermo"
)

// Medium is how a half-reaction is written: with H+ (acid) or OH- (base).
type Medium string

// The media.
const (
	Acid Medium = "acid"
	Base Medium = "base"
)

// balancer writes half-reactions between species of one DB.
type balancer struct {
	db      *thermo.DB
	water   *thermo.Species
	proton  *thermo.Species
	hydrox  *thermo.Species
	partner func(el, key string, not ...*thermo.Species) *thermo.Species // main carrier of an element, without the key element
}

func newBalancer(db *thermo.DB, partner func(string, string, ...*thermo.Species) *thermo.Species) (*balancer, error) {
	b := &balancer{db: db, partner: partner}
	var ok1, ok2, ok3 bool
	b.water, ok1 = db.Get("H2O")
	b.proton, ok2 = db.Get("H+")
	b.hydrox, ok3 = db.Get("OH-")
	if !ok1 || !ok2 || !ok3 {
		return nil, fmt.Errorf("explain: the species data lack H2O, H+ or OH-")
	}
	return b, nil
}

// maxScale bounds the whole-number multiplier that clears a half-reaction's
// fractions.
const maxScale = 60

// Reduction writes ox + n e- → red, balanced with partner species for the
// other elements, water, and H+ or OH- by medium, in smallest whole numbers.
// key is the element that changes state: the electrons per ox are fixed by
// its states in the two forms, which settles couples of oxygen itself
// (H2O2 → H2O, where water is also the medium).
func (b *balancer) Reduction(ox, red *thermo.Species, key string, med Medium) (thermo.Reaction, error) {
	terms := []*thermo.Species{ox, red}
	for _, el := range b.unmatched(ox, red) {
		if carried(terms[2:], el) {
			continue // the partner found for another element carries this one too (HOCN for the C and N of SCN-)
		}
		p := b.partner(el, key, terms...)
		if p != nil && contains(terms, p) {
			continue // one partner carries two elements (CN- for CuCN)
		}
		if p == nil {
			return thermo.Reaction{}, fmt.Errorf("no species carries %s to balance %s → %s", el, ox.Text, red.Text)
		}
		terms = append(terms, p)
	}
	// A partner may bring an element of its own (AgCl(s) for the silver of
	// Ag(CN)2- brings chloride): one more round of partners for elements
	// that only one term holds.
	for _, el := range lonely(terms) {
		if p := b.partner(el, key, terms...); p != nil && !contains(terms, p) {
			terms = append(terms, p)
		}
	}
	ion := b.proton
	if med == Base {
		ion = b.hydrox
	}
	for _, sp := range []*thermo.Species{b.water, ion} {
		if !contains(terms, sp) {
			terms = append(terms, sp)
		}
	}
	perOx := float64(ox.Atoms[key]) * (ox.Ox[key] - red.Ox[key])
	nu, e, err := balanced(terms, perOx)
	if err != nil {
		return thermo.Reaction{}, fmt.Errorf("%s → %s: %v", ox.Text, red.Text, err)
	}
	formed := nu[1] > 0 // the reduced form, or a partner when it carries the change (S2O8^2- → SO4^2-)
	for i := 2; i < len(terms); i++ {
		formed = formed || (nu[i] > 0 && terms[i] != b.water && terms[i] != ion)
	}
	if e <= 0 || nu[1] < 0 || !formed {
		return thermo.Reaction{}, fmt.Errorf("%s is not reduced to %s", ox.Text, red.Text)
	}
	r := thermo.Reaction{Electrons: e}
	for i, sp := range terms {
		if nu[i] != 0 {
			r.Terms = append(r.Terms, thermo.Term{Species: sp, Nu: float64(nu[i])})
		}
	}
	return r, nil
}

// carried reports whether one of terms holds el.
func carried(terms []*thermo.Species, el string) bool {
	for _, t := range terms {
		if t.Atoms[el] > 0 {
			return true
		}
	}
	return false
}

// lonely lists the elements other than H and O, beyond the first two terms,
// that only one of terms holds.
func lonely(terms []*thermo.Species) []string {
	count := map[string]int{}
	for _, t := range terms {
		for el := range t.Atoms {
			count[el]++
		}
	}
	var out []string
	for el, n := range count {
		if n == 1 && el != "H" && el != "O" && terms[0].Atoms[el] == 0 && terms[1].Atoms[el] == 0 {
			out = append(out, el)
		}
	}
	sort.Strings(out)
	return out
}

// unmatched lists the elements other than H and O found in only one of the
// two forms: a partner species must carry them (chloride for AgCl → Ag,
// ammonia for Cu(NH3)4^2+ → Cu).
func (b *balancer) unmatched(ox, red *thermo.Species) []string {
	var out []string
	for _, pair := range [][2]*thermo.Species{{ox, red}, {red, ox}} {
		for el := range pair[0].Atoms {
			if el != "H" && el != "O" && pair[1].Atoms[el] == 0 {
				out = append(out, el)
			}
		}
	}
	sort.Strings(out)
	return out
}

// A half-reaction's coefficients depend only on its species and the
// electrons per oxidized form, and each request balances the same few
// couples again for the mix and for every held-back change: balanced keeps
// them. The key is the species texts (thermo reads a species' atoms and
// charge from its text), the charges and perOx, exactly; the cache is bounded and safe for concurrent use.
var coefficients = mustLRU(coefficientsSize)

// coefficientsSize bounds the half-reactions kept (a few hundred bytes each).
const coefficientsSize = 4096

type coefficientsEntry struct {
	nu  []int
	n   int
	err error
}

func mustLRU(size int) *lru.Cache[string, coefficientsEntry] {
	c, err := lru.New[string, coefficientsEntry](size)
	if err != nil {
		panic(err) // only for a size below 1
	}
	return c
}

// balanced is solveCoefficients through the cache. The slice returned is
// the caller's own.
func balanced(terms []*thermo.Species, perOx float64) ([]int, int, error) {
	b := make([]byte, 0, 16*len(terms)+24)
	for _, sp := range terms {
		b = append(b, sp.Text...)
		b = strconv.AppendInt(append(b, 0), int64(sp.Charge), 10)
		b = append(b, 0)
	}
	key := string(strconv.AppendFloat(b, perOx, 'g', -1, 64))
	if e, ok := coefficients.Get(key); ok {
		return append([]int(nil), e.nu...), e.n, e.err
	}
	nu, n, err := solveCoefficients(terms, perOx)
	coefficients.Add(key, coefficientsEntry{nu: append([]int(nil), nu...), n: n, err: err})
	return nu, n, err
}

// solveCoefficients finds signed coefficients (terms[0] consumed with −k)
// and the electrons n so that every element and the charge balance:
// Σ ν_t·atoms_t + (−n)·e⁻ = 0. It returns whole numbers.
func solveCoefficients(terms []*thermo.Species, perOx float64) ([]int, int, error) {
	els := map[string]int{}
	var names []string
	for _, sp := range terms {
		for el := range sp.Atoms {
			if _, ok := els[el]; !ok {
				els[el] = len(names)
				names = append(names, el)
			}
		}
	}
	rows := len(names) + 1 // elements and charge
	if !fullRank(terms, names, els) {
		rows++ // and the electrons per ox, when the rest leaves a choice
	}
	cols := len(terms) // terms 1.. plus the electron column
	a := mat.NewDense(rows, cols, nil)
	rhs := mat.NewVecDense(rows, nil)
	for j, sp := range terms {
		for el, n := range sp.Atoms {
			if j == 0 {
				rhs.SetVec(els[el], float64(n)) // ν₀ = −1 moved to the right
				continue
			}
			a.Set(els[el], j-1, float64(n))
		}
		if j == 0 {
			rhs.SetVec(len(names), float64(sp.Charge))
			continue
		}
		a.Set(len(names), j-1, float64(sp.Charge))
	}
	a.Set(len(names), cols-1, -1) // the electron's charge; its ν is −n for a reduction
	if rows > len(names)+1 {
		a.Set(len(names)+1, cols-1, 1)
		rhs.SetVec(len(names)+1, -perOx) // ν_e = −n, n per ox from the key element's states
	}
	var x mat.VecDense
	if err := x.SolveVec(a, rhs); err != nil {
		return nil, 0, fmt.Errorf("cannot be balanced: %v", err)
	}
	var res mat.VecDense
	res.MulVec(a, &x)
	res.SubVec(&res, rhs)
	if mat.Norm(&res, math.Inf(1)) > 1e-7 {
		return nil, 0, fmt.Errorf("cannot be balanced with these species")
	}
	vals := append([]float64{-1}, x.RawVector().Data...)
	k := wholeScale(vals)
	if k == 0 {
		return nil, 0, fmt.Errorf("needs coefficients beyond %d", maxScale)
	}
	out := make([]int, len(terms))
	for i := range terms {
		out[i] = int(math.Round(vals[i] * float64(k)))
	}
	n := -int(math.Round(vals[len(vals)-1] * float64(k)))
	return out, n, nil
}

// wholeScale is the least k ≤ maxScale that makes every value whole (0 when
// none does).
func wholeScale(vals []float64) int {
	for k := 1; k <= maxScale; k++ {
		ok := true
		for _, v := range vals {
			x := v * float64(k)
			if math.Abs(x-math.Round(x)) > 1e-6 {
				ok = false
				break
			}
		}
		if ok {
			return k
		}
	}
	return 0
}

// fullRank reports whether the element and charge rows alone fix every
// coefficient: true unless two terms can trade atoms freely (O2, H2O2 and
// water for a couple of oxygen itself).
func fullRank(terms []*thermo.Species, names []string, els map[string]int) bool {
	cols := len(terms) // terms 1.. and the electron
	a := mat.NewDense(len(names)+1, cols, nil)
	for j, sp := range terms[1:] {
		for el, n := range sp.Atoms {
			a.Set(els[el], j, float64(n))
		}
		a.Set(len(names), j, float64(sp.Charge))
	}
	a.Set(len(names), cols-1, -1)
	var svd mat.SVD
	if !svd.Factorize(a, mat.SVDNone) {
		return false
	}
	vals := svd.Values(nil)
	rank := 0
	for _, v := range vals {
		if v > 1e-9*vals[0] {
			rank++
		}
	}
	return rank == cols
}
