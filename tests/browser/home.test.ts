import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { openBrowser, screenshot, type BrowserSession } from '../support/browser'

const baseURL = inject('baseURL')
let browser: BrowserSession

beforeAll(async () => {
  browser = await openBrowser()
})
afterAll(async () => {
  await browser?.close()
})

describe('home page', () => {
  it('shows the product and a sign-in entry, loading nothing from outside localhost', async () => {
    const { page } = browser
    const requested: string[] = []
    const consoleErrors: string[] = []
    page.on('request', (req) => requested.push(req.url()))
    page.on('console', (msg) => msg.type() === 'error' && consoleErrors.push(msg.text()))

    await page.goto(baseURL, { waitUntil: 'networkidle' })
    await page.evaluate(() => document.fonts.ready)

    await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toBe('Bitslack')
    expect(await page.getByRole('link', { name: 'Sign in' }).count()).toBeGreaterThanOrEqual(1)

    const foreign = requested.filter((u) => !/^(http:\/\/(127\.0\.0\.1|localhost)(:\d+)?\/|data:|blob:)/.test(u))
    expect(foreign).toEqual([])
    // the shipped fonts are loaded from the app itself
    const fonts = requested.filter((u) => /\.(woff2?|ttf)(\?|$)/.test(u))
    expect(fonts.some((u) => /inter/i.test(u))).toBe(true)
    expect(await page.evaluate(() => document.fonts.check('16px Inter'))).toBe(true)

    // the page hydrates under the content security policy without violations
    expect(consoleErrors.filter((e) => /content security policy/i.test(e)).join("\n")).toBe("")
    const response = await page.request.get(baseURL)
    expect(response.headers()['content-security-policy']).toMatch(/script-src 'self' 'strict-dynamic' 'nonce-/)

    await screenshot(page, 'home')
  })
})
