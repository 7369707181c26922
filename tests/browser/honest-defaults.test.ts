/**
 * Honest defaults and results that read at a glance (issue 17), in Chromium: a new link is
 * "incomplete" until its values are real; the team's policy sets a new link's requirement
 * and is edited by an admin only; the standard-rates table names both ends' divisors and the
 * fastest rate; a sweep row past an absolute maximum reads infeasible; the zoomed timeline
 * draws levels and steps; a signed-in "/" goes to the team; the audit trail filters by event.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import type { Page } from 'playwright-core'
import { buildWorld, type World } from '../factories/world'
import { FACTORY_PASSWORD } from '../factories/users'
import { buildLink, buildLinkSpec, buildProject } from '../factories/workspace'
import { openBrowser, screenshot, signInWithForm, type BrowserSession } from '../support/browser'

const baseURL = inject('baseURL')
let world: World
let browser: BrowserSession
let projectId: number
let telemetryId: number

const signIn = (page: Page, email: string) => signInWithForm(page, baseURL, email, FACTORY_PASSWORD)

beforeAll(async () => {
  world = await buildWorld()
  projectId = (await buildProject(world.clients.engineer, world.teamId, 'Honest defaults board')).id
  telemetryId = (await buildLink(world.clients.engineer, projectId, buildLinkSpec('telemetry'))).id
  browser = await openBrowser()
}, 120_000)
afterAll(async () => {
  await browser?.close()
})

describe('honest defaults', () => {
  it('the admin sets the team policy; a viewer reads it; a new link takes its required margin and reads incomplete', async () => {
    const page = browser.page
    await signIn(page, world.users.admin.email)
    await page.goto(`${baseURL}/teams/${world.teamId}/settings`)
    const margin = page.getByLabel('Required UART margin')
    await margin.fill('0.2')
    await page.getByLabel('UART guard band').fill('0.04')
    await page.getByRole('button', { name: 'Save policy' }).click()
    await page.getByText('Policy saved.').waitFor()
    await screenshot(page, 'team-settings')
    const stored = await world.clients.viewer.get(`/api/teams/${world.teamId}/policy`)
    expect(stored.data.policy).toMatchObject({ requiredMarginUi: 0.2, guardBandUi: 0.04 })

    await signIn(page, world.users.viewer.email)
    await page.goto(`${baseURL}/teams/${world.teamId}/settings`)
    await page.getByTestId('policy-read-only').waitFor()
    expect(await page.getByRole('button', { name: 'Save policy' }).count()).toBe(0)

    await signIn(page, world.users.engineer.email)
    await page.goto(`${baseURL}/projects/${projectId}`)
    await page.getByRole('button', { name: 'New link' }).click()
    // a name of spaces is refused, not replaced
    await page.getByLabel('Link name').fill('   ')
    await page.getByRole('button', { name: 'Create' }).click()
    await page.getByText('enter a name for the link').waitFor()
    await page.getByLabel('Link name').fill('Blank status UART')
    await page.getByRole('button', { name: 'Create' }).click()
    await page.waitForURL(/\/links\/\d+$/)
    const verdict = page.getByTestId('verdict-incomplete')
    await verdict.waitFor()
    await expect(verdict.textContent()).resolves.toMatch(/incomplete — \d+ values? missing/)
    await expect(page.getByTestId('sticky-verdict').textContent()).resolves.toMatch(/incomplete/)
    expect(await page.getByTestId('worst-margin').count()).toBe(0)
    await expect(page.getByLabel('Required margin').inputValue()).resolves.toMatch(/^0\.2/)
    await screenshot(page, 'new-link-incomplete')

    // an unreadable field: not analysed, and the save state says so
    await page.getByLabel('Required margin').fill('banana')
    await page.getByLabel('Required margin').blur()
    await expect(page.getByTestId('verdict').first().textContent()).resolves.toMatch(/not analysed: fix 1 field/)
    await expect(page.getByTestId('save-state').textContent()).resolves.not.toMatch(/All edits saved/)
  }, 120_000)

  it('the standard rates name both ends and the fastest passing rate; a sweep row past the ratings reads infeasible', async () => {
    const page = browser.page
    await signIn(page, world.users.engineer.email)
    await page.goto(`${baseURL}/links/${telemetryId}`)
    await page.getByTestId('worst-margin').waitFor()
    const rates = page.locator('#link-rates')
    await expect(rates.getByRole('columnheader', { name: /^TX divisor \(16 MHz\)/ }).count()).resolves.toBe(1)
    await expect(rates.getByRole('columnheader', { name: /^RX divisor \(48 MHz\)/ }).count()).resolves.toBe(1)
    await expect(rates.getByRole('row', { name: /pass, fastest/ }).count()).resolves.toBe(1)
    await expect(page.getByTestId('verdict-fastest-rate').textContent()).resolves.toMatch(/fastest standard rate: 4\.8 kBd, TX divisor 208\.3125, RX divisor 625/)

    await page.getByLabel('RL from').fill('100')
    await page.getByRole('button', { name: 'Run pull-up sweep' }).click()
    await page.getByTestId('sweep-recommendation').waitFor()
    const sweep = page.getByTestId('pullup-sweep')
    // the 100 Ω row needs more LED current than the pin gives: infeasible, its reason first, never healthy
    // the row whose RL cell (after the actions and the status) reads 100 Ω
    const index = await sweep.locator('tbody tr').evaluateAll((rows) => rows.findIndex((r) => r.querySelectorAll('td')[2]?.textContent?.trim() === '100 Ω'))
    expect(index).toBeGreaterThanOrEqual(0)
    const row = sweep.locator('tbody tr').nth(index)
    await expect(row.locator('td').nth(1).textContent()).resolves.not.toMatch(/^\s*feasible/)
    await expect(row.textContent()).resolves.toMatch(/\(infeasible\)|broken|–/)
    expect(await row.locator('.text-healthy').count()).toBe(0)
    await screenshot(page, 'sweep-infeasible-row')
  }, 120_000)

  it('the zoomed timeline draws levels and steps, never a ramp across the window', async () => {
    const page = browser.page
    await page.goto(`${baseURL}/links/${telemetryId}`)
    await page.getByTestId('worst-margin').waitFor()
    const lanePaths = () => page.getByTestId('timeline').locator('svg path[fill="none"]').evaluateAll((ps) => ps.map((p) => p.getAttribute('d') ?? ''))
    const whole = await lanePaths()
    await page.getByTestId('zoom').selectOption({ label: 'bit d3' })
    await page.waitForTimeout(300)
    const zoomed = await lanePaths()
    expect(zoomed).toHaveLength(whole.length)
    const width = await page.getByTestId('timeline').locator('svg').first().evaluate((s) => s.getBoundingClientRect().width)
    for (const d of zoomed) {
      const pts = [...d.matchAll(/[ML]([-\d.]+),([-\d.]+)/g)].map((m) => [Number(m[1]), Number(m[2])] as const)
      // every sloped segment is an edge (short); the bug drew one straight line across the view
      for (let i = 1; i < pts.length; i++) {
        const [x0, y0] = pts[i - 1]!
        const [x1, y1] = pts[i]!
        if (Math.abs(y1 - y0) > 1) expect(Math.abs(x1 - x0), d).toBeLessThan(0.3 * width)
      }
    }
    // the sent frame is ideal: zoomed or not, only horizontal and vertical segments at the same two levels
    const levels = (d: string) => new Set([...d.matchAll(/[ML][-\d.]+,([-\d.]+)/g)].map((m) => Number(m[1]).toFixed(1)))
    expect([...levels(zoomed[0]!)].every((y) => levels(whole[0]!).has(y))).toBe(true)
    await screenshot(page, 'timeline-zoomed')
  }, 120_000)

  it('a signed-in "/" goes to the team; the admin reads the audit trail filtered by event', async () => {
    const page = browser.page
    await signIn(page, world.users.admin.email)
    await page.goto(`${baseURL}/`)
    await page.waitForURL(new RegExp(`/teams/${world.teamId}$`))
    await page.goto(`${baseURL}/teams/${world.teamId}/audit`)
    const table = page.getByTestId('audit-table')
    await table.waitFor()
    await page.getByTestId('audit-action').selectOption('policy')
    await table.getByText('policy.update').first().waitFor()
    const events = await table.locator('tbody tr td:nth-child(3)').allTextContents()
    expect(events.length).toBeGreaterThan(0)
    expect(events.every((e) => e.startsWith('policy.'))).toBe(true)
    await screenshot(page, 'audit-trail')
    // not for an engineer: the tab is not shown and the server refuses
    expect((await world.clients.engineer.get(`/api/teams/${world.teamId}/audit`)).status).toBe(403)
  }, 120_000)
})
