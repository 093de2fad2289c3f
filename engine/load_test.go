package engine

import (
	"bufio"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"sort"
	"strconv"
	"strings"
	"sync"
	"testing"
	"testing/fstest"

	"gonum.org/v1/gonum/unit/constant"
)

// dtDataDir is the repository's data directory, seen from this package.
const dtDataDir = "../data"

var dtLoadReal = sync.OnceValues(func() (*Tables, error) { return Load(os.DirFS(dtDataDir)) })

// dtReal loads the tables of data/ once for all tests.
func dtReal(t testing.TB) *Tables {
	t.Helper()
	tb, err := dtLoadReal()
	if err != nil {
		t.Fatalf("Load(data/): %v", err)
	}
	return tb
}

func TestLoadRealData(t *testing.T) {
	tb := dtReal(t)
	if n := len(tb.Chemicals); n < 160 {
		t.Errorf("%d chemicals, want at least 160", n)
	}
	if n := len(tb.Half); n < 130 {
		t.Errorf("%d half-reactions, want at least 130", n)
	}
	if n := len(tb.AcidBase); n < 30 {
		t.Errorf("%d acid–base pairs, want at least 30", n)
	}
	// Every element from hydrogen to bismuth, and uranium.
	for _, el := range strings.Fields(`H He Li Be B C N O F Ne Na Mg Al Si P S Cl Ar K Ca Sc Ti V Cr Mn Fe Co Ni Cu Zn
		Ga Ge As Se Br Kr Rb Sr Y Zr Nb Mo Tc Ru Rh Pd Ag Cd In Sn Sb Te I Xe Cs Ba La Ce Pr Nd Pm Sm Eu Gd Tb Dy Ho Er
		Tm Yb Lu Hf Ta W Re Os Ir Pt Au Hg Tl Pb Bi U`) {
		if tb.Atomic[el] <= 0 {
			t.Errorf("element %s has no atomic weight", el)
		}
	}
	for _, c := range tb.Chemicals {
		if c.MolarMass <= 0 || len(c.Names) == 0 || len(c.Gives) == 0 || c.Source == "" {
			t.Errorf("chemical %s is incomplete: %+v", c.Formula, c)
		}
	}
	for _, h := range tb.Half {
		if err := BalanceError(h.Reactants, h.Products, h.Electrons); err != nil {
			t.Errorf("half-reaction %s: %v", h.ID, err)
		}
		if !strings.Contains(h.Source, "from memory") && !strings.Contains(h.Source, "by definition") {
			t.Errorf("half-reaction %s: source %q does not say the value is recalled (\"from memory\")", h.ID, h.Source)
		}
	}
	for f, pts := range tb.Densities {
		if len(pts) == 1 && pts[0].PercentWW == 100 {
			continue // a liquid sold neat
		}
		if len(pts) < 5 || len(pts) > 12 {
			t.Errorf("density table of %s has %d rows, want 5 to 12", f, len(pts))
		}
	}
	for _, f := range []string{"HCl", "HNO3", "H2SO4", "NaOH", "KOH", "H2O2", "NH3", "NaOCl", "H3PO4", "CH3COOH", "HF", "FeCl3"} {
		if len(tb.Densities[f]) == 0 {
			t.Errorf("no density table for %s", f)
		}
	}
}

// TestSpellings checks that the tables use the agreed spelling of each
// species, so that the engine meets one species under one name.
func TestSpellings(t *testing.T) {
	tb := dtReal(t)
	used := map[string]bool{}
	for _, h := range tb.Half {
		for _, x := range append(append([]Term{}, h.Reactants...), h.Products...) {
			used[x.Text()] = true
		}
	}
	for _, c := range tb.Chemicals {
		for _, g := range c.Gives {
			used[g.Text()] = true
		}
	}
	for _, p := range tb.AcidBase {
		used[p.Acid.Text()], used[p.Base.Text()] = true, true
	}
	for _, s := range strings.Fields(`OCl- HOCl H2O(l) HSO4- SO4^2- Cr2O7^2- CrO4^2- S2O3^2- S4O6^2- HSO3- SO3^2- H2SO3
		CH3COOH CH3COO- NH4+ NH3 HCO3- CO3^2- H2CO3 H2PO4- HPO4^2- PO4^3- H3PO4 ClO2 ClO3- ClO4- NO3- NO2- HNO2
		NO(g) NO2(g) H2(g) O2(g) Cl2(g) Br2 I2(s) H+ OH-`) {
		if !used[s] {
			t.Errorf("species %s is used nowhere in the tables", s)
		}
	}
	for _, s := range []string{"ClO-", "HClO", "HOCl-", "SO2", "CH3CO2H", "H2CrO4", "NH4OH"} {
		if used[s] {
			t.Errorf("species %s is used; the tables spell it another way", s)
		}
	}
}

