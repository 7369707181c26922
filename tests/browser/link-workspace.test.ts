/**
 * The link workspace from a user's seat: the demo engineer finds why the telemetry UART
 * fails at 38400 baud, fixes it with the pull-up sweep and sees the verdict and the
 * timeline turn healthy; a viewer sees no edit controls and the server refuses their
 * PATCH. Screenshots of every page go to tests/.artifacts/screenshots.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import type { Page } from 'playwright-core'
import { TELEMETRY_LINK } from '../../server/db/seeders/demo-links'
import { apiClient } from '../support/api'
import { signUpConfirmed } from '../support/accounts'
import { openBrowser, screenshot, type BrowserSession } from '../support/browser'
import { linkIn, waitForMail } from '../support/mail'

const baseURL = inject('baseURL')
const PASSWORD = 'harrow-bay-demo'
const tag = Date.now().toString(36)

interface Fixture {
  teamId: number
  projectId: number
  linkId: number
  engineer: string
  viewer: string
  inviteUrl: string
}
let fx: Fixture
let browser: BrowserSession

/**
 * The demo scenario through the API (the suite's database is shared with other tests,
 * so the team is created fresh): an admin's team, the PX-7 project with the telemetry
 * link, and an engineer and a viewer who joined by invitation.
 */
async function buildDemo(): Promise<Fixture> {
  const admin = apiClient()
  const email = `admin-${tag}@harrowbay.example`
  const signUp = await signUpConfirmed(admin, { name: 'Ada Admin', email, password: PASSWORD, teamName: 'Harrow Bay Drives' })
  expect(signUp.status, JSON.stringify(signUp.data)).toBeLessThan(300)
  const teamId = signUp.data.teams[0].id as number
  const project = await admin.post(`/api/teams/${teamId}/projects`, { name: 'PX-7 pump inverter', description: 'Solar pump inverter.' })
  expect(project.status).toBe(201)
  const link = await admin.post(`/api/projects/${project.data.id}/links`, { spec: TELEMETRY_LINK })
  expect(link.status).toBe(201)
  const join = async (role: 'engineer' | 'viewer', name: string) => {
    const who = `${role}-${tag}@harrowbay.example`
    const inv = await admin.post(`/api/teams/${teamId}/invitations`, { email: who, role })
    expect(inv.status, JSON.stringify(inv.data)).toBeLessThan(300)
    const url = linkIn(await waitForMail(who), '/accept-invitation')
    return { who, url }
  }
  const eng = await join('engineer', 'Fen Firmware')
  const accepted = await apiClient().post(`/api/invitations/${eng.url.searchParams.get('token')}/accept`, { name: 'Fen Firmware', password: PASSWORD })
  expect(accepted.status).toBe(200)
  const viewer = await join('viewer', 'Vic Viewer')
  return { teamId, projectId: project.data.id, linkId: link.data.id, engineer: eng.who, viewer: viewer.who, inviteUrl: viewer.url.pathname + viewer.url.search }
}

async function signIn(page: Page, email: string) {
  await page.goto(`${baseURL}/sign-in`)
  await page.getByLabel('E-mail').fill(email)
  await page.getByLabel('Password').fill(PASSWORD)
  await page.getByRole('button', { name: 'Sign in' }).click()
  await page.waitForURL(/\/teams\/\d+/)
}

async function verdictText(page: Page) {
  await page.getByTestId('worst-margin').waitFor()
  await page.waitForFunction(() => !document.querySelector('[aria-labelledby="verdict-title"][aria-busy="true"]'))
  return (await page.getByTestId('verdict').first().textContent())?.trim() ?? ''
}

beforeAll(async () => {
  fx = await buildDemo()
  browser = await openBrowser()
}, 120_000)
afterAll(async () => {
  await browser?.close()
})

