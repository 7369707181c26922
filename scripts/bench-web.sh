#!/usr/bin/env bash
# npm run bench:web: builds and starts the production server against a throwaway cluster
# seeded with the demo (one worker on one port, the cluster launcher on another, and two
# processes behind HAProxy on a third), then runs scripts/bench-web.ts, which prints the
# figures. Settings: BENCH_SECONDS (default 8 per phase), BENCH_CONNECTIONS (default 20).
set -euo pipefail
cd "$(dirname "$0")/.."
. scripts/lib.sh
ensure_node_modules
[ -f .nuxt/tsconfig.app.json ] || npx nuxt prepare >/dev/null 2>&1
ensure_debian_packages "/usr/sbin/haproxy:haproxy"
unset DATABASE_URL NUXT_DATABASE_URL
export BITSLACK_PG_DIR=.data/postgres-bench BITSLACK_PG_PORT=${BITSLACK_BENCH_PG_PORT:-54398} BITSLACK_PG_DB=bitslack_bench
export BITSLACK_ENV=test NUXT_SESSION_PASSWORD=bench-session-password-at-least-32-characters
export BITSLACK_BUILD_DIR=$PWD/.data/bench-build/nuxt BITSLACK_OUTPUT_DIR=$PWD/.data/bench-build/output
export NODE_ENV=production HOST=127.0.0.1 BITSLACK_TRUST_PROXY=1
base=${BITSLACK_BENCH_PORT:-3500}

stop_on_exit
fresh_cluster
npx tsx scripts/db.ts seed
. scripts/fakes.sh
S3RVER_PORT=${BITSLACK_BENCH_S3_PORT:-4670}
start_s3rver
export SMTP_HOST=127.0.0.1 SMTP_PORT=9
log "building the server for the bench"
npx nuxt build >.data/bench-build.log 2>&1 || { tail -n 40 .data/bench-build.log >&2; exit 1; }
entry=$BITSLACK_OUTPUT_DIR/server/index.mjs

PORT=$base BITSLACK_WORKERS=1 node "$entry" >.data/bench-one.log 2>&1 &
pids+=($!)
PORT=$((base + 1)) node --import tsx scripts/serve.ts "$entry" >.data/bench-all.log 2>&1 &
pids+=($!)
for p in $((base + 2)) $((base + 3)); do
  PORT=$p BITSLACK_WORKERS=2 node "$entry" >".data/bench-$p.log" 2>&1 &
  pids+=($!)
done
cfg=.data/bench-haproxy.cfg
cat >"$cfg" <<CFG
global
  maxconn 4000
defaults
  mode http
  timeout connect 2s
  timeout client 60s
  timeout server 60s
  option forwardfor
frontend web
  bind 127.0.0.1:$((base + 4))
  default_backend app
backend app
  balance roundrobin
  option httpchk GET /api/health
  server a 127.0.0.1:$((base + 2)) check
  server b 127.0.0.1:$((base + 3)) check
CFG
/usr/sbin/haproxy -f "$cfg" -db >.data/bench-haproxy.log 2>&1 &
pids+=($!)

for p in $base $((base + 1)) $((base + 2)) $((base + 3)) $((base + 4)); do
  for _ in $(seq 1 150); do
    curl -fs "http://127.0.0.1:$p/api/health" >/dev/null 2>&1 && break
    sleep 0.2
  done
done
ONE_URL=http://127.0.0.1:$base ALL_URL=http://127.0.0.1:$((base + 1)) PROXY_URL=http://127.0.0.1:$((base + 4)) npx tsx scripts/bench-web.ts
