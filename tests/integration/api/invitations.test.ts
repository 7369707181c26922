import { beforeAll, describe, expect, it } from 'vitest'
import { inject } from 'vitest'
import { apiClient, type ApiClient } from '../../support/api'
import { linkIn, waitForMail } from '../../support/mail'
import { buildTeam, buildUser, signedIn, uniqueEmail, FACTORY_PASSWORD } from '../../factories/users'

let admin: ApiClient
let teamId: number
let teamName: string

beforeAll(async () => {
  const team = await buildTeam(`Invite Drives ${Math.random().toString(36).slice(2, 7)}`)
  teamId = team.id
  teamName = team.name
  const { user } = await buildUser({ team, role: 'admin', name: 'Ines Admin' })
  admin = await signedIn(user.email)
})

async function invite(email: string, role: string) {
  const res = await admin.post(`/api/teams/${teamId}/invitations`, { email, role })
  expect(res.status, JSON.stringify(res.data)).toBe(201)
  const mail = await waitForMail(email, { subject: 'invited you' })
  return { invitation: res.data, mail, token: linkIn(mail, '/accept-invitation').searchParams.get('token')! }
}

describe('invitations through the SMTP fake', () => {
  it('a new colleague follows the link, creates the account and lands in the team with the role', async () => {
    const email = uniqueEmail('newcomer')
    const { invitation, mail, token } = await invite(email, 'engineer')
    expect(invitation).toMatchObject({ email, role: 'engineer', teamId, invitedBy: { name: 'Ines Admin' } })
    expect(mail.subject).toContain('Bitslack')
    expect(mail.html).toContain(teamName)
    expect(mail.text).toContain(teamName)
    const link = linkIn(mail, '/accept-invitation')
    expect(link.origin).toBe(inject('baseURL'))
    const page = await apiClient().request('GET', `${link.pathname}${link.search}`, undefined, { accept: 'text/html' })
    expect(page.status).toBe(200)

    const preview = await apiClient().get(`/api/invitations/${token}`)
    expect(preview.status).toBe(200)
    expect(preview.data).toMatchObject({ teamName, email, role: 'engineer', invitedBy: 'Ines Admin', accountExists: false })

    const newcomer = apiClient()
    const missing = await newcomer.post(`/api/invitations/${token}/accept`, { name: 'Noor Newcomer' })
    expect(missing.status).toBe(400)
    expect(missing.data.statusMessage).toMatch(/^password: /)

    const accepted = await newcomer.post(`/api/invitations/${token}/accept`, { name: 'Noor Newcomer', password: 'newcomer password' })
    expect(accepted.status).toBe(200)
    expect(accepted.data.user).toMatchObject({ name: 'Noor Newcomer', email })
    expect(accepted.data.teams).toEqual([{ id: teamId, name: teamName, role: 'engineer' }])
    expect((await newcomer.get('/api/auth/me')).data.user.email).toBe(email)

    // single use
    expect((await apiClient().get(`/api/invitations/${token}`)).status).toBe(404)
    expect((await apiClient().post(`/api/invitations/${token}/accept`, { name: 'X', password: 'another password' })).status).toBe(404)

    const members = await admin.get(`/api/teams/${teamId}/members`)
    expect(members.data.map((m: { email: string; role: string }) => [m.email, m.role])).toContainEqual([email, 'engineer'])
    const audit = await admin.get(`/api/teams/${teamId}/audit`)
    expect(audit.data.map((a: { action: string }) => a.action)).toEqual(expect.arrayContaining(['invitation.create', 'member.join']))
  })

  it('an existing account joins once it proves itself (signed in, or its password)', async () => {
    const { user } = await buildUser({ team: await buildTeam(), role: 'admin', name: 'Olu Other' })
    const { token } = await invite(user.email, 'reviewer')
    expect((await apiClient().get(`/api/invitations/${token}`)).data.accountExists).toBe(true)
    const anonymous = await apiClient().post(`/api/invitations/${token}/accept`, {})
    expect(anonymous.status).toBe(401)
    const wrong = await apiClient().post(`/api/invitations/${token}/accept`, { password: 'not it' })
    expect(wrong.status).toBe(401)
    const self = await signedIn(user.email)
    const ok = await self.post(`/api/invitations/${token}/accept`, {})
    expect(ok.status).toBe(200)
    expect(ok.data.teams).toHaveLength(2)
    expect(ok.data.teams).toContainEqual({ id: teamId, name: teamName, role: 'reviewer' })
  })

  it('inviting a member is 409; a revoked invitation stops working; a re-invite replaces the old link', async () => {
    const { user } = await buildUser({ team: { id: teamId } as never, role: 'viewer' })
    expect((await admin.post(`/api/teams/${teamId}/invitations`, { email: user.email, role: 'viewer' })).status).toBe(409)

    const email = uniqueEmail('revoked')
    const first = await invite(email, 'viewer')
    const listed = await admin.get(`/api/teams/${teamId}/invitations`)
    expect(listed.data.map((i: { email: string }) => i.email)).toContain(email)
    const del = await admin.delete(`/api/teams/${teamId}/invitations/${first.invitation.id}`)
    expect(del.status).toBe(204)
    expect((await apiClient().get(`/api/invitations/${first.token}`)).status).toBe(404)
    expect((await admin.delete(`/api/teams/${teamId}/invitations/${first.invitation.id}`)).status).toBe(404)

    const email2 = uniqueEmail('twice')
    const a = await invite(email2, 'viewer')
    const res = await admin.post(`/api/teams/${teamId}/invitations`, { email: email2, role: 'engineer' })
    expect(res.status).toBe(201)
    expect((await apiClient().get(`/api/invitations/${a.token}`)).status).toBe(404)
  })

  it('rejects a bad role or address naming the field', async () => {
    const bad = await admin.post(`/api/teams/${teamId}/invitations`, { email: uniqueEmail(), role: 'owner' })
    expect(bad.status).toBe(400)
    expect(bad.data.statusMessage).toMatch(/^role: /)
    const addr = await admin.post(`/api/teams/${teamId}/invitations`, { email: 'nope', role: 'viewer' })
    expect(addr.data.statusMessage).toMatch(/^email: /)
  })

  it('an invitation accepted with a password signs in with it afterwards', async () => {
    const email = uniqueEmail('later')
    const { token } = await invite(email, 'viewer')
    await apiClient().post(`/api/invitations/${token}/accept`, { name: 'Lee Later', password: 'later password' })
    expect((await apiClient().post('/api/auth/sign-in', { email, password: 'later password' })).status).toBe(200)
    expect((await apiClient({ ip: '10.30.0.1' }).post('/api/auth/sign-in', { email, password: FACTORY_PASSWORD })).status).toBe(401)
  })
})
