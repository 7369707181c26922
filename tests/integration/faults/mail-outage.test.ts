/**
 * The mail service down: the action that sends a mail still succeeds, and the mail is
 * delivered by the job queue's retries once the service is back.
 */
import { afterAll, describe, expect, it } from 'vitest'
import { buildUser } from '../../factories/users'
import { apiClient } from '../../support/api'
import { linkIn, mailsTo, setMailService, waitForMail } from '../../support/mail'

afterAll(async () => {
  await setMailService('up')
})

describe('mail service outage', () => {
  it('accepts a password reset while SMTP refuses, and delivers the mail after it returns', async () => {
    const { user } = await buildUser()
    await setMailService('down')
    const res = await apiClient().post('/api/auth/password-reset', { email: user.email })
    expect(res.status).toBe(202)

    // refused at least once while down: nothing arrives
    await new Promise((r) => setTimeout(r, 2500))
    expect(await mailsTo(user.email)).toEqual([])

    await setMailService('up')
    const mail = await waitForMail(user.email, { subject: 'Reset', timeoutMs: 25_000 })
    expect(linkIn(mail, '/reset-password').searchParams.get('token')).toBeTruthy()
  })
})