// TestCouplesPresent checks that the couples the engine relies on are in
// the table, each in the medium it is written for.
func TestCouplesPresent(t *testing.T) {
	tb := dtReal(t)
	byID := map[string]*HalfReaction{}
	for _, h := range tb.Half {
		byID[h.ID] = h
	}
	want := map[string]Medium{
		"h-h2": Acid, "h2o-h2": Base, "o2-h2o": Acid, "o2-oh": Base, "o2-h2o2": Acid, "h2o2-h2o": Acid, "ho2-oh": Base,
		"o3-o2": Acid, "hocl-cl": Acid, "hocl-cl2": Acid, "ocl-cl": Base, "cl2-cl": Any, "clo2-clo2m": Any,
		"clo3-cl": Acid, "clo4-cl": Acid, "br2-br": Any, "i2-i": Any, "f2-f": Any,
		"mno4-mn2": Acid, "mno4-mno2": Acid, "mno4-mno2-base": Base, "cr2o7-cr3": Acid, "cro4-croh3": Base,
		"no3-no": Acid, "no3-no2": Acid, "no3-hno2": Acid, "no3-nh4": Acid, "s2o8-so4": Any, "so4-h2so3": Acid,
		"so4-so3-base": Base, "s4o6-s2o3": Any, "s-h2s": Acid, "s-s2": Any, "fe3-fe2": Any, "fe2-fe": Any,
		"cu2-cu": Any, "cu2-cu1": Any, "zn2-zn": Any, "znoh4-zn": Base, "al3-al": Any, "aloh4-al": Base, "mg2-mg": Any,
		"ni2-ni": Any, "sn2-sn": Any, "sn4-sn2": Any, "pb2-pb": Any, "pbso4-pb": Any, "pbo2-pbso4": Acid,
		"ag1-ag": Any, "agcl-ag": Any, "au3-au": Any, "aucl4-au": Any, "pt2-pt": Any, "cr3-cr": Any, "cd2-cd": Any,
		"co2-co": Any, "mn2-mn": Any, "ti2-ti": Any, "paa-ch3cooh": Acid, "n2-n2h5": Acid, "co2-h2c2o4": Acid,
		"ocn-cn-base": Base, "aucn2-au": Any,
	}
	for id, m := range want {
		h, ok := byID[id]
		if !ok {
			t.Errorf("half-reaction %s is missing", id)
			continue
		}
		if h.Medium != m {
			t.Errorf("half-reaction %s has medium %s, want %s", id, h.Medium, m)
		}
	}
}

// TestHalfReactionsAcidBaseConsistent checks the table against itself: a couple
// written for acid and the same couple written for base differ by the
// Nernst term for 14 pH units, with the pKa of any species that changes form
// between them (E°b = E°a + s·(Σ pKa shifts)/n − s·14·h/n with
// s = RT ln10/F at 25 °C and h the H+ of the acid form once the species are in
// their base forms). Agreement within 35 mV is what the handbook values
// allow; the pairs that disagree more are noted in their source fields.
func TestHalfReactionsAcidBaseConsistent(t *testing.T) {
	tb := dtReal(t)
	rt := float64(constant.Boltzmann) * float64(constant.Avogadro) * 298.15
	s := rt * math.Ln10 / float64(constant.Faraday) // 0.05916 V
	e := map[string]float64{}
	for _, h := range tb.Half {
		e[h.ID] = h.E0
	}
	pka := map[string]float64{}
	for _, p := range tb.AcidBase {
		pka[p.Acid.Ion()] = p.PKa
	}
	tests := []struct {
		acid, base string
		n, h       float64 // electrons; H+ of the acid form written with the base species
		shift      float64 // Σ pKa: + for a reactant that gained H+ in the acid form, − for a product
	}{
		{"o2-h2o", "o2-oh", 4, 4, 0},
		{"h-h2", "h2o-h2", 2, 2, 0},
		{"mno4-mno2", "mno4-mno2-base", 3, 4, 0},
		{"hocl-cl", "ocl-cl", 2, 2, pka["HOCl"]},
		{"hocl-cl2", "ocl-cl2", 2, 4, 2 * pka["HOCl"]},
		{"h2o2-h2o", "ho2-oh", 2, 3, pka["H2O2"]},
		{"o2-h2o2", "o2-ho2", 2, 1, -pka["H2O2"]},
		{"hobr-br", "obr-br", 2, 2, pka["HOBr"]},
		{"clo3-cl", "clo3-cl-base", 6, 6, 0},
		{"clo3-hclo2", "clo3-clo2m-base", 2, 2, -pka["HClO2"]},
		{"hclo2-hocl", "clo2m-ocl", 2, 2, pka["HClO2"] - pka["HOCl"]},
		{"clo4-clo3", "clo4-clo3-base", 2, 2, 0},
		{"bro3-br", "bro3-br-base", 6, 6, 0},
		{"io3-i", "io3-i-base", 6, 6, 0},
		{"no3-hno2", "no3-no2m-base", 2, 2, -pka["HNO2"]},
		{"hno2-no", "no2m-no-base", 1, 2, pka["HNO2"]},
		{"n2-n2h5", "n2-n2h4-base", 4, 4, -pka["N2H5+"]},
		{"n2-nh4", "n2-nh3-base", 6, 6, -2 * pka["NH4+"]},
		{"so4-h2so3", "so4-so3-base", 2, 2, -(pka["H2SO3"] + pka["HSO3-"])},
		{"h2so3-s2o3", "so3-s2o3-base", 4, 6, 2 * (pka["H2SO3"] + pka["HSO3-"])},
		{"h2so3-s", "so3-s-base", 4, 6, pka["H2SO3"] + pka["HSO3-"]},
		{"s-h2s", "s-hs-base", 2, 1, -pka["H2S"]},
	}
	for _, tc := range tests {
		ea, ok1 := e[tc.acid]
		eb, ok2 := e[tc.base]
		if !ok1 || !ok2 {
			t.Errorf("%s or %s is missing", tc.acid, tc.base)
			continue
		}
		want := ea + s*tc.shift/tc.n - s*14*tc.h/tc.n
		if math.Abs(eb-want) > 0.035 {
			t.Errorf("%s = %.3f V, but %s (%.3f V) implies %.3f V in base", tc.base, eb, tc.acid, ea, want)
		}
	}
}

