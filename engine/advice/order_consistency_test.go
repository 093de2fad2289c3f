package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
	"mixward/engine/pour"
)

// TestOneOrderPerAnswer: the order of addition named in the decision's
// title, in the rule actions and in the pour advice is one and the same,
// and it is the order the pour marks Advised. Tried as a plant chemist
// would: the title said "add SnCl2 into H2O2" while the pour advice said
// the reverse; the silicate action ran the acid in while the pour ran the
// silicate into the acid; a written acid-into-silicate was called "the
// worse one" and then advised; 600 L of cyanide rinse was to be run into
// 30 L of bleach. want is the stream to add ("" for any, "-" for none
// named); acid names the acid stream where a rule's action names the order
// by class ("run the acid into it", "Run the silicate into the acid", "add
// the acid into the water").
//
// The chemistry behind the wanted orders:
//   - silica gels fastest between about pH 3 and 10 and slowly on either
//     side (Iler, The Chemistry of Silica, 1979, from memory): the stream in
//     deficit runs into the one in excess, so the tank stays on the side of
//     its end point;
//   - acid (or caustic) into water, never the reverse (common practice, no
//     source; Bretherick's Handbook of Reactive Chemical Hazards, from
//     memory);
//   - a treatment reagent (hypochlorite, peroxide, bisulfite) is dosed into
//     the much larger rinse or waste tank under pH and ORP control, not the
//     tank run into the drum (common practice, no source);
//   - a redox pair whose heat all lands in the smaller stream when the
//     oxidant runs in (peroxide into stannous chloride scalds) is run the
//     other way (the pour's own figures).
func TestOneOrderPerAnswer(t *testing.T) {
	a := mustAdvisor(t)
	cases := []struct {
		name, req, want, acid string
	}{
		{"stannous-peroxide", "mix 100 L stannous chloride 10 % + 20 L H2O2 35 %", "SnCl2 10 %", ""},
		{"stannous-peroxide-equal", "mix 50 L stannous chloride 10 % + 50 L H2O2 35 %", "SnCl2 10 %", ""},
		{"ferrous-peroxide", "mix 200 L iron(II) sulfate 10 % + 20 L H2O2 35 %", "H2O2 35 %", ""},
		{"silicate-acid-deficit", "mix 200 L sodium metasilicate 10 % + 50 L HCl 10 %", "HCl 10 %", "HCl 10 %"},
		{"silicate-acid-written", "pour 20 L HCl 32 % into 400 L sodium silicate 30 %", "HCl 32 %", "HCl 32 %"},
		{"silicate-big-tank", "mix 1000 L sodium silicate 30 % + 10 L HCl 32 %", "HCl 32 %", "HCl 32 %"},
		{"silicate-acid-excess", "mix 20 L sodium silicate 30 % + 400 L HCl 10 %", "Na2SiO3 30 %", "HCl 10 %"},
		{"silicate-middle", "mix 200 L sodium metasilicate 10 % + 100 L HCl 10 %", "", "HCl 10 %"},
		{"copper-cyanide-bleach", "mix 600 L copper cyanide 2 g/L, NaCN 1 g/L, pH 11 + 30 L NaOCl 12.5 %", "NaOCl 12.5 %", ""},
		{"cyanide-bleach", "mix 800 L NaCN 0.5 g/L, pH 10.5 + 5 L NaOCl 12.5 %", "NaOCl 12.5 %", ""},
		{"cyanide-peroxide", "mix 800 L NaCN 0.5 g/L, NaOH 1 g/L + 10 L H2O2 35 %", "H2O2 35 %", ""},
		{"chromium-bisulfite", "mix 800 L chromic acid 0.5 g/L + 20 L sodium bisulfite 38 %", "NaHSO3 38 %", ""},
		{"chromium-bleach", "mix 800 L chromic acid 0.5 g/L + 5 L NaOCl 12.5 %", "NaOCl 12.5 %", ""},
		{"acid-into-water", "mix 500 L water + 20 L H2SO4 98 %", "H2SO4 98 %", ""},
		{"water-into-acid-written", "pour 500 L water into 20 L H2SO4 98 %", "H2SO4 98 %", ""},
		{"caustic-into-water", "mix 100 L water + 60 L NaOH 50 %", "NaOH 50 %", ""},
		{"hf-into-water", "mix 500 L water + 20 L HF 48 %", "HF 48 %", "HF 48 %"},
		// The treatment reagent into the rinse: 800 L of rinse run into 10 L of
		// 35 % peroxide would boil it on the copper (common practice, no source).
		{"copper-cyanide-peroxide", "mix 800 L copper cyanide 1 g/L, NaCN 0.5 g/L, pH 11 + 10 L H2O2 35 %", "H2O2 35 %", ""},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			r := ask(t, a, c.req)
			if r.Decision == nil || r.Addition == nil || len(r.Addition.Orders) != 2 {
				t.Fatalf("no decision or no pair of orders")
			}
			x, y := r.Addition.Orders[0], r.Addition.Orders[1]
			var advised *engine.PourOrder
			for _, o := range []*engine.PourOrder{&x, &y} {
				if o.Advised {
					if advised != nil {
						t.Fatalf("both orders advised")
					}
					advised = o
				}
			}
			lines := append([]string{r.Decision.Title, r.Addition.Advice}, r.Decision.Actions...)
			named := map[string]string{} // added → the line that names it
			for _, l := range lines {
				for _, o := range []engine.PourOrder{x, y} {
					if namesOrder(l, o.Added, o.Into) {
						named[o.Added] = l
					}
				}
				if c.acid != "" {
					other := x.Added
					if other == c.acid {
						other = x.Into
					}
					for _, p := range []string{"run the acid into", "add the acid into the water"} {
						if strings.Contains(l, p) {
							named[c.acid] = l
						}
					}
					if strings.Contains(l, "Run the silicate into the acid") {
						named[other] = l
					}
				}
			}
			if len(named) > 1 {
				t.Errorf("the answer names both orders:\n%s", strings.Join(lines, "\n"))
			}
			for added, l := range named {
				if advised == nil || advised.Added != added {
					t.Errorf("%q names %s first, the pour advises %+v", l, added, advised)
				}
			}
			switch c.want {
			case "":
			case "-":
				if advised != nil || len(named) > 0 {
					t.Errorf("an order is named (%v, advised %+v), want none", named, advised)
				}
			default:
				if advised == nil || advised.Added != c.want {
					t.Errorf("advised %+v, want %s added", advised, c.want)
				}
				if _, ok := named[c.want]; !ok {
					t.Errorf("no line names %s added:\n%s", c.want, strings.Join(lines, "\n"))
				}
				// The title names an order only where it matters: the
				// orders differ by pour.Rank.
				if pour.Rank(&x) != pour.Rank(&y) && !strings.Contains(r.Decision.Title, c.want+" into") {
					t.Errorf("title %q does not name %s added", r.Decision.Title, c.want)
				}
			}
		})
	}
}

