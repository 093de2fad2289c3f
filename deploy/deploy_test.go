// Package deploy holds the deployment kit (Dockerfile checks, the systemd
// unit, the Slack app manifests and the environment example). It has no Go
// code of its own; these tests keep the kit honest, because `docker build`
// cannot run on the development machines.
package deploy

import (
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strings"
	"testing"
)

func read(t *testing.T, path string) string {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// instructions returns the Dockerfile's instructions with continuation
// lines joined, comments dropped.
func instructions(text string) []string {
	var out []string
	var cur strings.Builder
	for _, line := range strings.Split(text, "\n") {
		trim := strings.TrimSpace(line)
		if cur.Len() == 0 && (trim == "" || strings.HasPrefix(trim, "#")) {
			continue
		}
		if strings.HasSuffix(trim, "\\") {
			cur.WriteString(strings.TrimSuffix(trim, "\\") + " ")
			continue
		}
		cur.WriteString(trim)
		out = append(out, cur.String())
		cur.Reset()
	}
	return out
}

func TestDockerfile(t *testing.T) {
	ins := instructions(read(t, "../Dockerfile"))
	var stages []string
	var runtime []string // instructions of the last stage
	for _, in := range ins {
		if strings.HasPrefix(in, "FROM ") {
			stages = append(stages, in)
			runtime = nil
		}
		runtime = append(runtime, in)
	}
	if len(stages) < 2 {
		t.Fatalf("want a multi-stage build, got stages %q", stages)
	}
	if !regexp.MustCompile(`^FROM golang:1\.26\S* AS build$`).MatchString(stages[0]) {
		t.Errorf("first stage %q: want a Go 1.26 build stage named build", stages[0])
	}
	if strings.Contains(stages[len(stages)-1], "golang") {
		t.Errorf("runtime stage %q must not be the Go toolchain image", stages[len(stages)-1])
	}
	all := strings.Join(ins, "\n")
	// The same build as .ci/run: cgo on, ./cmd/mixward, no stray tags.
	build := regexp.MustCompile(`RUN CGO_ENABLED=1 go build .*-o /out/mixward \./cmd/mixward`)
	if !build.MatchString(all) {
		t.Errorf("no cgo build of ./cmd/mixward in the build stage")
	}
	ci := read(t, "../.ci/run")
	if !strings.Contains(ci, "CGO_ENABLED=1 go build -trimpath") {
		t.Errorf(".ci/run does not build the binary the way the Dockerfile does")
	}
	if strings.Contains(all, "-tags") != strings.Contains(ci, "go build -tags") {
		t.Errorf("the Dockerfile and .ci/run disagree on build tags")
	}
	want := map[string]*regexp.Regexp{
		"copies the binary from the build stage": regexp.MustCompile(`^COPY --from=build /out/mixward /usr/local/bin/mixward$`),
		"creates a non-root user":                regexp.MustCompile(`useradd --system`),
		"runs as that user":                      regexp.MustCompile(`^USER mixward`),
		"keeps the database on /data":            regexp.MustCompile(`^VOLUME \["/data"\]$`),
		"points MIXWARD_DB at /data":             regexp.MustCompile(`MIXWARD_DB=/data/mixward\.db`),
		"checks health on /healthz":              regexp.MustCompile(`^HEALTHCHECK .*CMD \["/usr/local/bin/mixward", "healthcheck"\]`),
		"starts the bot":                         regexp.MustCompile(`^CMD \["serve"\]$`),
	}
	for what, re := range want {
		found := false
		for _, in := range runtime {
			if re.MatchString(in) {
				found = true
			}
		}
		if !found {
			t.Errorf("the runtime stage never %s (%s)", what, re)
		}
	}
	for _, in := range runtime {
		if strings.HasPrefix(in, "USER root") || strings.HasPrefix(in, "USER 0") {
			t.Errorf("runtime stage switches to root: %q", in)
		}
	}
}

func TestSystemdUnit(t *testing.T) {
	unit := read(t, "mixward.service")
	for _, line := range []string{
		"NoNewPrivileges=yes", "ProtectSystem=strict", "ProtectHome=yes", "PrivateTmp=yes",
		"StateDirectory=mixward", "ExecStart=/usr/local/bin/mixward serve",
		"EnvironmentFile=/etc/mixward/mixward.env", "Environment=MIXWARD_DB=/var/lib/mixward/mixward.db",
	} {
		if !regexp.MustCompile(`(?m)^` + regexp.QuoteMeta(line) + `$`).MatchString(unit) {
			t.Errorf("mixward.service lacks %q", line)
		}
	}
}

// TestManifests: both Slack manifests ask for the same, minimal scopes, and
// differ only where Socket Mode and HTTP mode must.
func TestManifests(t *testing.T) {
	scopes := func(text string) []string {
		var out []string
		in := false
		for _, line := range strings.Split(text, "\n") {
			switch {
			case strings.TrimSpace(line) == "bot:":
				in = true
			case in && strings.HasPrefix(strings.TrimSpace(line), "- "):
				out = append(out, strings.TrimPrefix(strings.TrimSpace(line), "- "))
			case in:
				in = false
			}
		}
		sort.Strings(out)
		return out
	}
	sock, http := read(t, "slack-manifest.socket.yaml"), read(t, "slack-manifest.http.yaml")
	want := []string{"app_mentions:read", "channels:history", "channels:read", "chat:write", "commands", "files:write", "groups:history",
		"groups:read", "im:history", "mpim:history", "usergroups:read", "users:read"}
	for name, m := range map[string]string{"socket": sock, "http": http} {
		if got := scopes(m); strings.Join(got, ",") != strings.Join(want, ",") {
			t.Errorf("%s manifest scopes = %v, want %v", name, got, want)
		}
		for _, ev := range []string{"- app_mention", "- message.im", "command: /mixward", "interactivity:\n    is_enabled: true",
			"callback_id: mixward_new", "type: global"} {
			if !strings.Contains(m, ev) {
				t.Errorf("%s manifest lacks %q", name, ev)
			}
		}
		if strings.Contains(m, "\t") {
			t.Errorf("%s manifest has a tab; YAML indents with spaces", name)
		}
	}
	if !strings.Contains(sock, "socket_mode_enabled: true") || strings.Contains(sock, "request_url") {
		t.Errorf("socket manifest must enable Socket Mode and name no request URL")
	}
	if !strings.Contains(http, "socket_mode_enabled: false") || !strings.Contains(http, "/slack/events") || !strings.Contains(http, "/slack/commands") ||
		!strings.Contains(http, "request_url: https://mixward.example.internal/slack/interactive") {
		t.Errorf("http manifest must point events at /slack/events, the command at /slack/commands and interactivity at /slack/interactive")
	}
}

// TestEnvDocumented: every MIXWARD_ and SLACK_ variable the program reads is
// in mixward.env.example and in the README.
func TestEnvDocumented(t *testing.T) {
	example := read(t, "mixward.env.example")
	readme := read(t, "../README.md")
	re := regexp.MustCompile(`"((?:MIXWARD|SLACK)_[A-Z_]+)"`)
	files, err := filepath.Glob("../cmd/mixward/*.go")
	if err != nil {
		t.Fatal(err)
	}
	seen := map[string]bool{}
	for _, f := range files {
		if strings.HasSuffix(f, "_test.go") {
			continue
		}
		for _, m := range re.FindAllStringSubmatch(read(t, f), -1) {
			seen[m[1]] = true
		}
	}
	if len(seen) < 5 {
		t.Fatalf("found only %d variables in cmd/mixward; is the pattern right?", len(seen))
	}
	for v := range seen {
		if !strings.Contains(example, v+"=") {
			t.Errorf("%s is read by mixward but not in deploy/mixward.env.example", v)
		}
		if !strings.Contains(readme, v) {
			t.Errorf("%s is read by mixward but not documented in README.md", v)
		}
	}
}

// TestAdminOnLoopback: the admin endpoints (/metrics has no authentication)
// default to loopback in the image, the unit and the env example, and each
// says how to expose them on purpose.
func TestAdminOnLoopback(t *testing.T) {
	docker := read(t, "../Dockerfile")
	if !strings.Contains(docker, "MIXWARD_ADMIN_ADDR=127.0.0.1:9464") {
		t.Errorf("Dockerfile does not default the admin address to 127.0.0.1:9464")
	}
	for _, in := range instructions(docker) {
		if strings.HasPrefix(in, "EXPOSE") && strings.Contains(in, "9464") {
			t.Errorf("Dockerfile exposes the admin port: %q", in)
		}
	}
	if !strings.Contains(docker, "-p 127.0.0.1:9464:9464") {
		t.Errorf("Dockerfile does not say how to publish the admin port deliberately")
	}
	env := read(t, "mixward.env.example")
	if !regexp.MustCompile(`(?m)^MIXWARD_ADMIN_ADDR=127\.0\.0\.1:9464$`).MatchString(env) || !strings.Contains(env, "private interface deliberately") {
		t.Errorf("mixward.env.example: want MIXWARD_ADMIN_ADDR=127.0.0.1:9464 and how to expose it")
	}
	if strings.Contains(read(t, "mixward.service"), "MIXWARD_ADMIN_ADDR=0.0.0.0") {
		t.Errorf("mixward.service puts the admin endpoints on every interface")
	}
}

// TestDynamicUserAdvice: the unit runs as a DynamicUser with its state in
// StateDirectory, and no document asks for a chown to a user that exists
// only while the service runs.
func TestDynamicUserAdvice(t *testing.T) {
	unit := read(t, "mixward.service")
	for _, line := range []string{"DynamicUser=yes", "StateDirectory=mixward", "WorkingDirectory=/var/lib/mixward"} {
		if !regexp.MustCompile(`(?m)^` + regexp.QuoteMeta(line) + `$`).MatchString(unit) {
			t.Errorf("mixward.service lacks %q", line)
		}
	}
	owned := regexp.MustCompile(`(?i)owned by the service user|chown\s+mixward|chown\s+\S*:mixward`)
	for _, f := range []string{"mixward.service", "mixward.env.example", "../README.md"} {
		if m := owned.FindString(read(t, f)); m != "" {
			t.Errorf("%s advises %q, which cannot work with DynamicUser=yes", f, m)
		}
	}
	if env := read(t, "mixward.env.example"); !strings.Contains(env, "-o root -g root -m 0600") {
		t.Errorf("mixward.env.example does not say to install the file root-owned, mode 0600")
	}
}

// TestReplicasExample: the two-replica example runs two replicas of one
// site on one PostgreSQL URL without a password in it, under different
// replica names, and sets only documented variables.
func TestReplicasExample(t *testing.T) {
	text := read(t, "compose.replicas.yaml")
	readme := read(t, "../README.md")
	set := map[string][]string{}
	for _, m := range regexp.MustCompile(`(?m)^\s+(MIXWARD_[A-Z_]+): (.+)$`).FindAllStringSubmatch(text, -1) {
		set[m[1]] = append(set[m[1]], strings.TrimSpace(m[2]))
	}
	if dbs := set["MIXWARD_DB"]; len(dbs) != 2 || dbs[0] != dbs[1] || !strings.HasPrefix(dbs[0], "postgres://") || strings.Contains(dbs[0], ":@") ||
		regexp.MustCompile(`//[^/@]*:[^/@]*@`).MatchString(dbs[0]) {
		t.Errorf("MIXWARD_DB = %q; want one postgres:// URL without a password, twice", dbs)
	}
	if r := set["MIXWARD_REPLICA"]; len(r) != 2 || r[0] == r[1] {
		t.Errorf("MIXWARD_REPLICA = %q; want two different names", r)
	}
	for k := range set {
		if !strings.Contains(readme, "`"+k+"`") {
			t.Errorf("compose.replicas.yaml sets %s, which README.md does not document", k)
		}
	}
}
