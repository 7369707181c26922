/**
 * Scale-out on existing parts: two app processes on their own ports behind HAProxy (Debian's
 * package, installed by npm test when missing), sharing PostgreSQL and the S3 fake. Sessions,
 * sign-out, the sign-in back-off, report sign-off and capture jobs behave the same whichever
 * process answers; one process gone, the proxy keeps serving through the other.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { apiClient, type ApiClient } from '../../support/api'
import { slotPort, startApp, startHaproxy, type Running } from '../../support/servers'
import { buildTeam, buildUser, FACTORY_PASSWORD } from '../../factories/users'
import { buildLink, buildLinkSpec, buildProject } from '../../factories/workspace'
import { couplerCapture } from '../../factories/captures'

const ports = { a: slotPort(1), b: slotPort(2), proxy: slotPort(3) }
let a: Running
let b: Running
let proxy: Running
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms))

beforeAll(async () => {
  ;[a, b] = await Promise.all([startApp(ports.a), startApp(ports.b)])
  proxy = await startHaproxy(ports.proxy, [
    { name: 'app-a', port: ports.a },
    { name: 'app-b', port: ports.b },
  ])
}, 120_000)

afterAll(async () => {
  await proxy?.stop()
  await Promise.all([a?.stop(), b?.stop()])
})

/** A member of a fresh team, signed in through the proxy. */
async function member(role: 'admin' | 'engineer' | 'reviewer' | 'viewer', team?: { id: number }) {
  const t = team ?? (await buildTeam('Scale-out team'))
  const { user } = await buildUser({ team: t as never, role })
  const client = apiClient({ baseURL: proxy.url })
  const res = await client.post('/api/auth/sign-in', { email: user.email, password: FACTORY_PASSWORD })
  expect(res.status).toBe(200)
  return { client, user, team: t }
}

/** Which backends answered a series of requests. */
async function servedBy(client: ApiClient, path: string, n: number): Promise<Map<string, number[]>> {
  const seen = new Map<string, number[]>()
  for (let i = 0; i < n; i++) {
    const res = await client.get(path)
    const who = res.headers.get('x-served-by') ?? '?'
    seen.set(who, [...(seen.get(who) ?? []), res.status])
  }
  return seen
}

describe('two app processes behind HAProxy', () => {
  it('balance the requests of one session over both processes, every one answered', async () => {
    const { client } = await member('viewer')
    const seen = await servedBy(client, '/api/teams', 10)
    expect([...seen.keys()].sort()).toEqual(['app-a', 'app-b'])
    for (const statuses of seen.values()) expect(statuses.every((s) => s === 200)).toBe(true)
  })

  it('a sign-out through one process ends the session on both', async () => {
    const { client } = await member('viewer')
    const kept = client.clone()
    expect((await client.post('/api/auth/sign-out')).status).toBe(204)
    for (const url of [a.url, b.url]) expect((await kept.clone({ baseURL: url }).get('/api/auth/me')).status).toBe(401)
    const seen = await servedBy(kept, '/api/auth/me', 4)
    expect([...seen.values()].flat().every((s) => s === 401)).toBe(true)
  })

  it('the sign-in back-off counts failures from both processes', async () => {
    const { user } = await buildUser({ team: (await buildTeam('Back-off team')) as never, role: 'viewer' })
    const client = apiClient({ baseURL: proxy.url })
    const statuses: number[] = []
    const who = new Set<string>()
    for (let i = 0; i < 7; i++) {
      const res = await client.post('/api/auth/sign-in', { email: user.email, password: 'not the password' })
      statuses.push(res.status)
      who.add(res.headers.get('x-served-by') ?? '?')
    }
    expect(who.size).toBe(2)
    // 5 failures are free (BITSLACK_SIGN_IN_MAX_PER_ADDRESS); the next ones back off, whichever process answers
    expect(statuses.slice(0, 5)).toEqual([401, 401, 401, 401, 401])
    expect(statuses.slice(5)).toContain(429)
  })

  it('report sign-off: decisions sent to both processes at once, exactly one wins', async () => {
    const author = await member('engineer')
    const reviewer = await member('reviewer', author.team)
    const admin = await member('admin', author.team)
    const project = await buildProject(author.client, author.team.id)
    const link = await buildLink(author.client, project.id, buildLinkSpec('telemetry'))
    const frozen = await author.client.post(`/api/links/${link.id}/reports`, {})
    expect(frozen.status).toBe(201)
    expect((await author.client.post(`/api/reports/${frozen.data.id}/submit`, { reviewerId: reviewer.user.id })).status).toBe(200)
    const [off, back] = await Promise.all([
      reviewer.client.clone({ baseURL: a.url }).post(`/api/reports/${frozen.data.id}/sign-off`, {}),
      admin.client.clone({ baseURL: b.url }).post(`/api/reports/${frozen.data.id}/return`, { comment: 'not yet' }),
    ])
    expect([off.status, back.status].sort()).toEqual([200, 409])
    const states = await Promise.all([a, b].map(async (s) => (await author.client.clone({ baseURL: s.url }).get(`/api/reports/${frozen.data.id}`)).data.state))
    expect(states[0]).toBe(off.status === 200 ? 'signed-off' : 'returned')
    expect(states[1]).toBe(states[0])
  })

  it('a capture uploaded through the proxy is extracted by whichever process takes the job', async () => {
    const { client, team } = await member('engineer')
    const project = await buildProject(client, team.id)
    const link = await buildLink(client, project.id, buildLinkSpec('telemetry'))
    const form = new FormData()
    form.set('inputChannel', '1')
    form.set('outputChannel', '2')
    form.set('file', new Blob([couplerCapture().text], { type: 'text/csv' }), 'bench.csv')
    const res = await fetch(`${proxy.url}/api/links/${link.id}/captures`, { method: 'POST', body: form, headers: { cookie: client.cookie } })
    expect(res.status).toBe(202)
    const id = (await res.json()).id as number
    let status = 'queued'
    for (let i = 0; i < 120 && status !== 'done' && status !== 'failed'; i++) {
      await sleep(250)
      status = (await client.get(`/api/captures/${id}`)).data.status
    }
    expect(status).toBe('done')
    for (const url of [a.url, b.url]) expect((await client.clone({ baseURL: url }).get(`/api/captures/${id}`)).data.result.pairing.tPLH.mean).toBeCloseTo(22e-6, 6)
  })

  it('with one process stopped, the proxy serves every request through the other', async () => {
    const { client } = await member('viewer')
    await b.stop()
    const seen = await servedBy(client, '/api/teams', 10)
    expect([...seen.keys()]).toEqual(['app-a'])
    expect(seen.get('app-a')!.every((s) => s === 200)).toBe(true)
  })
})
