package state

import (
	"math"
	"strings"
	"testing"

	"mixward/data"
	"mixward/engine/thermo"
)

func loadDB(t testing.TB) *thermo.DB {
	t.Helper()
	db, err := thermo.Load(data.FS)
	if err != nil {
		t.Fatal(err)
	}
	return db
}

func TestLocksFileLoads(t *testing.T) {
	m, err := NewModel(loadDB(t), data.FS)
	if err != nil {
		t.Fatal(err)
	}
	if len(m.Locks) < 10 {
		t.Fatalf("locks.txt gave %d locks", len(m.Locks))
	}
	for _, l := range m.Locks {
		if l.Reason == "" || l.Source == "" {
			t.Errorf("lock %s (line %d) lacks a reason or source", l.ID, l.Line)
		}
	}
}

// TestGroupWeights checks which species a group counts and how many atoms.
func TestGroupWeights(t *testing.T) {
	db := loadDB(t)
	cases := []struct {
		group, species string
		want           float64
	}{
		{"O(>-2)", "H2O2", 2},
		{"O(>-2)", "O2(g)", 2},
		{"O(>-2)", "HSO5-", 2},
		{"O(>-2)", "S2O8^2-", 2},
		{"O(>-2)", "H2O", 0},
		{"O(>-2)", "OCl-", 0},
		{"O(0)", "O2", 2},
		{"O(0)", "H2O2", 0},
		{"S(6)", "SO4^2-", 1},
		{"S(6)", "HSO4-", 1},
		{"S(6)", "SO3^2-", 0},
		{"S(-2..3.5)", "S2O3^2-", 2},
		{"N(0..1)", "N2(g)", 2},
		{"N(5)", "NO3-", 1},
		{"Cl(3..5)", "ClO3-", 1},
		{"Cl(3..5)", "ClO2", 1},
		{"Cl(3..5)", "OCl-", 0},
		{"H(-1)", "BH4-", 4},
		{"C(organic)", "CH3COOH", 2},
		{"C(organic)", "HCOO-", 1},
		{"C(organic)", "HCO3-", 0},
		{"C(organic)", "CN-", 0},
		{"{OCN-, HOCN}", "OCN-", 1},
		// ammonia nitrogen, not the C–N of cyanide, cyanate, thiocyanate or urea
		{"N(-3..-1 without C)", "NH4+", 1},
		{"N(-3..-1 without C)", "Zn(NH3)4^2+", 4},
		{"N(-3..-1 without C)", "OCN-", 0},
		{"N(-3..-1 without C)", "SCN-", 0},
		{"N(-3..-1 without C)", "CO(NH2)2", 0},
		// a count before a species: a urea stands for two nitrogen molecules
		{"{N2(g), 2 CO(NH2)2}", "CO(NH2)2", 2},
		{"{N2(g), 2 CO(NH2)2}", "N2(g)", 1},
		{"{N2(g), 2 CO(NH2)2}", "NH4+", 0},
		// persulfate: sulfur stays +6, two peroxo oxygens above −II
		{"S(6)", "S2O8^2-", 2},
		// sulfamate: nitrogen −III and sulfur +VI (species.txt overrides)
		{"N(-3)", "NH2SO3-", 1},
		{"S(6)", "NH2SO3H", 1},
		{"Cl(3)", "ClO2-", 1},
		{"Cl(3)", "HClO2", 1},
		// copper(I) cyanide: read by the average-state rule as Cu(II) and
		// C(+1) until its row said otherwise, which let plating liquor
		// "reduce" its copper to metal with its own cyanide
		{"Cu(1)", "CuCN(s)", 1},
		{"C(2)", "CuCN(s)", 1},
	}
	for _, c := range cases {
		g, err := parseGroup(c.group)
		if err != nil {
			t.Fatalf("parseGroup(%q): %v", c.group, err)
		}
		sp, ok := db.Get(c.species)
		if !ok {
			t.Errorf("%s: no species data", c.species)
			continue
		}
		if got := g.Weight(sp); got != c.want {
			t.Errorf("%s.Weight(%s) = %g, want %g", c.group, c.species, got, c.want)
		}
	}
}

