# Shared shell helpers for scripts/start.sh, scripts/dev.sh and scripts/test.sh.

log() { printf '[bitslack] %s\n' "$*" >&2; }

# Install npm dependencies from the lockfile when they are missing or stale.
ensure_node_modules() {
  if [ ! -d node_modules ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
    log "installing dependencies (npm ci)"
    npm ci --no-audit --no-fund >&2
  fi
}

# Install Debian packages that are missing (one apt-get update for all of them).
# usage: ensure_debian_packages "cmd:package" ...
ensure_debian_packages() {
  local missing=() pair cmd pkg
  for pair in "$@"; do
    cmd=${pair%%:*}; pkg=${pair#*:}
    if ! command -v "$cmd" >/dev/null 2>&1 && [ ! -x "$cmd" ]; then missing+=("$pkg"); fi
  done
  [ ${#missing[@]} -eq 0 ] && return 0
  local SUDO=""
  [ "$(id -u)" -ne 0 ] && SUDO="sudo"
  log "installing Debian packages: ${missing[*]}"
  $SUDO apt-get update -qq >&2
  DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -qq --no-install-recommends "${missing[@]}" >&2
}

# A session secret that survives restarts of the local server (never committed).
ensure_session_secret() {
  if [ -z "${NUXT_SESSION_PASSWORD:-}" ]; then
    mkdir -p .data
    if [ ! -s .data/session-secret ]; then
      node -e "process.stdout.write(require('crypto').randomBytes(32).toString('hex'))" > .data/session-secret
      chmod 600 .data/session-secret
    fi
    NUXT_SESSION_PASSWORD=$(cat .data/session-secret)
    export NUXT_SESSION_PASSWORD
  fi
}

# Everything a script starts stops with it: call once, then append each PID to `pids`.
# The local cluster stops too when this script started it (STOP_LOCAL_PG=yes).
stop_on_exit() {
  pids=()
  trap _stop_started EXIT INT TERM
}
_stop_started() {
  for p in "${pids[@]}"; do kill "$p" 2>/dev/null || true; done
  # the servers finish their requests in flight before the database goes
  for p in "${pids[@]}"; do wait "$p" 2>/dev/null || true; done
  if [ "${STOP_LOCAL_PG:-}" = yes ]; then env -u DATABASE_URL bash scripts/pg.sh stop || true; fi
}

# The database of npm start / npm run dev: the local cluster unless DATABASE_URL names a
# server, migrated, with the demo seeded when it is empty.
prepare_demo_database() {
  [ -n "${DATABASE_URL:-}" ] || STOP_LOCAL_PG=yes
  bash scripts/pg.sh start
  DATABASE_URL=${DATABASE_URL:-$(bash scripts/pg.sh url)}
  export DATABASE_URL NUXT_DATABASE_URL=$DATABASE_URL
  npx tsx scripts/db.ts migrate
  npx tsx scripts/db.ts seed
}

# A throwaway cluster for test and load runs (BITSLACK_PG_DIR made anew), migrated.
fresh_cluster() {
  STOP_LOCAL_PG=yes
  bash scripts/pg.sh stop >/dev/null 2>&1 || true
  rm -rf "$BITSLACK_PG_DIR"
  bash scripts/pg.sh start
  DATABASE_URL=$(bash scripts/pg.sh url)
  export DATABASE_URL
  npx tsx scripts/db.ts migrate
}
