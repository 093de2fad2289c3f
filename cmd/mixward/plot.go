package main

import (
	"context"
	"errors"
	"fmt"
	"os"
	"strings"

	"mixward/engine"
	"mixward/engine/eph"
)

// cmdPlot draws the E–pH picture of a request. Tags resolve from the site
// catalogue in --db when that file exists; the request is not logged.
func (a *app) cmdPlot(ctx context.Context, args []string) error {
	fs := a.newFlags("plot", `plot [--db PATH] "<request>" -o mix.png`)
	out := fs.String("o", "mix.png", "PNG file to write")
	o := &storeOpts{site: envOr(a.getenv, envSite, "main")}
	fs.StringVar(&o.db, "db", envOr(a.getenv, "MIXWARD_DB", "mixward.db"), "SQLite `file` or postgres:// URL whose stream catalogue resolves tags (env MIXWARD_DB); read only when it exists")
	pos, err := parseFlags(fs, args)
	if err != nil {
		return err
	}
	text := strings.TrimSpace(strings.Join(pos, " "))
	if text == "" {
		fs.Usage()
		return &exitError{exitUsage, errors.New(`give the request in quotes, e.g. mixward plot "Zn + CuSO4 1 M" -o mix.png`)}
	}
	eng, err := loadEngine()
	if err != nil {
		return err
	}
	opt := engine.AskOptions{}
	if dbExists(o.db) {
		db, _, err := openDB(ctx, a, o)
		if err != nil {
			return err
		}
		defer db.Close()
		opt = catalogueOptions(ctx, db)
	}
	res, err := eng.Ask(text, opt)
	if err != nil {
		var pe *engine.ParseError
		if errors.As(err, &pe) {
			return &exitError{exitUsage, fmt.Errorf("cannot read the request: %s", pe.Error())}
		}
		return err
	}
	png, ok, err := eph.Plotter{Tables: eng.Tables}.Plot(res)
	if err != nil {
		return err
	}
	if !ok {
		return &exitError{exitFail, fmt.Errorf("nothing to draw: %s", engine.Headline(res))}
	}
	if err := os.WriteFile(*out, png, 0o644); err != nil {
		return fmt.Errorf("writing the picture: %w", err)
	}
	fmt.Fprintf(a.stdout, "wrote %s: %s with %s, mix pH %.2f\n", *out, res.Oxidizer.Species, res.Reducer.Species, res.Conditions.PH)
	return nil
}
