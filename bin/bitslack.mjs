#!/usr/bin/env node
// The bitslack command from a checkout: runs the TypeScript source (cli/run.ts) through
// tsx's loader. The published package carries the bundle of `npm run cli:build` instead.
import { register } from 'tsx/esm/api'

register()
await import('../cli/run.ts')
