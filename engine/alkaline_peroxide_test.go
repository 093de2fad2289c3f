package engine_test

import "testing"

// TestAlkalinePeroxideKeepsWhenDilute: clean peroxide at pH 9.5–11 is
// metastable for hours at room temperature, and dilute alkaline peroxide
// bleaching (1–5 % H2O2, pH 10.5–11, 60–90 °C, often with silicate) and
// ammonia–peroxide cleaning baths run for hours (common practice, no source);
// percarbonate is dissolved in water every day. Excess peroxide beside a
// reducer (cyanide) without a catalyst stays as peroxide. What does make it
// fall apart at once: a catalyst (iron, copper, manganese; cobalt and nickel
// once neutral or alkaline: Bretherick's Handbook of Reactive Chemical
// Hazards, hydrogen peroxide with metals, from memory), concentrated peroxide
// (about 2.9 mol/L, 10 %, and more) made alkaline, and strong alkali (a third
// or more of the peroxide as the anion, pKa 11.6: CRC Handbook, Dissociation
// Constants of Inorganic Acids and Bases, from memory) that is hot or meets
// peroxide of about 1.5 mol/L and more; the thresholds are common practice,
// no source, set from the heat of the breakdown (about 95 kJ/mol, from
// memory, some 23 °C per mol/L in water). Tried as a new user would: 6 %
// peroxide with a little ammonia read as 180 mol of oxygen and 65 °C.
func TestAlkalinePeroxideKeepsWhenDilute(t *testing.T) {
	const lock = "peroxide-self-decomposition"
	cases := []struct {
		req  string
		want mixOutcome
	}{
		// 6 % peroxide (357 mol) with a little ammonia, pH about 10: keeps.
		{"mix 200 L H2O2 6 % + 4 L ammonia 5 %", mixOutcome{atLeast: map[string]float64{"H2O2|HO2-": 340}, atMost: map[string]float64{"O2(g)": 0}, held: []string{lock}}},
		// An ammonia–peroxide cleaning bath at 75 °C.
		{"mix 100 L H2O2 3 % + 10 L ammonia 25 % at 75 C", mixOutcome{atLeast: map[string]float64{"H2O2|HO2-": 85}, atMost: map[string]float64{"O2(g)": 0}, held: []string{lock}}},
		// A silicate-stabilised alkaline bleaching bath at 80 °C.
		{"mix 1000 L water + 50 L H2O2 35 % + 20 L sodium silicate 10 % + 10 L NaOH 10 % at 80 C", mixOutcome{atLeast: map[string]float64{"H2O2|HO2-": 550}, atMost: map[string]float64{"O2(g)": 0}, held: []string{lock}}},
		// Percarbonate dissolved in water: 30 kg gives about 287 mol H2O2.
		{"mix 1000 L water + 30 kg sodium percarbonate", mixOutcome{atLeast: map[string]float64{"H2O2|HO2-": 280}, atMost: map[string]float64{"O2(g)": 0}, held: []string{lock}}},
		// Cyanide (20 mol) takes 20 mol of the 116 mol peroxide to cyanate;
		// the rest stays as peroxide without a catalyst.
		{"mix 100 L NaCN 1 % + 10 L H2O2 35 %", mixOutcome{atLeast: map[string]float64{"H2O2|HO2-": 90, "OCN-|HOCN": 19}, atMost: map[string]float64{"O2(g)": 0}}},
		// Peroxide a fifth neutralised by caustic (pH about 11), cold: keeps.
		{"mix 100 L H2O2 6 % + 10 L NaOH 10 %", mixOutcome{atLeast: map[string]float64{"H2O2|HO2-": 170}, atMost: map[string]float64{"O2(g)": 0}, held: []string{lock}}},

		// Still decomposes: concentrated peroxide made alkaline.
		{"mix 100 L H2O2 35 % + 2 L ammonia 25 %", mixOutcome{atLeast: map[string]float64{"O2(g)": 500}}},
		{"mix 100 L H2O2 50 % + 5 L NaOH 50 %", mixOutcome{atLeast: map[string]float64{"O2(g)": 800}}},
		// Strong alkali (more caustic than peroxide) with 6 % peroxide.
		{"mix 100 L H2O2 6 % + 10 L NaOH 50 %", mixOutcome{atLeast: map[string]float64{"O2(g)": 80}}},
		// Peroxide run into hot caustic.
		{"mix 100 L NaOH 2 %, 80 C + 5 L H2O2 35 %", mixOutcome{atLeast: map[string]float64{"O2(g)": 25}}},
		// Cobalt and nickel in alkaline peroxide, dilute and cold.
		{"mix 100 L H2O2 3 % + 1 L cobalt sulfate 10 % + 2 L NaOH 10 %", mixOutcome{atLeast: map[string]float64{"O2(g)": 40}}},
		{"mix 100 L H2O2 3 % + 1 L nickel sulfate 10 % + 2 L NaOH 10 %", mixOutcome{atLeast: map[string]float64{"O2(g)": 40}}},
		// Copper in percarbonate solution.
		{"mix 1000 L water + 30 kg sodium percarbonate + 1 kg copper sulfate", mixOutcome{atLeast: map[string]float64{"O2(g)": 130}}},
	}
	for _, c := range cases {
		t.Run(c.req, func(t *testing.T) { checkOutcome(t, c.req, c.want) })
	}
}
