import { spawnSync } from 'node:child_process'
import { describe, expect, it } from 'vitest'

const output = process.env.BITSLACK_OUTPUT_DIR || '.output'

describe('production start without its secrets', () => {
  it('refuses to start and names every missing variable', () => {
    const env: Record<string, string> = {
      PATH: process.env.PATH!,
      BITSLACK_ENV: 'production',
      PORT: String(Number(process.env.BITSLACK_TEST_PORT || 3100) + 5),
      NUXT_SESSION_PASSWORD: 'too-short',
    }
    const run = spawnSync(process.execPath, [`${output}/server/index.mjs`], { env, timeout: 20_000, encoding: 'utf8' })
    expect(run.status).toBe(1)
    expect(run.stderr).toContain('production start refused')
    for (const name of ['NUXT_SESSION_PASSWORD (at least 32 characters)', 'DATABASE_URL', 'SMTP_HOST', 'S3_BUCKET'])
      expect(run.stderr).toContain(name)
  })
})
