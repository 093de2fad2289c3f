package advice_test

import (
	"strings"
	"testing"

	"mixward/engine"
)

// TestWrittenOrderJudgedFirst: "pour A into B" writes an order of
// addition. When that order boils locally and the other does not (water run
// into 98 % sulfuric acid: "always add acid to water", common practice, no
// source), the decision says so first; the safe order as written keeps
// today's title. Tried as a new user would: the answer to "pour water into
// acid" read the same as to "pour acid into water" (review 12, T27).
func TestWrittenOrderJudgedFirst(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "pour 200 L water into 20 L H2SO4 98 %")
	w := r.Addition.Written
	if w == nil || !w.Worse || w.Into != "H2SO4 98 %" {
		t.Fatalf("water into acid: written %+v, want the written order marked worse", w)
	}
	if !strings.HasPrefix(r.Decision.Title, "not in the order written") || !strings.Contains(r.Decision.Title, "add H2SO4 98 % into H2O instead") {
		t.Errorf("water into acid: title %q, want it to refuse the order written and name the other", r.Decision.Title)
	}
	if r.Decision.Level == engine.NoConcern {
		t.Errorf("water into acid: %s", r.Decision.Level)
	}
	r = ask(t, a, "pour 20 L H2SO4 98 % into 200 L water")
	if w := r.Addition.Written; w == nil || w.Worse || strings.Contains(r.Decision.Title, "order written") {
		t.Errorf("acid into water: written %+v, title %q; want the order written not worse", w, r.Decision.Title)
	}
	r = ask(t, a, "mix 200 L water + 20 L H2SO4 98 %")
	if r.Addition.Written != nil {
		t.Errorf("mix with no order written: written %+v, want none", r.Addition.Written)
	}
}

// TestWrittenOrderSoonerWhenBothBoil: with equal volumes both orders boil
// at the end, but water run into strong acid boils from the first drop and
// acid run into water only from about a third of the pour (common practice,
// no source: "always add acid to water"). Tried as a new user would: the
// short answer to "pour water into acid" read the same as "pour acid into
// water". The written order is named as the worse one; the other order
// written gets no such line.
func TestWrittenOrderSoonerWhenBothBoil(t *testing.T) {
	a := mustAdvisor(t)
	r := ask(t, a, "pour 100 L water into 100 L H2SO4 96 %")
	if !strings.HasPrefix(r.Addition.Advice, "The order written is the worse one") {
		t.Errorf("water into acid: advice %q", r.Addition.Advice)
	}
	r = ask(t, a, "pour 100 L H2SO4 96 % into 100 L water")
	if strings.Contains(r.Addition.Advice, "order written") {
		t.Errorf("acid into water: advice %q", r.Addition.Advice)
	}
}