// TestMolarMassesAgainstPeriodictable compares every molar mass and atom
// count with testdata/periodictable/molar_masses.txt, which gen.py writes
// with the periodictable library.
func TestMolarMassesAgainstPeriodictable(t *testing.T) {
	tb := dtReal(t)
	path := filepath.Join("..", "testdata", "periodictable", "molar_masses.txt")
	f, err := os.Open(path)
	if err != nil {
		t.Fatalf("%v (run testdata/periodictable/gen.py)", err)
	}
	defer f.Close()
	type ref struct {
		mass  float64
		atoms string
	}
	refs := map[string]ref{}
	sc := bufio.NewScanner(f)
	header := ""
	for line := 1; sc.Scan(); line++ {
		text := sc.Text()
		if strings.HasPrefix(text, "#") {
			header += text + "\n"
			continue
		}
		fs := strings.Split(text, " | ")
		if len(fs) != 3 {
			t.Fatalf("%s:%d: %q is not `formula | mass | atoms`", path, line, text)
		}
		m, err := strconv.ParseFloat(fs[1], 64)
		if err != nil {
			t.Fatalf("%s:%d: %v", path, line, err)
		}
		refs[fs[0]] = ref{m, fs[2]}
	}
	if err := sc.Err(); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(header, "periodictable ") {
		t.Errorf("%s: the header does not name the library and its version:\n%s", path, header)
	}
	// Elements whose standard atomic weight CIAAW revised after the value
	// periodictable 1.6.0 carries: the library's value, the reason. The
	// reference masses are corrected by the difference before comparing.
	revised := map[string]struct {
		library float64
		why     string
	}{
		"Zn": {65.409, "periodictable keeps the IUPAC 2001 value; CIAAW revised zinc to 65.38 in 2007 (from memory)"},
	}
	for el, r := range revised {
		ref, ok := refs[el]
		if !ok {
			t.Errorf("%s is not a chemical of its own, so the revision of its weight (%s) cannot be checked", el, r.why)
			continue
		}
		if math.Abs(ref.mass-r.library) > 1e-4 {
			t.Errorf("periodictable now gives %s = %.4f, not %.4f; remove it from the revised list (%s)", el, ref.mass, r.library, r.why)
		}
	}
	for _, c := range tb.Chemicals {
		r, ok := refs[c.Formula]
		if !ok {
			t.Errorf("%s is missing from %s; run testdata/periodictable/gen.py", c.Formula, path)
			continue
		}
		delete(refs, c.Formula)
		a, _ := ParseFormula(c.Formula)
		if got := a.String(); got != r.atoms {
			t.Errorf("atoms of %s = %s, periodictable counts %s", c.Formula, got, r.atoms)
		}
		want := r.mass
		for el, rev := range revised {
			want += float64(a[el]) * (tb.Atomic[el] - rev.library)
		}
		if tol := math.Max(0.02, 1e-4*want); math.Abs(c.MolarMass-want) > tol {
			t.Errorf("molar mass of %s = %.4f g/mol, periodictable gives %.4f (tolerance %.4f)", c.Formula, c.MolarMass, want, tol)
		}
	}
	for f := range refs {
		t.Errorf("%s lists %s, which is not in data/chemicals.txt; run testdata/periodictable/gen.py", path, f)
	}
}

