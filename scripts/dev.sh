#!/usr/bin/env bash
# npm run dev: the same services as npm start, with nuxt dev (hot reload).
set -euo pipefail
cd "$(dirname "$0")/.."
. scripts/lib.sh
export BITSLACK_ENV=${BITSLACK_ENV:-demo}
ensure_node_modules
bash scripts/pg.sh start
DATABASE_URL=${DATABASE_URL:-$(bash scripts/pg.sh url)}
export DATABASE_URL NUXT_DATABASE_URL=$DATABASE_URL
ensure_session_secret
npx tsx scripts/db.ts migrate
npx tsx scripts/db.ts seed
pids=()
trap 'for p in "${pids[@]}"; do kill "$p" 2>/dev/null || true; done' EXIT INT TERM
. scripts/fakes.sh
start_fakes
print_fake_urls
npx nuxt dev --host 127.0.0.1 --port "${PORT:-3000}"
