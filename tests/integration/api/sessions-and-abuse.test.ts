/**
 * Sessions that end and abuse that cannot lock people out (issue 13), against the real
 * server and database: sign-out, idle and absolute expiry, sign out everywhere, a password
 * reset and a removal ending sessions; throttles on sign-up and reset requests; the password
 * rules; text hygiene, CSV formulas, strict ids, content types and Cache-Control.
 */
import { QueryTypes } from 'sequelize'
import { describe, expect, it } from 'vitest'
import { apiClient } from '../../support/api'
import { linkIn, mailsTo, waitForMail, waitForMails } from '../../support/mail'
import { buildUser, signedIn, uniqueEmail } from '../../factories/users'
import { buildLink, buildLinkSpec, buildProject } from '../../factories/workspace'
import { buildWorld } from '../../factories/world'
import { useTestDb } from '../../factories/db'

const sessionsOf = (userId: number) =>
  useTestDb().query<{ id: number }>('SELECT id FROM user_sessions WHERE user_id = :userId', { replacements: { userId }, type: QueryTypes.SELECT })

describe('server-side sessions', () => {
  it('sign-out ends the session: the same cookie reads nothing afterwards', async () => {
    const { user } = await buildUser()
    const client = await signedIn(user.email)
    const stolen = client.clone()
    expect((await stolen.get('/api/auth/me')).status).toBe(200)
    expect((await client.post('/api/auth/sign-out')).status).toBe(204)
    // the copied cookie is dead too: the row is gone
    expect((await stolen.get('/api/auth/me')).status).toBe(401)
    expect(await sessionsOf(user.id)).toEqual([])
  })

  it('an idle session and a session past its lifetime end', async () => {
    const { user } = await buildUser()
    const idle = await signedIn(user.email)
    const old = await signedIn(user.email)
    const rows = await sessionsOf(user.id)
    expect(rows).toHaveLength(2)
    const [a, b] = rows.map((r) => Number(r.id)).sort((x, y) => x - y)
    // default idle timeout 12 h, lifetime 7 days (README, security)
    await useTestDb().query("UPDATE user_sessions SET last_seen_at = now() - interval '13 hours' WHERE id = :id", { replacements: { id: a } })
    await useTestDb().query("UPDATE user_sessions SET created_at = now() - interval '8 days' WHERE id = :id", { replacements: { id: b } })
    expect((await idle.get('/api/auth/me')).status).toBe(401)
    expect((await old.get('/api/auth/me')).status).toBe(401)
  })

  it('lists the sessions with the current one marked; ends one; signs out everywhere', async () => {
    const { user } = await buildUser()
    const laptop = await signedIn(user.email)
    const phone = await signedIn(user.email)
    const list = await laptop.get('/api/auth/sessions')
    expect(list.status).toBe(200)
    expect(list.data).toHaveLength(2)
    expect(list.data.filter((s: { current: boolean }) => s.current)).toHaveLength(1)
    const other = list.data.find((s: { current: boolean }) => !s.current)
    expect((await laptop.delete(`/api/auth/sessions/${other.id}`)).status).toBe(204)
    expect((await phone.get('/api/auth/me')).status).toBe(401)
    expect((await laptop.get('/api/auth/me')).status).toBe(200)
    const again = await signedIn(user.email)
    expect((await again.delete('/api/auth/sessions')).status).toBe(204)
    expect((await laptop.get('/api/auth/me')).status).toBe(401)
    expect((await again.get('/api/auth/me')).status).toBe(401)
    // another user's session id is not the caller's to end
    const { user: stranger } = await buildUser()
    const theirs = await signedIn(stranger.email)
    const [row] = await sessionsOf(stranger.id)
    const mine = await signedIn(user.email)
    expect((await mine.delete(`/api/auth/sessions/${row!.id}`)).status).toBe(404)
    expect((await theirs.get('/api/auth/me')).status).toBe(200)
  })

  it('a password reset and a removal from the team end the sessions', async () => {
    const w = await buildWorld()
    const viewer = w.clients.viewer
    expect((await viewer.get('/api/auth/me')).status).toBe(200)
    expect((await w.clients.admin.delete(`/api/teams/${w.teamId}/members/${w.users.viewer.memberId}`)).status).toBe(204)
    expect((await viewer.get('/api/auth/me')).status).toBe(401)

    const { user } = await buildUser()
    const before = await signedIn(user.email)
    expect((await apiClient().post('/api/auth/password-reset', { email: user.email })).status).toBe(202)
    const token = linkIn(await waitForMail(user.email, { subject: 'Reset your Bitslack password' }), '/reset-password').searchParams.get('token')!
    expect((await apiClient().post('/api/auth/password-reset/complete', { token, password: 'a completely new passphrase' })).status).toBe(204)
    expect((await before.get('/api/auth/me')).status).toBe(401)
  })
})