func TestHash(t *testing.T) {
	tb := dtReal(t)
	// The documented definition, computed independently.
	names, err := fs.Glob(os.DirFS(dtDataDir), "*.txt")
	if err != nil {
		t.Fatal(err)
	}
	sort.Strings(names)
	h := sha256.New()
	for _, n := range names {
		b, err := os.ReadFile(filepath.Join(dtDataDir, n))
		if err != nil {
			t.Fatal(err)
		}
		fmt.Fprintf(h, "%s\x00%d\x00%s", n, len(b), b)
	}
	if want := hex.EncodeToString(h.Sum(nil)); tb.Hash != want {
		t.Errorf("Hash = %s, want %s", tb.Hash, want)
	}

	base := dtTableFS()
	t1 := dtMustLoad(t, base)
	other := dtCloneFS(base)
	other["hazards.txt"] = &fstest.MapFile{Data: []byte("# another table\n")}
	t2 := dtMustLoad(t, other)
	notTable := dtCloneFS(base)
	notTable["README.md"] = &fstest.MapFile{Data: []byte("not a table\n")}
	t3 := dtMustLoad(t, notTable)
	edited := dtCloneFS(base)
	edited[ChemicalsFile] = &fstest.MapFile{Data: append(append([]byte{}, base[ChemicalsFile].Data...), "# comment\n"...)}
	t4 := dtMustLoad(t, edited)
	if len(t1.Hash) != 64 {
		t.Errorf("Hash %q is not 64 hex digits", t1.Hash)
	}
	if t1.Hash == t2.Hash {
		t.Error("adding another *.txt table did not change the hash")
	}
	if t1.Hash != t3.Hash {
		t.Error("adding a file that is not *.txt changed the hash")
	}
	if t1.Hash == t4.Hash {
		t.Error("editing chemicals.txt did not change the hash")
	}
	if again := dtMustLoad(t, base); again.Hash != t1.Hash {
		t.Error("the hash of the same files differs between loads")
	}
}

// dtTableFS is a small valid set of tables. Each file has one comment line
// before its rows, so the n-th row is on line n+1.
func dtTableFS() fstest.MapFS {
	files := map[string]string{
		ElementsFile: `# test elements
H | hydrogen | 1.008 | test
C | carbon | 12.011 | test
O | oxygen | 15.999 | test
Na | sodium | 22.990 | test
Cl | chlorine | 35.45 | test
Mn | manganese | 54.938 | test
Cu | copper | 63.546 | test
`,
		AcidBaseFile: `# test pairs
HOCl | OCl- | 7.53 | test
`,
		ChemicalsFile: `# test chemicals
NaOCl | soluble-salt | Na+ + OCl- | sodium hypochlorite; bleach | test
HCl | strong-acid | H+ + Cl- | hydrochloric acid; muriatic acid | test
HOCl | weak-acid | HOCl | hypochlorous acid | test
Cu | metal | Cu(s) | copper | test
`,
		HalfReactionsFile: `# test half-reactions
cu2-cu | any | Cu^2+ + 2 e- -> Cu(s) | 0.3419 | test
mno4-mn2 | acid | MnO4- + 8 H+ + 5 e- -> Mn^2+ + 4 H2O | 1.507 | test
o2-oh | base | O2(g) + 2 H2O + 4 e- -> 4 OH- | 0.401 | test
`,
		DensitiesFile: `# test densities
HCl | 10 | 1.0474 | test
HCl | 20 | 1.0980 | test
`,
	}
	m := fstest.MapFS{}
	for n, s := range files {
		m[n] = &fstest.MapFile{Data: []byte(s)}
	}
	return m
}

func dtCloneFS(m fstest.MapFS) fstest.MapFS {
	c := fstest.MapFS{}
	for n, f := range m {
		c[n] = &fstest.MapFile{Data: append([]byte{}, f.Data...)}
	}
	return c
}

func dtMustLoad(t *testing.T, fsys fs.FS) *Tables {
	t.Helper()
	tb, err := Load(fsys)
	if err != nil {
		t.Fatalf("Load: %v", err)
	}
	return tb
}

// dtRowLine is the line number a row appended to file of dtTableFS gets.
func dtRowLine(m fstest.MapFS, file string) int {
	return strings.Count(string(m[file].Data), "\n") + 1
}

func TestLoadSmallTables(t *testing.T) {
	tb := dtMustLoad(t, dtTableFS())
	if len(tb.Chemicals) != 4 || len(tb.Half) != 3 || len(tb.AcidBase) != 1 || len(tb.Atomic) != 7 || len(tb.Densities["HCl"]) != 2 {
		t.Fatalf("loaded %d chemicals, %d half-reactions, %d pairs, %d elements, %d HCl densities; want 4, 3, 1, 7, 2",
			len(tb.Chemicals), len(tb.Half), len(tb.AcidBase), len(tb.Atomic), len(tb.Densities["HCl"]))
	}
	h := tb.Half[1]
	if h.ID != "mno4-mn2" || h.Electrons != 5 || h.E0 != 1.507 || h.Medium != Acid || len(h.Reactants) != 2 || len(h.Products) != 2 {
		t.Errorf("mno4-mn2 read as %+v", h)
	}
	if h.Reactants[1].Species != (Species{Formula: "H", Charge: 1, Phase: Aqueous}) || h.Reactants[1].Coef != 8 {
		t.Errorf("second reactant of mno4-mn2 = %+v, want 8 H+", h.Reactants[1])
	}
	if h.Products[1].Species != (Species{Formula: "H2O", Charge: 0, Phase: Liquid}) || h.Products[1].Coef != 4 {
		t.Errorf("second product of mno4-mn2 = %+v, want 4 H2O(l)", h.Products[1])
	}
	c := tb.Chemicals[0]
	if c.Formula != "NaOCl" || c.Class != SolubleSalt || len(c.Names) != 2 || c.Names[1] != "bleach" || len(c.Gives) != 2 {
		t.Errorf("NaOCl read as %+v", c)
	}
	// NaOCl: 22.990 + 15.999 + 35.45 (the weights of the test table).
	if want := 74.439; math.Abs(c.MolarMass-want) > 1e-9 {
		t.Errorf("molar mass of NaOCl = %.6f, want %.6f", c.MolarMass, want)
	}
	p := tb.AcidBase[0]
	if p.Acid != (Species{Formula: "HOCl", Charge: 0, Phase: Aqueous}) || p.Base != (Species{Formula: "OCl", Charge: -1, Phase: Aqueous}) || p.PKa != 7.53 {
		t.Errorf("HOCl pair read as %+v", p)
	}
}

