import { describe, expect, it } from 'vitest'
import { apiClient } from '../../support/api'
import { buildUser, FACTORY_PASSWORD, signedIn, uniqueEmail } from '../../factories/users'

describe('sign-up, sign-in, me, sign-out', () => {
  it('sign-up creates the team with its creator as admin and signs in', async () => {
    const client = apiClient()
    const email = uniqueEmail('founder')
    const res = await client.post('/api/auth/sign-up', { name: 'Ada Founder', email: email.toUpperCase(), password: 'a long enough password', teamName: 'Test Drives' })
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

  it('sign-up with a taken address is 409', async () => {
    const { user } = await buildUser()
    const res = await apiClient().post('/api/auth/sign-up', { name: 'X', email: user.email, password: 'a long enough password', teamName: 'T' })
    expect(res.status).toBe(409)
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

describe('sign-in rate limiting (PostgreSQL, per address and per IP)', () => {
  it('locks an address after 5 failures, with Retry-After, even with the right password', async () => {
    const { user } = await buildUser()
    for (let i = 0; i < 5; i++) {
      // each attempt from its own address: only the per-address counter rises
      const res = await apiClient({ ip: `10.1.${i}.1` }).post('/api/auth/sign-in', { email: user.email, password: 'wrong password' })
      expect(res.status).toBe(401)
    }
    const locked = await apiClient({ ip: '10.1.99.1' }).post('/api/auth/sign-in', { email: user.email, password: FACTORY_PASSWORD })
    expect(locked.status).toBe(429)
    const retry = Number(locked.headers.get('retry-after'))
    expect(retry).toBeGreaterThan(0)
    expect(retry).toBeLessThanOrEqual(15 * 60)
  })

  it('locks a client IP after 30 failures across addresses; other IPs still sign in', async () => {
    const ip = `10.2.${Math.floor(Math.random() * 250)}.7`
    const { user } = await buildUser()
    for (let i = 0; i < 30; i++) {
      const res = await apiClient({ ip }).post('/api/auth/sign-in', { email: uniqueEmail('spray'), password: 'guess' })
      expect(res.status).toBe(401)
    }
    const blocked = await apiClient({ ip }).post('/api/auth/sign-in', { email: user.email, password: FACTORY_PASSWORD })
    expect(blocked.status).toBe(429)
    expect(Number(blocked.headers.get('retry-after'))).toBeGreaterThan(0)
    const elsewhere = await apiClient({ ip: '10.3.0.1' }).post('/api/auth/sign-in', { email: user.email, password: FACTORY_PASSWORD })
    expect(elsewhere.status).toBe(200)
  })

  it('a success clears the address counter', async () => {
    const { user } = await buildUser()
    for (let i = 0; i < 4; i++) await apiClient({ ip: '10.4.0.1' }).post('/api/auth/sign-in', { email: user.email, password: 'wrong' })
    expect((await apiClient({ ip: '10.4.0.2' }).post('/api/auth/sign-in', { email: user.email, password: FACTORY_PASSWORD })).status).toBe(200)
    for (let i = 0; i < 4; i++) {
      const res = await apiClient({ ip: '10.4.0.3' }).post('/api/auth/sign-in', { email: user.email, password: 'wrong' })
      expect(res.status).toBe(401)
    }
  })
})
