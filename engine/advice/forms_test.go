package advice_test

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"mixward/engine"
	"mixward/engine/advice"
)

// formsOf is the Forms line of the short answer.
func formsOf(t *testing.T, r *engine.Result) string {
	t.Helper()
	for _, l := range strings.Split(advice.RenderShort(r), "\n") {
		if strings.HasPrefix(l, "Forms: ") {
			return l
		}
	}
	t.Fatal("short answer has no Forms line")
	return ""
}

// TestFormsShowsEveryCountedGas: the Forms line names every gas the
// hazards count in numbers, each judged gas at or above its limit, and says
// "no gas of concern" for none of these mixes. Tried as a new user would:
// each of these answered "Forms: no gas of concern" beside a hazard that
// counted the gas.
func TestFormsShowsEveryCountedGas(t *testing.T) {
	a := mustAdvisor(t)
	for _, tc := range []struct {
		name, req string
		want, not []string
	}{
		// Hydrochloric acid into concentrated sulfuric acid, and the
		// salt-cake reaction: HCl driven out (Vogel's Textbook, from
		// memory), against NIOSH's IDLH 50 ppm.
		{"hydrochloric into sulfuric", "mix 100 L HCl 32 % + 100 L H2SO4 98 %", []string{"HCl up to ", "× IDLH 50 ppm"}, nil},
		{"salt into sulfuric", "mix 50 L H2SO4 98 % + 20 kg NaCl", []string{"HCl up to ", "× IDLH 50 ppm"}, nil},
		// Peracetic acid (with its peroxide) made alkaline: the oxygen of
		// both breakdowns.
		{"peracid with caustic", "mix 100 L peracetic acid 15 % + 20 L NaOH 50 %", []string{"O2 up to "}, nil},
		// Hypochlorite with ammonium: chloramines, volatile, no NIOSH limit.
		{"bleach with ammonium", "mix 100 L NaOCl 12.5 % + 50 L NH4Cl 20 %", []string{"chloramine vapour", "no exposure limit listed"}, nil},
		// Peroxide with caustic: the state gives the oxygen off itself, and
		// the family's count must not add to it.
		{"peroxide with caustic", "mix 100 L H2O2 35 % + 20 L NaOH 50 %", []string{"O2 "}, []string{"up to"}},
		// Hypochlorite on copper: the state runs the catalysed breakdown.
		{"bleach with copper", "mix 50 L NaOCl 12.5 % + 50 L CuSO4 5 %", []string{"O2 "}, []string{"up to"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r := ask(t, a, tc.req)
			forms := formsOf(t, r)
			if strings.Contains(forms, "no gas of concern") {
				t.Errorf("%s", forms)
			}
			for _, w := range tc.want {
				if !strings.Contains(forms, w) {
					t.Errorf("%s: want %q in it", forms, w)
				}
			}
			for _, w := range tc.not {
				if strings.Contains(forms, w) {
					t.Errorf("%s: want no %q in it", forms, w)
				}
			}
			checkFormsComplete(t, r, forms)
		})
	}
}

// checkFormsComplete: every judged gas and every counted gas of the
// hazards is in the Forms line, with its amount: the state's own figure,
// plus what families beyond the state add (the larger figure where two
// hazards count the same source).
func checkFormsComplete(t *testing.T, r *engine.Result, forms string) {
	t.Helper()
	judged := map[string]float64{}
	beyond := map[string]map[string]float64{}
	told := map[string]float64{}
	for _, h := range r.Hazards {
		if h.Gas != nil {
			if _, ok := judged[h.Gas.Formula]; !ok {
				judged[h.Gas.Formula] = h.Gas.Mol
			}
			if !strings.Contains(forms, h.Gas.Formula+" ") {
				t.Errorf("%s: %s judged at %v× %s is missing", forms, h.Gas.Formula, h.Gas.Ratio, h.Gas.LimitName)
			}
		}
		for _, c := range h.Counts {
			switch {
			case c.InLiquid:
				if !strings.Contains(forms, c.Name) || !strings.Contains(forms, c.Formula+" in the liquid") {
					t.Errorf("%s: %s (%s in the liquid) is missing", forms, c.Name, c.Formula)
				}
			case c.Beyond:
				if beyond[c.Formula] == nil {
					beyond[c.Formula] = map[string]float64{}
				}
				beyond[c.Formula][c.From] = math.Max(beyond[c.Formula][c.From], c.Mol)
			default:
				told[c.Formula] = math.Max(told[c.Formula], c.Mol)
			}
		}
	}
	for f, m := range told {
		if _, ok := judged[f]; !ok && beyond[f] == nil && !strings.Contains(forms, f+" "+num3(m)+" mol") {
			t.Errorf("%s: want %s %s mol", forms, f, num3(m))
		}
	}
	for f, by := range beyond {
		sum := judged[f]
		for _, m := range by {
			sum += m
		}
		if want := f + " up to " + num3(sum) + " mol"; !strings.Contains(forms, want) {
			t.Errorf("%s: want %q (state %v mol + %v beyond it)", forms, want, judged[f], by)
		}
	}
	for f, m := range judged {
		if beyond[f] == nil && !strings.Contains(forms, f+" "+num3(m)+" mol") {
			t.Errorf("%s: want %s %s mol, the judged figure, nothing added to it", forms, f, num3(m))
		}
	}
}

// num3 writes a number as the short answer does: 3 significant digits,
// whole numbers where that needs an exponent.
func num3(x float64) string {
	s := fmt.Sprintf("%.3g", x)
	if strings.Contains(s, "e") {
		s = fmt.Sprintf("%.0f", x)
	}
	return s
}

// TestFormsNamesGasSurge: nitrogen from hydrazine with peroxide (N2H4 +
// 2 H2O2 → N2 + 4 H2O, 109 mol from 10 L of 35 %: 2.7 m³) has no exposure
// limit but swells the headspace many times over; the Forms line names it
// beside the gases of concern. Tried as a new user would: the line showed
// 7 mol of oxygen and left out the nitrogen.
func TestFormsNamesGasSurge(t *testing.T) {
	a := mustAdvisor(t)
	f := formsOf(t, ask(t, a, "mix 10 L hydrazine 35 % + 20 L H2O2 35 %"))
	if !strings.Contains(f, "N2 109 mol") || !strings.Contains(f, "gas surge") {
		t.Errorf("hydrazine with peroxide: %s; want the nitrogen named", f)
	}
	f = formsOf(t, ask(t, a, "mix 100 L HCl 32 % + 100 L H2SO4 98 %"))
	if strings.Contains(f, "gas surge") {
		t.Errorf("no surge gas expected: %s", f)
	}
}
