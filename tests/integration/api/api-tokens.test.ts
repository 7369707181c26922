/**
 * API tokens against the real server and database: created on the account routes and shown
 * once, stored only as a hash, scoped to one team and a role no higher than the owner's,
 * expiring, revoked one by one, every use in the team's audit log, not subject to the
 * same-origin check, rate-limited; and the bitslack command line checking a stored link with
 * one (run as a child process, as a CI step runs it).
 */
import { execFile } from 'node:child_process'
import { createHash } from 'node:crypto'
import path from 'node:path'
import { promisify } from 'node:util'
import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest'
import { apiClient, type ApiClient } from '../../support/api'
import { slotPort, startApp, type Running } from '../../support/servers'
import { buildUser, signedIn } from '../../factories/users'
import { buildLink, buildLinkSpec, buildProject } from '../../factories/workspace'
import { buildWorld, type World } from '../../factories/world'
import { useTestDb } from '../../factories/db'

let w: World
let linkId: number
const bearer = (token: string) => apiClient({ bearer: token })

async function createToken(client: ApiClient, body: Record<string, unknown>) {
  return client.post('/api/auth/tokens', { name: 'CI', teamId: w.teamId, scope: 'read', ...body })
}

beforeAll(async () => {
  w = await buildWorld()
  const project = await buildProject(w.clients.admin, w.teamId, 'Token project')
  linkId = (await buildLink(w.clients.admin, project.id)).id
})

