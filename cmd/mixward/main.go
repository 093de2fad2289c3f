// Command mixward answers "may these streams be mixed?" for process operators:
// in a terminal console, on the command line, or as a Slack bot.
package main

import (
	"context"
	"fmt"
	"io"
	"os"
	"os/signal"
	"syscall"
	"time"
)

func main() {
	restrictUmask()
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	go func() {
		<-ctx.Done()
		stop() // a second signal ends the process at once
		if g := signalGrace(os.Args[1:]); g > 0 {
			// A computation does not watch ctx: give the command time to
			// finish a write (SQLite rolls back what it does not), then stop.
			time.Sleep(g)
			fmt.Fprintln(os.Stderr, "mixward: stopped by a signal")
			os.Exit(exitSignal)
		}
	}()
	code := run(ctx, os.Args[1:], os.Getenv, os.Stdin, os.Stdout, os.Stderr)
	stop()
	os.Exit(code)
}

// exitSignal is the exit code of a command stopped by SIGTERM or SIGINT
// after its grace period (128 + SIGTERM, as shells report it).
const exitSignal = 128 + 15

// signalGrace is how long a command may go on after SIGTERM or SIGINT
// before it is stopped: serve drains on its own (--drain-timeout) and is
// never cut short; every other command gets a few seconds.
func signalGrace(args []string) time.Duration {
	if len(args) > 0 && args[0] == "serve" {
		return 0
	}
	return 5 * time.Second
}

// app carries what every subcommand needs; nothing in it is global.
type app struct {
	getenv func(string) string
	stdin  io.Reader
	stdout io.Writer
	stderr io.Writer
}

// exitError carries a process exit code with its message.
type exitError struct {
	code int
	err  error
}

func (e *exitError) Error() string { return e.err.Error() }
func (e *exitError) Unwrap() error { return e.err }

// Exit codes.
const (
	exitOK    = 0
	exitFail  = 1 // the command ran and found a problem (broken chain, I/O failure)
	exitUsage = 2 // bad input: a request that does not parse, an unknown flag
)

func run(ctx context.Context, args []string, getenv func(string) string, stdin io.Reader, stdout, stderr io.Writer) int {
	a := &app{getenv: getenv, stdin: stdin, stdout: stdout, stderr: stderr}
	err := a.dispatch(ctx, args)
	if err == nil {
		return exitOK
	}
	if ee, ok := err.(*exitError); ok {
		if ee.err != nil && ee.err.Error() != "" {
			fmt.Fprintln(stderr, "mixward:", ee.err)
		}
		return ee.code
	}
	fmt.Fprintln(stderr, "mixward:", err)
	return exitFail
}

func (a *app) dispatch(ctx context.Context, args []string) error {
	if len(args) == 0 {
		return a.cmdDefault(ctx)
	}
	switch args[0] {
	case "ask":
		return a.cmdAsk(ctx, args[1:])
	case "table":
		return a.cmdTable(ctx, args[1:])
	case "plot":
		return a.cmdPlot(ctx, args[1:])
	case "log":
		return a.cmdLog(ctx, args[1:])
	case "streams":
		return a.cmdStreams(ctx, args[1:])
	case "review":
		return a.cmdReview(ctx, args[1:])
	case "digest":
		return a.cmdDigest(ctx, args[1:])
	case "console":
		return a.cmdConsole(ctx, args[1:])
	case "serve":
		return a.cmdServe(ctx, args[1:])
	case "help", "-h", "-help", "--help":
		a.usage(a.stdout)
		return nil
	case "healthcheck":
		return a.cmdHealthcheck(ctx, args[1:])
	case "version", "--version":

		return a.cmdVersion(ctx)
	}
	a.usage(a.stderr)
	return &exitError{exitUsage, fmt.Errorf("unknown subcommand %q; run 'mixward help' for the list", args[0])}
}