func TestLoadAcceptsWaterAndIsomers(t *testing.T) {
	m := dtTableFS()
	m[ChemicalsFile].Data = append(m[ChemicalsFile].Data, `Na2O | strong-base | 2 Na+ + 2 OH- | sodium oxide | takes up one H2O
CuCl2.2H2O | soluble-salt | Cu^2+ + 2 Cl- | copper(ii) chloride dihydrate | gives off two H2O
C2H5OH | molecular | C2H5OH | ethanol | isomer of dimethyl ether
CH3OCH3 | molecular | CH3OCH3 | dimethyl ether | isomer of ethanol
`...)
	m[AcidBaseFile].Data = append(m[AcidBaseFile].Data, "Cu^2+ | CuOH+ | 8.0 | hydrolysis: the base carries one H2O more\n"...)
	tb := dtMustLoad(t, m)
	if len(tb.Chemicals) != 8 || len(tb.AcidBase) != 2 {
		t.Errorf("%d chemicals and %d acid–base pairs, want 8 and 2", len(tb.Chemicals), len(tb.AcidBase))
	}
}

// TestLoadRejects feeds the loader one bad row at a time and checks that the
// error names the file, the line and what is wrong.
func TestLoadRejects(t *testing.T) {
	tests := []struct {
		name string
		file string
		row  string // appended to the file
		want string
	}{
		{"unbalanced atoms", HalfReactionsFile, "bad | acid | MnO4- + 8 H+ + 5 e- -> Mn^2+ + 3 H2O | 1.5 | test", "atoms do not balance (H: left 8, right 6; O: left 4, right 3)"},
		{"unbalanced charge", HalfReactionsFile, "bad | acid | MnO4- + 8 H+ + 4 e- -> Mn^2+ + 4 H2O | 1.5 | test", "charge does not balance (left +3, right +2); fix the electrons or the charges"},
		{"duplicate id", HalfReactionsFile, "cu2-cu | any | Cu+ + e- -> Cu(s) | 0.521 | test", `id "cu2-cu": is already used at line 2`},
		{"duplicate reduction", HalfReactionsFile, "copper | any | Cu^2+ + 2 e- -> Cu(s) | 0.34 | test", "is the same reduction as cu2-cu"},
		{"unknown element in reduction", HalfReactionsFile, "zn2-zn | any | Zn^2+ + 2 e- -> Zn(s) | -0.76 | test", `element "Zn" is not in data/elements.txt`},
		{"acid with OH-", HalfReactionsFile, "o2-oh-2 | acid | O2(g) + 2 H2O + 4 e- -> 4 OH- | 0.4 | test", "an acid half-reaction cannot contain OH-"},
		{"base with H+", HalfReactionsFile, "mno4-b | base | MnO4- + 8 H+ + 5 e- -> Mn^2+ + 4 H2O | 1.5 | test", "a base half-reaction cannot contain H+"},
		{"base without OH-", HalfReactionsFile, "cu1-cu | base | Cu+ + e- -> Cu(s) | 0.521 | test", "mark it any"},
		{"any with H+", HalfReactionsFile, "h-h2 | any | 2 H+ + 2 e- -> H2(g) | 0 | test", "mark it acid or base"},
		{"unknown medium", HalfReactionsFile, "cu1-cu | neutral | Cu+ + e- -> Cu(s) | 0.521 | test", "use acid, base or any"},
		{"bad number", HalfReactionsFile, "cu1-cu | any | Cu+ + e- -> Cu(s) | 0.52V | test", `E° "0.52V": is not a number`},
		{"NaN", HalfReactionsFile, "cu1-cu | any | Cu+ + e- -> Cu(s) | NaN | test", "is not a number"},
		{"E° out of range", HalfReactionsFile, "cu1-cu | any | Cu+ + e- -> Cu(s) | 5.21 | test", "outside"},
		{"electrons on the right", HalfReactionsFile, "cu-cu2 | any | Cu(s) -> Cu^2+ + 2 e- | -0.34 | test", "electrons on the left"},
		{"no arrow", HalfReactionsFile, "cu1-cu | any | Cu+ + e- = Cu(s) | 0.52 | test", `exactly one "->"`},
		{"bad coefficient", HalfReactionsFile, "cu1-cu | any | Cu+ + 1.5 e- -> Cu(s) | 0.52 | test", "must be a whole number"},
		{"bad species", HalfReactionsFile, "cu1-cu | any | Cu^+ + e- -> Cu(s) | 0.52 | test", "digits and a sign"},
		{"twice on one side", HalfReactionsFile, "cu1-cu | any | Cu+ + Cu+ + 2 e- -> 2 Cu(s) | 0.52 | test", "appears twice on one side"},
		{"bad id", HalfReactionsFile, "Cu1_Cu | any | Cu+ + e- -> Cu(s) | 0.52 | test", "lower-case letters"},
		{"unknown element in formula", ChemicalsFile, "Xq2O | molecular | Xq2O | xq oxide | test", `formula "Xq2O": element "Xq" is not in data/elements.txt`},
		{"bad formula", ChemicalsFile, "NaCL | soluble-salt | Na+ + Cl- | table salt | test", `element "L" is not`},
		{"unparsable formula", ChemicalsFile, "Na(Cl | soluble-salt | Na+ + Cl- | table salt | test", `formula "Na(Cl": formula "Na(Cl": missing`},
		{"dissolved metal atom", HalfReactionsFile, "cu1-cu | any | Cu+ + e- -> Cu | 0.521 | test", "write its phase, like Cu(s)"},
		{"gives loses atoms", ChemicalsFile, "NaCl | soluble-salt | Na+ + OCl- | salt | test", "does not conserve the atoms of NaCl (formula less gives: O -1)"},
		{"gives not whole water", ChemicalsFile, "NaOOCl | soluble-salt | Na+ + OCl- | salt | test", "does not conserve"},
		{"gives charged", ChemicalsFile, "CuCl2 | soluble-salt | Cu^2+ + Cl2 | copper chloride | test", "is not neutral (charge +2)"},
		{"gives with electrons", ChemicalsFile, "CuCl2 | soluble-salt | Cu^2+ + 2 Cl- + e- | copper chloride | test", "without electrons"},
		{"unknown class", ChemicalsFile, "NaCl | salt | Na+ + Cl- | salt | test", "is not a class"},
		{"duplicate name", ChemicalsFile, "NaCl | soluble-salt | Na+ + Cl- | salt; bleach | test", `names "bleach": is already a name of NaOCl`},
		{"duplicate formula", ChemicalsFile, "HCl | strong-acid | H+ + Cl- | spirit of salt | test", "is already listed at line 3"},
		{"upper-case name", ChemicalsFile, "NaCl | soluble-salt | Na+ + Cl- | Table  Salt | test", `write names in lower case with single spaces: "table salt"`},
		{"empty name", ChemicalsFile, "NaCl | soluble-salt | Na+ + Cl- | salt;; halite | test", "empty name"},
		{"strong acid without H+", ChemicalsFile, "NaCl | strong-acid | Na+ + Cl- | salt | test", "a strong acid gives H+"},
		{"strong base without OH-", ChemicalsFile, "NaCl | strong-base | Na+ + Cl- | salt | test", "a strong base gives OH-"},
		{"weak acid without pKa", ChemicalsFile, "H2O2 | weak-acid | H2O2 | peroxide | test", "must be an acid of data/acidbase.txt"},
		{"weak base without pKa", ChemicalsFile, "NaCl.H2O | weak-base | Na+ + Cl- | wet salt | test", "must be a base of data/acidbase.txt"},
		{"metal dissolved", ChemicalsFile, "Mn | metal | Mn(g) | manganese | test", "a metal stays as itself"},
		{"sparingly soluble as ions", ChemicalsFile, "CuCl | sparingly-soluble-salt | Cu+ + Cl- | cuprous chloride | test", "stays as one solid"},
		{"second spelling", ChemicalsFile, "NaClO | soluble-salt | Na+ + ClO- | sodium hypochlorite solid | test", "has the same atoms and charge as"},
		{"second spelling in pairs", AcidBaseFile, "HClO2 | ClO2- | 1.96 | test\nHOClO | OClO- | 2 | test", "has the same atoms and charge as HClO2"},
		{"pair differs by more than H+", AcidBaseFile, "HCl | Cl2 | 1 | test", "must be HCl less one H+"},
		{"pair differs in charge", AcidBaseFile, "HClO4 | ClO4 | 1 | test", "(atoms differ by H +1, charge by +0)"},
		{"hydrolysis pair with a wrong charge", AcidBaseFile, "Cu^2+ | CuOH^2+ | 8 | test", "(atoms differ by H -1, O -1, charge by +0)"},
		{"hydrolysis pair with two waters", AcidBaseFile, "Cu^2+ | Cu(OH)2 | 8 | test", "must be Cu^2+ less one H+"},
		{"pKa out of range", AcidBaseFile, "HCl | Cl- | -9 | test", "outside"},
		{"pKa not a number", AcidBaseFile, "HCl | Cl- | strong | test", `pKa "strong": is not a number`},
		{"duplicate pair", AcidBaseFile, "HOCl | OCl- | 7.5 | test", "already listed at line 2"},
		{"pair with a solid", AcidBaseFile, "HCl | Cl-(s) | 1 | test", "dissolved species"},
		{"density not rising", DensitiesFile, "HCl | 15 | 1.0726 | test", "must rise in % w/w"},
		{"density jumps", DensitiesFile, "HCl | 30 | 1.6 | test", "jumps by"},
		{"density of unknown chemical", DensitiesFile, "NaOH | 10 | 1.1089 | test", "is not a chemical of data/chemicals.txt"},
		{"density out of range", DensitiesFile, "HCl | 30 | 3.1 | test", "must lie between"},
		{"percent out of range", DensitiesFile, "HCl | 120 | 1.2 | test", "at most 100"},
		{"one density row", DensitiesFile, "NaOCl | 12.5 | 1.18 | test", "has one density row"},
		{"density not a number", DensitiesFile, "HCl | 30 | heavy | test", "is not a number"},
		{"too few fields", ElementsFile, "Fe | iron | 55.845", "has 3 fields but this table has 4"},
		{"empty field", ElementsFile, "Fe | iron |  | test", "field 3: is empty"},
		{"duplicate element", ElementsFile, "H | protium | 1.008 | test", "is listed twice"},
		{"bad element symbol", ElementsFile, "fe | iron | 55.845 | test", "is not an element symbol"},
		{"element weight", ElementsFile, "Fe | iron | -55.845 | test", "between 0 and 300"},
		{"duplicate element name", ElementsFile, "Fe | copper | 55.845 | test", "is already used by the element at line 8"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			m := dtTableFS()
			line := dtRowLine(m, tc.file)
			m[tc.file].Data = append(m[tc.file].Data, tc.row+"\n"...)
			if strings.Contains(tc.row, "\n") {
				line++ // the second row is the bad one
			}
			_, err := Load(m)
			if err == nil {
				t.Fatalf("Load accepted %q in %s", tc.row, tc.file)
			}
			where := fmt.Sprintf("data/%s:%d: ", tc.file, line)
			if !strings.Contains(err.Error(), where) || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("Load error = %q\nwant it to contain %q and %q", err, where, tc.want)
			}
			var te *TableError
			if !errors.As(err, &te) {
				t.Errorf("error %v is not a *TableError", err)
			}
		})
	}
}

