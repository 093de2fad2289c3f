package hazard

import (
	"math"
	"strings"
	"testing"

	"mixward/data"
	"mixward/engine"
	"mixward/engine/thermo"
)

// TestFamilyHeatsAgainstSpeciesData checks data/familyheats.txt: every
// family rule that counts heat has a row; where the species data give the
// reaction enthalpy, a stated number agrees with it within 5 kJ/mol; the
// numbers the hazard messages quote (Go constants from NBS Tables 1982,
// from memory) agree with the rows; and Thornton's rule for chromic acid
// with ethanol is within 15 % of the ΔfH° route through the species data.
func TestFamilyHeatsAgainstSpeciesData(t *testing.T) {
	d, err := Load(data.FS)
	if err != nil {
		t.Fatal(err)
	}
	db, err := thermo.Load(data.FS)
	if err != nil {
		t.Fatal(err)
	}
	if err := d.UseSpecies(db); err != nil {
		t.Fatal(err)
	}
	for _, code := range []string{"formaldehyde-caustic-heat", "formaldehyde-ammonia-heat", "formaldehyde-oxidation",
		"chloroform-formation", "nitric-organic-runaway", "alkaline-peroxide", "oxidizer-organic-fire",
		// a family's own rows for one reagent, computed from the species data
		"nitric-organic-runaway:formic", "nitric-organic-runaway:methanol"} {
		fh, ok := d.Families[code]
		if !ok {
			t.Errorf("%s: no row in %s", code, FamilyHeatFile)
			continue
		}
		if strings.Contains(code, ":") && !fh.FromSpecies {
			t.Errorf("%s: not computed from the species data (%q)", code, fh.Reaction)
		}
		if fh.FromSpecies && !math.IsNaN(fh.Stated) && math.Abs(fh.Stated-fh.DeltaH) > 5 {
			t.Errorf("%s: stated %.1f kJ/mol, species data %.1f", code, fh.Stated, fh.DeltaH)
		}
	}
	// The oxidizing agents' reductions (oxidizerKJPerElectron) are
	// half-reactions computed from the species data; the stated numbers
	// are the hand values.
	for code, fh := range d.Families {
		if !strings.HasPrefix(code, "oxidizer-organic-fire:") {
			continue
		}
		if !fh.FromSpecies || fh.Electrons <= 0 {
			t.Errorf("%s: not a half-reaction the species data give (%q)", code, fh.Reaction)
		}
		if !math.IsNaN(fh.Stated) && math.Abs(fh.Stated-fh.DeltaH) > 5 {
			t.Errorf("%s: stated %.1f kJ/mol, species data %.1f", code, fh.Stated, fh.DeltaH)
		}
	}
	quoted := []struct {
		code string
		dH   float64
	}{
		{"formaldehyde-caustic-heat", -2 * cannizzaroKJ},
		{"formaldehyde-oxidation", -formaldehydeOCl},
		{"chloroform-formation", -3 * haloformKJ},
		{"oxidizer-organic-fire", -ThorntonKJPerElectron},
	}
	for _, q := range quoted {
		if fh := d.Families[q.code]; fh == nil || math.Abs(fh.DeltaH-q.dH) > 1 {
			t.Errorf("%s: row %+v, the message quotes %.1f kJ/mol", q.code, fh, q.dH)
		}
	}
	r, err := thermo.ParseReaction(db, "4 HCrO4- + 3 C2H5OH + 4 H+ -> 4 Cr(OH)3(s) + 3 CH3COOH + H2O")
	if err != nil {
		t.Fatal(err)
	}
	dh, ok := r.DeltaH()
	if !ok {
		t.Fatal("no ΔfH° for the chromic acid with ethanol reaction")
	}
	perEthanol, thornton := -dh/3, 4*ThorntonKJPerElectron
	if math.Abs(perEthanol-thornton)/perEthanol > 0.15 {
		t.Errorf("Cr(VI) with ethanol: %.0f kJ per ethanol from species data, Thornton's rule %.0f", perEthanol, thornton)
	}
}

// TestFamilyHeatRowsRejected: bad rows of the table say what is wrong.
func TestFamilyHeatRowsRejected(t *testing.T) {
	cases := []struct{ row, want string }{
		{"formaldehyde-oxidation | HCHO -> HCOOH | -391.5", "4 fields"},
		{"no-such-code | HCHO -> HCOOH | -1 | x", "not a hazard code"},
		{"no-such-code:formic | HCHO -> HCOOH | -1 | x", "not a hazard code"},
		{"formaldehyde-oxidation | HCHO -> HCOOH | hot | x", "not a reaction enthalpy"},
		{"formaldehyde-oxidation | a | -1 | x\nformaldehyde-oxidation | a | -1 | x", "listed twice"},
	}
	for _, tc := range cases {
		if _, err := parseFamilyHeats([]byte(tc.row)); err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%q: error %v, want %q", tc.row, err, tc.want)
		}
	}
	d := &Data{Families: map[string]*FamilyHeat{"x": {Code: "x", Reaction: "C6H12N4 -> C6H12N4", DeltaH: math.NaN(), Stated: math.NaN()}}}
	if err := d.UseSpecies(nil); err == nil {
		t.Error("a row neither stated nor given by the species data was accepted")
	}
}

// TestFamilyHeatNotTwice: when the mixed state already runs the oxidation
// of the organic matter (permanganate lifts the organic-carbon lock), the
// family's heat is not added to the state's again.
func TestFamilyHeatNotTwice(t *testing.T) {
	mk := func(runs bool) *Outcome {
		o := &Outcome{VolumeL: 100, TemperatureC: 25, Heat: Heat{Known: true, ReleasedkJ: 1000, RiseC: 2.4, ReachedC: 27.4}}
		if runs {
			o.Reactions = []Proceeding{{Reactants: []engine.Species{{Formula: "MnO4", Charge: -1}, {Formula: "C2H5OH"}}}}
		}
		return o
	}
	hs := func() []engine.Hazard {
		return []engine.Hazard{{Code: "oxidizer-organic-fire", ReactionHeat: &engine.ReactionHeat{ReleasedkJ: 5000, Reagents: []string{"MnO4-", "organic liquid"}}}}
	}
	o := mk(false)
	addFamilyHeat(o, hs())
	if o.Heat.ReleasedkJ != 6000 {
		t.Errorf("locked organic: released %.0f kJ, want 6000 (1000 + 5000)", o.Heat.ReleasedkJ)
	}
	o = mk(true)
	addFamilyHeat(o, hs())
	if o.Heat.ReleasedkJ != 1000 || len(o.Heat.Families) != 0 {
		t.Errorf("state runs the oxidation: released %.0f kJ, families %v; want 1000 and none", o.Heat.ReleasedkJ, o.Heat.Families)
	}
}
