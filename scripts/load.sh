#!/usr/bin/env bash
# npm run load: autocannon against the built server on loopback, for a bounded time, with
# a throwaway cluster seeded with the demo. Prints throughput, p50/p99 and errors.
# Settings: LOAD_SECONDS (default 20 per phase), LOAD_CONNECTIONS (default 50).
set -euo pipefail
cd "$(dirname "$0")/.."
. scripts/lib.sh
ensure_node_modules
[ -f .nuxt/tsconfig.app.json ] || npx nuxt prepare >/dev/null 2>&1
unset DATABASE_URL NUXT_DATABASE_URL
export BITSLACK_PG_DIR=.data/postgres-load BITSLACK_PG_PORT=${BITSLACK_LOAD_PG_PORT:-54399} BITSLACK_PG_DB=bitslack_load
export BITSLACK_ENV=test NUXT_SESSION_PASSWORD=load-session-password-at-least-32-characters
export BITSLACK_BUILD_DIR=$PWD/.data/load-build/nuxt BITSLACK_OUTPUT_DIR=$PWD/.data/load-build/output
PORT=${BITSLACK_LOAD_PORT:-3400}

stop_on_exit
fresh_cluster
npx tsx scripts/db.ts seed
# storage fake on its own port (no mail is sent in the mix)
. scripts/fakes.sh
S3RVER_PORT=${BITSLACK_LOAD_S3_PORT:-4669}
start_s3rver
export SMTP_HOST=127.0.0.1 SMTP_PORT=9
log "building the server for the load run"
npx nuxt build >.data/load-build.log 2>&1 || { tail -n 40 .data/load-build.log >&2; exit 1; }
PORT=$PORT HOST=127.0.0.1 NODE_ENV=production node "$BITSLACK_OUTPUT_DIR/server/index.mjs" >.data/load-server.log 2>&1 &
pids+=($!)
LOAD_URL=http://127.0.0.1:$PORT npx tsx scripts/load.ts