describe('creating, listing and revoking tokens', () => {
  it('shows the token once and stores only its SHA-256; the list never carries it', async () => {
    const res = await createToken(w.clients.engineer, { name: 'firmware CI', scope: 'edit', expiresInDays: 30 })
    expect(res.status).toBe(201)
    const token = res.data.token as string
    expect(token).toMatch(/^bsk_[A-Za-z0-9_-]{43}$/)
    expect(res.data).toMatchObject({ name: 'firmware CI', teamId: w.teamId, scope: 'edit', lastUsedAt: null })
    // 30 days from now, within a minute
    expect(Math.abs(new Date(res.data.expiresAt).getTime() - (Date.now() + 30 * 86_400_000))).toBeLessThan(60_000)
    const rows = await useTestDb().query<{ token_hash: string }>('SELECT token_hash FROM api_tokens WHERE id = :id', { replacements: { id: res.data.id }, type: QueryTypes.SELECT })
    expect(rows[0]!.token_hash).toBe(createHash('sha256').update(token).digest('hex'))
    const list = await w.clients.engineer.get('/api/auth/tokens')
    expect(list.status).toBe(200)
    expect(JSON.stringify(list.data)).not.toContain(token.slice(4))
    expect(list.data.find((t: { id: number }) => t.id === res.data.id)).toMatchObject({ name: 'firmware CI', teamName: expect.any(String) })
  })

  it('refuses a scope above the owner\'s role, a team the owner is not in, and bad fields (naming them)', async () => {
    expect((await createToken(w.clients.reviewer, { scope: 'edit' })).status).toBe(403)
    expect((await createToken(w.clients.viewer, { scope: 'edit' })).status).toBe(403)
    expect((await createToken(w.clients.viewer, { scope: 'read' })).status).toBe(201)
    expect((await createToken(w.clients.engineer, { teamId: w.otherTeamId })).status).toBe(404)
    const bad = await createToken(w.clients.engineer, { scope: 'admin', expiresInDays: 0 })
    expect(bad.status).toBe(400)
    expect(bad.data.message).toMatch(/scope|expiresInDays/)
    const noName = await createToken(w.clients.engineer, { name: '  ' })
    expect(noName.status).toBe(400)
    expect(noName.data.message).toContain('name')
  })

  it('a revoked token stops at once; another user\'s token id reads as missing', async () => {
    const res = await createToken(w.clients.engineer, {})
    const client = bearer(res.data.token)
    expect((await client.get(`/api/links/${linkId}`)).status).toBe(200)
    expect((await w.clients.admin.delete(`/api/auth/tokens/${res.data.id}`)).status).toBe(404)
    expect((await w.clients.engineer.delete(`/api/auth/tokens/${res.data.id}`)).status).toBe(204)
    const after = await client.get(`/api/links/${linkId}`)
    expect(after.status).toBe(401)
    expect(after.headers.get('www-authenticate')).toMatch(/^Bearer/)
  })

  it('an expired token is refused; a token whose owner left the team is refused', async () => {
    const res = await createToken(w.clients.engineer, { expiresInDays: 1 })
    expect((await bearer(res.data.token).get(`/api/links/${linkId}`)).status).toBe(200)
    await useTestDb().query("UPDATE api_tokens SET expires_at = now() - interval '1 second' WHERE id = :id", { replacements: { id: res.data.id } })
    expect((await bearer(res.data.token).get(`/api/links/${linkId}`)).status).toBe(401)

    const { user, membership } = await buildUser({ team: { id: w.teamId } as never, role: 'engineer' })
    const leaver = await signedIn(user.email)
    const t = await createToken(leaver, { scope: 'edit' })
    expect((await bearer(t.data.token).get(`/api/links/${linkId}`)).status).toBe(200)
    expect((await w.clients.admin.delete(`/api/teams/${w.teamId}/members/${membership!.id}`)).status).toBe(204)
    expect((await bearer(t.data.token).get(`/api/links/${linkId}`)).status).toBe(401)
  })

  it('an edit token of a member who became a viewer reads only', async () => {
    const { user, membership } = await buildUser({ team: { id: w.teamId } as never, role: 'engineer' })
    const t = await createToken(await signedIn(user.email), { scope: 'edit' })
    const client = bearer(t.data.token)
    const fresh = await buildLink(w.clients.admin, (await buildProject(w.clients.admin, w.teamId, 'Demotion')).id)
    expect((await client.patch(`/api/links/${fresh.id}`, { version: 1, spec: buildLinkSpec('debug', 'Edited by token') })).status).toBe(200)
    expect((await w.clients.admin.patch(`/api/teams/${w.teamId}/members/${membership!.id}`, { role: 'viewer' })).status).toBe(200)
    expect((await client.patch(`/api/links/${fresh.id}`, { version: 2, spec: buildLinkSpec('debug', 'Again') })).status).toBe(403)
    expect((await client.get(`/api/links/${fresh.id}`)).status).toBe(200)
  })
})

