package hazard

import (
	"strings"
	"testing"

	"mixward/engine"
)

func order(added, into string, sev ...engine.Severity) engine.PourOrder {
	o := engine.PourOrder{Added: added, Into: into}
	for _, s := range sev {
		o.Hazards = append(o.Hazards, engine.PourHazard{Code: "chlorine-release", FromFraction: 0.001, ToFraction: 0.5, Worst: s})
	}
	return o
}

func TestDecide(t *testing.T) {
	danger := []engine.Hazard{{Code: "hcn-release", Severity: engine.Danger, Title: "releases hydrogen cyanide", Action: "Do not combine."}}
	info := []engine.Hazard{{Code: "cyanide-kept-alkaline", Severity: engine.Info, Title: "cyanide present: keep it alkaline"}}
	for _, tc := range []struct {
		name    string
		final   []engine.Hazard
		orders  []engine.PourOrder
		level   engine.Level
		inTitle string
	}{
		{"nothing", nil, []engine.PourOrder{order("A", "B"), order("B", "A")}, engine.NoConcern, NoConcernTitle},
		{"info only", info, nil, engine.NoConcern, NoConcernTitle},
		{"final danger", danger, []engine.PourOrder{order("A", "B"), order("B", "A")}, engine.DoNotMix, "releases hydrogen cyanide"},
		{"one order avoids it", nil, []engine.PourOrder{order("B", "A", engine.Danger), order("A", "B")}, engine.WithPrecautions,
			"releases chlorine if poured the other way; order of addition matters: add A into B"},
		{"neither order", nil, []engine.PourOrder{order("B", "A", engine.Danger), order("A", "B", engine.Danger)}, engine.DoNotMix,
			"releases chlorine in either order of addition"},
		{"three streams: one pair matters", nil, []engine.PourOrder{
			order("B", "A"), order("A", "B"),
			order("C", "A", engine.Danger), order("A", "C"),
			order("C", "B"), order("B", "C")}, engine.WithPrecautions, "add A into C"},
		{"three streams: one pair unsafe both ways", nil, []engine.PourOrder{
			order("B", "A"), order("A", "B"),
			order("C", "A", engine.Danger), order("A", "C", engine.Danger),
			order("C", "B"), order("B", "C")}, engine.DoNotMix, "releases chlorine along the pour"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var add *engine.Addition
			if tc.orders != nil {
				add = &engine.Addition{Orders: tc.orders, Advice: "advice"}
			}
			d := Decide(tc.final, add)
			if d.Level != tc.level || !strings.Contains(d.Title, tc.inTitle) {
				t.Errorf("Decide = %s %q, want %s containing %q", d.Level, d.Title, tc.level, tc.inTitle)
			}
			if d.Level != engine.NoConcern && len(d.Actions) == 0 {
				t.Error("a decision of concern without actions")
			}
		})
	}
}

// TestSequenceDangerLeadsTheTitle: when every sequence of addition meets a
// danger and the final mix only warms, the decision is do-not-mix and its
// title says why (the danger along the pour) before the final mix's own
// reason, never "warms noticeably" alone beside a refusal.
func TestSequenceDangerLeadsTheTitle(t *testing.T) {
	final := []engine.Hazard{{Code: "warms", Severity: engine.Warning, Title: "warms noticeably", Action: "Dose slowly and watch the temperature."}}
	step := engine.PourOrder{Added: "B", Into: "A", Hazards: []engine.PourHazard{{Code: "near-boiling", FromFraction: 0.001, ToFraction: 0.001, Worst: engine.Danger}}}
	add := &engine.Addition{Sequences: []engine.PourSequence{{Streams: []string{"A", "B", "C"}, Steps: []engine.PourOrder{step}, Worst: engine.Danger}}}
	d := Decide(final, add)
	if d.Level != engine.DoNotMix {
		t.Fatalf("level %s, want do-not-mix", d.Level)
	}
	if !strings.HasPrefix(d.Title, "gets near boiling") || !strings.Contains(d.Title, "in every sequence") || !strings.Contains(d.Title, "warms noticeably") {
		t.Errorf("title %q, want the pour's danger first, then the final mix's reason", d.Title)
	}
}

// TestHeatActionFollowsItsCause: more water is the cure for the heat of
// diluting a concentrate ("always add acid to water", common practice, no
// source), not for the heat of a reaction (aluminium in caustic), which is
// taken in small portions with cooling.
func TestHeatActionFollowsItsCause(t *testing.T) {
	dilution := heatAction(&Outcome{}, Heat{Known: true, ReleasedkJ: 40000, MixingkJ: 38000})
	reaction := heatAction(&Outcome{}, Heat{Known: true, ReleasedkJ: 40000, MixingkJ: 2000, Reactions: true})
	if !strings.Contains(dilution, "use more water") || !strings.Contains(reaction, "small portions") {
		t.Errorf("dilution %q, reaction %q", dilution, reaction)
	}
}

// TestSilicaGelAlongThePour: a point of the pour gels throughout the tank
// only between about pH 3 and 10, or once the tank has crossed that range
// from where it started (Iler, The Chemistry of Silica, 1979, gel time
// against pH, from memory).
func TestSilicaGelAlongThePour(t *testing.T) {
	hs := []engine.Hazard{{Code: "silica-gel", Severity: engine.Warning}}
	tank := func(ph float64) func() float64 { return func() float64 { return ph } }
	for _, c := range []struct {
		name       string
		ph, tankPH float64
		want       bool
	}{
		{"silicate tank, acid in deficit", 12, 13, false},
		{"middle of the range", 7, 13, true},
		{"acid tank, silicate in deficit", 1, 0.5, false},
		{"acid tank crossed to alkaline", 12, 0.5, true},
		{"silicate tank crossed to acid", 1, 13, true},
	} {
		o := &Outcome{PH: c.ph}
		if got := len(AlongPourAt(hs, o, tank(c.tankPH))) == 1; got != c.want {
			t.Errorf("%s: silica-gel kept %v, want %v", c.name, got, c.want)
		}
	}
}

// TestWithoutSlowDosing: an action that says adding slowly does not help
// (a catalyst that is not used up) takes "add slowly" out of the others,
// and leaves actions alone otherwise.
func TestWithoutSlowDosing(t *testing.T) {
	in := []string{"Do not combine in a closed space. Add slowly with extraction running, away from hypochlorite.", catalysedAction}
	got := withoutSlowDosing(append([]string(nil), in...))
	if got[0] != "Do not combine in a closed space. Work with extraction running, away from hypochlorite." || got[1] != catalysedAction {
		t.Errorf("withoutSlowDosing = %q", got)
	}
	plain := []string{"Do not combine in a closed space. Add slowly with extraction running, away from hypochlorite."}
	if got := withoutSlowDosing(plain); got[0] != plain[0] {
		t.Errorf("without a catalyst action: %q, want unchanged", got)
	}
}
