package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
	"mixward/engine/advice"
)

// TestReview16 holds pours a plant-chemist review of the build would not
// sign, each with the reason and its source.
func TestReview16(t *testing.T) {
	a := mustAdvisor(t)
	for _, tc := range []struct {
		name, req string
		level     engine.Level
		want      string // a hazard code that must be there ("" for none)
		not       string // a hazard code that must not be there, final or along the pour
		finalNot  string // a hazard code that must not be there in the final mix
	}{
		{
			// Hydrazine with nitrite and a strong acid: the acid is the
			// acidification the azide-forming rule forbids, even where the
			// hydrazine buffers the final mix near pH 8.4 (Bretherick's
			// Handbook of Reactive Chemical Hazards, hydrazine with nitrous
			// acid, from memory).
			name: "hydrazine, nitrite and acid", req: "mix 100 L hydrazine 15 % + 100 L sodium nitrite 10 % + 50 L HCl 10 %",
			level: engine.DoNotMix, want: "azide-forming",
		},
		{
			// The trade's potassium peroxymonosulfate is the triple salt
			// 2KHSO5·KHSO4·K2SO4; it oxidizes chloride to chlorine in its
			// own acid (suppliers' safety data sheets: chlorine with
			// chlorides, from memory; E° HSO5-/HSO4- about 1.82 V against
			// 1.36 V for Cl2/Cl-, CRC Handbook, Electrochemical Series).
			// 200 L of 5 % is 200 × 1.03 × 0.05 / 614.7 × 2 = 33.5 mol HSO5-.
			name: "peroxymonosulfate with brine", req: "mix 200 L potassium peroxymonosulfate 5 % + 20 L sodium chloride 20 %",
			level: engine.DoNotMix, want: "chlorine-release",
		},
		{
			// Bleach is made and kept in brine: a trace of bleach in a
			// brine tank gives no chlorine without acid (common practice,
			// no source). The first millilitres of bleach on the salt used
			// to stand at 73 ppm over 2 mL of liquid: 6e-9 mol.
			name: "brine with a little bleach", req: "mix 1000 L water + 25 kg sodium chloride + 2 L NaOCl 12.5 %",
			level: engine.NoConcern, not: "chlorine-release",
		},
		{
			// Perborate tetrahydrate dissolves slowly, about 2.3 g per
			// 100 g of water (CRC Handbook, from memory): water run onto
			// 10 kg of it holds about 0.16 mol/L of peroxide at the first
			// percent of the pour, far from the alkaline strength that
			// heats itself (laundry practice: common practice, no source).
			name: "perborate make-up", req: "mix 1000 L water + 10 kg sodium perborate",
			level: engine.NoConcern, not: "near-boiling",
		},
		{
			// Free hydroxylamine from its sulfate and caustic: far less
			// stable than the salt (Bretherick's Handbook, hydroxylamine,
			// from memory): 100 L of 10 % salt frees about 129 mol.
			name: "hydroxylamine freed", req: "mix 100 L hydroxylamine sulfate 10 % + 20 L NaOH 50 %",
			level: engine.WithPrecautions, want: "hydroxylamine-freed",
		},
		{
			// Hot unbuffered dithionite breaks down and turns the bath
			// acid (common practice, no source).
			name: "hot dithionite", req: "mix 100 L water + 1 kg sodium dithionite at 70 C",
			level: engine.WithPrecautions, want: "hot-dithionite",
		},
		{
			// Held with caustic it keeps hot: no warning for the mix.
			name: "hot dithionite with caustic", req: "mix 100 L NaOH 1 % + 1 kg sodium dithionite at 70 C",
			level: engine.WithPrecautions, not: "hot-dithionite",
		},
		{
			// Piranha: three parts of 96 % sulfuric acid to one of 30 %
			// peroxide forms Caro's acid (Bretherick's Handbook, hydrogen
			// peroxide with sulfuric acid, from memory); with a solvent in
			// the mix it is a danger.
			name: "piranha with isopropanol", req: "mix 30 L H2O2 30 % + 90 L sulfuric acid 96 % + 5 L isopropanol",
			level: engine.DoNotMix, want: "caro-acid-forming",
		},
		{
			// Dilute peroxide and acid in a rinse tank: no Caro's acid in
			// the mix (the pair poured neat, peroxide into the 50 % acid,
			// does form some along its pour). Each run into the water is
			// the natural make-up and meets nothing, so the neat pair is
			// an action line, not a precaution of the mix (review 19:
			// common practice, no source).
			name: "dilute peroxide and acid rinse", req: "mix 1000 L water + 10 L H2O2 35 % + 10 L sulfuric acid 50 %",
			level: engine.NoConcern, finalNot: "caro-acid-forming",
		},
		{
			// Borohydride in caustic reducing copper: the fresh copper
			// catalyses the hydrolysis of the excess borohydride even at
			// pH 14 (Bretherick's Handbook, sodium tetrahydroborate with
			// metal salts, from memory): 50 L of 12 % is about 190 mol
			// BH4-, copper takes about 40, up to about 600 mol H2.
			name: "borohydride on copper", req: "mix 50 L sodium borohydride 12 %, NaOH 40 % + 500 L copper sulfate 5 %",
			level: engine.DoNotMix, want: "hydrogen-release",
		},
		{
			// Ammonium nitrate blended dry with caustic flakes: ammonia
			// with heat once the caustic draws moisture (Bretherick's
			// Handbook, ammonium salts with bases, from memory).
			name: "dry ammonium nitrate with caustic", req: "mix 25 kg ammonium nitrate + 5 kg sodium hydroxide",
			level: engine.DoNotMix, want: "dry-blend-ammonia",
		},
		{
			// Ammonium sulfate with salt: nothing.
			name: "dry ammonium sulfate with salt", req: "mix 25 kg ammonium sulfate + 10 kg sodium chloride",
			level: engine.NoConcern, not: "dry-blend-ammonia",
		},
		{
			// Iodine with strong ammonia: nitrogen triiodide (Bretherick's
			// Handbook, iodine with ammonia, from memory).
			name: "iodine with ammonia", req: "mix 50 L ammonia 25 % + 2 kg iodine",
			level: engine.DoNotMix, want: "nitrogen-triiodide",
		},
		{
			// Peroxide on potassium iodide, neutral: the foaming
			// breakdown, catalysed (Greenwood & Earnshaw, hydrogen
			// peroxide, from memory): 50 L of 35 % is 572 mol, 286 mol O2.
			name: "peroxide on iodide", req: "mix 100 L potassium iodide 10 % + 50 L H2O2 35 %",
			level: engine.DoNotMix, want: "oxygen-surge",
		},
		{
			// Ammonium persulfate 20 % (about 0.9 mol/L in the mix) with
			// neat glycol: slow cold, runaway warm (Bretherick's Handbook,
			// peroxodisulfates with organic matter, from memory); if it
			// runs, its heat (persulfate's reduction counted, review 19)
			// boils the mix: do not mix.
			name: "persulfate with glycol", req: "mix 200 L ammonium persulfate 20 % + 20 L ethylene glycol",
			level: engine.DoNotMix, want: "oxidizer-organic-fire",
		},
		{
			// A peracetic acid sanitiser dose with phosphoric acid: the
			// product is already at equilibrium, a mineral acid forms no
			// new peracid (peracetic acid suppliers' technical data, from
			// memory).
			name: "peracetic sanitiser with phosphoric acid", req: "mix 1000 L water + 3 L peracetic acid 15 % + 2 L phosphoric acid 75 %",
			level: engine.NoConcern, not: "peracid-runaway",
		},
		{
			// Copper(II) with cyanide: cyanogen, up to half the copper
			// (Greenwood & Earnshaw, cyanogen, from memory).
			name: "copper sulfate with cyanide", req: "mix 100 L sodium cyanide 5 % + 100 L copper sulfate 10 %",
			level: engine.DoNotMix, want: "cyanogen-release",
		},
		{
			// A copper cyanide plating bath (copper(I)) gives none.
			name: "copper cyanide bath diluted", req: "mix 500 L copper cyanide 30 g/L, NaCN 20 g/L + 100 L water",
			level: engine.NoConcern, not: "cyanogen-release",
		},
		{
			// Silver nitrate, nitric acid and ethanol: the fulminate
			// (Bretherick's Handbook, silver nitrate with ethanol, from
			// memory).
			name: "silver nitrate, nitric acid and ethanol", req: "mix 100 L silver nitrate 10 % + 50 L HNO3 65 % + 50 L ethanol",
			level: engine.DoNotMix, want: "silver-fulminate",
		},
		{
			// Calcium hypochlorite granules carry sodium chloride (high-test
			// grades about 15–20 %, suppliers' typical analysis, from
			// memory): with acetic acid at pH 4.6 they give chlorine, as
			// bleach does.
			name: "calcium hypochlorite with acetic acid", req: "mix 100 L calcium hypochlorite 10 % + 20 L acetic acid 80 %",
			level: engine.DoNotMix, want: "chlorine-release",
		},
		{
			// Hydroxylamine sulfate with nitrite: nitrous oxide, one per
			// hydroxylamine, with heat (Greenwood & Earnshaw, hydroxylamine
			// with nitrous acid, from memory); was held back.
			name: "hydroxylamine with nitrite", req: "mix 100 L hydroxylamine sulfate 10 % + 50 L sodium nitrite 20 %",
			level: engine.WithPrecautions, want: "scalding-heat",
		},
		{
			// Zinc and magnesium sulfate as the trade sells them, the
			// heptahydrates, dissolve with little heat (NBS Tables 1982,
			// from memory): a feed make-up is no concern.
			name: "zinc and magnesium sulfate make-up", req: "mix 1000 L water + 20 kg zinc sulfate + 10 kg magnesium sulfate",
			level: engine.NoConcern, not: "scalding-heat",
		},
		{
			// A litre of 5 % bleach with a litre of 5 % citric acid: a few
			// millilitres of chlorine, far above its limit over the liquid
			// (the amount threshold of a pour point must not hide it).
			name: "bleach with citric acid", req: "mix 1 L NaOCl 5 % + 1 L citric acid 5 %",
			level: engine.DoNotMix, want: "chlorine-release",
		},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r := ask(t, a, tc.req)
			if r.Decision == nil || r.Decision.Level != tc.level {
				t.Fatalf("decision %+v, want %s", r.Decision, tc.level)
			}
			codes := map[string]bool{}
			for _, h := range r.Hazards {
				codes[h.Code] = true
			}
			if tc.want != "" && !codes[tc.want] {
				t.Errorf("no %s among %v", tc.want, hazardCodes(r))
			}
			if tc.finalNot != "" && codes[tc.finalNot] {
				t.Errorf("%s fires in the final mix", tc.finalNot)
			}
			for _, o := range r.Addition.Orders {
				for _, h := range o.Hazards {
					codes[h.Code] = true
				}
			}
			if tc.not != "" && codes[tc.not] {
				t.Errorf("%s fires (final or along the pour)", tc.not)
			}
		})
	}
}

