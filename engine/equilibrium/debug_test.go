package equilibrium

import (
	"encoding/json"
	"fmt"
	"gonum.org/v1/gonum/mat"
	"math"
	"os"
	"strconv"
	"syscall"
	"testing"
	"time"
)

func TestDebugOne(t *testing.T) {
	k, err := strconv.Atoi(os.Getenv("DBG"))
	if err != nil {
		t.Skip()
	}
	p := randomProblems(60)[k]
	if f := os.Getenv("DBGFILE"); f != "" {
		b, _ := os.ReadFile(f)
		p = Problem{}
		json.Unmarshal(b, &p)
	}
	t.Logf("species: %s", describe(p))
	t.Logf("components %v totals %v", p.Components, p.Totals)
	tr := &trace{}
	st, err := solve(&p, tr)
	t.Logf("err %v", err)
	for _, n := range tr.notes {
		t.Log(n)
	}
	for i, s := range tr.steps {
		if i < 40 || i > len(tr.steps)-10 {
			t.Logf("step %d alpha %.3g merit %.3g -> %.3g", i, s.alpha, s.before, s.after)
		}
	}
	for i, s := range p.Species {
		if st.Amount != nil {
			t.Logf("%s %.4g", s.Name, st.Amount[i])
		}
	}
}

func TestDebugStart(t *testing.T) {
	k, err := strconv.Atoi(os.Getenv("DBG"))
	if err != nil {
		t.Skip()
	}
	p := randomProblems(60)[k]
	if f := os.Getenv("DBGFILE"); f != "" {
		b, _ := os.ReadFile(f)
		p = Problem{}
		json.Unmarshal(b, &p)
	}
	solvent, _ := validate(&p)
	off := make([]bool, len(p.Species))
	eliminate(&p, off)
	base, err := balanceRows(&p, off, &rowSet{}, solvent)
	s := newSystem(&p, solvent, off)
	s.setRows(base)
	for _, r := range base {
		t.Logf("row %s rhs %.17g noise %.3g coef %v", r.name, r.rhs, r.noise, r.coef)
	}
	n, err := s.lpStart()
	t.Logf("lp %v %v", n, err)
	pt := s.startFrom(n, false)
	s.evaluate(pt)
	t.Logf("theta %v", pt.theta)
	for i := range pt.amt {
		t.Logf("  %s n=%.4g log=%.4g", s.p.Species[i].Name, pt.amt[i], pt.logAmt[i])
	}
}

func TestDebugBig(t *testing.T) {
	k, err := strconv.Atoi(os.Getenv("DBGB"))
	if err != nil {
		t.Skip()
	}
	p := randomProblems(120)[k]
	t.Logf("species: %s", describe(p))
	t.Logf("components %v totals %v", p.Components, p.Totals)
	tr := &trace{}
	st, err := solve(&p, tr)
	t.Logf("err %v", err)
	for _, n := range tr.notes {
		t.Log(n)
	}
	for i, s := range p.Species {
		if st.Amount != nil {
			t.Logf("%s %.4g", s.Name, st.Amount[i])
		}
	}
}

func TestDebugCond(t *testing.T) {
	k, err := strconv.Atoi(os.Getenv("DBGC"))
	if err != nil {
		t.Skip()
	}
	p := randomProblems(60)[k]
	solvent, _ := validate(&p)
	off := make([]bool, len(p.Species))
	eliminate(&p, off)
	base, _ := balanceRows(&p, off, &rowSet{}, solvent)
	s := newSystem(&p, solvent, off)
	s.setRows(base)
	n, _ := s.lpStart()
	pt := s.startFrom(n, false)
	var w newtonWork
	err = s.solveGamma(pt, &w, nil)
	t.Logf("err %v svd %d iters %d", err, w.svdUsed, w.iter)

}

