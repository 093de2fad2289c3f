package equilibrium

import (
	"encoding/json"
	"os"
	"strconv"
	"testing"
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
	pt := s.startFrom(n, 0)
	s.evaluate(pt)
	t.Logf("theta %v", pt.theta)
	for i := range pt.amt {
		t.Logf("  %s n=%.4g log=%.4g", s.p.Species[i].Name, pt.amt[i], pt.logAmt[i])
	}
}
