/**
 * Global setup of the integration and browser tiers: start the built server
 * (BITSLACK_OUTPUT_DIR/server/index.mjs, built by scripts/test.sh) against the throwaway database,
 * wait until /api/health answers, and stop it afterwards.
 */
import { spawn, type ChildProcess } from 'node:child_process'
import type { TestProject } from 'vitest/node'

const port = Number(process.env.BITSLACK_TEST_PORT || 3100)
const baseURL = `http://127.0.0.1:${port}`

let server: ChildProcess | undefined

export async function setup(project: TestProject) {
  if (!process.env.DATABASE_URL) throw new Error('DATABASE_URL is not set: run the suite through npm test')
  const output = process.env.BITSLACK_OUTPUT_DIR || '.output'
  server = spawn(process.execPath, [`${output}/server/index.mjs`], {
    env: { ...process.env, PORT: String(port), HOST: '127.0.0.1', NODE_ENV: 'production' },
    stdio: ['ignore', 'inherit', 'inherit'],
  })
  const deadline = Date.now() + 60_000
  for (;;) {
    if (server.exitCode !== null) throw new Error(`the server exited with code ${server.exitCode}`)
    try {
      const res = await fetch(`${baseURL}/api/health`)
      if (res.ok) break
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) throw new Error('the server did not answer /api/health within 60 s')
    await new Promise((r) => setTimeout(r, 200))
  }
  project.provide('baseURL', baseURL)
}

export async function teardown() {
  if (server && server.exitCode === null) {
    server.kill('SIGTERM')
    await new Promise((r) => server!.once('exit', r))
  }
}

declare module 'vitest' {
  export interface ProvidedContext {
    baseURL: string
  }
}
