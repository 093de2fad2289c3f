package main

import (
	"context"

	"mixward/engine"
)

// askLogger records `mixward ask` queries in the store. Until the store is
// wired it records nothing.
type askLogger struct{}

func (a *app) openAskLog(ctx context.Context, path string) (*askLogger, error) { return nil, nil }

func (l *askLogger) Close() error { return nil }

func (l *askLogger) resolver(ctx context.Context) engine.Resolver { return nil }

func (l *askLogger) Log(ctx context.Context, eng *engine.Engine, text string, res *engine.Result, askErr error) error {
	return nil
}
