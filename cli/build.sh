#!/usr/bin/env bash
# npm run cli:build: bundle the command line (cli/run.ts with the engine, the shared schema
# and its packages) into cli/dist/bitslack.mjs, one file that runs on Node 20 with nothing
# installed (CommonJS packages inside get a require of their own). `cd cli && npm pack` then gives the publishable package (cli/package.json).
set -euo pipefail
cd "$(dirname "$0")/.."
npx esbuild cli/run.ts --bundle --platform=node --format=esm --target=node20 \
  --banner:js='#!/usr/bin/env node
import { createRequire as bitslackRequire } from "node:module"; const require = bitslackRequire(import.meta.url);' --outfile=cli/dist/bitslack.mjs --log-level=warning
chmod +x cli/dist/bitslack.mjs
echo "cli/dist/bitslack.mjs ($(wc -c <cli/dist/bitslack.mjs) bytes)"
