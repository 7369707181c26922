#!/usr/bin/env bash
# Project-local PostgreSQL on loopback, from Debian's packages.
#   scripts/pg.sh start   ensure the server binaries, init the cluster once, start it, create the database
#   scripts/pg.sh stop    stop the cluster started here
#   scripts/pg.sh status  say whether it runs
#   scripts/pg.sh url     print the connection URL
# Settings (environment): BITSLACK_PG_DIR (default .data/postgres), BITSLACK_PG_PORT (54329),
# BITSLACK_PG_DB (bitslack). When DATABASE_URL is set, a managed server is used and this
# script does nothing.
set -euo pipefail
cd "$(dirname "$0")/.."
ROOT=$(pwd)
DATA=${BITSLACK_PG_DIR:-$ROOT/.data/postgres}
case "$DATA" in /*) ;; *) DATA=$ROOT/$DATA ;; esac
PORT=${BITSLACK_PG_PORT:-54329}
DB=${BITSLACK_PG_DB:-bitslack}
SOCK=$DATA/../$(basename "$DATA")-socket

log() { printf '[postgres] %s\n' "$*" >&2; }

find_bindir() {
  local d
  d=$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1 || true)
  if [ -n "$d" ] && [ -x "$d/initdb" ]; then echo "$d"; fi
}

ensure_binaries() {
  BIN=$(find_bindir)
  if [ -z "$BIN" ]; then
    log "no PostgreSQL server found; installing Debian's postgresql package (apt-get)"
    local SUDO=""
    [ "$(id -u)" -ne 0 ] && SUDO="sudo"
    $SUDO apt-get update -qq >&2
    DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -qq postgresql >&2
    BIN=$(find_bindir)
    [ -n "$BIN" ] || { log "PostgreSQL install failed"; exit 1; }
  fi
}

# As root, initdb and the server run as the 'postgres' system user (initdb refuses root).
as_owner() {
  if [ "$(id -u)" -eq 0 ]; then runuser -u postgres -- "$@"; else "$@"; fi
}

is_running() {
  [ -f "$DATA/postmaster.pid" ] && as_owner "$BIN/pg_ctl" -D "$DATA" status >/dev/null 2>&1
}

start() {
  ensure_binaries
  mkdir -p "$DATA" "$SOCK"
  if [ "$(id -u)" -eq 0 ]; then
    id postgres >/dev/null 2>&1 || useradd --system --home-dir /var/lib/postgresql --shell /bin/false postgres
    chown postgres "$DATA" "$SOCK"
    chmod 700 "$DATA"
    # the postgres user must be able to reach the folders
    p=$(dirname "$DATA"); while [ "$p" != "/" ]; do chmod o+x "$p" 2>/dev/null || true; p=$(dirname "$p"); done
  fi
  if [ ! -f "$DATA/PG_VERSION" ]; then
    log "initialising a cluster in $DATA"
    as_owner "$BIN/initdb" -D "$DATA" -U postgres --auth=trust -E UTF8 --locale=C.UTF-8 >/dev/null 2>&1 \
      || as_owner "$BIN/initdb" -D "$DATA" -U postgres --auth=trust -E UTF8 >/dev/null
  fi
  if is_running; then
    log "already running on 127.0.0.1:$PORT"
  else
    as_owner "$BIN/pg_ctl" -D "$DATA" -l "$DATA/server.log" \
      -o "-p $PORT -c listen_addresses=127.0.0.1 -k $SOCK" -w -t 60 start >/dev/null \
      || { log "start failed; see $DATA/server.log"; tail -n 20 "$DATA/server.log" >&2 || true; exit 1; }
    log "started on 127.0.0.1:$PORT (data: $DATA)"
  fi
  if ! "$BIN/psql" -h 127.0.0.1 -p "$PORT" -U postgres -tAc "select 1 from pg_database where datname='$DB'" postgres | grep -q 1; then
    "$BIN/createdb" -h 127.0.0.1 -p "$PORT" -U postgres "$DB"
    log "created database $DB"
  fi
}

stop() {
  BIN=$(find_bindir)
  if [ -n "$BIN" ] && is_running; then
    as_owner "$BIN/pg_ctl" -D "$DATA" -m fast -w stop >/dev/null
    log "stopped"
  fi
}

if [ -n "${DATABASE_URL:-}" ] && [ "${1:-}" != "url" ]; then
  log "DATABASE_URL is set: using that server, nothing to start or stop"
  exit 0
fi

case "${1:-}" in
  start) start ;;
  stop) stop ;;
  status) BIN=$(find_bindir); if [ -n "$BIN" ] && is_running; then echo running; else echo stopped; fi ;;
  url) echo "${DATABASE_URL:-postgres://postgres@127.0.0.1:$PORT/$DB}" ;;
  *) echo "usage: $0 start|stop|status|url" >&2; exit 2 ;;
esac
