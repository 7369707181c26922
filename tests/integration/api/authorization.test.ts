/**
 * The authorisation matrix: every route x {signed out, viewer, engineer, reviewer, admin,
 * member of another team}, with the expected status per cell (shared/permissions.ts is
 * the table under test). Each cell runs on a copy of the caller's cookie jar, and routes
 * that change or delete something get fresh rows per cell, so cells never affect each other.
 */
import { randomUUID } from 'node:crypto'
import { readdirSync } from 'node:fs'
import { beforeAll, describe, expect, it } from 'vitest'
import { apiClient, type ApiClient } from '../../support/api'
import { linkIn, waitForMail } from '../../support/mail'
import { buildWorld, CALLERS, type Caller, type World } from '../../factories/world'
import { buildUser, signedIn, uniqueEmail } from '../../factories/users'
import { buildLink, buildLinkSpec, buildPart, buildPartBody, buildProject } from '../../factories/workspace'

type Statuses = [signedOut: number, viewer: number, engineer: number, reviewer: number, admin: number, outsider: number]

interface Row {
  method: 'GET' | 'POST' | 'PATCH' | 'DELETE'
  /** the route as documented */
  route: string
  /**
   * the concrete request of one cell (fresh rows where the cell changes something); a cell that
   * ends sessions names its own client, a second session of the caller, so the shared ones live on
   */
  request: (caller: Caller) => Promise<{ path: string; body?: unknown; client?: ApiClient }>
  expected: Statuses
}

let w: World
let fixed: { projectId: number; linkId: number; partId: number; builtInPartId: number }

const PUBLIC: Statuses = [200, 200, 200, 200, 200, 200]
const SIGNED_IN: Statuses = [401, 200, 200, 200, 200, 200]
const READ: Statuses = [401, 200, 200, 200, 200, 404]
const ADMIN_ONLY: Statuses = [401, 403, 403, 403, 200, 404]
const ADMIN_DELETE: Statuses = [401, 403, 403, 403, 204, 404]
const ENGINEER_CREATE: Statuses = [401, 403, 201, 403, 201, 404]
const ENGINEER_EDIT: Statuses = [401, 403, 200, 403, 200, 404]

const admin = () => w.clients.admin
const freshProject = async () => (await buildProject(admin(), w.teamId, `Matrix ${randomUUID().slice(0, 6)}`)).id
const freshLink = async () => (await buildLink(admin(), fixed.projectId)).id
const freshPart = async () => (await buildPart(admin(), w.teamId, `Matrix part ${randomUUID().slice(0, 6)}`)).id
const freshMember = async () => (await buildUser({ team: { id: w.teamId } as never, role: 'viewer' })).membership!.id
/** A second session of the caller's user (none when signed out). */
async function ownSession(caller: Caller): Promise<ApiClient | undefined> {
  return caller === 'signedOut' ? undefined : signedIn(w.users[caller].email)
}
/** A throwaway user in the caller's place (same team and role), for a cell that signs out everywhere. */
async function standIn(caller: Caller): Promise<ApiClient | undefined> {
  if (caller === 'signedOut') return undefined
  const team = { id: caller === 'outsider' ? w.otherTeamId : w.teamId } as never
  const { user } = await buildUser({ team, role: caller === 'outsider' ? 'admin' : caller })
  return signedIn(user.email)
}
/** The id of a second session of the caller's user, to end through the shared one. */
async function ownSessionId(caller: Caller): Promise<number> {
  const other = await ownSession(caller)
  if (!other) return 1
  const list = await other.get('/api/auth/sessions')
  return (list.data as { id: number; current: boolean }[]).find((s) => s.current)!.id
}

/** A token of the caller's own to revoke (a made-up id when signed out, or for a token caller). */
async function ownTokenId(caller: Caller): Promise<number> {
  if (caller === 'signedOut') return 1
  const res = await w.clients[caller].post('/api/auth/tokens', { name: 'to revoke', teamId: caller === 'outsider' ? w.otherTeamId : w.teamId, scope: 'read' })
  expect(res.status).toBe(201)
  return res.data.id as number
}

