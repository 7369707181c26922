import { describe, expect, it } from 'vitest'
import { apiClient } from '../../support/api'
import { buildUser, FACTORY_PASSWORD, signedIn, uniqueEmail } from '../../factories/users'
import { signUpConfirmed } from '../../support/accounts'
import { mailsTo, waitForMail } from '../../support/mail'

describe('sign-up, sign-in, me, sign-out', () => {
  it('sign-up, confirmed from the mail, creates the team with its creator as admin and signs in', async () => {
    const client = apiClient()
    const email = uniqueEmail('founder')
    const res = await signUpConfirmed(client, { name: 'Ada Founder', email: email.toUpperCase(), password: 'a long enough password', teamName: 'Test Drives' })
    expect(res.status).toBe(201)
    expect(res.data.user).toMatchObject({ name: 'Ada Founder', email })
    expect(res.data.teams).toEqual([{ id: expect.any(Number), name: 'Test Drives', role: 'admin' }])
    const cookie = res.headers.getSetCookie().join(';')
    expect(cookie).toMatch(/nuxt-session=/)
    expect(cookie).toMatch(/HttpOnly/i)
    const me = await client.get('/api/auth/me')
    expect(me.status).toBe(200)
    expect(me.data).toEqual({ user: { id: res.data.user.id, name: 'Ada Founder', email }, teams: res.data.teams })
  })

  it('sign-up with a taken address answers as for a new one and tells the owner by mail, nobody else (issue 13)', async () => {
    const { user } = await buildUser()
    const fresh = await apiClient().post('/api/auth/sign-up', { name: 'X', email: uniqueEmail('fresh'), password: 'a long enough password', teamName: 'T' })
    const taken = await apiClient().post('/api/auth/sign-up', { name: 'X', email: user.email, password: 'a long enough password', teamName: 'T' })
    expect(taken.status).toBe(fresh.status)
    expect(taken.status).toBe(202)
    expect(taken.data).toEqual(fresh.data)
    expect(taken.headers.getSetCookie()).toEqual([])
    await waitForMail(user.email, { subject: 'Your Bitslack account already exists' })
    expect(await mailsTo(user.email, 'Confirm your Bitslack account')).toEqual([])
  })

  it('signs in, answers me, signs out', async () => {
    const { user } = await buildUser({ name: 'Sam Sign' })
    const client = await signedIn(user.email)
    const me = await client.get('/api/auth/me')
    expect(me.data.user).toEqual({ id: user.id, name: 'Sam Sign', email: user.email })
    const out = await client.post('/api/auth/sign-out')
    expect(out.status).toBe(204)
    expect((await client.get('/api/auth/me')).status).toBe(401)
  })

  it('a wrong password and an unknown address get the same vague 401', async () => {
    const { user } = await buildUser()
    const wrong = await apiClient({ ip: '10.9.0.1' }).post('/api/auth/sign-in', { email: user.email, password: 'not the password' })
    const unknown = await apiClient({ ip: '10.9.0.1' }).post('/api/auth/sign-in', { email: uniqueEmail('nobody'), password: 'whatever' })
    expect(wrong.status).toBe(401)
    expect(unknown.status).toBe(401)
    expect(wrong.data.statusMessage).toBe('wrong e-mail or password')
    expect(unknown.data.statusMessage).toBe('wrong e-mail or password')
  })

  it('me is 401 when signed out', async () => {
    expect((await apiClient().get('/api/auth/me')).status).toBe(401)
  })
})

describe('validation names the field', () => {
  it.each([
    [{ name: 'A', email: 'not-an-address', password: 'a long enough password', teamName: 'T' }, 'email'],
    [{ name: 'A', email: 'a@b.test', password: 'short', teamName: 'T' }, 'password'],
    [{ name: '', email: 'a@b.test', password: 'a long enough password', teamName: 'T' }, 'name'],
    [{ name: 'A', email: 'a@b.test', password: 'a long enough password' }, 'teamName'],
  ])('sign-up %j -> 400 naming %s', async (body, field) => {
    const res = await apiClient().post('/api/auth/sign-up', body)
    expect(res.status).toBe(400)
    expect(res.data.statusMessage).toMatch(new RegExp(`^${field}: `))
    expect(res.data.data.issues[0].path).toEqual([field])
  })

  it('a body that is not JSON is 400, not 500', async () => {
    const res = await apiClient().request('POST', '/api/auth/sign-in', '{"email": ', { 'content-type': 'application/json' })
    expect(res.status).toBe(400)
  })
})

