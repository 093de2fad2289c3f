package pour

import (
	"slices"
	"strings"
	"testing"

	"mixward/engine"
)

// fakeEval raises "gas" as a danger whenever the acid stream (named "acid")
// is in excess of the base by volume (with some base in), and "warm" as a warning past half the
// final ratio: enough to check the ranges and the advice without the engine.
func fakeEval(req *engine.Request) ([]engine.Hazard, error) {
	vol := map[string]float64{}
	for _, s := range req.Streams {
		vol[s.Text] += s.VolumeL
	}
	var hs []engine.Hazard
	if vol["acid"] > vol["base"] && vol["base"] > 0 { // each alone has nothing
		hs = append(hs, engine.Hazard{Code: "gas", Severity: engine.Danger})
	}
	if vol["acid"] >= 0.5 && vol["base"] >= 0.5 {
		hs = append(hs, engine.Hazard{Code: "warm", Severity: engine.Warning})
	}
	hs = append(hs, engine.Hazard{Code: "note", Severity: engine.Info})
	return hs, nil
}

func TestAnalyseTwoStreams(t *testing.T) {
	req := &engine.Request{Streams: []engine.Stream{{Text: "acid", VolumeL: 1}, {Text: "base", VolumeL: 1}}}
	add := Analyse(req, fakeEval)
	if len(add.Orders) != 2 || add.Points != 2*len(fractions) {
		t.Fatalf("orders %d, points %d", len(add.Orders), add.Points)
	}
	// base into acid: the tank is all acid at first, so gas from the first drop
	// until the base catches up (never: volumes equal only at the end).
	bIntoA := add.Orders[0]
	if bIntoA.Added != "base" || bIntoA.Into != "acid" {
		t.Fatalf("first order %s into %s", bIntoA.Added, bIntoA.Into)
	}
	got := map[string]engine.PourHazard{}
	for _, h := range bIntoA.Hazards {
		got[h.Code] = h
	}
	if g := got["gas"]; g.FromFraction != fractions[0] || g.ToFraction != 0.995 || g.Worst != engine.Danger {
		t.Errorf("gas along base into acid: %+v", g)
	}
	if w := got["warm"]; w.FromFraction != 0.5 || w.ToFraction != 1 {
		t.Errorf("warm along base into acid: %+v", w)
	}
	if _, ok := got["note"]; ok {
		t.Error("info hazards are not pour hazards")
	}
	// acid into base never has acid in excess.
	for _, h := range add.Orders[1].Hazards {
		if h.Code == "gas" {
			t.Errorf("gas while acid runs into base: %+v", h)
		}
	}
	if !strings.HasPrefix(add.Advice, "Add acid into base, slowly; never base into acid") {
		t.Errorf("advice %q", add.Advice)
	}
}

func TestAnalyseThreeStreamsAndNeither(t *testing.T) {
	// Any two streams meet the hazard; one alone has none (a stream's own
	// hazards are not the pour's).
	always := func(req *engine.Request) ([]engine.Hazard, error) {
		if len(req.Streams) < 2 {
			return nil, nil
		}
		return []engine.Hazard{{Code: "gas", Severity: engine.Danger, Gas: &engine.GasJudged{Ratio: 100}}}, nil
	}
	req := &engine.Request{Streams: []engine.Stream{{Text: "a"}, {Text: "b"}, {Text: "c", MassKg: 2}}}
	add := Analyse(req, always)
	if len(add.Orders) != 6 {
		t.Fatalf("three streams give %d orders, want each pair both ways (6)", len(add.Orders))
	}
	if strings.Count(add.Advice, "Neither order is safe") != 3 {
		t.Errorf("advice %q", add.Advice)
	}
	if Analyse(&engine.Request{Streams: req.Streams[:1]}, always) != nil {
		t.Error("one stream has no pour")
	}
}

func TestFractionsDenserAtTheEnds(t *testing.T) {
	Fractions := Fractions()
	if len(Fractions) < 20 || len(Fractions) > 40 || Fractions[len(Fractions)-1] != 1 {
		t.Fatalf("%d fractions ending at %g", len(Fractions), Fractions[len(Fractions)-1])
	}
	mid := Fractions[12] - Fractions[11]
	if !(Fractions[1]-Fractions[0] < mid && Fractions[len(Fractions)-1]-Fractions[len(Fractions)-2] < mid) {
		t.Error("fractions are not denser near the ends")
	}
	for i := 1; i < len(Fractions); i++ {
		if Fractions[i] <= Fractions[i-1] {
			t.Errorf("fractions not increasing at %d", i)
		}
	}
}

