/**
 * Accessibility (issue 12): axe-core runs on every page, signed out and as each role, with
 * the WCAG 2.0 / 2.1 A and AA rules; the pages must have no violation. The link page is
 * checked with its analysis, pull-up sweep and spread study on screen, the report page with
 * its tables and charts. The bit timeline stays reachable by keyboard (each bit a button).
 */
import { readFileSync } from 'node:fs'
import path from 'node:path'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import type { Page } from 'playwright-core'
import { buildWorld, type World } from '../factories/world'
import { FACTORY_PASSWORD } from '../factories/users'
import { buildLink, buildLinkSpec, buildProject } from '../factories/workspace'
import { openBrowser, signInWithForm, type BrowserSession } from '../support/browser'

const baseURL = inject('baseURL')
const AXE = readFileSync(path.resolve('node_modules/axe-core/axe.min.js'), 'utf8')
// WCAG 2 levels A and AA, as axe-core tags them (https://github.com/dequelabs/axe-core/blob/develop/doc/API.md#axe-core-tags)
const TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa']

let world: World
let browser: BrowserSession
let projectId: number
let uartId: number
let spiId: number
let reportId: number

const signIn = (page: Page, email: string) => signInWithForm(page, baseURL, email, FACTORY_PASSWORD)

/** axe's violations on the page as it stands: "rule (n): first targets". */
async function violations(page: Page): Promise<string[]> {
  if (!(await page.evaluate(() => 'axe' in window))) await page.addScriptTag({ content: AXE })
  const r = await page.evaluate(async (tags) => {
    const axe = (window as unknown as { axe: { run: (c: Document, o: unknown) => Promise<{ violations: { id: string; nodes: { target: string[]; failureSummary?: string }[] }[] }> } }).axe
    return axe.run(document, { runOnly: { type: 'tag', values: tags } })
  }, TAGS)
  return r.violations.map((v) => `${v.id} (${v.nodes.length}): ${v.nodes.slice(0, 3).map((n) => `${n.target.join(' ')} ${n.failureSummary?.split('\n')[1] ?? ''}`).join(' | ')}`)
}

async function visit(page: Page, url: string, ready?: string) {
  await page.goto(`${baseURL}${url}`)
  await page.waitForLoadState('networkidle')
  if (ready) await page.getByTestId(ready).first().waitFor()
}

beforeAll(async () => {
  world = await buildWorld()
  projectId = (await buildProject(world.clients.engineer, world.teamId, 'Accessibility board')).id
  uartId = (await buildLink(world.clients.engineer, projectId, buildLinkSpec('telemetry'))).id
  spiId = (await buildLink(world.clients.engineer, projectId, buildLinkSpec('spi'))).id
  const frozen = await world.clients.engineer.post(`/api/links/${uartId}/reports`, {})
  expect(frozen.status, JSON.stringify(frozen.data)).toBe(201)
  reportId = frozen.data.id
  browser = await openBrowser()
}, 120_000)
afterAll(async () => {
  await browser?.close()
})

describe('accessibility (axe-core, WCAG 2 A and AA)', () => {
  it('the signed-out pages have no violation', async () => {
    const page = browser.page
    await page.context().clearCookies()
    const found: Record<string, string[]> = {}
    for (const url of ['/sign-in', '/sign-up', '/forgot-password']) {
      await visit(page, url)
      const v = await violations(page)
      if (v.length) found[url] = v
    }
    expect(found).toEqual({})
  })

  for (const role of ['viewer', 'engineer', 'reviewer', 'admin'] as const) {
    it(`every page as the ${role} has no violation`, async () => {
      const page = browser.page
      await signIn(page, world.users[role].email)
      const pages: [string, string | undefined][] = [
        [`/teams/${world.teamId}`, undefined],
        [`/teams/${world.teamId}/members`, undefined],
        [`/teams/${world.teamId}/parts`, undefined],
        [`/projects/${projectId}`, undefined],
        [`/links/${uartId}`, 'worst-margin'],
        [`/links/${spiId}`, 'worst-margin'],
        [`/reports/${reportId}`, 'worst-margin'],
        ['/review-queue', undefined],
      ]
      const found: Record<string, string[]> = {}
      for (const [url, ready] of pages) {
        await visit(page, url, ready)
        const v = await violations(page)
        if (v.length) found[url] = v
      }
      expect(found).toEqual({})
    }, 120_000)
  }

  it('the link page with its sweep and spread study open, and the timeline by keyboard', async () => {
    const page = browser.page
    await signIn(page, world.users.engineer.email)
    await visit(page, `/links/${uartId}`, 'worst-margin')
    await page.getByRole('button', { name: 'Run pull-up sweep' }).click()
    await page.getByTestId('sweep-recommendation').waitFor()
    await page.getByRole('button', { name: 'Run spread study' }).click()
    await page.waitForLoadState('networkidle')
    expect(await violations(page)).toEqual([])
    // every bit of the timeline is a button with its margin in its name
    const zoom = page.getByTestId('zoom')
    const before = await zoom.inputValue()
    await page.getByRole('button', { name: /^bit d0: margin / }).focus()
    await page.keyboard.press('Enter')
    await expect(zoom.inputValue()).resolves.not.toBe(before)
  }, 120_000)
})
