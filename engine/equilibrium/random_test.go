package equilibrium

import (
	"fmt"
	"math"
	"math/rand/v2"
	"sort"
)

// Random problems for the property tests, the fuzz target and the
// benchmarks. Two families:
//   - feeds drawn from the test catalogue (real ΔfG° values, NBS 1982),
//     with every catalogue species made only of the fed elements;
//   - synthetic complexation systems of a chosen size: invented metals with
//     hydroxo, chloro and sulfato complexes and a hydroxide solid, their
//     μ° built from random but plausible stability constants (log β up to
//     6 per ligand, pKsp 10–40). These are numerical test material only.

// feed is a neutral unit that can be added to water.
type feed struct {
	name string
	ions map[string]float64
}

var feeds = []feed{
	{"NaCl", map[string]float64{"Na+": 1, "Cl-": 1}},
	{"HCl", map[string]float64{"H+": 1, "Cl-": 1}},
	{"NaOH", map[string]float64{"Na+": 1, "OH-": 1}},
	{"acetic acid", map[string]float64{"CH3COOH": 1}},
	{"ammonia", map[string]float64{"NH3": 1}},
	{"HNO3", map[string]float64{"H+": 1, "NO3-": 1}},
	{"AgCl", map[string]float64{"AgCl(s)": 1}},
	{"CaCO3", map[string]float64{"CaCO3(s)": 1}},
	{"CaCl2", map[string]float64{"Ca^2+": 1, "Cl-": 2}},
	{"FeCl2", map[string]float64{"Fe^2+": 1, "Cl-": 2}},
	{"FeCl3", map[string]float64{"Fe^3+": 1, "Cl-": 3}},
	{"KMnO4", map[string]float64{"K+": 1, "MnO4-": 1}},
	{"H2SO4", map[string]float64{"H+": 2, "SO4^2-": 1}},
	{"zinc", map[string]float64{"Zn(s)": 1}},
	{"NaBr", map[string]float64{"Na+": 1, "Br-": 1}},
	{"NaOCl", map[string]float64{"Na+": 1, "OCl-": 1}},
	{"cerium(IV) sulfate", map[string]float64{"Ce^4+": 1, "SO4^2-": 2}},
}

// noLocked are catalogue species left out of random feeds: O2 and H2 would
// let water itself react (oxygen or hydrogen evolution), which the engine
// treats with locks, not here.
var noLocked = map[string]bool{"O2": true, "O2(g)": true, "H2": true, "H2(g)": true}

// randomFeedProblem draws 1–4 feeds with amounts from 1e-6 to 1 mol in 1 kg
// of water.
func randomFeedProblem(r *rand.Rand) Problem {
	recipe := map[string]float64{"H2O": water}
	elems := map[string]bool{"H": true, "O": true}
	for k := 1 + r.IntN(4); k > 0; k-- {
		f := feeds[r.IntN(len(feeds))]
		mol := math.Pow(10, -6+6*r.Float64())
		for ion, nu := range f.ions {
			recipe[ion] += nu * mol
			for e := range catalogue[ion].atoms {
				elems[e] = true
			}
		}
	}
	var names []string
	for name, e := range catalogue {
		if noLocked[name] {
			continue
		}
		ok := true
		for el := range e.atoms {
			ok = ok && elems[el]
		}
		if ok {
			names = append(names, name)
		}
	}
	sort.Strings(names)
	return build(names, recipe)
}

// complexProblem builds a synthetic complexation system with about n
// species.
func complexProblem(n int, seed uint64) Problem {
	r := rand.New(rand.NewPCG(seed, 7))
	comps := []string{"H", "O", "Na", "Cl", "S"}
	type sp struct {
		name   string
		phase  Phase
		charge int
		atoms  map[string]float64
		mu0    float64
	}
	mu := func(name string) float64 { return catalogue[name].dfG / rt }
	list := []sp{
		{"H2O", Solvent, 0, map[string]float64{"H": 2, "O": 1}, mu("H2O")},
		{"H+", Aqueous, 1, map[string]float64{"H": 1}, 0},
		{"OH-", Aqueous, -1, map[string]float64{"H": 1, "O": 1}, mu("OH-")},
		{"Na+", Aqueous, 1, map[string]float64{"Na": 1}, mu("Na+")},
		{"Cl-", Aqueous, -1, map[string]float64{"Cl": 1}, mu("Cl-")},
		{"SO4^2-", Aqueous, -2, map[string]float64{"S": 1, "O": 4}, mu("SO4^2-")},
		{"HSO4-", Aqueous, -1, map[string]float64{"H": 1, "S": 1, "O": 4}, mu("HSO4-")},
	}
	totals := map[string]float64{"H": 2 * water, "O": water}
	acid := math.Pow(10, -4+3*r.Float64())
	totals["H"] += acid
	totals["Cl"] += acid
	totals["Na"] += 0.01
	totals["S"] += 0.005
	totals["O"] += 0.02
	ligands := []struct {
		name   string
		charge int
		atoms  map[string]float64
	}{
		{"OH", -1, map[string]float64{"O": 1, "H": 1}},
		{"Cl", -1, map[string]float64{"Cl": 1}},
		{"SO4", -2, map[string]float64{"S": 1, "O": 4}},
	}
	ligMu := []float64{mu("OH-"), mu("Cl-"), mu("SO4^2-")}
	for m := 1; len(list) < n; m++ {
		el := fmt.Sprintf("M%d", m)
		comps = append(comps, el)
		z := 2 + r.IntN(2)
		m0 := -(100 + 300*r.Float64()) / rt
		list = append(list, sp{el + fmt.Sprintf("^%d+", z), Aqueous, z, map[string]float64{el: 1}, m0})
		amt := math.Pow(10, -4+3*r.Float64())
		totals[el] += amt
		totals["Cl"] += float64(z) * amt
		// the hydroxide solid
		solid := sp{el + "(OH)(s)", Pure, 0, map[string]float64{el: 1, "O": float64(z), "H": float64(z)},
			m0 + float64(z)*ligMu[0] - (10+30*r.Float64())*math.Ln10}
		list = append(list, solid)
		for a := 0; a <= 3 && len(list) < n; a++ {
			for b := 0; b <= 3-a && len(list) < n; b++ {
				for c := 0; c <= 1 && len(list) < n; c++ {
					if a+b+c == 0 {
						continue
					}
					counts := []int{a, b, c}
					s := sp{fmt.Sprintf("%s(OH)%dCl%d(SO4)%d", el, a, b, c), Aqueous, z, map[string]float64{el: 1}, m0}
					for li, k := range counts {
						s.charge += k * ligands[li].charge
						for e, v := range ligands[li].atoms {
							s.atoms[e] += float64(k) * v
						}
						s.mu0 += float64(k) * (ligMu[li] - 6*r.Float64()*math.Ln10)
					}
					if a > 0 { // hydrolysis is weaker than the ligand series suggests
						s.mu0 += float64(a) * 8 * math.Ln10
					}
					list = append(list, s)
				}
			}
		}
	}
	p := Problem{Components: comps, Totals: make([]float64, len(comps)), TemperatureK: t25, PressureBar: 1}
	for j, c := range comps {
		p.Totals[j] = totals[c]
	}
	for _, s := range list {
		spc := Species{Name: s.name, Phase: s.phase, Charge: s.charge, Amounts: make([]float64, len(comps)), Mu0: s.mu0}
		for j, c := range comps {
			spc.Amounts[j] = s.atoms[c]
		}
		p.Species = append(p.Species, spc)
	}
	return p
}
