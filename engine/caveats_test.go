package engine

import (
	"reflect"
	"strings"
	"testing"
)

func cvPresent(t *testing.T, molar float64, texts ...string) []SpeciesAmount {
	t.Helper()
	out := hzPresent(t, texts...)
	for i := range out {
		out[i].Molar = molar
	}
	return out
}

func cvN(n int) *int { return &n }

func TestCaveats(t *testing.T) {
	o2FromWater := hzEq(t, "2 Cl2|2 H2O(l)", "4 Cl-|4 H+|1 O2(g)")
	tests := []struct {
		name   string
		in     CaveatInput
		want   []string // substrings, each in some caveat
		absent []string // substrings in no caveat
		count  *int     // expected number of caveats, nil to skip the check
	}{
		{name: "nothing to say", in: CaveatInput{PH: 7}, count: cvN(0)},
		{
			name:  "near-zero cell potential",
			in:    CaveatInput{ECell: 0.04, HasECell: true, PH: 7},
			want:  []string{"+0.04 V", "verdict is uncertain"},
			count: cvN(1),
		},
		{
			name:  "negative near-zero cell potential",
			in:    CaveatInput{ECell: -0.09, HasECell: true},
			want:  []string{"-0.09 V", "uncertain"},
			count: cvN(1),
		},
		{name: "clear verdict", in: CaveatInput{ECell: 0.35, HasECell: true}, count: cvN(0)},
		{name: "no cell potential", in: CaveatInput{ECell: 0, HasECell: false}, count: cvN(0)},
		{
			name: "oxygen from water with chloride present",
			in: CaveatInput{Oxidizer: &Couple{Species: "Cl2"}, Reducer: &Couple{Species: "H2O(l)"}, Reaction: o2FromWater,
				Present: cvPresent(t, 1, "Cl2", "Cl-", "H2O(l)"), ECell: 0.2, HasECell: true, PH: 1},
			want: []string{"overpotential", "chloride in the mix is oxidised first"},
		},
		{
			name: "oxygen from water without halide",
			in: CaveatInput{Oxidizer: &Couple{Species: "F2(g)"}, Reducer: &Couple{Species: "H2O(l)"}, Reaction: hzEq(t, "2 F2(g)|2 H2O(l)", "4 F-|4 H+|1 O2(g)"),
				ECell: 1.6, HasECell: true, PH: 1},
			want:   []string{"overpotential", "little or no gas"},
			absent: []string{"chloride"},
		},
		{
			name: "hydrogen from neutral water",
			in: CaveatInput{Oxidizer: &Couple{Species: "H2O(l)"}, Reducer: &Couple{Species: "Fe(s)"},
				Reaction: hzEq(t, "1 Fe(s)|2 H2O(l)", "1 Fe^2+|2 OH-|1 H2(g)"), ECell: 0.03, HasECell: true, PH: 7},
			want: []string{"corrosion over days", "pH 7.0", "uncertain"},
		},
		{
			name: "aluminium in nitric acid passivates",
			in: CaveatInput{Oxidizer: &Couple{Species: "NO3-"}, Reducer: &Couple{Species: "Al(s)"}, Chemicals: []string{"HNO3", "Al"},
				Present: cvPresent(t, 12, "NO3-", "H+", "Al(s)"), Reaction: hzEq(t, "1 Al(s)|3 NO3-|6 H+", "1 Al^3+|3 NO2(g)|3 H2O(l)"),
				ECell: 2.5, HasECell: true, PH: -1},
			want: []string{"Passivation: aluminium in nitric acid", "stainless steel", "mainly NO2", "The equation shown gives NO2."},
		},
		{
			name: "iron in chromic acid passivates",
			in: CaveatInput{Present: append(cvPresent(t, 0.5, "Cr2O7^2-", "H+"), SpeciesAmount{Species: hzSpecies(t, "Fe(s)"), Mol: 3}),
				Oxidizer: &Couple{Species: "Cr2O7^2-"}, Reducer: &Couple{Species: "Fe(s)"}, ECell: 1.6, HasECell: true, PH: 0.5},
			want: []string{"Passivation: iron in chromic acid"},
		},
		{
			name: "concentrated sulfuric acid with copper",
			in: CaveatInput{Present: append(cvPresent(t, 18, "HSO4-", "H+"), SpeciesAmount{Species: hzSpecies(t, "Cu(s)"), Mol: 1}),
				ECell: -0.34, HasECell: true, PH: -1},
			want:   []string{"Concentrated sulfuric acid, when hot, oxidises metals such as copper"},
			absent: []string{"Passivation"},
		},
		{
			name: "dilute nitric acid gives NO",
			in: CaveatInput{Oxidizer: &Couple{Species: "NO3-"}, Reducer: &Couple{Species: "Cu(s)"}, Present: cvPresent(t, 2, "NO3-", "H+"),
				Reaction: hzEq(t, "3 Cu(s)|2 NO3-|8 H+", "3 Cu^2+|2 NO(g)|4 H2O(l)"), ECell: 0.62, HasECell: true, PH: 0},
			want:   []string{"Here nitrate is about 2 M, where NO is expected.", "The equation shown gives NO."},
			absent: []string{"Passivation", "slowly outside acid"},
		},
		{
			name:  "nitrate in neutral water",
			in:    CaveatInput{Oxidizer: &Couple{Species: "NO3-"}, Present: cvPresent(t, 0.1, "NO3-"), ECell: 0.5, HasECell: true, PH: 7},
			want:  []string{"Nitrate oxidises slowly outside acid", "NO, with some N2O or ammonium"},
			count: cvN(2),
		},
		{
			name: "sulfate as the oxidizer",
			in:   CaveatInput{Oxidizer: &Couple{Species: "SO4^2-"}, Reducer: &Couple{Species: "Zn(s)"}, ECell: 0.9, HasECell: true, PH: 1},
			want: []string{"Sulfate oxidises metals only in hot, concentrated sulfuric acid"},
		},
		{
			name:  "perchlorate",
			in:    CaveatInput{Oxidizer: &Couple{Species: "ClO4-"}, ECell: 0.8, HasECell: true, PH: 1},
			want:  []string{"Perchlorate is kinetically inert"},
			count: cvN(1),
		},
		{
			name: "gold with chloride and an oxidizer",
			in: CaveatInput{Oxidizer: &Couple{Species: "NO3-"}, Reducer: &Couple{Species: "Au(s)"}, Present: cvPresent(t, 3, "NO3-", "Cl-", "H+", "Au(s)"),
				ECell: -0.2, HasECell: true, PH: -0.5},
			want: []string{"gold dissolves only with a complexing ligand, here chloride with a strong oxidizer"},
		},
		{
			name:   "gold without a ligand",
			in:     CaveatInput{Present: cvPresent(t, 1, "H+", "SO4^2-", "Au(s)"), PH: 0},
			want:   []string{"none is present, so expect no attack"},
			absent: []string{"here chloride"},
			count:  cvN(1),
		},
		{
			name: "copper with ammonia",
			in:   CaveatInput{Present: cvPresent(t, 1, "NH3", "NH4+", "Cu(s)", "O2"), PH: 10},
			want: []string{"ammonia bind copper ions strongly"},
		},
		{
			name: "silver with cyanide",
			in:   CaveatInput{Present: cvPresent(t, 0.1, "CN-", "Ag(s)"), PH: 11},
			want: []string{"cyanide bind silver ions strongly"},
		},
		{
			name: "dichromate close to zero",
			in:   CaveatInput{Oxidizer: &Couple{Species: "Cr2O7^2-"}, ECell: 0.12, HasECell: true, PH: 1},
			want: []string{"1.232 V", "1.33 V"},
		},
		{
			name: "close alternative",
			in: CaveatInput{ECell: 0.5, HasECell: true, Alternatives: []Alternative{
				{Oxidizer: &Couple{Species: "OCl-"}, Reducer: &Couple{Species: "Cl-"}, ECell: 0.45},
				{Oxidizer: &Couple{Species: "OCl-"}, Reducer: &Couple{Species: "H2O(l)"}, ECell: 0.2},
			}},
			want:   []string{"OCl- with Cl- (+0.45 V)", "products can be a mixture"},
			absent: []string{"H2O(l) ("},
		},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := Caveats(tc.in)
			all := strings.Join(got, "\n")
			for _, w := range tc.want {
				if !strings.Contains(all, w) {
					t.Errorf("no caveat contains %q; got:\n%s", w, all)
				}
			}
			for _, a := range tc.absent {
				if strings.Contains(all, a) {
					t.Errorf("a caveat contains %q; got:\n%s", a, all)
				}
			}
			if tc.count != nil && len(got) != *tc.count {
				t.Errorf("got %d caveats, want %d:\n%s", len(got), *tc.count, all)
			}
			if !reflect.DeepEqual(got, Caveats(tc.in)) {
				t.Errorf("Caveats is not deterministic")
			}
		})
	}
}

func TestCaveatsOrder(t *testing.T) {
	in := CaveatInput{
		Oxidizer: &Couple{Species: "NO3-"}, Reducer: &Couple{Species: "Al(s)"},
		Present: cvPresent(t, 10, "NO3-", "H+", "Al(s)", "Au(s)"), ECell: 0.05, HasECell: true, PH: 0,
	}
	got := Caveats(in)
	order := []string{"uncertain", "Passivation", "Nitrate gives", "Complex formation: gold"}
	last := -1
	for _, w := range order {
		idx := -1
		for i, c := range got {
			if strings.Contains(c, w) {
				idx = i
				break
			}
		}
		if idx < 0 {
			t.Fatalf("no caveat contains %q:\n%s", w, strings.Join(got, "\n"))
		}
		if idx <= last {
			t.Errorf("caveat %q out of order:\n%s", w, strings.Join(got, "\n"))
		}
		last = idx
	}
}
