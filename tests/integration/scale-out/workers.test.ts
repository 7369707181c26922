/**
 * All cores and overload: the cluster launcher (scripts/serve.ts, what npm start runs) serves
 * with several workers and restarts them one at a time without a refused request; a process
 * whose heavy-request gate is full answers 503 with Retry-After at once, and its health
 * check keeps answering.
 */
import { afterAll, describe, expect, it } from 'vitest'
import { apiClient } from '../../support/api'
import { slotPort, startApp, type Running } from '../../support/servers'
import { buildTeam, buildUser, FACTORY_PASSWORD } from '../../factories/users'
import { buildLinkSpec } from '../../factories/workspace'

const started: Running[] = []
afterAll(async () => {
  await Promise.all(started.map((s) => s.stop()))
})

async function signedInAt(url: string) {
  const { user } = await buildUser({ team: (await buildTeam('Workers team')) as never, role: 'engineer' })
  const client = apiClient({ baseURL: url })
  expect((await client.post('/api/auth/sign-in', { email: user.email, password: FACTORY_PASSWORD })).status).toBe(200)
  return client
}

describe('the cluster launcher', () => {
  it('serves with two workers, and a rolling restart (SIGHUP) refuses no request', async () => {
    const app = await startApp(slotPort(4), {}, 2)
    started.push(app)
    const log = (app as Running & { log: string[] }).log
    expect(log.join('\n')).toMatch(/serving with 2 workers/)
    const client = await signedInAt(app.url)
    const statuses: number[] = []
    let stop = false
    const traffic = (async () => {
      while (!stop) {
        try {
          statuses.push((await client.post('/api/analyze', buildLinkSpec('telemetry'))).status)
        } catch {
          statuses.push(0)
        }
      }
    })()
    await new Promise((r) => setTimeout(r, 300))
    app.child.kill('SIGHUP')
    for (let i = 0; i < 200 && !log.some((l) => /restart done/.test(l)); i++) await new Promise((r) => setTimeout(r, 100))
    stop = true
    await traffic
    expect(log.some((l) => /restart done/.test(l))).toBe(true)
    expect(statuses.length).toBeGreaterThan(10)
    expect(statuses.filter((s) => s !== 200)).toEqual([])
  })
})

describe('overload', () => {
  it('a full gate answers 503 with Retry-After, never a long queue; the health check still answers', async () => {
    const app = await startApp(slotPort(6), { BITSLACK_HEAVY_CONCURRENCY: '1', BITSLACK_HEAVY_QUEUE: '1' })
    started.push(app)
    const client = await signedInAt(app.url)
    const heavy = { link: buildLinkSpec('telemetry'), trials: 5000, seed: 1 }
    const burst = Array.from({ length: 8 }, () => client.post('/api/analyze/spread', heavy))
    const health = fetch(`${app.url}/api/health`)
    const results = await Promise.all(burst)
    expect((await health).status).toBe(200)
    const refused = results.filter((r) => r.status === 503)
    // one served, one waiting: the other six are turned away at once
    expect(results.filter((r) => r.status === 200).length).toBeGreaterThanOrEqual(2)
    expect(refused.length).toBeGreaterThanOrEqual(5)
    for (const r of refused) {
      expect(r.headers.get('retry-after')).toBe('2')
      expect(r.data.statusMessage).toMatch(/busy/)
    }
    expect(results.every((r) => r.status === 200 || r.status === 503)).toBe(true)
  })
})
