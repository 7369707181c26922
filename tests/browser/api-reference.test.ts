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

describe('API reference page', () => {
  it('reads the OpenAPI description: operations by area, the analysis body field by field', async () => {
    const { page } = browser
    await page.goto(`${baseURL}/api-reference`, { waitUntil: 'networkidle' })
    await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toContain('Bitslack API')
    const ops = page.getByTestId('api-operation')
    expect(await ops.count()).toBeGreaterThan(30)
    const analyze = ops.filter({ hasText: 'POST/api/analyze' }).first()
    expect(await analyze.textContent()).toContain('protocol')
    await screenshot(page, 'api-reference')
  })
})
