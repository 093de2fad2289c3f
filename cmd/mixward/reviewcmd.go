package main

import (
	"context"
	"encoding/csv"
	"fmt"
	"io"
	"strings"

	"mixward/engine/advice"
)

// cmdReview judges every pair of the site's tagged streams.
func (a *app) cmdReview(ctx context.Context, args []string) error {
	fs := a.newFlags("review", "review [--format text|json|csv] [--db PATH]\n\n"+
		"Judges every pair of the site's tagged streams and lists them worst first: must not be combined,\n"+
		"then with precautions, with the reason and the safer order of addition.")
	format := fs.String("format", "text", "output `format`: text, json or csv")
	so := storeFlags(a, fs)
	pos, err := parseFlags(fs, args)
	if err != nil {
		return err
	}
	if len(pos) > 0 {
		return &exitError{exitUsage, fmt.Errorf("review takes no arguments, got %q", strings.Join(pos, " "))}
	}
	if err := checkFormat(*format, "text", "json", "csv"); err != nil {
		return err
	}
	db, _, err := openDB(ctx, a, so)
	if err != nil {
		return err
	}
	defer db.Close()
	eng, err := loadEngine()
	if err != nil {
		return err
	}
	adv, err := loadAdvisor(eng)
	if err != nil {
		return err
	}
	ps, err := reviewSite(ctx, db, adv)
	if err != nil {
		return err
	}
	if len(ps) == 0 {
		return &exitError{exitFail, fmt.Errorf("the stream catalogue in %s has fewer than two streams; add them with 'mixward streams set'", so.db)}
	}
	switch *format {
	case "json":
		return writeJSON(a.stdout, ps)
	case "csv":
		return writeReviewCSV(a.stdout, ps)
	}
	_, err = io.WriteString(a.stdout, advice.RenderReview(ps))
	return err
}

// reviewSite reads the catalogue and judges each pair of its streams.
func reviewSite(ctx context.Context, db streamReader, adv *advice.Advisor) ([]advice.Pair, error) {
	ss, err := db.Streams(ctx)
	if err != nil {
		return nil, err
	}
	ts := make([]advice.Tagged, len(ss))
	for i, s := range ss {
		ts[i] = advice.Tagged{Tag: s.Tag, Stream: s.Stream}
	}
	return adv.Review(ts), nil
}

func writeReviewCSV(w io.Writer, ps []advice.Pair) error {
	cw := csv.NewWriter(w)
	cw.Write([]string{"level", "a", "b", "title", "codes", "safer_order", "reasons"})
	for _, p := range ps {
		cw.Write([]string{string(p.Level), p.A, p.B, csvSafe(p.Title), strings.Join(p.Codes, " "), csvSafe(p.Order), csvSafe(strings.Join(p.Reasons, "; "))})
	}
	cw.Flush()
	return cw.Error()
}

// csvSafe keeps a spreadsheet from reading a cell as a formula.
func csvSafe(s string) string {
	if s != "" && strings.ContainsRune("=+-@\t\r", rune(s[0])) {
		return "'" + s
	}
	return s
}
