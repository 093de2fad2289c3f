package bot

import (
	"errors"
	"reflect"
	"strings"
	"testing"
	"time"
	"unicode/utf8"
)

func TestCleanText(t *testing.T) {
	for _, tc := range []struct {
		in, bot, want string
	}{
		{"<@UBOT> mix 200 L NaOCl 12.5 % + 50 L HCl 10 %", "UBOT", "mix 200 L NaOCl 12.5 % + 50 L HCl 10 %"},
		{"<@UBOT|mixward>   help", "UBOT", "help"},
		{"hey <@UBOT> streams", "UBOT", "hey streams"},
		{"<@UOTHER> <@UBOT> help", "UBOT", "<@UOTHER> help"},               // other mentions stay
		{"<@UBOT> <@UBOT> help", "", "help"},                               // bot unknown: leading mentions go
		{"search <@UOP> verdict:error", "", "search <@UOP> verdict:error"}, // inside: kept
		{"search user:<@UOP>", "", "search user:<@UOP>"},                   // part of a word: kept
		{"mix 1 L NaOCl 12.5 % <@UBOT>", "", "mix 1 L NaOCl 12.5 %"},       // trailing: dropped
		{"mix 1 L NaOCl &gt; 5 % &amp; more &lt;x", "", "mix 1 L NaOCl > 5 % & more <x"},
		{"mix <http://example.invalid|T-101> + T-204", "", "mix T-101 + T-204"},
		{"see <https://example.invalid/a>", "", "see https://example.invalid/a"},
		{"mix\u00a0200\u00a0L NaOCl\n12.5 %", "", "mix 200 L NaOCl 12.5 %"},
		{"   ", "", ""},
	} {
		if got := CleanText(tc.in, tc.bot); got != tc.want {
			t.Errorf("CleanText(%q, %q) = %q, want %q", tc.in, tc.bot, got, tc.want)
		}
	}
}

