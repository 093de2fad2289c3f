package equilibrium

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// randomProblems returns seeded problems of both families.
func randomProblems(count int) []Problem {
	r := rand.New(rand.NewPCG(2026, 12))
	var ps []Problem
	for k := 0; k < count; k++ {
		ps = append(ps, randomFeedProblem(r))
	}
	for k := 0; k < count/4; k++ {
		ps = append(ps, complexProblem(20+r.IntN(60), uint64(k)))
	}
	return ps
}

func describe(p Problem) string {
	s := ""
	for i, sp := range p.Species {
		if i > 0 {
			s += " "
		}
		s += sp.Name
	}
	return s
}

func TestPropertyConservation(t *testing.T) {
	for k, p := range randomProblems(120) {
		st, err := Solve(p)
		if err != nil {
			t.Errorf("problem %d (%s): %v", k, describe(p), err)
			continue
		}
		checkTotals(t, p, st)
	}
}

// frozenGibbs is the convex function the equilibrium minimises, with the
// activity coefficients and the solvent mass held at their values in ref:
// Σaq n(μ° + ln γ + ln(n/W) − 1) + Σpure n μ° + Σgas n(μ° + ln P + ln(n/N)).
// It returns the change from ref.Amount to ref.Amount + d, summed term by
// term so that large constant parts cancel exactly.
func frozenGibbsChange(p Problem, ref State, d []float64) float64 {
	var w float64
	for i, s := range p.Species {
		if s.Phase == Solvent {
			w = ref.Amount[i] * MolarMassWater
		}
	}
	ng0, ng1 := ref.GasMoles, ref.GasMoles
	for i, s := range p.Species {
		if s.Phase == Gas {
			ng1 += d[i]
		}
	}
	xlnx := func(n, scale float64) float64 {
		if n <= 0 {
			return 0
		}
		return n * math.Log(n/scale)
	}
	total := 0.0
	for i, s := range p.Species {
		n0, n1 := ref.Amount[i], ref.Amount[i]+d[i]
		switch s.Phase {
		case Aqueous:
			c := s.Mu0 + ref.LogGamma[i] - 1
			total += d[i]*c + xlnx(n1, w) - xlnx(n0, w)
		case Gas:
			total += d[i]*(s.Mu0+math.Log(p.PressureBar)) + xlnx(n1, ng1) - xlnx(n0, ng0)
		default:
			total += d[i] * s.Mu0
		}
	}
	return total
}

// reactionBasis returns the null space of the component and charge rows:
// every reaction vector (charge-neutral, element-conserving).
func reactionBasis(p Problem) [][]float64 {
	ns := len(p.Species)
	rows := len(p.Components) + 1
	m := mat.NewDense(rows, ns, nil)
	for i, s := range p.Species {
		for j := range p.Components {
			m.Set(j, i, s.Amounts[j])
		}
		if s.Phase == Aqueous {
			m.Set(rows-1, i, float64(s.Charge))
		}
	}
	var svd mat.SVD
	if !svd.Factorize(m, mat.SVDFull) {
		panic("svd failed")
	}
	vals := svd.Values(nil)
	var v mat.Dense
	svd.VTo(&v)
	var basis [][]float64
	for c := 0; c < ns; c++ {
		if c < len(vals) && vals[c] > 1e-9*vals[0] {
			continue
		}
		col := make([]float64, ns)
		for i := range col {
			col[i] = v.At(i, c)
		}
		basis = append(basis, col)
	}
	return basis
}

// feasibleStep scales direction d so that every amount stays ≥ 0 and no
// present amount changes by more than frac of itself; it returns 0 when the
// direction leaves the feasible set at once.
func feasibleStep(amount, d []float64, frac float64) float64 {
	t := math.Inf(1)
	for i, v := range d {
		if math.Abs(v) < 1e-300 {
			continue
		}
		if amount[i] <= 0 {
			if v < 0 {
				return 0
			}
			continue
		}
		t = math.Min(t, frac*amount[i]/math.Abs(v))
	}
	if math.IsInf(t, 1) {
		return 0
	}
	return t
}

func TestPropertyMinimum(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 9))
	for k, p := range randomProblems(60) {
		st, err := Solve(p)
		if err != nil {
			t.Errorf("problem %d: %v", k, err)
			continue
		}
		basis := reactionBasis(p)
		tryDir := func(dir []float64, what string) {
			for _, frac := range []float64{1e-3, 0.1, 0.5} {
				for _, sign := range []float64{1, -1} {
					d := make([]float64, len(dir))
					for i := range dir {
						d[i] = sign * dir[i]
					}
					step := feasibleStep(st.Amount, d, frac)
					if step == 0 {
						continue
					}
					scale := 0.0
					for i := range d {
						d[i] *= step
						scale += math.Abs(d[i] * p.Species[i].Mu0)
					}
					if dg := frozenGibbsChange(p, st, d); dg < -1e-9*scale-1e-14 {
						t.Errorf("problem %d: G falls by %.3g moving along %s (frac %g)", k, dg, what, frac)
						return
					}
				}
			}
		}
		for b, dir := range basis {
			tryDir(dir, "reaction vector "+string(rune('0'+b%10)))
		}
		for trial := 0; trial < 20 && len(basis) > 0; trial++ {
			dir := make([]float64, len(p.Species))
			for _, v := range basis {
				axpy(dir, r.NormFloat64(), v)
			}
			tryDir(dir, "a random reaction combination")
		}
	}
}

