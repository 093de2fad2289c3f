package store

import (
	"context"
	"errors"
	"fmt"
	"reflect"
	"strings"
	"testing"
	"time"
	"unicode"
)

// searchFixture logs nine queries ten minutes apart from t0 (ids 1–9).
func searchFixture(t *testing.T, b backend) *DB {
	t.Helper()
	c := newClock(t0)
	db, _ := b.mustOpen(t, c.Now)
	mk := func(user, req, verdict, errText string, species []string, hz ...Hazard) *Query {
		return &Query{UserID: "U-" + user, UserName: user, Channel: "C0SHIFT", Request: req, Verdict: verdict,
			Error: errText, Species: species, Hazards: hz}
	}
	for _, q := range []*Query{
		/*1*/ mk("op.north", "mix 200 L NaOCl 12.5 % + 50 L HCl 10 %", VerdictSpontaneous, "", []string{"OCl-", "H+", "Cl-"},
			Hazard{"CL2-GAS", "danger", "chlorine gas is released"}),
		/*2*/ mk("op.south", `mix "T-101" + (HCl) NEAR tank*`, VerdictError, `unknown word "NEAR"`, nil),
		/*3*/ mk("op.north", "mix 20 L CuSO4 0.5 M + 2 kg Zn", VerdictSpontaneous, "", []string{"Cu^2+", "SO4^2-", "Zn(s)"}),
		/*4*/ mk("op.north", "mix 100 L KMnO4 0.02 M + 10 L FeSO4 0.1 M", VerdictSpontaneous, "", []string{"MnO4-", "Fe^2+", "H+"},
			Hazard{"HEAT", "warning", "temperature rises"}),
		/*5*/ mk("op.south", "rinse -HCl tank OR drain", VerdictError, "no streams", nil),
		/*6*/ mk("opérateur.é", "Café crème + NaOH 1 M", VerdictNoReaction, "", []string{"Na+", "OH-"}),
		/*7*/ mk("op.east", "混合 水処理 NaOCl", VerdictNoReaction, "", []string{"OCl-"}),
		/*8*/ mk("op.east", "mix 10 L H2O2 3 % + 1 L NaOCl 12.5 %", VerdictSpontaneous, "", []string{"H2O2", "OCl-"},
			Hazard{"O2-GAS", "warning", "oxygen gas"}),
		/*9*/ demoQuery(), // "mix T-101 + 40 L HCl 1 M", resolved to NaOCl; op.north, U0TK1
	} {
		mustLog(t, db, q)
		c.Add(10 * time.Minute)
	}
	return db
}

func ids(qs []*Query) []int64 {
	out := []int64{}
	for _, q := range qs {
		out = append(out, q.ID)
	}
	return out
}