func TestParseCommand(t *testing.T) {
	utc := time.UTC
	day := func(s string) time.Time { t, _ := time.Parse("2006-01-02", s); return t }
	for _, tc := range []struct {
		in      string
		want    Command
		wantErr string
	}{
		{in: "", want: Command{Kind: KindHelp}},
		{in: "HELP", want: Command{Kind: KindHelp, Text: "HELP"}},
		{in: "mix 200 L NaOCl 12.5 % + 50 L HCl 10 %", want: Command{Kind: KindMix, Text: "mix 200 L NaOCl 12.5 % + 50 L HCl 10 %"}},
		{in: "200 L NaOCl 12.5 % + T-204", want: Command{Kind: KindMix, Text: "200 L NaOCl 12.5 % + T-204"}},
		{in: "streams", want: Command{Kind: KindStreams, Text: "streams", Action: "list"}},
		{in: "streams list", want: Command{Kind: KindStreams, Text: "streams list", Action: "list"}},
		{in: "streams t-101", want: Command{Kind: KindStreams, Text: "streams t-101", Action: "show", Tag: "T-101"}},
		{in: "streams show T-101", want: Command{Kind: KindStreams, Text: "streams show T-101", Action: "show", Tag: "T-101"}},
		{in: "streams history T-101", want: Command{Kind: KindStreams, Text: "streams history T-101", Action: "history", Tag: "T-101"}},
		{in: "streams rm T-101", want: Command{Kind: KindStreams, Text: "streams rm T-101", Action: "remove", Tag: "T-101"}},
		{in: "streams set T-101 200 L NaOH 5 % note: weekly top-up", want: Command{Kind: KindStreams, Text: "streams set T-101 200 L NaOH 5 % note: weekly top-up",
			Action: "set", Tag: "T-101", Stream: "200 L NaOH 5 %", Note: "weekly top-up"}},
		{in: "streams set T-101 = NaOH 5 %", want: Command{Kind: KindStreams, Text: "streams set T-101 = NaOH 5 %", Action: "set", Tag: "T-101", Stream: "NaOH 5 %"}},
		{in: "streams set T-101", wantErr: "needs the stream"},
		{in: "streams set 101 NaOH", wantErr: "needs a stream tag first"},
		{in: "streams show", wantErr: "takes one stream tag"},
		{in: "streams show T-101 T-102", wantErr: "takes one stream tag"},
		{in: "streams frobnicate", wantErr: "I don't know `streams frobnicate`"},
		{in: "search", want: Command{Kind: KindSearch, Text: "search", Search: SearchQuery{Page: 1}}},
		{in: "search hypochlorite acid since:2026-11-01 until:2026-11-30 user:<@UOP> verdict:Spontaneous hazard:toxic-gas page:2",
			want: Command{Kind: KindSearch, Text: "search hypochlorite acid since:2026-11-01 until:2026-11-30 user:<@UOP> verdict:Spontaneous hazard:toxic-gas page:2",
				Search: SearchQuery{Terms: []string{"hypochlorite", "acid"}, Since: day("2026-11-01"), Until: day("2026-12-01"), User: "UOP", Verdict: "spontaneous", Hazard: "toxic-gas", Page: 2}}},
		{in: "search Fe^2+ note:x", want: Command{Kind: KindSearch, Text: "search Fe^2+ note:x", Search: SearchQuery{Terms: []string{"Fe^2+", "note:x"}, Page: 1}}},
		{in: "search since:yesterday", wantErr: "is not a date"},
		{in: "search verdict:maybe", wantErr: "is not one of"},
		{in: "search page:0", wantErr: "not a page number"},
		{in: "search since:2026-11-30 until:2026-11-01", wantErr: "must be after"},
		{in: "digest", want: Command{Kind: KindDigest, Text: "digest"}},
		{in: "digest 24h", want: Command{Kind: KindDigest, Text: "digest 24h", Hours: 24}},
		{in: "digest tomorrow", wantErr: "takes nothing"},
	} {
		got, err := ParseCommand(tc.in, utc)
		if tc.wantErr != "" {
			var ue *UsageError
			if !errors.As(err, &ue) || !strings.Contains(ue.Message, tc.wantErr) || ue.Example == "" {
				t.Errorf("ParseCommand(%q) error = %v, want a usage error with an example containing %q", tc.in, err, tc.wantErr)
			}
			continue
		}
		if err != nil {
			t.Errorf("ParseCommand(%q): %v", tc.in, err)
			continue
		}
		if tc.want.Text == "" {
			tc.want.Text = tc.in
		}
		if !reflect.DeepEqual(got, tc.want) {
			t.Errorf("ParseCommand(%q)\n got %+v\nwant %+v", tc.in, got, tc.want)
		}
	}
}

func TestParseIDList(t *testing.T) {
	got := ParseIDList(" U123, S456;<@U789|pat> <!subteam^S999|@reviewers>,,")
	want := []string{"U123", "S456", "U789", "S999"}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("ParseIDList = %v, want %v", got, want)
	}
}

func FuzzParseCommand(f *testing.F) {
	for _, s := range []string{"help", "mix 1 L NaOCl 12.5 %", "streams set T-101 NaOH note: x", "search a since:2026-01-01 page:3", "digest 12h", "streams show",
		"streams set T-101 \xff\xffNaOH note: x", "streams set T-101 İİ NaOH NOTE:"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		c, err := ParseCommand(CleanText(s, "UBOT"), time.UTC)
		var ue *UsageError
		if err != nil && (!errors.As(err, &ue) || ue.Message == "") {
			t.Errorf("ParseCommand(%q) returned a non-usage error %v", s, err)
		}
		if err == nil && c.Kind == "" {
			t.Errorf("ParseCommand(%q) gave no kind", s)
		}
		if utf8.ValidString(s) && !utf8.ValidString(c.Text) {
			t.Errorf("ParseCommand(%q) made invalid UTF-8 %q", s, c.Text)
		}
	})
}
