import { beforeAll, describe, expect, it } from 'vitest'
import { buildWorld, type World } from '../../factories/world'
import { buildUser } from '../../factories/users'

let w: World

beforeAll(async () => {
  w = await buildWorld()
})

describe('members and roles', () => {
  it('lists the team for any member, with the role in each team', async () => {
    const teams = await w.clients.viewer.get('/api/teams')
    expect(teams.data).toEqual([{ id: w.teamId, name: expect.any(String), role: 'viewer' }])
    const members = await w.clients.viewer.get(`/api/teams/${w.teamId}/members`)
    expect(members.data.map((m: { role: string }) => m.role).sort()).toEqual(['admin', 'engineer', 'reviewer', 'viewer'])
  })

  it('an admin changes a role; the change applies at once (roles are not cached in the session)', async () => {
    const { user, membership } = await buildUser({ team: { id: w.teamId } as never, role: 'viewer' })
    const { signedIn } = await import('../../factories/users')
    const client = await signedIn(user.email)
    expect((await client.post(`/api/teams/${w.teamId}/projects`, { name: 'nope' })).status).toBe(403)
    const res = await w.clients.admin.patch(`/api/teams/${w.teamId}/members/${membership!.id}`, { role: 'engineer' })
    expect(res.status).toBe(200)
    expect(res.data).toMatchObject({ id: membership!.id, userId: user.id, role: 'engineer' })
    expect((await client.post(`/api/teams/${w.teamId}/projects`, { name: 'now allowed' })).status).toBe(201)
    const removed = await w.clients.admin.delete(`/api/teams/${w.teamId}/members/${membership!.id}`)
    expect(removed.status).toBe(204)
    // removal from a team ends the removed member's sessions: the old cookie reads nothing
    expect((await client.get(`/api/teams/${w.teamId}/projects`)).status).toBe(401)
    // signed in again, the team is gone for them: 404, not 403
    expect((await (await signedIn(user.email)).get(`/api/teams/${w.teamId}/projects`)).status).toBe(404)
  })

  it('never leaves a team without an admin', async () => {
    const demote = await w.clients.admin.patch(`/api/teams/${w.teamId}/members/${w.users.admin.memberId}`, { role: 'engineer' })
    expect(demote.status).toBe(409)
    expect(demote.data.statusMessage).toMatch(/at least one admin/)
    expect((await w.clients.admin.delete(`/api/teams/${w.teamId}/members/${w.users.admin.memberId}`)).status).toBe(409)
  })

  it('two admins demoting each other at once: one wins, the other gets 409', async () => {
    const { buildTeam, signedIn } = await import('../../factories/users')
    const team = await buildTeam()
    const a = await buildUser({ team, role: 'admin' })
    const b = await buildUser({ team, role: 'admin' })
    const [ca, cb] = await Promise.all([signedIn(a.user.email), signedIn(b.user.email)])
    const results = await Promise.all([
      ca.patch(`/api/teams/${team.id}/members/${b.membership!.id}`, { role: 'viewer' }),
      cb.patch(`/api/teams/${team.id}/members/${a.membership!.id}`, { role: 'viewer' }),
    ])
    const statuses = results.map((r) => r.status).sort()
    // the loser is either refused by the rule (409) or no longer an admin (403)
    expect(statuses[0]).toBe(200)
    expect([403, 409]).toContain(statuses[1])
    const members = await (results[0]!.status === 200 ? ca : cb).get(`/api/teams/${team.id}/members`)
    expect(members.data.filter((m: { role: string }) => m.role === 'admin')).toHaveLength(1)
  })

  it('a foreign member id is 404, a malformed one 400', async () => {
    expect((await w.clients.admin.patch(`/api/teams/${w.teamId}/members/${w.users.outsider.memberId}`, { role: 'viewer' })).status).toBe(404)
    const bad = await w.clients.admin.patch(`/api/teams/${w.teamId}/members/abc`, { role: 'viewer' })
    expect(bad.status).toBe(400)
    expect(bad.data.statusMessage).toMatch(/^memberId: /)
  })

  it('the audit log records who changed what, newest first, for admins', async () => {
    const audit = await w.clients.admin.get(`/api/teams/${w.teamId}/audit?limit=5`)
    expect(audit.status).toBe(200)
    expect(audit.data.length).toBeLessThanOrEqual(5)
    const roleChange = audit.data.find((a: { action: string }) => a.action === 'member.role')
    expect(roleChange).toMatchObject({ entity: 'member', user: { id: w.users.admin.id }, detail: { from: 'viewer', to: 'engineer' } })
    const ids = audit.data.map((a: { id: number }) => a.id)
    expect([...ids].sort((x: number, y: number) => y - x)).toEqual(ids)
    expect((await w.clients.admin.get(`/api/teams/${w.teamId}/audit?limit=0`)).status).toBe(400)
  })
})
