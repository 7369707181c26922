import { describe, expect, it } from 'vitest'
import { buildUser, FACTORY_PASSWORD } from '../../factories/users'
import { apiClient } from '../../support/api'

describe('session cookie', () => {
  it('is HttpOnly, SameSite=Lax and Secure, and sealed (no readable user data)', async () => {
    const { user } = await buildUser({ name: 'Cookie Reader' })
    const res = await apiClient().post('/api/auth/sign-in', { email: user.email, password: FACTORY_PASSWORD })
    expect(res.status).toBe(200)
    const session = res.headers.getSetCookie().find((c) => c.startsWith('nuxt-session='))
    expect(session).toBeDefined()
    expect(session).toMatch(/;\s*HttpOnly/i)
    expect(session).toMatch(/;\s*SameSite=Lax/i)
    expect(session).toMatch(/;\s*Secure/i)
    const value = decodeURIComponent(session!.split(';')[0]!.slice('nuxt-session='.length))
    expect(value).not.toContain(user.email)
    expect(Buffer.from(value.split('*')[0] ?? '', 'base64').toString('latin1')).not.toContain('Cookie Reader')
  })
})