async function freshInvitation() {
  const email = uniqueEmail('matrix')
  const res = await admin().post(`/api/teams/${w.teamId}/invitations`, { email, role: 'viewer' })
  expect(res.status).toBe(201)
  const token = linkIn(await waitForMail(email), '/accept-invitation').searchParams.get('token')!
  return { id: res.data.id as number, token }
}

const rows: Row[] = [
  // accounts (public routes answer the same for everyone)
  { method: 'POST', route: '/api/auth/sign-up', request: async () => ({ path: '/api/auth/sign-up', body: { name: 'New Founder', email: uniqueEmail('founder'), password: 'matrix password', teamName: 'Matrix Team' } }), expected: [202, 202, 202, 202, 202, 202] },
  { method: 'POST', route: '/api/auth/sign-in', request: async () => ({ path: '/api/auth/sign-in', body: { email: uniqueEmail('nobody'), password: 'wrong' } }), expected: [401, 401, 401, 401, 401, 401] },
  { method: 'POST', route: '/api/auth/sign-up/confirm', request: async () => ({ path: '/api/auth/sign-up/confirm', body: { token: randomUUID().replace(/-/g, '') } }), expected: [400, 400, 400, 400, 400, 400] },
  { method: 'POST', route: '/api/auth/sign-out', request: async (caller) => ({ path: '/api/auth/sign-out', client: await ownSession(caller) }), expected: [204, 204, 204, 204, 204, 204] },
  { method: 'GET', route: '/api/auth/sessions', request: async () => ({ path: '/api/auth/sessions' }), expected: SIGNED_IN },
  { method: 'DELETE', route: '/api/auth/sessions', request: async (caller) => ({ path: '/api/auth/sessions', client: await standIn(caller) }), expected: [401, 204, 204, 204, 204, 204] },
  { method: 'DELETE', route: '/api/auth/sessions/[sessionId]', request: async (caller) => ({ path: `/api/auth/sessions/${await ownSessionId(caller)}` }), expected: [401, 204, 204, 204, 204, 204] },
  { method: 'GET', route: '/api/auth/me', request: async () => ({ path: '/api/auth/me' }), expected: SIGNED_IN },
  { method: 'GET', route: '/api/auth/tokens', request: async () => ({ path: '/api/auth/tokens' }), expected: SIGNED_IN },
  { method: 'POST', route: '/api/auth/tokens', request: async (caller) => ({ path: '/api/auth/tokens', body: { name: 'matrix', teamId: caller === 'outsider' ? w.otherTeamId : w.teamId, scope: 'read' } }), expected: [401, 201, 201, 201, 201, 201] },
  { method: 'DELETE', route: '/api/auth/tokens/[tokenId]', request: async (caller) => ({ path: `/api/auth/tokens/${await ownTokenId(caller)}` }), expected: [401, 204, 204, 204, 204, 204] },
  { method: 'POST', route: '/api/auth/password-reset', request: async () => ({ path: '/api/auth/password-reset', body: { email: uniqueEmail('nobody') } }), expected: [202, 202, 202, 202, 202, 202] },
  { method: 'POST', route: '/api/auth/password-reset/complete', request: async () => ({ path: '/api/auth/password-reset/complete', body: { token: randomUUID().replace(/-/g, ''), password: 'matrix password' } }), expected: [400, 400, 400, 400, 400, 400] },
  { method: 'GET', route: '/api/invitations/[token]', request: async () => ({ path: `/api/invitations/${(await freshInvitation()).token}` }), expected: PUBLIC },
  { method: 'POST', route: '/api/invitations/[token]/accept', request: async () => ({ path: `/api/invitations/${(await freshInvitation()).token}/accept`, body: { name: 'Invited Person', password: 'matrix password' } }), expected: PUBLIC },
  { method: 'GET', route: '/api/config', request: async () => ({ path: '/api/config' }), expected: PUBLIC },
  { method: 'GET', route: '/api/openapi.json', request: async () => ({ path: '/api/openapi.json' }), expected: PUBLIC },

  // teams
  { method: 'GET', route: '/api/teams', request: async () => ({ path: '/api/teams' }), expected: SIGNED_IN },
  { method: 'GET', route: '/api/teams/[teamId]/members', request: async () => ({ path: `/api/teams/${w.teamId}/members` }), expected: READ },
  { method: 'PATCH', route: '/api/teams/[teamId]/members/[memberId]', request: async () => ({ path: `/api/teams/${w.teamId}/members/${await freshMember()}`, body: { role: 'reviewer' } }), expected: ADMIN_ONLY },
  { method: 'DELETE', route: '/api/teams/[teamId]/members/[memberId]', request: async () => ({ path: `/api/teams/${w.teamId}/members/${await freshMember()}` }), expected: ADMIN_DELETE },
  { method: 'GET', route: '/api/teams/[teamId]/invitations', request: async () => ({ path: `/api/teams/${w.teamId}/invitations` }), expected: ADMIN_ONLY },
  { method: 'POST', route: '/api/teams/[teamId]/invitations', request: async () => ({ path: `/api/teams/${w.teamId}/invitations`, body: { email: uniqueEmail('invitee'), role: 'viewer' } }), expected: [401, 403, 403, 403, 201, 404] },
  { method: 'DELETE', route: '/api/teams/[teamId]/invitations/[invitationId]', request: async () => ({ path: `/api/teams/${w.teamId}/invitations/${(await freshInvitation()).id}` }), expected: ADMIN_DELETE },
  { method: 'GET', route: '/api/teams/[teamId]/audit', request: async () => ({ path: `/api/teams/${w.teamId}/audit` }), expected: ADMIN_ONLY },
  { method: 'GET', route: '/api/teams/[teamId]/policy', request: async () => ({ path: `/api/teams/${w.teamId}/policy` }), expected: READ },
  {
    method: 'PATCH',
    route: '/api/teams/[teamId]/policy',
    request: async () => {
      const current = (await admin().get(`/api/teams/${w.teamId}/policy`)).data
      return { path: `/api/teams/${w.teamId}/policy`, body: { version: current.version, policy: current.policy } }
    },
    expected: ADMIN_ONLY,
  },

  // projects
  { method: 'GET', route: '/api/teams/[teamId]/projects', request: async () => ({ path: `/api/teams/${w.teamId}/projects` }), expected: READ },
  { method: 'POST', route: '/api/teams/[teamId]/projects', request: async () => ({ path: `/api/teams/${w.teamId}/projects`, body: { name: 'Matrix project' } }), expected: ENGINEER_CREATE },
  { method: 'GET', route: '/api/projects/[projectId]', request: async () => ({ path: `/api/projects/${fixed.projectId}` }), expected: READ },
  { method: 'PATCH', route: '/api/projects/[projectId]', request: async () => ({ path: `/api/projects/${await freshProject()}`, body: { version: 1, name: 'Renamed' } }), expected: ENGINEER_EDIT },
  { method: 'DELETE', route: '/api/projects/[projectId]', request: async () => ({ path: `/api/projects/${await freshProject()}` }), expected: ADMIN_DELETE },
  { method: 'GET', route: '/api/projects/[projectId]/links', request: async () => ({ path: `/api/projects/${fixed.projectId}/links` }), expected: READ },
  { method: 'POST', route: '/api/projects/[projectId]/links', request: async () => ({ path: `/api/projects/${fixed.projectId}/links`, body: { spec: buildLinkSpec('debug') } }), expected: ENGINEER_CREATE },

  // links
  { method: 'GET', route: '/api/links/[linkId]', request: async () => ({ path: `/api/links/${fixed.linkId}` }), expected: READ },
  { method: 'PATCH', route: '/api/links/[linkId]', request: async () => ({ path: `/api/links/${await freshLink()}`, body: { version: 1, spec: buildLinkSpec('debug', 'Edited') } }), expected: ENGINEER_EDIT },
  { method: 'DELETE', route: '/api/links/[linkId]', request: async () => ({ path: `/api/links/${await freshLink()}` }), expected: [401, 403, 204, 403, 204, 404] },
  { method: 'GET', route: '/api/links/[linkId]/analysis', request: async () => ({ path: `/api/links/${fixed.linkId}/analysis` }), expected: READ },
  // a member reads it; the fixed link has no signed-off revision: 409
  { method: 'GET', route: '/api/links/[linkId]/since-sign-off', request: async () => ({ path: `/api/links/${fixed.linkId}/since-sign-off` }), expected: [401, 409, 409, 409, 409, 404] },

  // compute: a session is enough, no team data is read
  { method: 'POST', route: '/api/analyze', request: async () => ({ path: '/api/analyze', body: buildLinkSpec('debug') }), expected: SIGNED_IN },
  { method: 'POST', route: '/api/analyze/pullup-sweep', request: async () => ({ path: '/api/analyze/pullup-sweep', body: { link: buildLinkSpec('telemetry'), channelId: 'telemetry', stageIndex: 0, options: { series: 'E12', rlMin: 1000, rlMax: 4700 } } }), expected: SIGNED_IN },
  { method: 'POST', route: '/api/analyze/spread', request: async () => ({ path: '/api/analyze/spread', body: { link: buildLinkSpec('debug'), trials: 50, seed: 3 } }), expected: SIGNED_IN },

  // parts
  { method: 'GET', route: '/api/teams/[teamId]/parts', request: async () => ({ path: `/api/teams/${w.teamId}/parts` }), expected: READ },
  { method: 'POST', route: '/api/teams/[teamId]/parts', request: async () => ({ path: `/api/teams/${w.teamId}/parts`, body: buildPartBody('Matrix coupler') }), expected: ENGINEER_CREATE },
  { method: 'GET', route: '/api/parts/[partId] (team part)', request: async () => ({ path: `/api/parts/${fixed.partId}` }), expected: READ },
  { method: 'GET', route: '/api/parts/[partId] (built-in)', request: async () => ({ path: `/api/parts/${fixed.builtInPartId}` }), expected: SIGNED_IN },
  { method: 'PATCH', route: '/api/parts/[partId] (team part)', request: async () => ({ path: `/api/parts/${await freshPart()}`, body: { version: 1, description: 'edited' } }), expected: ENGINEER_EDIT },
  { method: 'PATCH', route: '/api/parts/[partId] (built-in)', request: async () => ({ path: `/api/parts/${fixed.builtInPartId}`, body: { version: 1, description: 'edited' } }), expected: [401, 403, 403, 403, 403, 403] },
  { method: 'DELETE', route: '/api/parts/[partId] (team part)', request: async () => ({ path: `/api/parts/${await freshPart()}` }), expected: ADMIN_DELETE },
  { method: 'DELETE', route: '/api/parts/[partId] (built-in)', request: async () => ({ path: `/api/parts/${fixed.builtInPartId}` }), expected: [401, 403, 403, 403, 403, 403] },
]

