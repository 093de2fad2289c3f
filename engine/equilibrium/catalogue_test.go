package equilibrium

import (
	"math"
	"sort"

	"gonum.org/v1/gonum/unit/constant"
)

// entry is a species of the test catalogue with its ΔfG° at 298.15 K.
type entry struct {
	name   string
	phase  Phase
	charge int
	atoms  map[string]float64
	dfG    float64 // kJ/mol
	source string
}

// catalogue: ΔfG° at 298.15 K, NBS Tables of Chemical Thermodynamic
// Properties (Wagman et al. 1982), from memory, unless noted.
var catalogue = map[string]entry{}

func init() {
	nbs := "NBS Tables 1982; from memory"
	for _, e := range []entry{
		{"H2O", Solvent, 0, at("H", 2, "O", 1), -237.129, "CODATA Key Values 1989; from memory"},
		{"H+", Aqueous, 1, at("H", 1), 0, "convention"},
		{"OH-", Aqueous, -1, at("O", 1, "H", 1), -157.244, nbs},
		{"Na+", Aqueous, 1, at("Na", 1), -261.905, nbs},
		{"Cl-", Aqueous, -1, at("Cl", 1), -131.228, nbs},
		{"CH3COOH", Aqueous, 0, at("C", 2, "H", 4, "O", 2), -396.46, nbs},
		{"CH3COO-", Aqueous, -1, at("C", 2, "H", 3, "O", 2), -369.31, nbs},
		{"NH3", Aqueous, 0, at("N", 1, "H", 3), -26.50, nbs},
		{"NH4+", Aqueous, 1, at("N", 1, "H", 4), -79.31, nbs},
		{"Ag+", Aqueous, 1, at("Ag", 1), 77.107, nbs},
		{"AgCl(s)", Pure, 0, at("Ag", 1, "Cl", 1), -109.789, nbs},
		{"Ca^2+", Aqueous, 2, at("Ca", 1), -553.58, nbs},
		{"CaCO3(s)", Pure, 0, at("Ca", 1, "C", 1, "O", 3), -1128.79, nbs + " (calcite)"},
		{"CO3^2-", Aqueous, -2, at("C", 1, "O", 3), -527.81, nbs},
		{"HCO3-", Aqueous, -1, at("H", 1, "C", 1, "O", 3), -586.77, nbs},
		{"CO2", Aqueous, 0, at("C", 1, "O", 2), -385.98, nbs},
		{"CO2(g)", Gas, 0, at("C", 1, "O", 2), -394.359, nbs},
		{"Fe^2+", Aqueous, 2, at("Fe", 1), -78.90, nbs},
		{"Fe^3+", Aqueous, 3, at("Fe", 1), -4.7, nbs},
		{"MnO4-", Aqueous, -1, at("Mn", 1, "O", 4), -447.2, nbs},
		{"Mn^2+", Aqueous, 2, at("Mn", 1), -228.1, nbs},
		{"Zn^2+", Aqueous, 2, at("Zn", 1), -147.06, nbs},
		{"Zn(s)", Pure, 0, at("Zn", 1), 0, "element in its standard state"},
		{"Ce^3+", Aqueous, 3, at("Ce", 1), -672.0, nbs},
		{"Ce^4+", Aqueous, 4, at("Ce", 1), -503.8, nbs},
		{"SO4^2-", Aqueous, -2, at("S", 1, "O", 4), -744.53, nbs},
		{"HSO4-", Aqueous, -1, at("H", 1, "S", 1, "O", 4), -755.91, nbs},
		{"K+", Aqueous, 1, at("K", 1), -283.27, nbs},
		{"NO3-", Aqueous, -1, at("N", 1, "O", 3), -111.25, nbs},
		{"Br-", Aqueous, -1, at("Br", 1), -103.96, nbs},
		{"Br2", Aqueous, 0, at("Br", 2), 3.93, nbs},
		{"Br2(l)", Pure, 0, at("Br", 2), 0, "element in its standard state"},
		{"Cl2", Aqueous, 0, at("Cl", 2), 6.94, nbs},
		{"Cl2(g)", Gas, 0, at("Cl", 2), 0, "element in its standard state"},
		{"HOCl", Aqueous, 0, at("H", 1, "O", 1, "Cl", 1), -79.9, nbs},
		{"OCl-", Aqueous, -1, at("O", 1, "Cl", 1), -36.8, nbs},
		{"O2", Aqueous, 0, at("O", 2), 16.4, nbs},
		{"O2(g)", Gas, 0, at("O", 2), 0, "element in its standard state"},
		{"H2", Aqueous, 0, at("H", 2), 17.6, nbs},
		{"H2(g)", Gas, 0, at("H", 2), 0, "element in its standard state"},
		{"N2(g)", Gas, 0, at("N", 2), 0, "element in its standard state"},
	} {
		catalogue[e.name] = e
	}
}

func at(kv ...any) map[string]float64 {
	m := map[string]float64{}
	for k := 0; k < len(kv); k += 2 {
		m[kv[k].(string)] = float64(kv[k+1].(int))
	}
	return m
}

const t25 = 298.15

// rt is RT at 25 °C in kJ/mol; R = N_A·k (CODATA 2018 exact values via gonum unit/constant).
var rt = float64(constant.Avogadro) * float64(constant.Boltzmann) * t25 / 1000

// build makes a Problem of the named species with totals from the recipe
// (mol of each species fed).
func build(names []string, recipe map[string]float64) Problem {
	elems := map[string]bool{}
	for _, n := range names {
		for e := range catalogue[n].atoms {
			elems[e] = true
		}
	}
	var comps []string
	for e := range elems {
		comps = append(comps, e)
	}
	sort.Strings(comps)
	p := Problem{Components: comps, Totals: make([]float64, len(comps)), TemperatureK: t25, PressureBar: 1}
	for _, n := range names {
		e, ok := catalogue[n]
		if !ok {
			panic("test catalogue lacks " + n)
		}
		sp := Species{Name: n, Phase: e.phase, Charge: e.charge, Amounts: make([]float64, len(comps)), Mu0: e.dfG / rt}
		for j, c := range comps {
			sp.Amounts[j] = e.atoms[c]
		}
		p.Species = append(p.Species, sp)
	}
	for n, mol := range recipe {
		e, ok := catalogue[n]
		if !ok {
			panic("test catalogue lacks " + n)
		}
		for j, c := range comps {
			p.Totals[j] += mol * e.atoms[c]
		}
	}
	return p
}

func index(p Problem, name string) int {
	for i, s := range p.Species {
		if s.Name == name {
			return i
		}
	}
	panic("no species " + name)
}

// pH returns −log10 of the H+ activity.
func pH(p Problem, st State) float64 {
	i := index(p, "H+")
	return -(math.Log(st.Molality[i]) + st.LogGamma[i]) / math.Ln10
}

// water is 1 kg of water in mol (1000 g / 18.015 g/mol).
const water = 1 / MolarMassWater
