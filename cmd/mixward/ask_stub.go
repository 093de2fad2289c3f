//go:build !mixward_pending

package main

import (
	"context"
	"fmt"
	"io"
)

func (a *app) cmdDefault(ctx context.Context) error { return a.cmdConsole(ctx, nil) }

func (a *app) cmdAsk(ctx context.Context, args []string) error {
	return &exitError{exitFail, fmt.Errorf("'ask' is not built yet")}
}

func (a *app) cmdTable(ctx context.Context, args []string) error {
	return &exitError{exitFail, fmt.Errorf("'table' is not built yet")}
}

func (a *app) cmdPlot(ctx context.Context, args []string) error {
	return &exitError{exitFail, fmt.Errorf("'plot' is not built yet")}
}

func (a *app) cmdVersion(ctx context.Context) error { return nil }

func (a *app) usage(w io.Writer) { fmt.Fprintln(w, "usage: mixward <subcommand>") }