// TestPermanganatePeroxideInAcid: in sulfuric acid held in excess,
// permanganate takes peroxide stoichiometrically to manganese(II) and
// oxygen (2 MnO4- + 5 H2O2 + 6 H+ → 2 Mn2+ + 5 O2 + 8 H2O: the
// permanganate titration of peroxide), and manganese(II) in acid does not
// break down the excess peroxide (Greenwood & Earnshaw, Chemistry of the
// Elements, manganese, from memory). 200 L of 2 % KMnO4 is 200 × 1.01 ×
// 0.02 / 158.03 = 25.6 mol: 64 mol O2, not the 509 mol of all the
// peroxide. Without the acid, manganese dioxide forms and does break the
// peroxide down (the lock's catalyst clause).
func TestPermanganatePeroxideInAcid(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 200 L potassium permanganate 2 % + 100 L H2O2 30 % + 50 L sulfuric acid 20 %")
	if o2 := gasMolOf(r, "O2"); o2 < 55 || o2 > 75 {
		t.Errorf("permanganate with peroxide in excess sulfuric acid: O2 %.1f mol, want about 64 (permanganate limiting)", o2)
	}
	r = ask(t, a, "mix 200 L potassium permanganate 2 % + 100 L H2O2 30 %")
	if o2 := gasMolOf(r, "O2"); o2 < 400 {
		t.Errorf("permanganate with peroxide, no acid: O2 %.1f mol, want the peroxide broken down on manganese dioxide (about 500)", o2)
	}
}