func TestSearchHostileTerms(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		db := searchFixture(t, b)
		ctx := context.Background()
		none := []int64{}
		for _, tc := range []struct {
			terms string
			want  []int64
		}{
			{"NaOCl", []int64{9, 8, 7, 1}}, // 9 through its resolved text
			{"naocl", []int64{9, 8, 7, 1}},
			{`"NaOCl`, []int64{9, 8, 7, 1}}, // unclosed quote
			{`NaOCl"`, []int64{9, 8, 7, 1}},
			{`'NaOCl'`, []int64{9, 8, 7, 1}},
			{`NaOCl*`, []int64{9, 8, 7, 1}},
			{`NaO*`, none},         // * is not a prefix operator: no row has the word "nao"
			{`Na*`, []int64{9, 6}}, // the word "na" (from Na+), not NaOCl or NaOH
			{`NEAR`, []int64{2}},
			{`tank NEAR HCl`, []int64{2}},   // all three words, not a NEAR query
			{`NEAR/3`, none},                // "near" and "3": no row has both
			{`-HCl`, []int64{9, 5, 2, 1}},   // not a negation
			{`HCl -tank`, []int64{5, 2}},    // both words required
			{`HCl OR CuSO4`, none},          // OR is a word, not an operator
			{`NaOCl NOT HCl`, none},         // likewise NOT
			{`HCl AND NaOCl`, none},         // and AND
			{`(HCl)`, []int64{9, 5, 2, 1}},  // parentheses dropped
			{`((`, none},                    // nothing searchable
			{`)`, none},                     //
			{`*`, none},                     //
			{`"`, none},                     //
			{`""`, none},                    //
			{`-`, none},                     //
			{`^`, none},                     //
			{`request:NaOCl`, none},         // not a column filter
			{`species:MnO4`, none},          //
			{`Fe^2+`, []int64{4}},           // phrase "fe 2"
			{`MnO4-`, []int64{4}},           //
			{`Zn(s)`, []int64{3}},           // phrase "zn s"
			{`Cu(s)`, none},                 // Cu^2+ and Zn(s) are in row 3 but "cu s" is not a phrase there
			{`café`, []int64{6}},            //
			{`CAFÉ`, []int64{6}},            //
			{`cafe`, []int64{6}},            // accents folded
			{`opérateur`, none},             // user names are filtered, not searched
			{`水処理`, []int64{7}},             //
			{`混合 NaOCl`, []int64{7}},        //
			{`chlorine gas`, []int64{9, 1}}, // hazard message
			{`"released chlorine"`, none},   // a phrase keeps its order
			{`"chlorine gas"`, []int64{9, 1}},
			{`CL2-GAS`, []int64{9, 1}}, // hazard code
			{`gas`, []int64{9, 8, 1}},
			{`T-101`, []int64{9, 2}},
			{`'; DROP TABLE queries; --`, none},
			{`%`, none},
			{`_`, none},
			{"NaOCl\x00", []int64{9, 8, 7, 1}},
			{"\xff\xfeNaOCl", []int64{9, 8, 7, 1}},
			{"💥", none},
			{strings.Repeat("HCl ", 2000), []int64{9, 5, 2, 1}},
			{strings.Repeat("x", 10000), none},
			{strings.Repeat("(", 500) + "HCl" + strings.Repeat(")", 500), []int64{9, 5, 2, 1}},
		} {
			name := tc.terms
			if len(name) > 40 {
				name = name[:40]
			}
			t.Run(name, func(t *testing.T) {
				page, err := db.Search(ctx, SearchOptions{Terms: tc.terms})
				if err != nil {
					t.Fatalf("Search(%q): %v", tc.terms, err)
				}
				if got := ids(page.Queries); !reflect.DeepEqual(got, tc.want) {
					t.Errorf("Search(%q) = %v, want %v (phrases %q)", tc.terms, got, tc.want, page.Phrases)
				}
			})
		}
		if n, err := db.Count(ctx); err != nil || n != 9 {
			t.Errorf("after hostile searches Count = %d, %v", n, err)
		}
	})
}

func TestSearchFilters(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		db := searchFixture(t, b)
		ctx := context.Background()
		for _, tc := range []struct {
			name string
			o    SearchOptions
			want []int64
		}{
			{"all", SearchOptions{}, []int64{9, 8, 7, 6, 5, 4, 3, 2, 1}},
			{"verdict error", SearchOptions{Verdict: VerdictError}, []int64{5, 2}},
			{"verdict no-reaction", SearchOptions{Verdict: VerdictNoReaction}, []int64{7, 6}},
			{"user name any case", SearchOptions{User: "OP.NORTH"}, []int64{9, 4, 3, 1}},
			{"user id", SearchOptions{User: "U0TK1"}, []int64{9}},
			{"unicode user", SearchOptions{User: "opérateur.é"}, []int64{6}},
			{"hazard code any case", SearchOptions{Hazard: "cl2-gas"}, []int64{9, 1}},
			{"hazard HEAT", SearchOptions{Hazard: "HEAT"}, []int64{9, 4}},
			{"hazard unknown", SearchOptions{Hazard: "NOPE"}, []int64{}},
			{"any of several hazard codes", SearchOptions{HazardAny: []string{"nope", "Cl2-gas", "heat"}}, []int64{9, 4, 1}},
			{"any of no known codes", SearchOptions{HazardAny: []string{"nope"}}, []int64{}},
			{"since", SearchOptions{Since: t0.Add(60 * time.Minute)}, []int64{9, 8, 7}},
			{"until", SearchOptions{Until: t0.Add(20 * time.Minute)}, []int64{2, 1}},
			{"window and terms", SearchOptions{Terms: "HCl", Since: t0.Add(30 * time.Minute), Until: t0.Add(60 * time.Minute)}, []int64{5}},
			{"window before all", SearchOptions{Terms: "HCl", Until: t0}, []int64{}},
			{"window after all", SearchOptions{Terms: "HCl", Since: t0.Add(24 * time.Hour)}, []int64{}},
			{"terms and user", SearchOptions{Terms: "NaOCl", User: "op.east"}, []int64{8, 7}},
			{"terms, verdict, hazard", SearchOptions{Terms: "gas", Verdict: VerdictSpontaneous, Hazard: "O2-GAS"}, []int64{8}},
		} {
			t.Run(tc.name, func(t *testing.T) {
				page, err := db.Search(ctx, tc.o)
				if err != nil {
					t.Fatal(err)
				}
				if got := ids(page.Queries); !reflect.DeepEqual(got, tc.want) {
					t.Errorf("Search(%+v) = %v, want %v", tc.o, got, tc.want)
				}
			})
		}
	})
}

