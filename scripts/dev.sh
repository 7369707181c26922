#!/usr/bin/env bash
# npm run dev: the same services as npm start, with nuxt dev (hot reload).
set -euo pipefail
cd "$(dirname "$0")/.."
. scripts/lib.sh
export BITSLACK_ENV=${BITSLACK_ENV:-demo}
ensure_node_modules
stop_on_exit
prepare_demo_database
ensure_session_secret
. scripts/fakes.sh
start_fakes
print_fake_urls
npx nuxt dev --host 127.0.0.1 --port "${PORT:-3000}"