func TestConditions(t *testing.T) {
	has := map[string]bool{"Cl(1)": true, "Cu(2)": true, "NH2SO3-": true}
	env := Env{TempC: 25, PH: 8, Has: func(g Group) bool { return has[strings.Trim(g.String(), "{}")] }}
	cases := []struct {
		cond string
		want bool
	}{
		{"t<60", true},
		{"t>=60", false},
		{"ph>=3 and ph<12", true},
		{"not has Cl(1) or not has Ni(2), Co(2), Cu(2)", false},
		{"not has Fe(2..3), Mn(2..4) and t<60", true},
		{"not (ph>=13 and has Al(0), Zn(0))", true},
		{"has N(3) and has NH2SO3-, NH2SO3H", false},
		{"has Cl(1), Br(1) or (ph<4 and t<60)", true},
		// A species that begins with a parenthesis may stand in a
		// has-list, first or later; a parenthesis elsewhere groups.
		{"has (CH3)2CHOH, Cu(2)", true},
		{"not (has Cl(1) and has Br(1), (CH3)2CHOH, NH2SO3-)", false},
		{"has (CH3)2CHOH or (ph<4 and t<60)", false},
	}
	for _, c := range cases {
		got, err := parseCond(c.cond)
		if err != nil {
			t.Errorf("parseCond(%q): %v", c.cond, err)
			continue
		}
		if got.Holds(env) != c.want {
			t.Errorf("%q (read as %s) = %v, want %v", c.cond, got, !c.want, c.want)
		}
	}
}

func TestLockErrors(t *testing.T) {
	cases := []struct{ row, want string }{
		{"x | no-gain S(6) | t<60 | why", "want 5 fields"},
		{"x | keep S(6) | t<60 | why | src", "not no-gain"},
		{"x | no-gain S(9) | t<60 | why | src", "between -8 and 8"},
		{"x | no-gain S(6) | t<<60 | why | src", "not a number"},
		{"two words | no-gain S(6) | t<60 | why | src", "one word"},
		{"x | no-gain S(6) | (t<60 | why | src", "missing )"},
		{"x | no-gain {N2, 0 NH3} | t<60 | why | src", "a count before a species"},
		{"x | no-gain {N2, two NH3} | t<60 | why | src", "a count before a species"},
		{"x | one-way N(3) | t<60 | why | src", "one-way takes an element alone"},
		{"x | one-way N or no-gain S(6) | t<60 | why | src", "stands alone"},
		{"x | never Na(0) | always | why | src", "never takes a list of species"},
		{"x | never {Na(s)} or no-gain S(6) | always | why | src", "stands alone"},
	}
	for _, c := range cases {
		_, err := parseLocks("locks.txt", []byte(c.row+"\n"))
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("parseLocks(%q) error = %v, want one containing %q", c.row, err, c.want)
		}
	}
}

func TestLockGroupsChecked(t *testing.T) {
	db := loadDB(t)
	for _, row := range []string{
		"x | no-gain Qq(6) | t<60 | why | src",
		"x | no-gain S(6) | has Zz9- | why | src",
	} {
		locks, err := parseLocks("locks.txt", []byte(row))
		if err != nil {
			t.Fatalf("parseLocks(%q): %v", row, err)
		}
		if err := checkGroups(&locks[0], db, elementsOf(db)); err == nil {
			t.Errorf("checkGroups(%q) = nil, want an error naming the unknown group", row)
		}
	}
}

func FuzzParseLocks(f *testing.F) {
	for _, s := range []string{
		"a | no-gain S(6) or no-loss O(-1..0) | not (has Cl(1), Cu(2) and t<60) or ph>=3 | r | s",
		"b | fixed {OCN-, HOCN} | always | r | s",
	} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		locks, err := parseLocks("locks.txt", []byte(s))
		if err != nil {
			return
		}
		for _, l := range locks {
			if l.When != nil {
				l.When.Holds(Env{Has: func(Group) bool { return true }})
			}
		}
	})
}

func TestConcCondition(t *testing.T) {
	c, err := parseCond("conc(N(5))>=8 and t<60")
	if err != nil {
		t.Fatal(err)
	}
	env := Env{TempC: 25, Molar: func(g Group) float64 {
		if g.Element == "N" {
			return 14.4 // 65 % nitric acid (CRC, Concentrative properties; from memory)
		}
		return 0
	}}
	if !c.Holds(env) {
		t.Errorf("%s does not hold at 14.4 mol/L", c)
	}
	env.Molar = func(Group) float64 { return 3 }
	if c.Holds(env) {
		t.Errorf("%s holds at 3 mol/L", c)
	}
	if _, err := parseCond("conc(N(5)>=8"); err == nil {
		t.Error("a conc condition without its closing parenthesis parsed")
	}
}