// TestSequencesFindTheSafeOne: caustic, acid and bleach. Chlorine comes off
// only while bleach meets more acid than caustic; run the acid into the
// caustic first and the bleach last and nothing is met, although the pair
// bleach–acid is unsafe either way on its own (common practice, no source:
// neutralise first, then add the hypochlorite).
func TestSequencesFindTheSafeOne(t *testing.T) {
	eval := func(req *engine.Request) ([]engine.Hazard, error) {
		vol := map[string]float64{}
		for _, s := range req.Streams {
			vol[s.Text] += s.VolumeL
		}
		if vol["bleach"] > 0 && vol["acid"] > vol["base"]+1e-9 {
			return []engine.Hazard{{Code: "chlorine", Severity: engine.Danger}}, nil
		}
		return nil, nil
	}
	req := &engine.Request{Streams: []engine.Stream{{Text: "bleach", VolumeL: 1}, {Text: "base", VolumeL: 1.2}, {Text: "acid", VolumeL: 1}}}
	add := Analyse(req, eval)
	if len(add.Sequences) != 6 {
		t.Fatalf("%d sequences, want 6", len(add.Sequences))
	}
	best := add.Sequences[0]
	if best.Worst != "" {
		t.Fatalf("best sequence %v meets %s", best.Streams, best.Worst)
	}
	// The bleach goes in last: acid run into a tank holding bleach and
	// caustic meets the bleach where it lands, before the caustic (common
	// practice, no source: never add acid to a tank containing hypochlorite).
	if best.Streams[2] != "bleach" {
		t.Errorf("best sequence %v does not end with the bleach", best.Streams)
	}
	for _, s := range add.Sequences {
		if s.Streams[0] == "bleach" && s.Streams[1] == "base" && s.Worst != engine.Danger {
			t.Errorf("sequence %v (acid last, into bleach and caustic) meets %q, want danger where the acid lands", s.Streams, s.Worst)
		}
	}
	if last := add.Sequences[5]; last.Worst != engine.Danger {
		t.Errorf("worst sequence %v meets %q, want danger", last.Streams, last.Worst)
	}
	if !strings.HasPrefix(add.Advice, "In sequence: start with ") || !strings.Contains(add.Advice, "that sequence keeps apart the streams that meet chlorine") {
		t.Errorf("advice %q", add.Advice)
	}
	// Each distinct step is judged once: 6 pair orders and 3 second steps,
	// each second step also where the added stream lands.
	if want := 9*len(fractions) + 3*len(inletShares); add.Points != want {
		t.Errorf("points %d, want %d", add.Points, want)
	}
	// Five streams are not searched.
	five := &engine.Request{Streams: append(slices.Clone(req.Streams), engine.Stream{Text: "d"}, engine.Stream{Text: "e"})}
	if s := Analyse(five, eval).Sequences; s != nil {
		t.Errorf("five streams gave %d sequences", len(s))
	}
}

// TestLocalHazardsLeadTheOrder: the hazards where the added stream lands
// come first in its order from the first drop, and steer the advice, even
// when the mix as a whole meets nothing.
func TestLocalHazardsLeadTheOrder(t *testing.T) {
	quiet := func(*engine.Request) ([]engine.Hazard, error) { return nil, nil }
	local := func(added engine.Stream, tank []engine.Stream) []engine.PourHazard {
		if added.Text == "water" && len(tank) == 1 && tank[0].Text == "oleum" {
			return []engine.PourHazard{{Code: "boils", FromFraction: fractions[0], ToFraction: 1, Worst: engine.Danger}}
		}
		return nil
	}
	req := &engine.Request{Streams: []engine.Stream{{Text: "water", VolumeL: 10}, {Text: "oleum", VolumeL: 1}}}
	add := AnalyseLocal(req, quiet, local)
	var got []string
	for _, o := range add.Orders {
		if len(o.Hazards) > 0 {
			got = append(got, o.Added+">"+o.Into+":"+o.Hazards[0].Code)
		}
	}
	if len(got) != 1 || got[0] != "water>oleum:boils" {
		t.Errorf("orders with hazards %v, want only water into oleum boiling", got)
	}
	if !strings.HasPrefix(add.Advice, "Add oleum into water, slowly; never water into oleum") {
		t.Errorf("advice %q", add.Advice)
	}
}

