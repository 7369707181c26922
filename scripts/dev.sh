#!/usr/bin/env bash
# npm run dev: the same services as npm start, with nuxt dev (hot reload).
set -euo pipefail
cd "$(dirname "$0")/.."
. scripts/lib.sh
export BITSLACK_ENV=${BITSLACK_ENV:-demo}
if (exec 3<>"/dev/tcp/127.0.0.1/${PORT:-3000}") 2>/dev/null; then
  echo "[bitslack] port ${PORT:-3000} is already in use: stop the other server, or start with PORT=<free port> npm run dev" >&2
  exit 1
fi
ensure_node_modules
stop_on_exit
prepare_demo_database
ensure_session_secret
. scripts/fakes.sh
start_fakes
print_fake_urls
npx nuxt dev --host 127.0.0.1 --port "${PORT:-3000}"