func TestSearchPaging(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		db := searchFixture(t, b)
		ctx := context.Background()
		var all []int64
		o := SearchOptions{Limit: 4}
		for pages := 0; ; pages++ {
			if pages > 5 {
				t.Fatal("paging does not end")
			}
			page, err := db.Search(ctx, o)
			if err != nil {
				t.Fatal(err)
			}
			all = append(all, ids(page.Queries)...)
			if !page.HasMore {
				if len(page.Queries) != 1 || page.NextOffset != 0 {
					t.Errorf("last page = %v next %d, want one row and no next offset", ids(page.Queries), page.NextOffset)
				}
				break
			}
			if len(page.Queries) != 4 || page.NextOffset != o.Offset+4 {
				t.Errorf("page at %d = %v next %d", o.Offset, ids(page.Queries), page.NextOffset)
			}
			o.Offset = page.NextOffset
		}
		if want := []int64{9, 8, 7, 6, 5, 4, 3, 2, 1}; !reflect.DeepEqual(all, want) {
			t.Errorf("pages = %v, want %v", all, want)
		}
		page, _ := db.Search(ctx, SearchOptions{Limit: 1, Offset: 9})
		if len(page.Queries) != 0 || page.HasMore {
			t.Errorf("page past the end = %+v", page)
		}
		page, _ = db.Search(ctx, SearchOptions{Limit: 5000})
		if page.Limit != MaxLimit {
			t.Errorf("Limit 5000 used as %d, want %d", page.Limit, MaxLimit)
		}
	})
}

func TestSearchInvalid(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		db := searchFixture(t, b)
		for _, o := range []SearchOptions{{Verdict: "dangerous"}, {Offset: -1}} {
			if _, err := db.Search(context.Background(), o); !errors.Is(err, ErrInvalid) {
				t.Errorf("Search(%+v) = %v, want ErrInvalid", o, err)
			}
		}
	})
}

