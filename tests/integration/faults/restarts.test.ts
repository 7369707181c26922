/**
 * Faults: the server killed with SIGKILL in the middle of a burst of writes loses no
 * acknowledged write; a database restart while the app runs gives clear 503s during the
 * outage and the app recovers by itself afterwards.
 */
import { execFileSync, spawn, type ChildProcess } from 'node:child_process'
import { buildTeam, buildUser, FACTORY_PASSWORD } from '../../factories/users'
import { afterAll, describe, expect, inject, it } from 'vitest'
import { TELEMETRY_LINK } from '../../../server/db/seeders/demo-links'

const baseURL = inject('baseURL')
const output = process.env.BITSLACK_OUTPUT_DIR || '.output'
const sparePort = Number(process.env.BITSLACK_TEST_PORT || 3100) + 7
const spareURL = `http://127.0.0.1:${sparePort}`
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms))

let spare: ChildProcess | undefined

async function startSpare(): Promise<ChildProcess> {
  const child = spawn(process.execPath, [`${output}/server/index.mjs`], {
    env: { ...process.env, PORT: String(sparePort), HOST: '127.0.0.1', NODE_ENV: 'production', SMTP_HOST: '127.0.0.1', SMTP_PORT: '9' },
    stdio: 'ignore',
  })
  for (let i = 0; i < 150; i++) {
    if (child.exitCode !== null) throw new Error(`spare server exited with ${child.exitCode}`)
    try {
      if ((await fetch(`${spareURL}/api/health`)).ok) return child
    } catch {
      // not up yet
    }
    await sleep(200)
  }
  throw new Error('spare server did not start')
}

/** An admin of a fresh team signed in at `url` (the cookie and the team). */
async function signUp(url: string) {
  const team = await buildTeam('Fault team')
  const { user } = await buildUser({ name: 'Fault Tester', team, role: 'admin' })
  const res = await fetch(`${url}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: user.email, password: FACTORY_PASSWORD }),
  })
  expect(res.status).toBe(200)
  const cookie = res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ')
  return { cookie, teamId: team.id }
}

afterAll(() => {
  if (spare && spare.exitCode === null) spare.kill('SIGKILL')
})

describe('fault tolerance', () => {
  it('loses no acknowledged write when the server is killed with SIGKILL mid-burst', async () => {
    spare = await startSpare()
    const { cookie, teamId } = await signUp(spareURL)
    const created = await fetch(`${spareURL}/api/teams/${teamId}/projects`, {
      method: 'POST',
      headers: { cookie, 'content-type': 'application/json' },
      body: JSON.stringify({ name: 'Burst project' }),
    })
    expect(created.status).toBeLessThan(300)
    const projectId = (await created.json()).id as number

    const acknowledged: number[] = []
    let refused = 0
    const writes = Array.from({ length: 400 }, (_, i) =>
      (async () => {
        await sleep(i * 3)
        try {
          const res = await fetch(`${spareURL}/api/projects/${projectId}/links`, {
            method: 'POST',
            headers: { cookie, 'content-type': 'application/json' },
            body: JSON.stringify({ spec: { ...TELEMETRY_LINK, name: `burst ${i}` } }),
          })
          if (res.status < 300) acknowledged.push((await res.json()).id)
        } catch {
          refused++ // connection cut by the kill: never acknowledged
        }
      })(),
    )
    // kill once the burst is well under way: some writes acknowledged, many still to come
    while (acknowledged.length < 20) await sleep(5)
    spare.kill('SIGKILL')
    await Promise.all(writes)
    expect(acknowledged.length, 'writes acknowledged before the kill').toBeGreaterThan(0)
    expect(refused, 'writes cut off by the kill').toBeGreaterThan(0)

    // every acknowledged link is there, read through the main server
    const res = await fetch(`${baseURL}/api/projects/${projectId}/links`, { headers: { cookie } })
    expect(res.status, 'listing through the main server').toBe(200)
    const listed = (await res.json()) as { id: number }[]
    const ids = new Set((Array.isArray(listed) ? listed : (listed as any).links).map((l: { id: number }) => l.id))
    expect(acknowledged.filter((id) => !ids.has(id)), 'acknowledged links missing after the kill').toEqual([])
  })

  it('answers 503 while the database is down and recovers by itself when it is back', async () => {
    const { cookie, teamId } = await signUp(baseURL)
    const read = () => fetch(`${baseURL}/api/teams/${teamId}/projects`, { headers: { cookie } })
    expect((await read()).status).toBe(200)

    execFileSync('bash', ['scripts/pg.sh', 'stop'], { env: { ...process.env, DATABASE_URL: '' }, stdio: 'pipe' })
    try {
      const during = await read()
      expect(during.status).toBe(503)
      const body = await during.json()
      expect(body.statusMessage ?? body.message).toMatch(/database/i)
      expect((await fetch(`${baseURL}/api/health`)).status).toBe(503)
    } finally {
      execFileSync('bash', ['scripts/pg.sh', 'start'], { env: { ...process.env, DATABASE_URL: '' }, stdio: 'pipe' })
    }

    let status = 0
    for (let i = 0; i < 50 && status !== 200; i++) {
      status = (await read()).status
      if (status !== 200) await sleep(200)
    }
    expect(status).toBe(200)
  })
})