// TestHydrateNamedForSulfideAndPhosphate: sodium sulfide (flakes of about
// 60 % Na2S) and trisodium phosphate (the dodecahydrate crystals) are sold
// as hydrates (common practice, no source); for sodium sulfide the answer
// says it read the name as the anhydrous salt and how to write the hydrate,
// as it does for soda ash; trisodium phosphate, like ferrous sulfate, is
// read as the crystal sold, and the answer says how to write the anhydrous
// salt.
func TestHydrateNamedForSulfideAndPhosphate(t *testing.T) {
	a := mustAdvisor(t)
	for req, want := range map[string]string{
		"mix 500 L sulfuric acid 25 % + 30 kg sodium sulfide": "write Na2S.9H2O",
		"mix 500 L water + 20 kg trisodium phosphate":         "read as Na3PO4.12H2O, the hydrate sold; write Na3PO4",
	} {
		if short := advice.RenderShort(ask(t, a, req)); !strings.Contains(short, want) {
			t.Errorf("%s: no %q in\n%s", req, want, short)
		}
	}
}

// TestComplexedCyanideInAcidNamesHCN: a request that acidifies a
// hexacyanoferrate is the acidification itself; its action names hydrogen
// cyanide instead of only "keep it alkaline" (hexacyanoferrate safety data
// sheets, EUH032, from memory).
func TestComplexedCyanideInAcidNamesHCN(t *testing.T) {
	r := ask(t, mustAdvisor(t), "mix 100 L potassium ferricyanide 5 % + 20 L HCl 32 %")
	// The acidification is judged by cyanide-complex-acid, whose
	// headline names hydrogen cyanide.
	h, ok := hazardOf(r, "cyanide-complex-acid")
	if !ok || !strings.HasPrefix(h.Action, "Do not") || !strings.Contains(h.Title, "hydrogen cyanide") || !strings.Contains(h.Message, "hydrogen cyanide") {
		t.Errorf("hexacyanoferrate in acid: %+v, want an action that leads with \"Do not\" and hydrogen cyanide named", h)
	}
	if _, ok := hazardOf(r, "cyanide-complexed"); ok {
		t.Error("hexacyanoferrate in acid: cyanide-complexed raised beside cyanide-complex-acid")
	}
}

