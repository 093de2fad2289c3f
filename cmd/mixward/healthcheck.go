package main

import (
	"context"
	"fmt"
	"io"
	"net"
	"net/http"
	"strings"
	"time"
)

// cmdHealthcheck asks a running `mixward serve` for its /healthz on the admin
// address, for container health checks that have no curl. It exits 1 when
// the service is not healthy.
func (a *app) cmdHealthcheck(ctx context.Context, args []string) error {
	fs := a.newFlags("healthcheck", "healthcheck [--admin-addr HOST:PORT] [--timeout 5s]")
	addr := fs.String("admin-addr", envOr(a.getenv, "MIXWARD_ADMIN_ADDR", "127.0.0.1:9464"), "admin address of the running service (env MIXWARD_ADMIN_ADDR)")
	timeout := fs.Duration("timeout", 5*time.Second, "how long to wait for an answer")
	if _, err := parseFlags(fs, args); err != nil {
		return err
	}
	host, port, err := net.SplitHostPort(*addr)
	if err != nil {
		return &exitError{exitUsage, fmt.Errorf("--admin-addr %q: %v; write HOST:PORT, e.g. 127.0.0.1:9464", *addr, err)}
	}
	if host == "" || host == "0.0.0.0" || host == "::" {
		host = "127.0.0.1"
	}
	url := "http://" + net.JoinHostPort(host, port) + "/healthz"
	ctx, cancel := context.WithTimeout(ctx, *timeout)
	defer cancel()
	req, err := http.NewRequestWithContext(ctx, http.MethodGet, url, nil)
	if err != nil {
		return err
	}
	resp, err := http.DefaultClient.Do(req)
	if err != nil {
		return &exitError{exitFail, fmt.Errorf("no answer from %s: %v", url, err)}
	}
	defer resp.Body.Close()
	body, _ := io.ReadAll(io.LimitReader(resp.Body, 4096))
	if resp.StatusCode != http.StatusOK {
		return &exitError{exitFail, fmt.Errorf("%s answered %s: %s", url, resp.Status, strings.TrimSpace(string(body)))}
	}
	fmt.Fprintf(a.stdout, "healthy: %s\n", strings.TrimSpace(string(body)))
	return nil
}