describe('account pages', () => {
  it('show their forms', async () => {
    const { page } = browser
    for (const [path, name, heading] of [
      ['/sign-in', 'sign-in', 'Sign in'],
      ['/sign-up', 'sign-up', 'Create a team'],
      ['/forgot-password', 'forgot-password', 'Reset your password'],
      ['/reset-password?token=not-a-real-token', 'reset-password', 'Choose a new password'],
    ] as const) {
      await page.goto(`${baseURL}${path}`, { waitUntil: 'networkidle' })
      await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toBe(heading)
      await screenshot(page, name)
    }
    await page.goto(`${baseURL}${fx.inviteUrl}`, { waitUntil: 'networkidle' })
    await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toContain('Harrow Bay Drives')
    await screenshot(page, 'accept-invitation')
  })

  it('sends a signed-out visitor of a link to sign-in', async () => {
    const { page } = browser
    await page.context().clearCookies()
    await page.goto(`${baseURL}/links/${fx.linkId}`)
    await page.waitForURL(/\/sign-in\?redirect=/)
  })
})

describe('the engineer fixes the telemetry link', () => {
  it('sees it fail at 38400 baud with the broken bits marked, learns from the sweep what would pass, applies the best row at 9600 baud', async () => {
    const { page } = browser
    await page.context().clearCookies()
    await signIn(page, fx.engineer)
    await page.getByRole('heading', { level: 1, name: 'Projects' }).waitFor()
    await page.getByRole('link', { name: /PX-7 pump inverter/ }).first().waitFor()
    await screenshot(page, 'team-projects')

    await page.getByRole('link', { name: /PX-7 pump inverter/ }).first().click()
    await page.waitForURL(/\/projects\/\d+/)
    await page.getByRole('link', { name: 'Gate-driver telemetry UART' }).first().waitFor()
    await expect(page.locator('nav[aria-label="Breadcrumb"] [aria-current="page"]').textContent()).resolves.toContain('PX-7')
    await screenshot(page, 'project')

    await page.getByRole('link', { name: 'Gate-driver telemetry UART' }).first().click()
    await page.waitForURL(/\/links\/\d+/)
    expect(await verdictText(page)).toContain('fail')
    await expect(page.getByTestId('max-rate').textContent()).resolves.toMatch(/kBd/)
    expect(await page.getByTestId('safety-caution').textContent()).toContain('bench verification')
    // the timeline names the broken bits and marks them in the drawing
    const summary = await page.getByTestId('timeline-summary').textContent()
    expect(summary).toMatch(/broken bits?/)
    const brokenBits = await page.locator('[data-testid^="bit-"][data-state="broken"]').count()
    expect(brokenBits).toBeGreaterThan(0)
    await expect(page.getByText('38.4 kBd').first().isVisible()).resolves.toBe(true)
    await screenshot(page, 'link-telemetry-fails')

    // a typed field problem shows beside the field, from the shared schema
    const baud = page.getByLabel('Baud', { exact: true })
    await baud.fill('38.4 kq')
    await page.getByText("unknown unit 'kq'").first().waitFor()
    await baud.fill('38.4k')

    // the pull-up sweep: no pull-up reaches 38.4 kBd within the ratings (the coupler's storage delay);
    // it says how far the best row gets and which circuit change would meet the target
    await page.getByRole('button', { name: 'Run pull-up sweep' }).click()
    await page.getByTestId('sweep-recommendation').waitFor()
    await expect(page.getByTestId('sweep-recommendation').textContent()).resolves.toMatch(/no feasible row/)
    await expect(page.getByTestId('sweep-reached').textContent()).resolves.toMatch(/kBd/)
    await expect(page.getByTestId('advice-logic-output-coupler').textContent()).resolves.toMatch(/meets the target/)
    await page.getByTestId('pullup-sweep').scrollIntoViewIfNeeded()
    await screenshot(page, 'link-pullup-sweep')
    // apply the best row, then run the link at a standard rate that row reaches
    await page.getByTestId('apply-best').click()
    await baud.fill('9600')
    await page.waitForFunction(() => document.querySelector('[data-testid="verdict"]')?.textContent?.includes('pass'), null, { timeout: 15_000 })
    expect(await verdictText(page)).toContain('pass')
    expect(await page.locator('[data-testid^="bit-"][data-state="broken"]').count()).toBe(0)
    await expect(page.getByTestId('timeline-summary').textContent()).resolves.toMatch(/healthy|thin/)
    await page.evaluate(() => window.scrollTo(0, 0))
    // the sweep's wide table scrolls inside its card: the page itself never grows sideways
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(1366)
    await screenshot(page, 'link-telemetry-fixed')

    // explicit save; the project page then shows the new verdict
    await page.getByRole('button', { name: 'Save', exact: true }).click()
    await expect(page.getByTestId('save-state').textContent()).resolves.toBeTruthy()
    await page.waitForFunction(() => document.querySelector('[data-testid="save-state"]')?.textContent?.includes('All edits saved'))
  })

  it('shows a concurrent save as a conflict with reload and compare', async () => {
    const { page } = browser
    await page.goto(`${baseURL}/links/${fx.linkId}`)
    await verdictText(page)
    // another engineer saves first
    const other = apiClient()
    await other.post('/api/auth/sign-in', { email: fx.engineer, password: PASSWORD })
    const current = await other.get(`/api/links/${fx.linkId}`)
    const changed = { ...current.data.spec, description: 'Edited elsewhere.' }
    expect((await other.patch(`/api/links/${fx.linkId}`, { version: current.data.version, spec: changed })).status).toBe(200)
    await page.getByLabel('Link name').fill('Gate-driver telemetry UART (edited)')
    await page.getByRole('button', { name: 'Save', exact: true }).click()
    await page.getByTestId('conflict').waitFor()
    await page.getByRole('button', { name: 'Compare' }).click()
    await expect(page.getByTestId('conflict').textContent()).resolves.toContain('description')
    await screenshot(page, 'link-conflict')
    await page.getByRole('button', { name: /Reload their version/ }).click()
    await expect(page.getByTestId('conflict').count()).resolves.toBe(0)
  })

  it('lists the part library and the members', async () => {
    const { page } = browser
    await page.goto(`${baseURL}/teams/${fx.teamId}/parts`, { waitUntil: 'networkidle' })
    await page.getByRole('heading', { level: 1, name: 'Part library' }).waitFor()
    await page.getByText('PTC-20 generic phototransistor coupler').first().waitFor()
    await screenshot(page, 'part-library')
    await page.goto(`${baseURL}/teams/${fx.teamId}/members`, { waitUntil: 'networkidle' })
    await page.getByRole('heading', { level: 1, name: 'Members' }).waitFor()
    await page.getByText(fx.engineer).first().waitFor()
    await screenshot(page, 'members')
  })
})