// TestCatalysedPeroxideNotInPortions: iron salts catalyse the breakdown of
// peroxide and are not used up (Bretherick's Handbook of Reactive Chemical
// Hazards, hydrogen peroxide with metal salts, from memory): dosing the iron
// "in small portions, letting each finish" cannot control it, since the
// first portion breaks down the whole tank. A pair that uses its partner up
// (hypochlorite with peroxide) is still dosed slowly.
func TestCatalysedPeroxideNotInPortions(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 500 L H2O2 50 % + 50 L ferrous sulfate 20 %")
	h, ok := hazardOf(r, "boils")
	if !ok || strings.Contains(h.Action, "small portions") || !strings.Contains(h.Action, "not used up") {
		t.Errorf("peroxide with iron: boils %+v, want the catalyst named, not small portions", h)
	}
	r = ask(t, a, "mix 200 L sodium hydroxide 20 % + 5 kg aluminium")
	if h, ok := hazardOf(r, "boils"); !ok || !strings.Contains(h.Action, "small portions") {
		t.Errorf("aluminium in caustic: boils %+v, want small portions", h)
	}
}

// TestAluminiumInHotCaustic: aluminium dissolves in caustic while it stays
// strongly alkaline, 2 Al + 2 OH- + 6 H2O → 2 Al(OH)4- + 3 H2 (common
// practice, no source); the allowance counts the hydroxide above a
// hydroxide level, not above a pH read at 80 °C, where water ionises more
// (pKw about 12.6, CRC Handbook, Ionization Constant of Water, from
// memory). 500 L of 2 % caustic (255 mol OH-) with 5 kg of aluminium
// (185 mol): aluminium-limited, 278 mol H2, hot as cold.
func TestAluminiumInHotCaustic(t *testing.T) {
	a := mustAdvisor(t)
	for _, req := range []string{"mix 500 L NaOH 2 % + 5 kg aluminium", "mix 500 L NaOH 2 % + 5 kg aluminium at 80 C"} {
		if h2 := gasMolOf(ask(t, a, req), "H2"); h2 < 250 || h2 > 300 {
			t.Errorf("%s: H2 %.1f mol, want about 278 (aluminium-limited)", req, h2)
		}
	}
}