func TestLoadReportsEveryBadRow(t *testing.T) {
	m := dtTableFS()
	m[HalfReactionsFile].Data = append(m[HalfReactionsFile].Data, "bad1 | any | Cu^2+ + e- -> Cu(s) | 0.34 | test\nbad2 | any | Cu+ + e- -> Cu(s) | +-0.52 | test\n"...)
	m[ChemicalsFile].Data = append(m[ChemicalsFile].Data, "NaCl | salt | Na+ + Cl- | salt | test\n"...)
	_, err := Load(m)
	if err == nil {
		t.Fatal("Load accepted three bad rows")
	}
	var joined interface{ Unwrap() []error }
	if !errors.As(err, &joined) || len(joined.Unwrap()) != 3 {
		t.Fatalf("want three joined errors, got %q", err)
	}
	for _, want := range []string{"data/halfreactions.txt:5:", "data/halfreactions.txt:6:", "data/chemicals.txt:6:"} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("error %q does not mention %s", err, want)
		}
	}
}

func TestLoadMissingOrEmptyFiles(t *testing.T) {
	m := dtTableFS()
	delete(m, DensitiesFile)
	if _, err := Load(m); err == nil || !strings.Contains(err.Error(), "data/densities.txt: cannot read the table") {
		t.Errorf("without densities.txt: error = %v", err)
	}
	m = dtTableFS()
	delete(m, ElementsFile)
	if _, err := Load(m); err == nil || !strings.Contains(err.Error(), "data/elements.txt: cannot read the table") || strings.Contains(err.Error(), "chemicals.txt") {
		t.Errorf("without elements.txt: error = %v; want only that file named", err)
	}
	m = dtTableFS()
	m[ElementsFile].Data = []byte("# nothing here\n\n")
	if _, err := Load(m); err == nil || !strings.Contains(err.Error(), "data/elements.txt: the table has no rows") {
		t.Errorf("with an empty elements.txt: error = %v", err)
	}
	m = dtTableFS()
	m[ChemicalsFile].Data = []byte("\ufeff# with a byte-order mark and Windows line ends\r\nHCl | strong-acid | H+ + Cl- | hydrochloric acid | test\r\n")
	if _, err := Load(m); err != nil {
		t.Errorf("a table with a BOM and CRLF line ends: %v", err)
	}
}