// namesOrder reports whether line tells the operator to run added into
// into: "Add A into B", "dose A slowly into B", "then dose A slowly into
// it" after "Bring B to neutral", "add A into B instead"; not "never A into
// B" or "running A into B ... is not practical".
func namesOrder(line, added, into string) bool {
	for _, verb := range []string{"Add ", "add ", "Dose ", "dose "} {
		for _, mid := range []string{" into ", " slowly into "} {
			if strings.Contains(line, verb+added+mid+into) {
				return true
			}
		}
		if strings.Contains(line, "Bring "+into+" to neutral") && strings.Contains(line, verb+added+" slowly into it") {
			return true
		}
	}
	return false
}

// TestSequenceSetsThePairOrders: with three streams and a sequence named,
// no pair's own advice runs a stream into one the sequence adds after it
// (tried as a plant chemist would: "start with the cyanide, then caustic,
// then bleach", followed by "Add NaOH 50 % into NaOCl 12.5 %").
func TestSequenceSetsThePairOrders(t *testing.T) {
	a := mustAdvisor(t)
	for _, req := range []string{
		"mix 600 L NaCN 1 g/L, pH 11 + 30 L NaOCl 12.5 % + 20 L NaOH 50 %",
		"mix 200 L NaOCl 12.5 % + 50 L HCl 10 % + 100 L NaOH 10 %",
	} {
		r := ask(t, a, req)
		if r.Addition == nil || len(r.Addition.Sequences) == 0 || !strings.HasPrefix(r.Addition.Advice, "In sequence:") {
			t.Fatalf("%s: no sequence named: %+v", req, r.Addition)
		}
		seq := r.Addition.Sequences[0].Streams
		if !strings.Contains(r.Decision.Title, strings.Join(seq, ", then ")) {
			t.Errorf("%s: title %q does not name the sequence advised %v", req, r.Decision.Title, seq)
		}
		pos := map[string]int{}
		for i, s := range seq {
			pos[s] = i
		}
		for _, o := range r.Addition.Orders {
			if namesOrder(r.Addition.Advice, o.Added, o.Into) && pos[o.Added] < pos[o.Into] {
				t.Errorf("%s: advice runs %s into %s against the sequence %v: %s", req, o.Added, o.Into, seq, r.Addition.Advice)
			}
		}
	}
}