func TestPhrases(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want []string
	}{
		{"", nil},
		{"NaOCl HCl", []string{"naocl", "hcl"}},
		{`"sodium hypochlorite" acid`, []string{"sodium hypochlorite", "acid"}},
		{`"open quote runs on`, []string{"open quote runs on"}},
		{"Fe^2+ MnO4-", []string{"fe 2", "mno4"}},
		{"NEAR/3 a*b", []string{"near 3", "a b"}},
		{"\t\n  ", nil},
		{"Ünïcödé", []string{"ünïcödé"}},
	} {
		if got := Phrases(tc.in); !reflect.DeepEqual(got, tc.want) {
			t.Errorf("Phrases(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

// FuzzSearch checks that no search text makes SQLite or FTS fail, and that
// every row returned holds every phrase's words.
func FuzzSearch(f *testing.F) {
	for _, s := range []string{"NaOCl", `"a`, "NEAR(a b)", "-x", "a* OR b", "^c", "col:x", "((", "é", "水", "\x00", "'"} {
		f.Add(s)
	}
	c := newClock(t0)
	db, _ := mustOpen(f, c.Now)
	for _, req := range []string{"mix NaOCl + HCl", `weird "quoted" (text) NEAR* -minus ^caret`, "Café 水処理 Fe^2+"} {
		q := demoQuery()
		q.Request, q.Resolved, q.Hazards, q.Species = req, "", nil, nil
		mustLog(f, db, q)
	}
	f.Fuzz(func(t *testing.T, terms string) {
		page, err := db.Search(context.Background(), SearchOptions{Terms: terms})
		if errors.Is(err, ErrInvalid) && strings.Contains(err.Error(), "at most") {
			return // over the documented term and word limits: refused with a clear message, nothing searched
		}
		if err != nil {
			t.Fatalf("Search(%q): %v", terms, err)
		}
		for _, q := range page.Queries {
			text := " " + strings.Join(wordsOf(q.Request), " ") + " "
			for _, p := range page.Phrases {
				for _, w := range strings.Fields(p) {
					if !strings.Contains(text, " "+foldAccents(w)+" ") {
						t.Errorf("Search(%q) returned %q, which lacks %q", terms, q.Request, w)
					}
				}
			}
		}
	})
}

// wordsOf splits s into folded words the way the search does.
func wordsOf(s string) []string {
	var out []string
	for _, p := range Phrases(s) {
		for _, w := range strings.Fields(p) {
			out = append(out, foldAccents(w))
		}
	}
	return out
}

// foldAccents folds the few accented letters the fuzz corpus uses and drops
// combining marks, as the unicode61 tokenizer does.
func foldAccents(s string) string {
	s = strings.NewReplacer("é", "e", "è", "e", "ü", "u", "ö", "o", "ï", "i").Replace(s)
	return strings.Map(func(r rune) rune {
		if unicode.Is(unicode.Mn, r) {
			return -1
		}
		return r
	}, s)
}

func TestSearchIndexCatchesUp(t *testing.T) {
	c := newClock(t0)
	db, path := mustOpen(t, c.Now)
	ctx := context.Background()
	logN(t, db, c, 2*indexBatch+22)
	mark := func() int64 {
		var n int64
		if err := db.r.QueryRowContext(ctx, `SELECT indexed_upto FROM search_state`).Scan(&n); err != nil {
			t.Fatal(err)
		}
		return n
	}
	if got := mark(); got != 2*indexBatch {
		t.Errorf("indexed up to %d after %d queries, want %d (batches of %d)", got, 2*indexBatch+22, 2*indexBatch, indexBatch)
	}
	// The newest query is not yet indexed: Search indexes it first.
	last := int64(2*indexBatch + 22)
	page, err := db.Search(ctx, SearchOptions{Terms: fmt.Sprintf("T-%d", 100+last)})
	if err != nil || len(page.Queries) != 1 || page.Queries[0].ID != last {
		t.Fatalf("Search(newest) = %v, %v", ids(page.Queries), err)
	}
	if got := mark(); got != last {
		t.Errorf("indexed up to %d after a search, want %d", got, last)
	}
	logN(t, db, c, 3)
	db.Close()
	var n int64
	rawDB(t, path).QueryRow(`SELECT indexed_upto FROM search_state`).Scan(&n)
	if n != last+3 {
		t.Errorf("indexed up to %d after Close, want %d", n, last+3)
	}
}

// TestSearchWindowClockStepBack logs rows whose times go backwards (a clock
// stepped back) and checks that time windows still find every row.
func TestSearchWindowClockStepBack(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		db, _ := b.mustOpen(t, nil)
		ctx := context.Background()
		for i, min := range []int{0, 10, 20, 5, 30} { // the fourth row is earlier than the third
			q := demoQuery()
			q.Time = t0.Add(time.Duration(min) * time.Minute)
			q.Request = fmt.Sprintf("mix T-%d + HCl", 101+i)
			mustLog(t, db, q)
		}
		var broken bool
		db.r.QueryRowContext(ctx, `SELECT time_order_broken FROM search_state`).Scan(&broken)
		if !broken {
			t.Error("time_order_broken not set after a row earlier than the one before it")
		}
		for _, tc := range []struct {
			since, until int
			want         []int64
		}{
			{0, 8, []int64{4, 1}},
			{4, 6, []int64{4}},
			{5, 25, []int64{4, 3, 2}},
			{25, 60, []int64{5}},
		} {
			o := SearchOptions{Terms: "HCl", Since: t0.Add(time.Duration(tc.since) * time.Minute), Until: t0.Add(time.Duration(tc.until) * time.Minute)}
			page, err := db.Search(ctx, o)
			if err != nil || !reflect.DeepEqual(ids(page.Queries), tc.want) {
				t.Errorf("window %d–%d min: %v, %v; want %v", tc.since, tc.until, ids(page.Queries), err, tc.want)
			}
		}
	})
}

func TestSearchWindowEqualTimes(t *testing.T) {
	eachBackend(t, func(t *testing.T, b backend) {
		db, _ := b.mustOpen(t, newClock(t0).Now) // every row at the same instant
		ctx := context.Background()
		for i := 0; i < 5; i++ {
			mustLog(t, db, demoQuery())
		}
		page, err := db.Search(ctx, SearchOptions{Terms: "HCl", Since: t0, Until: t0.Add(time.Second)})
		if err != nil || !reflect.DeepEqual(ids(page.Queries), []int64{5, 4, 3, 2, 1}) {
			t.Errorf("equal times: %v, %v", ids(page.Queries), err)
		}
	})
}
