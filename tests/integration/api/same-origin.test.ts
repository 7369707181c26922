import { describe, expect, inject, it } from 'vitest'

const baseURL = inject('baseURL')

async function post(headers: Record<string, string>) {
  return fetch(`${baseURL}/api/auth/sign-out`, { method: 'POST', headers })
}

describe('cross-site request protection on mutating routes', () => {
  it('refuses a POST whose Origin is another site', async () => {
    const res = await post({ origin: 'http://attacker.example' })
    expect(res.status).toBe(403)
  })
  it('refuses a POST the browser marks cross-site', async () => {
    const res = await post({ 'sec-fetch-site': 'cross-site' })
    expect(res.status).toBe(403)
  })
  it('refuses an opaque (null) Origin', async () => {
    const res = await post({ origin: 'null' })
    expect(res.status).toBe(403)
  })
  it('lets a same-origin POST through to the route', async () => {
    const res = await post({ origin: baseURL, 'sec-fetch-site': 'same-origin' })
    expect(res.status).not.toBe(403)
  })
})