describe('sign-in back-off (PostgreSQL, per account and address; per address over accounts)', () => {
  const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms))

  it('after 5 failures from one address that address waits (429, Retry-After); the right password from another address signs in at once (issue 13)', async () => {
    const { user } = await buildUser()
    const here = apiClient({ ip: `10.1.${Math.floor(Math.random() * 250)}.1` })
    for (let i = 0; i < 5; i++) expect((await here.post('/api/auth/sign-in', { email: user.email, password: 'wrong password' })).status).toBe(401)
    const held = await here.post('/api/auth/sign-in', { email: user.email, password: FACTORY_PASSWORD })
    expect(held.status).toBe(429)
    const retry = Number(held.headers.get('retry-after'))
    expect(retry).toBeGreaterThan(0)
    expect(retry).toBeLessThanOrEqual(1)
    // the owner elsewhere is never locked out
    expect((await apiClient({ ip: '10.1.99.1' }).post('/api/auth/sign-in', { email: user.email, password: FACTORY_PASSWORD })).status).toBe(200)
    // and here, once the back-off has passed
    await sleep(retry * 1000 + 100)
    expect((await here.post('/api/auth/sign-in', { email: user.email, password: FACTORY_PASSWORD })).status).toBe(200)
  })

  it('the back-off doubles with each further failure', async () => {
    const { user } = await buildUser()
    const ip = `10.5.${Math.floor(Math.random() * 250)}.3`
    for (let i = 0; i < 5; i++) await apiClient({ ip }).post('/api/auth/sign-in', { email: user.email, password: 'wrong' })
    await sleep(1100)
    expect((await apiClient({ ip }).post('/api/auth/sign-in', { email: user.email, password: 'wrong' })).status).toBe(401)
    const held = await apiClient({ ip }).post('/api/auth/sign-in', { email: user.email, password: FACTORY_PASSWORD })
    expect(held.status).toBe(429)
    expect(Number(held.headers.get('retry-after'))).toBe(2)
  })

  it('an address spraying many accounts is slowed down; the same account from elsewhere still signs in', async () => {
    const ip = `10.2.${Math.floor(Math.random() * 250)}.7`
    const { user } = await buildUser()
    for (let i = 0; i < 30; i++) expect((await apiClient({ ip }).post('/api/auth/sign-in', { email: uniqueEmail('spray'), password: 'guess' })).status).toBe(401)
    const slowed = await apiClient({ ip }).post('/api/auth/sign-in', { email: user.email, password: FACTORY_PASSWORD })
    expect(slowed.status).toBe(429)
    expect(Number(slowed.headers.get('retry-after'))).toBeLessThanOrEqual(1)
    expect((await apiClient({ ip: '10.3.0.1' }).post('/api/auth/sign-in', { email: user.email, password: FACTORY_PASSWORD })).status).toBe(200)
  })

  it("a success clears that address's failures for the account", async () => {
    const { user } = await buildUser()
    const ip = `10.4.${Math.floor(Math.random() * 250)}.1`
    for (let i = 0; i < 4; i++) await apiClient({ ip }).post('/api/auth/sign-in', { email: user.email, password: 'wrong' })
    expect((await apiClient({ ip }).post('/api/auth/sign-in', { email: user.email, password: FACTORY_PASSWORD })).status).toBe(200)
    for (let i = 0; i < 4; i++) expect((await apiClient({ ip }).post('/api/auth/sign-in', { email: user.email, password: 'wrong' })).status).toBe(401)
  })
})
