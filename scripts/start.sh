#!/usr/bin/env bash
# npm start: from a fresh clone to a running production server on http://localhost:3000.
# Installs dependencies, ensures and starts PostgreSQL on loopback, migrates, seeds the
# demo on an empty database, starts the local mail fake, builds, and serves with one
# worker process per core (scripts/serve.ts).
set -euo pipefail
cd "$(dirname "$0")/.."
. scripts/lib.sh

PORT=${PORT:-3000}
HOST=${HOST:-127.0.0.1}
export BITSLACK_ENV=${BITSLACK_ENV:-demo}

# another server already answering on the port would be mistaken for this one: refuse
if (exec 3<>"/dev/tcp/$HOST/$PORT") 2>/dev/null; then
  echo "[bitslack] port $PORT on $HOST is already in use (another Bitslack or another program): stop it, or start with PORT=<free port> npm start" >&2
  exit 1
fi

ensure_node_modules
stop_on_exit
prepare_demo_database
ensure_session_secret

. scripts/fakes.sh
start_fakes

log "building (nuxt build)"
npx nuxt build >.data/build.log 2>&1 || { tail -n 40 .data/build.log >&2; exit 1; }

log "Bitslack is at http://localhost:$PORT"
log "demo sign-in: admin@harrowbay.example (also firmware@, hardware@, reviewer@, viewer@) / password harrow-bay-demo"
print_fake_urls
# one worker per core (BITSLACK_WORKERS to choose); kill -HUP <pid> restarts them one at a time
PORT=$PORT HOST=$HOST node --import tsx scripts/serve.ts .output/server/index.mjs &
pids+=($!)
wait "${pids[-1]}"