beforeAll(async () => {
  w = await buildWorld()
  const projectId = await buildProject(admin(), w.teamId, 'Matrix fixed project').then((p) => p.id)
  const linkId = await buildLink(admin(), projectId).then((l) => l.id)
  const partId = await buildPart(admin(), w.teamId, 'Matrix fixed part').then((p) => p.id)
  const parts = await admin().get(`/api/teams/${w.teamId}/parts`)
  const builtInPartId = parts.data.find((p: { builtIn: boolean }) => p.builtIn).id as number
  fixed = { projectId, linkId, partId, builtInPartId }
})

describe('authorisation matrix', () => {
  describe.each(rows)('$method $route', (row) => {
    it.each(CALLERS.map((caller, i) => ({ caller, status: row.expected[i]! })))('as $caller -> $status', async ({ caller, status }) => {
      const { path, body, client: own } = await row.request(caller)
      const client: ApiClient = (own ?? w.clients[caller as Caller]).clone({ ip: `10.77.${CALLERS.indexOf(caller)}.1` })
      const res = await client.request(row.method, path, body)
      expect(res.status, `${row.method} ${path} as ${caller}: ${JSON.stringify(res.data).slice(0, 300)}`).toBe(status)
    })
  })

  it('has a row for every route file of the accounts, workspace and compute API', () => {
    // routes of other features (reports, captures, datasheets, import/export) have their own matrices
    const others = /\/(reports|review-queue|captures|datasheets|import|export)\b|\/health\./
    const files = readdirSync('server/api', { recursive: true, encoding: 'utf8' }).filter((f) => /\.(get|post|patch|delete|put)\.ts$/.test(f))
    const routes = files
      .map((f) => `/api/${f}`)
      .filter((f) => !others.test(f))
      .map((f) => {
        const [, path, method] = f.match(/^(.*)\.(get|post|patch|delete|put)\.ts$/)!
        return `${method!.toUpperCase()} ${path!.replace(/\/index$/, '')}`
      })
    const covered = new Set(rows.map((r) => `${r.method} ${r.route.replace(/ \(.*\)$/, '')}`))
    expect(routes.length).toBeGreaterThan(30)
    expect(routes.filter((r) => !covered.has(r))).toEqual([])
  })
})

