/**
 * Captures from an engineer's seat: upload a scope export of the telemetry coupler on the
 * link page, watch the extraction finish, read the measured tPLH / tPHL, add them to the
 * coupler stage as a characterisation point and save the link; a viewer sees the
 * measurement but no upload form. Screenshots go to tests/.artifacts/screenshots.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import type { Page } from 'playwright-core'
import { buildWorld, type World } from '../factories/world'
import { FACTORY_PASSWORD } from '../factories/users'
import { buildLink, buildLinkSpec, buildProject } from '../factories/workspace'
import { delayedEdges, nrzEdges, sampleWave, toCsv } from '../factories/captures'
import { openBrowser, screenshot, type BrowserSession } from '../support/browser'

const baseURL = inject('baseURL')
let world: World
let linkId: number
let browser: BrowserSession

/** The telemetry coupler (invented PTC-20 at 4.7 kOhm) measured at a slow test rate: tPLH 22 us, tPHL 3 us. */
function couplerCsv(): Buffer {
  const bit = 1 / 9600
  const input = nrzEdges(40, bit, 20e-6, 23)
  const output = delayedEdges(input, { tPLH: 22e-6, tPHL: 3e-6, inverting: true })
  const dt = 100e-9
  const n = Math.ceil((40 * bit + 100e-6) / dt)
  const vin = sampleWave(n, 0, dt, { edges: input, low: 0, high: 3.3, rise: { kind: 'ramp', duration: 20e-9 }, fall: { kind: 'ramp', duration: 20e-9 }, noiseRms: 0.01 })
  const vout = sampleWave(n, 0, dt, { edges: output, low: 0.2, high: 3.3, rise: { kind: 'exp', tau: 15e-6 / Math.log(9) }, fall: { kind: 'ramp', duration: 2e-6 }, noiseRms: 0.02 })
  return Buffer.from(toCsv(0, dt, [vin, vout], { header: ['Time (s),TX pin (V),Coupler out (V)'] }))
}

async function signIn(page: Page, email: string) {
  await page.goto(`${baseURL}/sign-in`)
  await page.getByLabel('E-mail').fill(email)
  await page.getByLabel('Password').fill(FACTORY_PASSWORD)
  await page.getByRole('button', { name: 'Sign in' }).click()
  await page.waitForURL(/\/teams\/\d+/)
}

beforeAll(async () => {
  world = await buildWorld()
  const project = await buildProject(world.clients.engineer, world.teamId)
  linkId = (await buildLink(world.clients.engineer, project.id, buildLinkSpec('telemetry'))).id
  browser = await openBrowser()
}, 120_000)
afterAll(async () => {
  await browser?.close()
})

describe('captures on the link page', () => {
  it('the engineer uploads a capture, reads tPLH / tPHL and adds them to the coupler stage', async () => {
    const page = browser.page
    await signIn(page, world.users.engineer.email)
    await page.goto(`${baseURL}/links/${linkId}`)
    const panel = page.getByTestId('captures')
    await panel.waitFor()
    await expect(panel.textContent()).resolves.toMatch(/At most 48 MB per file/)
    await page.getByTestId('capture-file').setInputFiles({ name: 'coupler-4k7.csv', mimeType: 'text/csv', buffer: couplerCsv() })
    await panel.getByLabel('Pull-up RL of this measurement (optional)').fill('4.7k')
    await panel.getByRole('button', { name: 'Upload capture' }).click()
    await panel.locator('.tag-healthy', { hasText: 'done' }).waitFor({ timeout: 30_000 })
    await panel.getByRole('img', { name: /^Capture waveform/ }).waitFor()
    const table = panel.getByRole('table', { name: 'Measured timing' })
    const plh = (await table.getByRole('row', { name: /tPLH/ }).textContent()) ?? ''
    expect(plh).toMatch(/22\.\d+ µs|22 µs|21\.9\d* µs/)
    await screenshot(page, 'capture-measured')

    await panel.getByRole('button', { name: 'Add characterisation point' }).click()
    // the capture was taken on this board: a point at its own conditions (the library's points were taken at 5 V)
    await expect(panel.getByTestId('capture-apply').getByRole('status').textContent()).resolves.toMatch(/characterisation point added at RL 4700 ohm/)
    await page.getByRole('button', { name: 'Save', exact: true }).click()
    await page.getByTestId('save-state').filter({ hasText: 'All edits saved' }).waitFor()
    const saved = await world.clients.engineer.get(`/api/links/${linkId}`)
    const stage = saved.data.spec.channels[0].stages[0]
    const point = stage.characterization.find((c: { rl: number; vcc?: number }) => c.rl === 4700 && c.vcc === stage.vcc)
    expect(Math.abs(point.tplh - 22e-6)).toBeLessThan(0.1e-6)
    expect(Math.abs(point.tphl - 3e-6)).toBeLessThan(0.1e-6)
    await screenshot(page, 'capture-applied')
  })

  it('a viewer sees the measurement and no upload form', async () => {
    await browser.context.clearCookies()
    const page = browser.page
    await signIn(page, world.users.viewer.email)
    await page.goto(`${baseURL}/links/${linkId}`)
    const panel = page.getByTestId('captures')
    await panel.getByRole('table', { name: 'Measured timing' }).waitFor()
    expect(await page.getByTestId('capture-file').count()).toBe(0)
    expect(await panel.getByTestId('capture-apply').count()).toBe(0)
  })
})
