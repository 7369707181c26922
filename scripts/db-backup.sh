#!/usr/bin/env bash
# npm run db:backup [-- FILE]: a custom-format pg_dump of the database (DATABASE_URL or the
# local cluster) into FILE (default .data/backups/bitslack-<UTC time>.dump).
set -euo pipefail
cd "$(dirname "$0")/.."
BIN=$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1)
[ -n "$BIN" ] || { echo "pg_dump not found: install Debian's postgresql package" >&2; exit 1; }
URL=${DATABASE_URL:-$(bash scripts/pg.sh url)}
FILE=${1:-.data/backups/bitslack-$(date -u +%Y%m%dT%H%M%SZ).dump}
mkdir -p "$(dirname "$FILE")"
"$BIN/pg_dump" --format=custom --no-owner --no-privileges --file="$FILE" "$URL"
echo "[backup] wrote $FILE ($(stat -c %s "$FILE") bytes)"