// TestInletJudgesNoHeat: where a stream lands in a tank of two or more
// streams, a gas met in local excess is reported, heat is not: a stream's
// whole heat set free in a hundredth of the tank is no state the tank
// passes through (caustic flakes, then ferrous sulfate, into water read
// "near boiling" from the first drop).
func TestInletJudgesNoHeat(t *testing.T) {
	eval := func(req *engine.Request) ([]engine.Hazard, error) {
		vol := map[string]float64{}
		for _, s := range req.Streams {
			vol[s.Text] += s.VolumeL + s.MassKg
		}
		var hs []engine.Hazard
		if vol["salt"] > vol["water"] && vol["water"] > 0 { // the salt alone has nothing
			hs = append(hs, engine.Hazard{Code: "near-boiling", Severity: engine.Danger, Heat: &engine.HeatJudged{ReachedC: 95}})
			hs = append(hs, engine.Hazard{Code: "fumes", Severity: engine.Danger})
		}
		return hs, nil
	}
	req := &engine.Request{Streams: []engine.Stream{{Text: "water", VolumeL: 200}, {Text: "lye", VolumeL: 20}, {Text: "salt", MassKg: 5}}}
	add := Analyse(req, eval)
	found := false
	for _, s := range add.Sequences {
		if s.Streams[2] != "salt" {
			continue
		}
		last := s.Steps[1]
		for _, h := range last.Hazards {
			if strings.HasPrefix(h.Message, "where salt lands") {
				if h.Code != "fumes" {
					t.Errorf("sequence %v: inlet reports %s, a heat code", s.Streams, h.Code)
				}
				found = true
			}
		}
	}
	if !found {
		t.Error("the gas where the salt lands is not reported")
	}
}

// An order that passes through the milder heat hazards on its way to
// boiling is named by the hottest only; gases are all named.
func TestCodesNameTheHottestHeatOnly(t *testing.T) {
	o := engine.PourOrder{Hazards: []engine.PourHazard{
		{Code: "warms"}, {Code: "scalding-heat"}, {Code: "hcn-release"}, {Code: "near-boiling"}, {Code: "boils"}, {Code: "warms"},
	}}
	if got, want := codes(o), "hcn-release, boils"; got != want {
		t.Errorf("codes = %q, want %q", got, want)
	}
	o.Hazards = o.Hazards[:3]
	if got, want := codes(o), "scalding-heat, hcn-release"; got != want {
		t.Errorf("codes = %q, want %q", got, want)
	}
}

// TestDoseTheSmallerStream: when both orders meet the same level, the
// advice never runs a stream ten times larger into the other to shorten
// the stretch: it doses the smaller into the larger (common practice, no
// source: a drum of peroxide is dosed into the rinse tank).
func TestDoseTheSmallerStream(t *testing.T) {
	h := []engine.PourHazard{{Code: "cyanide-oxidation", Worst: engine.Warning, FromFraction: 0.5, ToFraction: 1}}
	bulk := engine.PourOrder{Added: "rinse", Into: "peroxide", AddedL: 800, IntoL: 5, Hazards: h}
	drum := engine.PourOrder{Added: "peroxide", Into: "rinse", AddedL: 5, IntoL: 800,
		Hazards: []engine.PourHazard{{Code: "cyanide-oxidation", Worst: engine.Warning, FromFraction: 0.001, ToFraction: 1}}}
	if got := pairAdvice(&bulk, &drum); !strings.HasPrefix(got, "Dose peroxide slowly into rinse") || !drum.Advised || bulk.Advised {
		t.Errorf("advice %q", got)
	}
}

