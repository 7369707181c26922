/**
 * User text is escaped everywhere: script-like text planted in every text field a user
 * can fill (names, descriptions, labels, stage and part names, comments) is shown as
 * text on every page, and nothing in it runs.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { TELEMETRY_LINK } from '../../server/db/seeders/demo-links'
import { buildTeam, buildUser, FACTORY_PASSWORD, signedIn } from '../factories/users'
import type { ApiClient } from '../support/api'
import { openBrowser, screenshot, type BrowserSession } from '../support/browser'

const baseURL = inject('baseURL')
/** Each variant tries another way in; each sets a flag and opens a dialog if it ever runs. */
const PAYLOADS = [
  `<script>window.__xss='script'</script>`,
  `<img src=x onerror="window.__xss='img';alert(1)">`,
  `"><svg onload="window.__xss='svg';alert(2)">`,
  `javascript:window.__xss='href'`,
  `{{ constructor.constructor('window.__xss="template"')() }}`,
]
const P = (i: number) => `Hostile ${i} ${PAYLOADS[i % PAYLOADS.length]}`

let browser: BrowserSession
let api: ApiClient
let email = ''
const pages: string[] = []

beforeAll(async () => {
  const team = await buildTeam(P(0))
  const { user } = await buildUser({ team, role: 'admin', name: P(1) })
  email = user.email
  api = await signedIn(email)
  const project = await api.post(`/api/teams/${team.id}/projects`, { name: P(2), description: P(3) })
  expect(project.status).toBe(201)
  const spec = structuredClone(TELEMETRY_LINK) as any
  spec.name = P(4)
  spec.description = P(0)
  spec.channels[0].label = P(1)
  spec.channels[0].stages[0].name = P(2)
  spec.channels[0].receiver.family = P(3).slice(0, 40)
  const link = await api.post(`/api/projects/${project.data.id}/links`, { spec })
  expect(link.status).toBe(201)
  const part = await api.post(`/api/teams/${team.id}/parts`, { name: P(3), category: 'phototransistor coupler', description: P(0), stage: spec.channels[0].stages[0] })
  expect(part.status).toBeLessThan(300)
  const report = await api.post(`/api/links/${link.data.id}/reports`, {})
  expect(report.status).toBeLessThan(300)
  const comment = await api.post(`/api/reports/${report.data.id}/comments`, { body: P(1), target: { kind: 'report' } })
  expect(comment.status).toBeLessThan(300)
  pages.push(
    `/teams/${team.id}`,
    `/projects/${project.data.id}`,
    `/links/${link.data.id}`,
    `/teams/${team.id}/parts`,
    `/teams/${team.id}/members`,
    `/reports/${report.data.id}`,
  )
  browser = await openBrowser()
})

afterAll(async () => {
  await browser?.close()
})

describe('user text is escaped', () => {
  it('shows planted script-like text as text on every page and runs none of it', async () => {
    const { page } = browser
    const dialogs: string[] = []
    page.on('dialog', async (d) => {
      dialogs.push(d.message())
      await d.dismiss()
    })
    const signIn = await page.request.post(`${baseURL}/api/auth/sign-in`, { data: { email, password: FACTORY_PASSWORD } })
    expect(signIn.status()).toBe(200)

    for (const path of pages) {
      await page.goto(baseURL + path, { waitUntil: 'networkidle' })
      await page.waitForTimeout(300)
      expect(await page.evaluate(() => (window as any).__xss), `${path}: planted text ran`).toBeUndefined()
      expect(dialogs, `${path}: a dialog opened`).toEqual([])
      // the planted text is on the page as visible characters, not as markup
      expect(await page.locator('body').innerText(), `${path} shows the text`).toContain('Hostile')
      expect(await page.locator('img[src="x"], svg[onload]').count(), `${path}: markup injected`).toBe(0)
    }
    await screenshot(page, 'escaping-link-page')
  })
})