// TestChromeReductionAtLowPH: a bisulfite reduction of chromium(VI) runs
// at pH 2–3 and stops above about 4 (common practice, no source: chromium
// waste treatment); the short answer says so.
func TestChromeReductionAtLowPH(t *testing.T) {
	r := ask(t, mustAdvisor(t), "mix 500 L chromic acid 3 g/L + 20 L sodium bisulfite 38 %")
	if h, ok := hazardOf(r, "chromium-vi-exposure"); !ok || !strings.Contains(h.Action, "pH 2–3") {
		t.Errorf("chromium(VI) with bisulfite: %+v, want the reduction at pH 2–3 named", h)
	}
}

// TestFormsNamesAGasOnlyAlongThePour: borohydride held in caustic run into
// hydrochloric acid gives hydrogen where it lands, four per borohydride the
// acid reaches (Kreevoy and Jacobson 1979, from memory), though the final
// mix stays alkaline and gives none: the Forms line names it with its
// amount along the pour, not "no gas of concern".
func TestFormsNamesAGasOnlyAlongThePour(t *testing.T) {
	short := advice.RenderShort(ask(t, mustAdvisor(t), "mix 100 L sodium borohydride 12 %, NaOH 40 % + 100 L HCl 10 %"))
	if !strings.Contains(short, "Forms: H2 none in the final mix; up to ") || strings.Contains(short, "no gas of concern") {
		t.Errorf("want hydrogen along the pour on the Forms line:\n%s", short)
	}
}

// TestPeroxideTakenByAReducerIsDosedSlowly: hypophosphite takes peroxide up
// (H2PO2- + 2 H2O2 → H2PO4- + 2 H2O), so the heat is controlled by dosing
// slowly; only a catalyst that is not used up makes slow dosing useless.
// The boiling hypophosphite is named for phosphine (sodium hypophosphite
// safety data sheets, from memory). With iodide the surge and the heat give
// one action, not two that contradict each other.
func TestPeroxideTakenByAReducerIsDosedSlowly(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "mix 100 L sodium hypophosphite 25 % + 50 L H2O2 35 %")
	if h, ok := hazardOf(r, "boils"); !ok || strings.Contains(h.Action, "not used up") {
		t.Errorf("hypophosphite with peroxide: boils %+v, want slow dosing, not a catalyst", h)
	}
	if _, ok := hazardOf(r, "hypophosphite-phosphine"); !ok {
		t.Errorf("hypophosphite boiling: no phosphine warning among %v", hazardCodes(r))
	}
	short := advice.RenderShort(ask(t, a, "mix 100 L potassium iodide 10 % + 50 L H2O2 35 %"))
	if strings.Contains(short, "dose one into the other slowly") {
		t.Errorf("peroxide on iodide: a slow-dosing action beside the catalyst's:\n%s", short)
	}
}

// TestPersulfateGlycolShowsHeatIfItRuns: persulfate does not oxidize the
// glycol at once in the cold, so its heat is not counted, but the Heat line
// shows what it gives if it runs warm: about 175 mol persulfate × 2
// electrons × 198.5 kJ (Thornton's rule, from memory, with persulfate's
// heat of reduction against oxygen's, NBS Tables 1982 ΔfH°, from memory)
// is about 70 MJ.
func TestPersulfateGlycolShowsHeatIfItRuns(t *testing.T) {
	short := advice.RenderShort(ask(t, mustAdvisor(t), "mix 200 L ammonium persulfate 20 % + 20 L ethylene glycol"))
	if !strings.Contains(short, "if it runs: ") {
		t.Errorf("persulfate with glycol: want the heat if it runs:\n%s", short)
	}
}