// TestReachCondition: "reach" is the temperature the mix reaches by its own
// heat, never below the starting temperature.
func TestReachCondition(t *testing.T) {
	cases := []struct {
		tempC, reachC float64
		cond          string
		want          bool
	}{
		{25, 0, "reach<60", true},
		{25, 90, "reach<60", false},
		{70, 0, "reach>=60", true},
		{25, 59, "reach>=60", false},
		{25, 90, "t<60 and reach>=60", true},
	}
	for _, c := range cases {
		got, err := parseCond(c.cond)
		if err != nil {
			t.Fatalf("parseCond(%q): %v", c.cond, err)
		}
		if h := got.Holds(Env{TempC: c.tempC, ReachC: c.reachC}); h != c.want {
			t.Errorf("%q at %g °C reaching %g °C = %v, want %v", c.cond, c.tempC, c.reachC, h, c.want)
		}
	}
}

// TestAcidAllowancePer: an acid allowance may count K atoms per proton.
func TestAcidAllowancePer(t *testing.T) {
	r, err := parseRule("no-gain N(-3..4) + acid to ph 3 x 0.25")
	if err != nil {
		t.Fatal(err)
	}
	if r.AcidTo == nil || *r.AcidTo != 3 || r.Per != 0.25 {
		t.Errorf("parsed %+v, want acid to pH 3 at 0.25 per proton", r)
	}
	if _, err := parseRule("no-gain N(-3..4) + acid to ph 3 x 0"); err == nil {
		t.Error("x 0 accepted")
	}
}

// TestGroupWithoutRejectsBadElement: "without" takes another element.
func TestGroupWithoutRejectsBadElement(t *testing.T) {
	for _, s := range []string{"N(-3 without N)", "N(-3 without c)", "N(-3 without )"} {
		if _, err := parseGroup(s); err == nil {
			t.Errorf("parseGroup(%q): no error", s)
		}
	}
	if g, err := parseGroup("N(-3..-1 without C)"); err != nil || g.Without != "C" || g.Lo != -3 || g.Hi != -1 {
		t.Errorf("parseGroup(N(-3..-1 without C)) = %+v, %v", g, err)
	}
}

// TestPairedRule: "no-gain S(0) + with S(4)" counts sulfur(0) less
// sulfur(IV), so sulfur may come off thiosulfate only beside as much sulfur
// dioxide or bisulfite (S2O3^2- + 2 H+ → S + SO2 + H2O), never beside
// sulfate; the pairing joins two oxidation-state groups of one element.
func TestPairedRule(t *testing.T) {
	r, err := parseRule("no-gain S(0) + with S(4)")
	if err != nil {
		t.Fatal(err)
	}
	if r.With == nil || r.With.Element != "S" || r.With.Lo != 4 {
		t.Fatalf("parsed %+v, want S(0) paired with S(4)", r)
	}
	db := loadDB(t)
	var mx Mix
	for _, s := range []string{"S(s)", "HSO3-", "SO2(g)", "SO4^2-", "S2O3^2-"} {
		sp, ok := db.Get(s)
		if !ok {
			t.Fatalf("%s: no species data", s)
		}
		mx.Species = append(mx.Species, sp)
	}
	n0 := []float64{0.5, 0.25, 0.25, 1, 3}
	c := ruleConstraint(&mx, "x#0", r, n0)
	want := []float64{1, -1, -1, 0, 0}
	for i, w := range want {
		if c.Coef[i] != w {
			t.Errorf("coefficient of %s = %g, want %g", mx.Species[i].Text, c.Coef[i], w)
		}
	}
	if c.Bound != 0 {
		t.Errorf("bound %g, want 0 (0.5 mol S less 0.5 mol sulfur(IV))", c.Bound)
	}
	for _, bad := range []string{"no-gain S(0) + with N(4)", "no-gain S(0) + with {SO2}", "no-loss S(0) + with S(4)", "no-gain {S(s)} + with S(4)"} {
		if _, err := parseRule(bad); err == nil {
			t.Errorf("parseRule(%q): no error", bad)
		}
	}
}