describe('no enumeration, throttles', () => {
  it('a reset request answers alike for known and unknown addresses; an account gets at most three links an hour', async () => {
    const { user } = await buildUser()
    const known = await apiClient().post('/api/auth/password-reset', { email: user.email })
    const unknown = await apiClient().post('/api/auth/password-reset', { email: uniqueEmail('nobody') })
    expect(known.status).toBe(202)
    expect(unknown.status).toBe(202)
    expect(known.data).toEqual(unknown.data)
    for (let i = 0; i < 4; i++) expect((await apiClient().post('/api/auth/password-reset', { email: user.email })).status).toBe(202)
    await waitForMails(user.email, 3, { subject: 'Reset your Bitslack password' })
    await new Promise((r) => setTimeout(r, 1500))
    expect(await mailsTo(user.email, 'Reset your Bitslack password')).toHaveLength(3)
  })

  it('sign-ups and reset requests are limited per client address (429 with Retry-After)', async () => {
    const client = apiClient()
    const body = () => ({ name: 'Flood', email: uniqueEmail('flood'), password: 'a long enough password', teamName: 'Flood' })
    for (let i = 0; i < 10; i++) expect((await client.post('/api/auth/sign-up', body())).status).toBe(202)
    const refused = await client.post('/api/auth/sign-up', body())
    expect(refused.status).toBe(429)
    expect(Number(refused.headers.get('retry-after'))).toBeGreaterThan(0)
    const resets = apiClient()
    for (let i = 0; i < 10; i++) expect((await resets.post('/api/auth/password-reset', { email: uniqueEmail('r') })).status).toBe(202)
    expect((await resets.post('/api/auth/password-reset', { email: uniqueEmail('r') })).status).toBe(429)
  })

  it('invitation accepts are throttled per invitation: wrong passwords cannot be tried without end', async () => {
    const w = await buildWorld()
    const { user } = await buildUser()
    const invite = await w.clients.admin.post(`/api/teams/${w.teamId}/invitations`, { email: user.email, role: 'viewer' })
    expect(invite.status).toBe(201)
    const token = linkIn(await waitForMail(user.email), '/accept-invitation').searchParams.get('token')!
    const statuses: number[] = []
    for (let i = 0; i < 12; i++) statuses.push((await apiClient().post(`/api/invitations/${token}/accept`, { password: 'not the password at all' })).status)
    expect(statuses.slice(0, 10).every((s) => s === 401)).toBe(true)
    expect(statuses.slice(10)).toEqual([429, 429])
  })
})

describe('password rules (ASVS 2.1)', () => {
  it.each(['aaaaaaaaaaaa', '123456789012', 'password1234', '            '])('refuses %j with the reason beside the field', async (password) => {
    const res = await apiClient().post('/api/auth/sign-up', { name: 'Weak', email: uniqueEmail('weak'), password, teamName: 'T' })
    expect(res.status).toBe(400)
    expect(res.data.data.issues[0].path).toEqual(['password'])
    expect(res.data.statusMessage).toMatch(/^password: password (is too easy to guess|must be at least 12)/)
  })
  it('accepts a long passphrase of common words', async () => {
    expect((await apiClient().post('/api/auth/sign-up', { name: 'Strong', email: uniqueEmail('strong'), password: 'copper kettle orbits quietly', teamName: 'T' })).status).toBe(202)
  })
})

describe('inputs and headers', () => {
  it('a NUL or a lone surrogate in a name is a 400 naming the field, never a 500', async () => {
    const w = await buildWorld()
    const project = await buildProject(w.clients.engineer, w.teamId)
    for (const name of ['bad\u0000name', 'bad\ud800name']) {
      const res = await w.clients.engineer.post(`/api/projects/${project.id}/links`, { spec: { ...buildLinkSpec('debug'), name } })
      expect(res.status).toBe(400)
      expect(JSON.stringify(res.data.data.issues)).toMatch(/name/)
    }
  })

  it('a stage named like a formula is neutralised in the CSV export', async () => {
    const w = await buildWorld()
    const project = await buildProject(w.clients.engineer, w.teamId)
    const spec = buildLinkSpec('telemetry')
    spec.channels[0]!.stages[0]!.name = '=HYPERLINK("http://x.example","y")'
    const link = await buildLink(w.clients.engineer, project.id, spec)
    const frozen = await w.clients.engineer.post(`/api/links/${link.id}/reports`, {})
    expect(frozen.status).toBe(201)
    const csv = await w.clients.viewer.request('GET', `/reports/${frozen.data.id}/tables.csv?table=stages`)
    expect(csv.status).toBe(200)
    expect(csv.data as string).toContain(`"'=HYPERLINK(""http://x.example"",""y"")"`)
    expect(csv.data as string).not.toMatch(/(^|,)=HYPERLINK/m)
  })

  it('ids are strict decimal integers', async () => {
    const w = await buildWorld()
    for (const id of ['0x2', '1e3', '+7', '07', ' 7']) expect((await w.clients.viewer.get(`/api/teams/${encodeURIComponent(id)}/projects`)).status, id).toBe(400)
  })

  it('a JSON route answers 415 to another content type', async () => {
    const w = await buildWorld()
    const res = await w.clients.engineer.request('POST', `/api/teams/${w.teamId}/projects`, 'name=x', { 'content-type': 'application/x-www-form-urlencoded' })
    expect(res.status).toBe(415)
  })

  it('API answers and signed-in pages carry Cache-Control: no-store', async () => {
    const w = await buildWorld()
    const api = await w.clients.viewer.get('/api/auth/me')
    expect(api.headers.get('cache-control')).toBe('no-store')
    const page = await w.clients.viewer.request('GET', `/teams/${w.teamId}`, undefined, { accept: 'text/html' })
    expect(page.headers.get('cache-control')).toBe('no-store')
  })
})