describe('a viewer', () => {
  it('sees no edit controls and the server refuses their PATCH', async () => {
    const { page } = browser
    await page.context().clearCookies()
    await page.goto(`${baseURL}${fx.inviteUrl}`)
    await page.getByLabel('Your name').fill('Vic Viewer')
    await page.getByLabel('Choose a password').fill(PASSWORD)
    await page.getByRole('button', { name: 'Accept and join' }).click()
    await page.waitForURL(/\/teams\/\d+/)
    await page.goto(`${baseURL}/links/${fx.linkId}`)
    await verdictText(page)
    await page.getByTestId('read-only').waitFor()
    expect(await page.getByRole('button', { name: 'Save', exact: true }).count()).toBe(0)
    expect(await page.getByRole('button', { name: 'Add stage' }).count()).toBe(0)
    expect(await page.locator('[data-testid="channel-telemetry"] input').count()).toBe(0)
    expect(await page.getByRole('button', { name: /Apply/ }).count()).toBe(0)
    await screenshot(page, 'link-viewer')

    // the server refuses anyway, with the viewer's own session
    const status = await page.evaluate(async (id) => {
      const link = await (await fetch(`/api/links/${id}`)).json()
      const res = await fetch(`/api/links/${id}`, { method: 'PATCH', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ version: link.version, spec: link.spec }) })
      return res.status
    }, fx.linkId)
    expect(status).toBe(403)
  })
})
