package main

import (
	"context"
	"errors"

	"mixward/bot"
	"mixward/engine"
	"mixward/engine/advice"
)

// askOnce answers one request for `mixward ask`. With logging it goes
// through the same path as the chat (bot.Record): the query is written to
// the log, as user $MIXWARD_USER or $USER in channel "cli", before the
// answer is shown. Without logging, an existing log is still read for the
// stream catalogue, so that tags resolve.
func (a *app) askOnce(ctx context.Context, eng *engine.Engine, adv *advice.Advisor, o *storeOpts, text string, noLog bool) (res *engine.Result, id int64, askErr error, err error) {
	if noLog {
		if !dbExists(o.db) {
			res, askErr = adv.Ask(text, engine.AskOptions{})
			return res, 0, askErr, nil
		}
		// Only the catalogue is read: the file is not changed or upgraded.
		db, _, err := openReadDB(ctx, a, o, true)
		if err != nil {
			return nil, 0, nil, err
		}
		defer db.Close()
		res, askErr = adv.Ask(text, catalogueOptions(ctx, db))
		return res, 0, askErr, nil
	}
	db, loc, err := openDB(ctx, a, o)
	if err != nil {
		return nil, 0, nil, err
	}
	defer db.Close()
	b := &bot.Bot{
		Engine: adv, Log: db, Catalogue: db, Location: loc,
		EngineVersion: engine.Version, DataHash: eng.Tables.Hash,
	}
	user := cliUser(a)
	res, id, askErr, err = b.Record(ctx, bot.Incoming{Transport: "cli", Channel: "cli", UserID: user, UserName: user}, text)
	return res, id, askErr, err
}

// catalogueResolver resolves stream tags from the site catalogue.
func catalogueResolver(ctx context.Context, db streamReader) engine.Resolver {
	return func(tag string) (string, bool) {
		s, err := db.Stream(ctx, tag)
		if err != nil {
			return "", false
		}
		return s.Stream, true
	}
}

// catalogueTags lists the catalogue's tags, for "did you mean" on a tag
// that is not there; nil when the catalogue cannot be read.
func catalogueTags(ctx context.Context, db streamReader) func() []string {
	return func() []string {
		ss, err := db.Streams(ctx)
		if err != nil {
			return nil
		}
		tags := make([]string, len(ss))
		for i, s := range ss {
			tags[i] = s.Tag
		}
		return tags
	}
}

// catalogueOptions resolves tags from the site catalogue in db and suggests
// its tags for near misses.
func catalogueOptions(ctx context.Context, db streamReader) engine.AskOptions {
	return engine.AskOptions{Resolve: catalogueResolver(ctx, db), Tags: catalogueTags(ctx, db)}
}

var errNotLogged = errors.New("the query could not be written to the log, so no answer is given (every answer is on record first)")
