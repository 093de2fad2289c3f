package main

// Placeholders replaced by the bot work (issue: chat bot).

import (
	"context"
	"fmt"
)

func (a *app) cmdConsole(ctx context.Context, args []string) error {
	return &exitError{exitFail, fmt.Errorf("'console' is not built yet")}
}

func (a *app) cmdServe(ctx context.Context, args []string) error {
	return &exitError{exitFail, fmt.Errorf("'serve' is not built yet")}
}
