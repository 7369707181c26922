/**
 * npm run db:backup / db:restore: a backup of the test database restored into a fresh
 * cluster (its own folder and port) holds the data written before the backup.
 */
import { execFileSync } from 'node:child_process'
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import path from 'node:path'
import pg from 'pg'
import { afterAll, describe, expect, it } from 'vitest'

const sourceUrl = process.env.DATABASE_URL!
const scratch = mkdtempSync(path.join(tmpdir(), 'bitslack-restore-'))
const freshEnv = {
  ...process.env,
  DATABASE_URL: '',
  BITSLACK_PG_DIR: path.join(scratch, 'cluster'),
  BITSLACK_PG_PORT: String(Number(process.env.BITSLACK_PG_PORT || 54339) + 10),
  BITSLACK_PG_DB: 'restored',
}
delete (freshEnv as Record<string, string | undefined>).DATABASE_URL

async function query(url: string, sql: string, params: unknown[] = []) {
  const client = new pg.Client({ connectionString: url })
  await client.connect()
  try {
    return (await client.query(sql, params)).rows
  } finally {
    await client.end()
  }
}

afterAll(() => {
  try {
    execFileSync('bash', ['scripts/pg.sh', 'stop'], { env: freshEnv, stdio: 'ignore' })
  } finally {
    rmSync(scratch, { recursive: true, force: true })
  }
})

describe('database backup and restore', () => {
  it('restores a backup into a fresh cluster with the data in it', async () => {
    const marker = `Backup check ${Date.now()}`
    await query(sourceUrl, 'INSERT INTO teams (name, created_at, updated_at) VALUES ($1, now(), now())', [marker])

    const file = path.join(scratch, 'backup.dump')
    execFileSync('bash', ['scripts/db-backup.sh', file], { env: process.env, stdio: 'pipe' })

    execFileSync('bash', ['scripts/pg.sh', 'start'], { env: freshEnv, stdio: 'pipe' })
    const freshUrl = execFileSync('bash', ['scripts/pg.sh', 'url'], { env: freshEnv }).toString().trim()
    expect(await query(freshUrl, "SELECT to_regclass('public.teams') AS t")).toEqual([{ t: null }])

    execFileSync('bash', ['scripts/db-restore.sh', file], { env: { ...freshEnv, DATABASE_URL: freshUrl }, stdio: 'pipe' })
    const rows = await query(freshUrl, 'SELECT name FROM teams WHERE name = $1', [marker])
    expect(rows).toEqual([{ name: marker }])
    const migrations = await query(freshUrl, 'SELECT count(*)::int AS n FROM schema_migrations')
    expect(migrations[0].n).toBeGreaterThan(0)
  })
})