// TestOneRuleForTheOrder: the advice chooses by Rank, which leaves out a
// mere warm-up, as the decision's title does; the written order is judged
// by the same choice; a treatment reagent is dosed into the much larger
// tank when what it meets beyond the other order is a gas that holding the
// pH prevents (hypochlorite into a cyanide rinse held at pH 10.5 or more
// under ORP control: common practice, no source).
func TestOneRuleForTheOrder(t *testing.T) {
	warn := func(code string, from float64) engine.PourHazard {
		return engine.PourHazard{Code: code, Worst: engine.Warning, FromFraction: from, ToFraction: 1}
	}
	// Peroxide into stannous chloride scalds; the other way only warms,
	// over more of the pour.
	hot := engine.PourOrder{Added: "peroxide", Into: "tin", AddedL: 20, IntoL: 100,
		Hazards: []engine.PourHazard{{Code: "warms", Worst: engine.Warning, FromFraction: 0.07, ToFraction: 0.2}, {Code: "scalding-heat", Worst: engine.Warning, FromFraction: 0.3, ToFraction: 0.8}}}
	mild := engine.PourOrder{Added: "tin", Into: "peroxide", AddedL: 100, IntoL: 20, Hazards: []engine.PourHazard{warn("warms", 0.07)}}
	if got := pairAdvice(&hot, &mild); !strings.HasPrefix(got, "Add tin into peroxide") || !mild.Advised || hot.Advised || strings.Contains(got, "warms") {
		t.Errorf("advice %q, advised %v/%v", got, mild.Advised, hot.Advised)
	}
	// 600 L of rinse into 30 L of bleach meets less, but the bleach is
	// dosed into the rinse with its pH held.
	bulk := engine.PourOrder{Added: "rinse", Into: "bleach", AddedL: 600, IntoL: 30, Hazards: []engine.PourHazard{warn("cyanide-oxidation", 0.001)}}
	dose := engine.PourOrder{Added: "bleach", Into: "rinse", AddedL: 30, IntoL: 600, Hazards: []engine.PourHazard{
		{Code: "hcn-release", Worst: engine.Danger, FromFraction: 0.001, ToFraction: 0.3}, warn("cyanide-oxidation", 0.001)}}
	if got := pairAdvice(&bulk, &dose); !strings.HasPrefix(got, "Dose bleach slowly into rinse, under control, holding the pH at 10.5 or more") || !dose.Advised || !dose.Dosed || bulk.Advised {
		t.Errorf("advice %q, advised %v/%v", got, dose.Advised, bulk.Advised)
	}
	// A danger the pH does not decide is not dosed into: the larger stream
	// still runs into the smaller.
	bulk.Advised, dose.Advised, dose.Dosed = false, false, false
	dose.Hazards[0].Code = "nitrogen-trichloride"
	if got := pairAdvice(&bulk, &dose); !strings.HasPrefix(got, "Add rinse into bleach") || !bulk.Advised || dose.Advised {
		t.Errorf("advice %q", got)
	}
	// Written: acid written into a silicate tank that it is advised into
	// is not the worse order, whatever meets its hazard sooner.
	acid := engine.PourOrder{Added: "acid", Into: "silicate", AddedL: 20, IntoL: 400, Hazards: []engine.PourHazard{warn("silica-gel", 0.001)}}
	sil := engine.PourOrder{Added: "silicate", Into: "acid", AddedL: 400, IntoL: 20, Hazards: []engine.PourHazard{warn("silica-gel", 0.003)}}
	add := &engine.Addition{Orders: []engine.PourOrder{sil, acid}}
	add.Advice = advice(add)
	Written(add, &engine.Request{PourInto: true, Streams: make([]engine.Stream, 2)})
	if add.Written == nil || add.Written.Worse || strings.Contains(add.Advice, "worse") || !add.Orders[1].Advised {
		t.Errorf("written %+v, advice %q", add.Written, add.Advice)
	}
}

// TestStreamsOwnHazardsAreNotThePours: a hazard the tank or the added
// stream has by itself, as loud, is not met along the pour (caustic dosed
// into a cyanide liquor does not release its hydrogen cyanide; water run
// into strong ammonia does not raise its fumes); one the pour makes louder
// is.
func TestStreamsOwnHazardsAreNotThePours(t *testing.T) {
	eval := func(req *engine.Request) ([]engine.Hazard, error) {
		vol := map[string]float64{}
		for _, s := range req.Streams {
			vol[s.Text] += s.VolumeL
		}
		var hs []engine.Hazard
		if vol["cyanide"] > 0 {
			// The liquor's own trace over its headspace; acid makes it louder.
			r := 2.0
			if vol["acid"] > 0 {
				r = 500
			}
			hs = append(hs, engine.Hazard{Code: "hcn-release", Severity: engine.Danger, Gas: &engine.GasJudged{Formula: "HCN", Ratio: r}})
		}
		return hs, nil
	}
	for _, tc := range []struct {
		other string
		want  bool
	}{{"caustic", false}, {"acid", true}} {
		req := &engine.Request{Streams: []engine.Stream{{Text: "cyanide", VolumeL: 100}, {Text: tc.other, VolumeL: 10}}}
		add := Analyse(req, eval)
		for _, o := range add.Orders {
			got := false
			for _, h := range o.Hazards {
				got = got || h.Code == "hcn-release"
			}
			if got != tc.want {
				t.Errorf("%s into %s: hcn-release met %v, want %v", o.Added, o.Into, got, tc.want)
			}
		}
	}
}
