#!/usr/bin/env bash
# npm run db:restore -- FILE: restore a backup made by db:backup into the database
# (DATABASE_URL or the local cluster), replacing the objects it contains.
set -euo pipefail
cd "$(dirname "$0")/.."
FILE=${1:?usage: npm run db:restore -- FILE}
[ -f "$FILE" ] || { echo "no such backup: $FILE" >&2; exit 1; }
BIN=$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1)
[ -n "$BIN" ] || { echo "pg_restore not found: install Debian's postgresql package" >&2; exit 1; }
URL=${DATABASE_URL:-$(bash scripts/pg.sh url)}
"$BIN/pg_restore" --clean --if-exists --no-owner --no-privileges --single-transaction --dbname="$URL" "$FILE"
echo "[restore] restored $FILE"