func TestBalanceError(t *testing.T) {
	sp := func(s string) Species {
		x, err := ParseSpecies(s)
		if err != nil {
			t.Fatal(err)
		}
		return x
	}
	term := func(n int, s string) Term { return Term{Species: sp(s), Coef: n} }
	tests := []struct {
		name       string
		reactants  []Term
		products   []Term
		electrons  int
		wantErrSub string
	}{
		{"permanganate", []Term{term(1, "MnO4-"), term(8, "H+")}, []Term{term(1, "Mn^2+"), term(4, "H2O")}, 5, ""},
		{"net equation, no electrons",
			[]Term{term(2, "MnO4-"), term(16, "H+"), term(10, "Cl-")},
			[]Term{term(2, "Mn^2+"), term(5, "Cl2(g)"), term(8, "H2O")}, 0, ""},
		{"electrons on the product side", []Term{term(1, "Cu(s)")}, []Term{term(1, "Cu^2+")}, -2, ""},
		{"electrons as a term", []Term{term(1, "Fe^3+"), term(1, "e-")}, []Term{term(1, "Fe^2+")}, 0, ""},
		{"atoms", []Term{term(1, "MnO4-"), term(8, "H+")}, []Term{term(1, "Mn^2+"), term(3, "H2O")}, 5, "atoms do not balance (H: left 8, right 6; O: left 4, right 3)"},
		{"charge", []Term{term(1, "MnO4-"), term(8, "H+")}, []Term{term(1, "Mn^2+"), term(4, "H2O")}, 4, "charge does not balance (left +3, right +2)"},
		{"element only on one side", []Term{term(1, "Cu^2+")}, []Term{term(1, "Zn(s)")}, 2, "Cu: left 1, right 0; Zn: left 0, right 1"},
		{"zero coefficient", []Term{term(0, "Cu^2+")}, []Term{term(1, "Cu(s)")}, 2, "coefficients must be positive"},
		{"bad formula", []Term{{Species: Species{Formula: "Cu(", Charge: 2}, Coef: 1}}, []Term{term(1, "Cu(s)")}, 2, "missing"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			err := BalanceError(tc.reactants, tc.products, tc.electrons)
			if tc.wantErrSub == "" {
				if err != nil {
					t.Fatalf("BalanceError = %v, want nil", err)
				}
				return
			}
			if err == nil || !strings.Contains(err.Error(), tc.wantErrSub) {
				t.Fatalf("BalanceError = %v, want an error containing %q", err, tc.wantErrSub)
			}
			if strings.Contains(tc.wantErrSub, "balance") && !errors.Is(err, ErrUnbalanced) {
				t.Errorf("error %v does not wrap ErrUnbalanced", err)
			}
		})
	}
}