// TestNoNewBonds: "no-new-bonds C" counts, for every carbon count k, the
// carbon of organic species of k or more carbon atoms and the whole
// k-carbon pieces each holds, so that methanol gives no acetic acid and two
// glycerols give no three acetic acids.
func TestNoNewBonds(t *testing.T) {
	r, err := parseRule("no-new-bonds C")
	if err != nil || r.Dir != NoNewBonds {
		t.Fatalf("parseRule(no-new-bonds C) = %+v, %v", r, err)
	}
	for _, bad := range []string{"no-new-bonds N", "no-new-bonds", "no-new-bonds C(organic)"} {
		if _, err := parseRule(bad); err == nil {
			t.Errorf("parseRule(%q): no error", bad)
		}
	}
	if _, err := parseLocks("locks.txt", []byte("x | no-new-bonds C or no-gain S(6) | always | why | src\n")); err == nil {
		t.Error("no-new-bonds joined by or: no error")
	}
	db := loadDB(t)
	var mx Mix
	for _, s := range []string{"CH3OH", "CH3COOH", "C3H5(OH)3", "H2CO3", "CN-"} {
		sp, ok := db.Get(s)
		if !ok {
			t.Fatalf("%s: no species data", s)
		}
		mx.Species = append(mx.Species, sp)
	}
	// k=2 carbon, k=2 pieces, k=3 carbon (no pieces rule at the largest count)
	want := map[string][]float64{
		"C(organic, 2 or more C)":   {0, 2, 3, 0, 0},
		"C(organic, pieces of 2 C)": {0, 1, 1, 0, 0},
		"C(organic, 3 or more C)":   {0, 0, 3, 0, 0},
	}
	rules := chainRules(&mx)
	if len(rules) != len(want) {
		t.Fatalf("chainRules gave %d rules, want %d", len(rules), len(want))
	}
	for _, r := range rules {
		w, ok := want[r.Group.String()]
		if !ok {
			t.Errorf("unexpected rule on %s", r.Group)
			continue
		}
		for i, sp := range mx.Species {
			if got := r.Group.Weight(sp); got != w[i] {
				t.Errorf("%s.Weight(%s) = %g, want %g", r.Group, sp.Text, got, w[i])
			}
		}
	}
	if g, err := parseGroup("C(organic>=2)"); err != nil || g.MinAtoms != 2 || !g.Organic {
		t.Errorf("parseGroup(C(organic>=2)) = %+v, %v", g, err)
	}
	if _, err := parseGroup("C(organic>=1)"); err == nil {
		t.Error("C(organic>=1): no error")
	}
}

// TestSpentByRule: "no-gain G + spent by G2 x K" caps the group at what the
// streams bring less K per atom of G2, never below zero: two chlorite take
// one hypochlorous acid (White's Handbook of Chlorination, chlorine–chlorite
// generation, from memory).
func TestSpentByRule(t *testing.T) {
	r, err := parseRule("no-gain {HOCl, Cl2} + spent by Cl(3) x 0.5")
	if err != nil {
		t.Fatal(err)
	}
	if r.SpentBy == nil || r.SpentBy.Element != "Cl" || r.Per != 0.5 {
		t.Fatalf("parsed %+v, want spent by Cl(3) at 0.5", r)
	}
	db := loadDB(t)
	var mx Mix
	for _, s := range []string{"HOCl", "Cl2", "ClO2-", "Cl-"} {
		sp, ok := db.Get(s)
		if !ok {
			t.Fatalf("%s: no species data", s)
		}
		mx.Species = append(mx.Species, sp)
	}
	for _, c := range []struct{ hocl, cl2, clo2, want float64 }{
		{20, 0, 27.5, 6.25}, // hypochlorite beyond half the chlorite is left
		{20, 1, 50, 0},      // chlorite enough for all of it: never below zero
		{5, 0, 0, 5},        // no chlorite: the plain no-gain cap
	} {
		got := ruleConstraint(&mx, "x#0", r, []float64{c.hocl, c.cl2, c.clo2, 10}).Bound
		if math.Abs(got-c.want) > 1e-9 {
			t.Errorf("HOCl %g, Cl2 %g, chlorite %g: bound %g, want %g", c.hocl, c.cl2, c.clo2, got, c.want)
		}
	}
	for _, bad := range []string{"no-loss {HOCl} + spent by Cl(3)", "no-gain {HOCl} + spent by Cl(3) x 0", "no-gain {HOCl} + spent by"} {
		if _, err := parseRule(bad); err == nil {
			t.Errorf("parseRule(%q): no error", bad)
		}
	}
}