func TestPropertyMeritFalls(t *testing.T) {
	for k, p := range randomProblems(60) {
		tr := &trace{}
		if _, err := solve(&p, tr); err != nil {
			t.Errorf("problem %d: %v", k, err)
			continue
		}
		for s, step := range tr.steps {
			if !(step.after <= step.before) {
				t.Errorf("problem %d step %d: merit rose from %.6g to %.6g", k, s, step.before, step.after)
			}
		}
	}
}

func TestPropertyPermutation(t *testing.T) {
	r := rand.New(rand.NewPCG(11, 3))
	for k, p := range randomProblems(40) {
		st, err := Solve(p)
		if err != nil {
			t.Errorf("problem %d: %v", k, err)
			continue
		}
		perm := r.Perm(len(p.Species))
		q := p
		q.Species = make([]Species, len(p.Species))
		for to, from := range perm {
			q.Species[to] = p.Species[from]
		}
		st2, err := Solve(q)
		if err != nil {
			t.Errorf("problem %d permuted: %v", k, err)
			continue
		}
		for to, from := range perm {
			a, b := st.Amount[from], st2.Amount[to]
			// Amounts below 1e-14 mol are at the rounding of totals of
			// ~100 mol (2e-16 relative) wherever an oxidation state has no
			// partner to set it: listing order may move them.
			if math.Abs(a-b) > 1e-7*math.Max(math.Abs(a), math.Abs(b))+1e-14 {
				t.Errorf("problem %d: %s = %.10g, permuted %.10g", k, p.Species[from].Name, a, b)
			}
		}
		if math.Abs(st.G-st2.G) > 1e-10*math.Abs(st.G) {
			t.Errorf("problem %d: G %.12g, permuted %.12g", k, st.G, st2.G)
		}
	}
}

func TestPropertySaltInWater(t *testing.T) {
	for _, tc := range []struct {
		salt    string
		species []string
		ions    map[string]float64
	}{
		{"NaCl", []string{"H2O", "H+", "OH-", "Na+", "Cl-", "Cl2", "Cl2(g)", "HOCl", "OCl-"}, map[string]float64{"Na+": 1, "Cl-": 1}},
		{"NaBr", []string{"H2O", "H+", "OH-", "Na+", "Br-", "Br2", "Br2(l)"}, map[string]float64{"Na+": 1, "Br-": 1}},
		{"KCl", []string{"H2O", "H+", "OH-", "K+", "Cl-", "Cl2", "Cl2(g)"}, map[string]float64{"K+": 1, "Cl-": 1}},
	} {
		for _, mol := range []float64{1e-6, 1e-3, 0.3} {
			recipe := map[string]float64{"H2O": water}
			for ion, nu := range tc.ions {
				recipe[ion] = nu * mol
			}
			p := build(tc.species, recipe)
			st, err := Solve(p)
			if err != nil {
				t.Fatalf("%s %g mol: %v", tc.salt, mol, err)
			}
			for i, s := range p.Species {
				fed := recipe[s.Name]
				switch {
				case s.Phase == Solvent:
					if math.Abs(st.Amount[i]-water) > 1e-6 { // autoprotolysis takes 1e-7 mol
						t.Errorf("%s: water %.12g mol, fed %.12g", tc.salt, st.Amount[i], water)
					}
				case fed > 0:
					if math.Abs(st.Amount[i]-fed) > 1e-9*fed {
						t.Errorf("%s %g mol: %s %.12g, fed %.12g", tc.salt, mol, s.Name, st.Amount[i], fed)
					}
				case s.Name != "H+" && s.Name != "OH-":
					// Oxidized or reduced forms have no partner here and
					// must stay at zero up to the rounding of the totals
					// (the H and O totals of 55 mol of water carry ~1e-14
					// mol of rounding, which sets the redox balance).
					if st.Amount[i] > 1e-12*mol+1e-14*water {
						t.Errorf("%s %g mol: %s formed (%.3g mol)", tc.salt, mol, s.Name, st.Amount[i])
					}
				}
			}
			if st.GasMoles != 0 {
				t.Errorf("%s: gas phase formed", tc.salt)
			}
		}
	}
}
