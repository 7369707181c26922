import { describe, expect, it } from 'vitest'
import { inject } from 'vitest'
import { apiClient } from '../../support/api'
import { linkIn, mailsTo, waitForMail, waitForMails } from '../../support/mail'
import { buildUser, FACTORY_PASSWORD, uniqueEmail } from '../../factories/users'

describe('password reset through the SMTP fake', () => {
  it('mails a single-use link; following it sets the new password', async () => {
    const { user } = await buildUser({ name: 'Pat Forgetful' })
    const ask = await apiClient().post('/api/auth/password-reset', { email: user.email })
    expect(ask.status).toBe(202)

    const mail = await waitForMail(user.email, { subject: 'Reset your Bitslack password' })
    expect(mail.html).toContain('Bitslack')
    expect(mail.text).toContain('Bitslack')
    expect(mail.html).toContain('/reset-password?token=')
    const link = linkIn(mail, '/reset-password')
    expect(link.origin).toBe(inject('baseURL'))
    const token = link.searchParams.get('token')!

    // the page the link opens exists
    const page = await apiClient().request('GET', `${link.pathname}${link.search}`, undefined, { accept: 'text/html' })
    expect(page.status).toBe(200)

    const done = await apiClient().post('/api/auth/password-reset/complete', { token, password: 'a brand new password' })
    expect(done.status).toBe(204)

    const oldPassword = await apiClient({ ip: '10.20.0.1' }).post('/api/auth/sign-in', { email: user.email, password: FACTORY_PASSWORD })
    expect(oldPassword.status).toBe(401)
    const newPassword = await apiClient().post('/api/auth/sign-in', { email: user.email, password: 'a brand new password' })
    expect(newPassword.status).toBe(200)

    // single use
    const again = await apiClient().post('/api/auth/password-reset/complete', { token, password: 'yet another password' })
    expect(again.status).toBe(400)
    expect(again.data.data.issues[0].path).toEqual(['token'])
  })

  it('answers 202 for an unknown address and sends nothing', async () => {
    const email = uniqueEmail('ghost')
    const res = await apiClient().post('/api/auth/password-reset', { email })
    expect(res.status).toBe(202)
    // a known address's mail arrives within milliseconds; give an unknown one as long
    const { user } = await buildUser()
    await apiClient().post('/api/auth/password-reset', { email: user.email })
    await waitForMail(user.email)
    expect(await mailsTo(email)).toEqual([])
  })

  it('a newer request revokes the older link', async () => {
    const { user } = await buildUser()
    await apiClient().post('/api/auth/password-reset', { email: user.email })
    const first = linkIn(await waitForMail(user.email), '/reset-password').searchParams.get('token')!
    await apiClient().post('/api/auth/password-reset', { email: user.email })
    const mails = await waitForMails(user.email, 2)
    expect(mails).toHaveLength(2)
    const res = await apiClient().post('/api/auth/password-reset/complete', { token: first, password: 'a brand new password' })
    expect(res.status).toBe(400)
    const second = linkIn(mails[1]!, '/reset-password').searchParams.get('token')!
    expect((await apiClient().post('/api/auth/password-reset/complete', { token: second, password: 'a brand new password' })).status).toBe(204)
  })

  it('rejects a malformed token and a short password naming the field', async () => {
    const bad = await apiClient().post('/api/auth/password-reset/complete', { token: 'x', password: 'a brand new password' })
    expect(bad.status).toBe(400)
    expect(bad.data.statusMessage).toMatch(/^token: /)
    const short = await apiClient().post('/api/auth/password-reset/complete', { token: 'A'.repeat(43), password: 'short' })
    expect(short.status).toBe(400)
    expect(short.data.statusMessage).toMatch(/^password: /)
  })
})

describe('a password reset revokes the sessions signed in before it', () => {
  it('signs out every earlier session and keeps the new one', async () => {
    const { user } = await buildUser({ name: 'Sam Stolenlaptop' })
    const earlier = apiClient()
    expect((await earlier.post('/api/auth/sign-in', { email: user.email, password: FACTORY_PASSWORD })).status).toBe(200)
    expect((await earlier.get('/api/auth/me')).status).toBe(200)

    expect((await apiClient().post('/api/auth/password-reset', { email: user.email })).status).toBe(202)
    const token = linkIn(await waitForMail(user.email, { subject: 'Reset your Bitslack password' }), '/reset-password').searchParams.get('token')!
    expect((await apiClient().post('/api/auth/password-reset/complete', { token, password: 'a fresh secret 123' })).status).toBe(204)

    expect((await earlier.get('/api/auth/me')).status).toBe(401)
    expect((await earlier.get('/api/teams')).status).toBe(401)
    const later = apiClient()
    expect((await later.post('/api/auth/sign-in', { email: user.email, password: 'a fresh secret 123' })).status).toBe(200)
    expect((await later.get('/api/auth/me')).status).toBe(200)
  })
})
