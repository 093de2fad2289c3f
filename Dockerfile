# mixward: multi-stage build. The first stage compiles with cgo (SQLite
# through mattn/go-sqlite3); the runtime stage is a small Debian image with
# a non-root user and the database on the /data volume.
FROM golang:1.26-bookworm AS build
WORKDIR /src
COPY go.mod go.sum ./
RUN go mod download
COPY . .
# The same build as .ci/run: cgo on, no build tags (the log uses SQLite's
# built-in FTS4), a trimmed path.
RUN CGO_ENABLED=1 go build -trimpath -ldflags="-s -w" -o /out/mixward ./cmd/mixward

FROM debian:bookworm-slim AS runtime
RUN apt-get update \
 && apt-get install -y --no-install-recommends ca-certificates tzdata \
 && rm -rf /var/lib/apt/lists/* \
 && groupadd --system --gid 10001 mixward \
 && useradd --system --uid 10001 --gid mixward --home-dir /data --shell /usr/sbin/nologin mixward \
 && mkdir -p /data && chown mixward:mixward /data
COPY --from=build /out/mixward /usr/local/bin/mixward
# /healthz and /metrics stay on the container's loopback, where the
# HEALTHCHECK below asks. /metrics has no authentication: to scrape it from
# outside, expose it deliberately, e.g.
#   docker run -e MIXWARD_ADMIN_ADDR=0.0.0.0:9464 -p 127.0.0.1:9464:9464 ...
# (publish on the host's loopback or a private interface, never 0.0.0.0).
ENV MIXWARD_DB=/data/mixward.db \
    MIXWARD_ADMIN_ADDR=127.0.0.1:9464
VOLUME ["/data"]
WORKDIR /data
USER mixward:mixward
EXPOSE 8080
HEALTHCHECK --interval=30s --timeout=5s --start-period=20s --retries=3 \
  CMD ["/usr/local/bin/mixward", "healthcheck"]
ENTRYPOINT ["/usr/local/bin/mixward"]
CMD ["serve"]
