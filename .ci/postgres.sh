#!/usr/bin/env bash
# Starts a throw-away PostgreSQL from the Debian package for CI (sourced by .ci/run): installed if
# missing, its data directory in a temporary folder, listening on 127.0.0.1:${PG_PORT:-54329}
# only, stopped and removed when the calling shell exits. Exports TEST_DATABASE_URL.
# Run as root, the server runs as the `postgres` user (PostgreSQL refuses to run as root).

pg_bin() { ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1; }

if [ -z "$(pg_bin)" ]; then
  export DEBIAN_FRONTEND=noninteractive
  apt-get update
  apt-get install -y --no-install-recommends postgresql
fi
PG_BIN="$(pg_bin)"
PG_PORT="${PG_PORT:-54329}"
PG_DIR="$(mktemp -d -t scorecourt-pg-XXXXXX)"

as_pg() {
  if [ "$(id -u)" = 0 ]; then su postgres -s /bin/sh -c "$*"; else sh -c "$*"; fi
}
[ "$(id -u)" = 0 ] && chown postgres "$PG_DIR"

stop_postgres() {
  as_pg "'$PG_BIN/pg_ctl' -D '$PG_DIR/data' -m immediate stop" >/dev/null 2>&1 || true
  rm -rf "$PG_DIR"
}
trap stop_postgres EXIT

as_pg "'$PG_BIN/initdb' -D '$PG_DIR/data' -A trust -U postgres --no-sync -E UTF8 >/dev/null"
# Durability off (fsync, synchronous_commit, full_page_writes): this is a throw-away test cluster,
# removed when the shell exits, so nothing is lost that anyone needs; the tests then wait for no
# disk flush at each COMMIT. A database anyone keeps must run with PostgreSQL's defaults.
as_pg "'$PG_BIN/pg_ctl' -D '$PG_DIR/data' -l '$PG_DIR/server.log' -w -o \"-p $PG_PORT -k '$PG_DIR' -c listen_addresses=127.0.0.1 -c fsync=off -c synchronous_commit=off -c full_page_writes=off -c max_connections=200\" start" >/dev/null
export TEST_DATABASE_URL="postgres://postgres@127.0.0.1:${PG_PORT}/postgres"
echo "PostgreSQL $("$PG_BIN/postgres" --version | awk '{print $3}') on 127.0.0.1:${PG_PORT} (data in $PG_DIR)"
