#!/usr/bin/env bash
# npm test: installs what the suite needs, starts a throwaway PostgreSQL cluster on its
# own port and folder, builds the app, runs every tier (unit, integration, browser) in
# one vitest run, stops what it started (also on failure) and ends with the line
# "N passed, N failed".
set -uo pipefail
cd "$(dirname "$0")/.."
. scripts/lib.sh

# The suite never touches a configured production or development database.
unset DATABASE_URL NUXT_DATABASE_URL

# Each run takes a free slot (a lock file), so runs in parallel on one machine get their
# own cluster, ports and build folders. Slot 0 uses the documented defaults.
mkdir -p .data
for s in 0 1 2 3 4 5 6 7; do
  exec {slot_fd}>".data/test-slot-$s.lock"
  if flock -n "$slot_fd"; then SLOT=$s; break; fi
  exec {slot_fd}>&-
done
[ -n "${SLOT:-}" ] || { echo "no free test slot (8 runs in parallel?)" >&2; echo "0 passed, 1 failed"; exit 1; }
export BITSLACK_TEST_SLOT=$SLOT
export BITSLACK_PG_DIR=${BITSLACK_TEST_PG_DIR:-.data/postgres-test-$SLOT}
export BITSLACK_PG_PORT=${BITSLACK_TEST_PG_PORT:-$((54339 + 20 * SLOT))}
export BITSLACK_TEST_PORT=${BITSLACK_TEST_PORT:-$((3100 + 10 * SLOT))}
export BITSLACK_PG_DB=bitslack_test
export BITSLACK_BUILD_DIR=$PWD/.data/test-build-$SLOT/nuxt
export BITSLACK_OUTPUT_DIR=$PWD/.data/test-build-$SLOT/output
export BITSLACK_ENV=test
export NUXT_SESSION_PASSWORD=test-session-password-at-least-32-characters-long

set -e
# dependencies and the default .nuxt types (the root tsconfig refers to them) come first,
# outside this run's own build folder
env -u BITSLACK_BUILD_DIR -u BITSLACK_OUTPUT_DIR bash -c '. scripts/lib.sh; ensure_node_modules'
[ -f .nuxt/tsconfig.app.json ] || env -u BITSLACK_BUILD_DIR -u BITSLACK_OUTPUT_DIR npx nuxt prepare >/dev/null 2>&1
pkgs=("/usr/bin/chromium:chromium" "ngspice:ngspice" "pdftoppm:poppler-utils" "/usr/sbin/haproxy:haproxy")
ls /usr/lib/postgresql/*/bin/initdb >/dev/null 2>&1 || pkgs+=("/nonexistent-initdb:postgresql")
ensure_debian_packages "${pkgs[@]}"

stop_on_exit
fresh_cluster
set +e

log "building the app for the integration and browser tiers"
if ! npx nuxt build >".data/test-build-$SLOT.log" 2>&1; then
  tail -n 60 ".data/test-build-$SLOT.log" >&2
  echo "0 passed, 1 failed"
  exit 1
fi

# The type check counts as one test of the closing line.
log "type-checking (nuxt typecheck)"
if npx nuxt typecheck >".data/typecheck-$SLOT.log" 2>&1; then
  typecheck=passed
else
  typecheck=failed
  grep -E "error TS" ".data/typecheck-$SLOT.log" | head -n 40 >&2
fi

mkdir -p tests/.artifacts
results=tests/.artifacts/vitest-$SLOT.json
rm -f "$results"
npx vitest run --config vitest.all.config.ts --reporter=default --reporter=json --outputFile.json="$results" "$@"
status=$?

node -e '
const fs = require("fs")
const [f, typecheck] = process.argv.slice(1)
const tc = typecheck === "passed" ? [1, 0] : [0, 1]
if (!fs.existsSync(f)) { console.log(`${tc[0]} passed, ${tc[1] + 1} failed`); process.exit(0) }
const r = JSON.parse(fs.readFileSync(f, "utf8"))
// a file that fails to load has no failed test of its own: count it as a failure
const brokenFiles = r.testResults.filter((s) => s.status === "failed" && s.assertionResults.every((a) => a.status !== "failed")).length
console.log(`${r.numPassedTests + tc[0]} passed, ${r.numFailedTests + brokenFiles + tc[1]} failed`)
' "$results" "$typecheck"
[ "$typecheck" = passed ] || status=1
exit $status