func BenchmarkLoad(b *testing.B) {
	fsys := os.DirFS(dtDataDir)
	for b.Loop() {
		if _, err := Load(fsys); err != nil {
			b.Fatal(err)
		}
	}
}

// FuzzLoadTables appends one arbitrary row to one table of the small test set: the
// loader must never panic, and a row it accepts must not lose the others.
func FuzzLoadTables(f *testing.F) {
	files := []string{ElementsFile, ChemicalsFile, HalfReactionsFile, AcidBaseFile, DensitiesFile}
	f.Add(uint8(1), "NaCl | soluble-salt | Na+ + Cl- | salt | test")
	f.Add(uint8(2), "cu1-cu | any | Cu+ + e- -> Cu(s) | 0.521 | test")
	f.Add(uint8(2), "x | acid | MnO4- + 8 H+ + 5 e- -> Mn^2+ + 4 H2O(aq) | 1 | t")
	f.Add(uint8(3), "HCl | Cl- | -3 | test")
	f.Add(uint8(4), "HCl | 25 | 1.1239 | test")
	f.Add(uint8(0), "Fe | iron | 55.845 | test")
	f.Add(uint8(1), "((( | | | |")
	f.Fuzz(func(t *testing.T, which uint8, row string) {
		m := dtTableFS()
		file := files[int(which)%len(files)]
		m[file].Data = append(m[file].Data, row+"\n"...)
		tb, err := Load(m)
		if err != nil {
			return
		}
		if len(tb.Chemicals) < 4 || len(tb.Half) < 3 || len(tb.AcidBase) < 1 || len(tb.Atomic) < 7 {
			t.Fatalf("accepting %q in %s lost rows: %d chemicals, %d half-reactions", row, file, len(tb.Chemicals), len(tb.Half))
		}
		for _, h := range tb.Half {
			if err := BalanceError(h.Reactants, h.Products, h.Electrons); err != nil {
				t.Fatalf("accepted %q, but %s does not balance: %v", row, h.ID, err)
			}
		}
		// What Load accepts, the parse-only loader of New reads the same.
		fast, err := loadFast(m)
		if err != nil || !reflect.DeepEqual(fast, tb) {
			t.Fatalf("Load accepted %q in %s, but loadFast differs (error %v)", row, file, err)
		}
	})
}