describe('using a token', () => {
  it('reaches its own team only; account routes and pages need a browser', async () => {
    const t = await createToken(w.clients.engineer, {})
    const client = bearer(t.data.token)
    const teams = await client.get('/api/teams')
    expect(teams.data).toEqual([expect.objectContaining({ id: w.teamId, role: 'viewer' })])
    expect((await client.get('/api/auth/me')).status).toBe(403)
    expect((await client.get('/api/auth/tokens')).status).toBe(403)
    expect((await client.post('/api/auth/tokens', { name: 'x', teamId: w.teamId, scope: 'read' })).status).toBe(403)
    expect((await client.get('/api/review-queue')).status).toBe(403)
    expect((await client.get(`/links/${linkId}`)).status).toBe(403)
    expect((await client.get(`/links/${linkId}/link.json`)).status).toBe(200)
    expect((await bearer('bsk_not-a-real-token-000000000000000000000000').get('/api/teams')).status).toBe(401)
    expect((await apiClient().request('GET', '/api/teams', undefined, { authorization: 'Basic abc' })).status).toBe(401)
  })

  it('is not subject to the same-origin check: a script posts without a browser\'s Origin', async () => {
    const t = await createToken(w.clients.engineer, { scope: 'edit' })
    const res = await bearer(t.data.token).request('POST', '/api/analyze', buildLinkSpec('debug'), { origin: 'https://elsewhere.example', 'sec-fetch-site': 'cross-site' })
    expect(res.status).toBe(200)
    // the same from a browser session is refused
    expect((await w.clients.engineer.request('POST', '/api/analyze', buildLinkSpec('debug'), { origin: 'https://elsewhere.example' })).status).toBe(403)
  })

  it('every use is in the team\'s audit log, and the list shows the last use', async () => {
    const t = await createToken(w.clients.engineer, { name: 'audited' })
    await bearer(t.data.token).get(`/api/links/${linkId}`)
    await bearer(t.data.token).get(`/api/links/${linkId}/analysis`)
    let uses: { action: string; entityId: number; detail: { path: string; status: number; method: string } }[] = []
    for (let i = 0; i < 50 && uses.length < 2; i++) {
      const audit = await w.clients.admin.get(`/api/teams/${w.teamId}/audit?action=token.use&limit=500`)
      uses = audit.data.filter((e: { entityId: number }) => e.entityId === t.data.id)
      if (uses.length < 2) await new Promise((r) => setTimeout(r, 100))
    }
    expect(uses.map((u) => u.detail.path).sort()).toEqual([`/api/links/${linkId}`, `/api/links/${linkId}/analysis`])
    expect(uses.every((u) => u.detail.status === 200 && u.detail.method === 'GET')).toBe(true)
    const list = await w.clients.engineer.get('/api/auth/tokens')
    expect(list.data.find((x: { id: number }) => x.id === t.data.id).lastUsedAt).not.toBeNull()
  })
})

describe('the token rate', () => {
  let spare: Running
  afterAll(async () => spare?.stop())

  it('answers 429 with Retry-After beyond the requests a minute of one token', async () => {
    spare = await startApp(slotPort(8), { BITSLACK_TOKEN_REQUESTS_PER_MINUTE: '5' })
    const t = await createToken(w.clients.engineer, {})
    const client = apiClient({ bearer: t.data.token, baseURL: spare.url })
    const statuses: number[] = []
    let retryAfter: string | null = null
    for (let i = 0; i < 7; i++) {
      const res = await client.get(`/api/links/${linkId}`)
      statuses.push(res.status)
      if (res.status === 429) retryAfter = res.headers.get('retry-after')
    }
    expect(statuses).toEqual([200, 200, 200, 200, 200, 429, 429])
    expect(Number(retryAfter)).toBeGreaterThan(0)
  })
})

describe('bitslack check --server', () => {
  const run = promisify(execFile)
  async function bitslack(...args: string[]) {
    try {
      const { stdout } = await run(process.execPath, [path.resolve('bin/bitslack.mjs'), ...args])
      return { code: 0, out: stdout, err: '' }
    } catch (e) {
      const x = e as { code: number; stdout: string; stderr: string }
      return { code: x.code, out: x.stdout, err: x.stderr }
    }
  }

  it('checks a stored link with a token: the server\'s verdict and exit code; a bad token is exit 2', async () => {
    const t = await createToken(w.clients.engineer, { name: 'cli' })
    const base = inject('baseURL')
    const stored = await w.clients.engineer.get(`/api/links/${linkId}/analysis`)
    const r = await bitslack('check', '--server', base, '--token', t.data.token, '--link', String(linkId), '--json')
    expect(r.code, r.err).toBe(stored.data.verdict === 'pass' ? 0 : 1)
    expect(JSON.parse(r.out).verdict).toBe(stored.data.verdict)
    // the same link at a rate it cannot carry fails (the override is analysed by the server's engine)
    const fast = await bitslack('check', '--server', base, '--token', t.data.token, '--link', String(linkId), '--baud', '20M')
    expect(fast.code, fast.err).toBe(1)
    const refused = await bitslack('check', '--server', base, '--token', 'bsk_wrong-token-0000000000000000000000000000', '--link', String(linkId))
    expect(refused.code).toBe(2)
    expect(refused.err).toContain('401')
  }, 60_000)
})