/**
 * The same routes with API tokens instead of sessions: a read token acts as a viewer, an edit
 * token as an engineer (an admin's edit token too: never more than its scope), a token of
 * another team as a non-member; account routes and invitations refuse every token (403).
 */
const TOKEN_CALLERS = [
  { name: 'read token of an engineer', owner: 'engineer', scope: 'read', actsAs: 'viewer' },
  { name: 'edit token of an engineer', owner: 'engineer', scope: 'edit', actsAs: 'engineer' },
  { name: 'edit token of an admin', owner: 'admin', scope: 'edit', actsAs: 'engineer' },
  { name: 'edit token of another team\'s admin', owner: 'outsider', scope: 'edit', actsAs: 'outsider' },
] as const
const SESSION_ONLY = /^\/api\/(auth|invitations)\//
const tokens: Record<string, string> = {}

describe('authorisation matrix with API tokens', () => {
  beforeAll(async () => {
    for (const t of TOKEN_CALLERS) {
      const teamId = t.owner === 'outsider' ? w.otherTeamId : w.teamId
      const res = await w.clients[t.owner].post('/api/auth/tokens', { name: `matrix ${t.scope}`, teamId, scope: t.scope })
      expect(res.status, JSON.stringify(res.data)).toBe(201)
      tokens[t.name] = res.data.token
    }
  })

  describe.each(rows)('$method $route', (row) => {
    it.each(TOKEN_CALLERS.map((t) => ({ ...t, status: SESSION_ONLY.test(row.route) ? 403 : row.expected[CALLERS.indexOf(t.actsAs)]! })))(
      'with the $name -> $status',
      async ({ name, actsAs, status }) => {
        const { path, body } = await row.request(actsAs)
        const client = apiClient({ bearer: tokens[name], ip: `10.78.${TOKEN_CALLERS.findIndex((t) => t.name === name)}.1` })
        const res = await client.request(row.method, path, body)
        expect(res.status, `${row.method} ${path} with the ${name}: ${JSON.stringify(res.data).slice(0, 300)}`).toBe(status)
      },
    )
  })
})

describe('authentication comes before validation', () => {
  it.each([
    ['POST', () => `/api/teams/${w.teamId}/projects`],
    ['PATCH', () => `/api/links/${fixed.linkId}`],
    ['POST', () => '/api/analyze'],
    ['PATCH', () => '/api/links/not-a-number'],
  ] as const)('signed out, an invalid %s %s is 401, not 400', async (method, path) => {
    const res = await w.clients.signedOut.request(method, path(), { nonsense: true })
    expect(res.status).toBe(401)
  })

  it('a member with the wrong role gets 403 before the body is looked at', async () => {
    const res = await w.clients.viewer.request('PATCH', `/api/links/${fixed.linkId}`, { nonsense: true })
    expect(res.status).toBe(403)
  })
})
