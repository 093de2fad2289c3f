package main

// Placeholders replaced by the store work (issue: query log). Each returns a
// clear "not built yet" error so that nothing pretends to work.

import (
	"context"
	"fmt"
)

func (a *app) cmdLog(ctx context.Context, args []string) error {
	return &exitError{exitFail, fmt.Errorf("'log' is not built yet")}
}

func (a *app) cmdStreams(ctx context.Context, args []string) error {
	return &exitError{exitFail, fmt.Errorf("'streams' is not built yet")}
}

func (a *app) cmdDigest(ctx context.Context, args []string) error {
	return &exitError{exitFail, fmt.Errorf("'digest' is not built yet")}
}