func TestDebugNull(t *testing.T) {
	k, err := strconv.Atoi(os.Getenv("DBGN"))
	if err != nil {
		t.Skip()
	}
	p := randomProblems(60)[k]
	solvent, _ := validate(&p)
	off := make([]bool, len(p.Species))
	eliminate(&p, off)
	base, _ := balanceRows(&p, off, &rowSet{}, solvent)
	s := newSystem(&p, solvent, off)
	s.setRows(base)
	n, _ := s.lpStart()
	pt := s.startFrom(n, false)
	var w newtonWork
	err = s.solveGamma(pt, &w, nil)
	q := len(s.rows)
	w.pures = s.unknowns(pt, w.pures)
	d := q + len(w.pures)
	if pt.gasOn {
		d++
	}
	s.jacobian(pt, &w, d)
	// equilibrate as solveLinear does
	jac := w.jac[:d*d]
	for r := 0; r < d; r++ {
		m := 0.0
		for c := 0; c < d; c++ {
			m = math.Max(m, math.Abs(jac[r*d+c]))
		}
		for c := 0; c < d; c++ {
			jac[r*d+c] /= m
		}
	}
	for c := 0; c < d; c++ {
		m := 0.0
		for r := 0; r < d; r++ {
			m = math.Max(m, math.Abs(jac[r*d+c]))
		}
		for r := 0; r < d; r++ {
			jac[r*d+c] /= m
		}
	}
	a := mat.NewDense(d, d, jac)
	var svd mat.SVD
	svd.Factorize(a, mat.SVDFull)
	vals := svd.Values(nil)
	t.Logf("sv %v", vals)
	var u, v mat.Dense
	svd.UTo(&u)
	svd.VTo(&v)
	for r := 0; r < d; r++ {
		name := "pure"
		if r < q {
			name = s.rows[r].name
		}
		t.Logf("%-50s u %.3f  v %.3f", name, u.At(r, d-1), v.At(r, d-1))
	}
	for r := 0; r < d; r++ {
		row := ""
		for c := 0; c < d; c++ {
			row += fmt.Sprintf("%9.2e ", jac[r*d+c])
		}
		t.Log(row)
	}
}

func TestDebugSpeed(t *testing.T) {
	if os.Getenv("DBGS") == "" {
		t.Skip()
	}
	for _, n := range []int{20, 40, 80, 160} {
		p := complexProblem(n, 1)
		tr := &trace{}
		st, err := solve(&p, tr)
		t.Logf("n=%d comps=%d err=%v iters=%d notes=%d", len(p.Species), len(p.Components), err, st.Iterations, len(tr.notes))
		for _, no := range tr.notes {
			t.Log("   ", no)
		}
		solvent, _ := validate(&p)
		off := make([]bool, len(p.Species))
		eliminate(&p, off)
		base, _ := balanceRows(&p, off, &rowSet{}, solvent)
		s := newSystem(&p, solvent, off)
		s.setRows(base)
		t0 := time.Now()
		for k := 0; k < 20; k++ {
			s.lpStart()
		}
		t.Logf("   lp %v", time.Since(t0)/20)
	}
}

func TestDebugWarm(t *testing.T) {
	if os.Getenv("DBGS") == "" {
		t.Skip()
	}
	for _, n := range []int{20, 40, 80, 160} {
		p := complexProblem(n, 1)
		st, _ := Solve(p)
		q := nearby(p)
		q.Start = st.Amount
		tr := &trace{}
		st2, err := solve(&q, tr)
		t.Logf("n=%d cold iters %d warm iters=%d err=%v notes=%v", n, st.Iterations, st2.Iterations, err, tr.notes)
	}
}

func cpuNow() time.Duration {
	var ru syscall.Rusage
	syscall.Getrusage(syscall.RUSAGE_SELF, &ru)
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

func TestDebugCPU(t *testing.T) {
	if os.Getenv("DBGS") == "" {
		t.Skip()
	}
	for _, n := range []int{20, 40, 80, 160} {
		p := complexProblem(n, 1)
		st, _ := Solve(p)
		q := nearby(p)
		q.Start = st.Amount
		const reps = 200
		c0 := cpuNow()
		for k := 0; k < reps; k++ {
			Solve(p)
		}
		c1 := cpuNow()
		for k := 0; k < reps; k++ {
			Solve(q)
		}
		c2 := cpuNow()
		solvent, _ := validate(&p)
		off := make([]bool, len(p.Species))
		eliminate(&p, off)
		base, _ := balanceRows(&p, off, &rowSet{}, solvent)
		s := newSystem(&p, solvent, off)
		s.setRows(base)
		for k := 0; k < reps; k++ {
			s.lpStart()
		}
		c3 := cpuNow()
		t.Logf("n=%d cold %v warm %v lp %v (CPU per solve)", len(p.Species), (c1-c0)/reps, (c2-c1)/reps, (c3-c2)/reps)
	}
}
