/**
 * The margin report journey in Chromium: the engineer freezes the telemetry link from the
 * link page and submits the revision to the reviewer; the reviewer finds it in the review
 * queue, comments on one bit and signs it off; the page prints without navigation.
 * Screenshots go to tests/.artifacts/screenshots.
 */
import { execFileSync } from 'node:child_process'
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import path from 'node:path'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import type { Page } from 'playwright-core'
import { formatUi } from '../../shared/utils/units'
import { buildWorld, type World } from '../factories/world'
import { FACTORY_PASSWORD } from '../factories/users'
import { buildLink, buildLinkSpec, buildProject } from '../factories/workspace'
import { waitForMail } from '../support/mail'
import { openBrowser, screenshot, signInWithForm, type BrowserSession } from '../support/browser'

const baseURL = inject('baseURL')
let world: World
let linkId: number
let projectId: number
let browser: BrowserSession
const dir = mkdtempSync(path.join(tmpdir(), 'bitslack-print-'))

const signIn = (page: Page, email: string) => signInWithForm(page, baseURL, email, FACTORY_PASSWORD)

beforeAll(async () => {
  world = await buildWorld()
  projectId = (await buildProject(world.clients.engineer, world.teamId, 'PX-7 test board')).id
  linkId = (await buildLink(world.clients.engineer, projectId, buildLinkSpec('telemetry'))).id
  browser = await openBrowser()
}, 120_000)
afterAll(async () => {
  await browser?.close()
  rmSync(dir, { recursive: true, force: true })
})

describe('margin report in the browser', () => {
  it('freeze -> submit -> review queue -> comment on a bit -> sign off; printable', async () => {
    const page = browser.page
    const consoleErrors: string[] = []
    page.on('console', (m) => m.type() === 'error' && consoleErrors.push(m.text()))
    await signIn(page, world.users.engineer.email)
    await page.goto(`${baseURL}/links/${linkId}`)
    const revisions = page.getByTestId('link-revisions')
    await revisions.waitFor()
    await revisions.getByRole('button', { name: 'Freeze as revision' }).click()
    await page.waitForURL(/\/reports\/\d+$/)
    const reportId = Number(/\/reports\/(\d+)$/.exec(page.url())![1])
    const stored = (await world.clients.viewer.get(`/api/reports/${reportId}`)).data

    await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toContain('Gate-driver telemetry UART')
    await expect(page.getByTestId('report-state').first().textContent()).resolves.toContain('draft')
    await expect(page.getByTestId('worst-margin').textContent()).resolves.toContain(formatUi(stored.result.uart.worstMarginUi))
    await page.getByLabel('Submit to reviewer').selectOption(String(world.users.reviewer.id))
    await page.getByRole('button', { name: 'Submit for review' }).click()
    await page.getByText('Waiting for Test reviewer').waitFor()
    await waitForMail(world.users.reviewer.email, { subject: 'Margin report to review' })

    // the reviewer
    await signIn(page, world.users.reviewer.email)
    // the header counts what waits for the reviewer
    await expect(page.getByTestId('review-queue-count').textContent()).resolves.toMatch(/^1/)
    await page.getByTestId('review-queue-link').click()
    await page.waitForURL(/\/review-queue$/)
    await page.getByRole('link', { name: 'Gate-driver telemetry UART' }).first().waitFor()
    await screenshot(page, 'review-queue')
    await page.goto(`${baseURL}/reports/${reportId}`)
    await page.getByRole('button', { name: 'Comment on bit d0' }).click()
    await page.locator('#comment-body').fill('d0 late side: check the edge on the bench.')
    await page.getByRole('button', { name: 'Add comment' }).click()
    await page.getByTestId('comments').getByText('d0 late side: check the edge on the bench.').waitFor()
    await expect(page.getByTestId('comments').textContent()).resolves.toContain('Bit d0 of telemetry')
    await page.getByRole('button', { name: /Sign off r\d+/ }).click()
    await page.getByTestId('sign-off').getByText('signed off').first().waitFor()
    await waitForMail(world.users.engineer.email, { subject: 'signed off' })
    await page.getByRole('button', { name: 'Recompute with today’s engine' }).click()
    await expect(page.getByTestId('recompute').textContent()).resolves.toContain('Same answer')
    await page.evaluate(() => document.fonts.ready)
    await screenshot(page, 'report')
    await page.evaluate(() => window.scrollTo(0, 0))
    await page.screenshot({ path: 'tests/.artifacts/screenshots/report-top.png' })

    // print: no navigation, no buttons, the report's sections and the caution
    await page.emulateMedia({ media: 'print' })
    await expect(page.locator('body > div > div > header').first().isVisible()).resolves.toBe(false)
    await expect(page.getByRole('button', { name: 'Add comment' }).isVisible()).resolves.toBe(false)
    await screenshot(page, 'report-print')
    const pdf = await page.pdf({ format: 'A4', printBackground: true })
    const file = path.join(dir, 'print.pdf')
    writeFileSync(file, pdf)
    const info = execFileSync('pdfinfo', [file], { encoding: 'utf8' })
    expect(info).toMatch(/A4/)
    expect(Number(/Pages:\s+(\d+)/.exec(info)![1])).toBeGreaterThanOrEqual(4)
    const text = execFileSync('pdftotext', [file, '-'], { encoding: 'utf8' })
    expect(text).toContain('Stages and settings')
    expect(text).toContain('Per-bit margins')
    // the sortable table headers stay in print (only action buttons go)
    expect(text).toContain('Early margin')
    expect(text).toContain('Timing only.')
    expect(text).not.toContain('Sign out')
    expect(text).not.toContain('Add comment')
    await page.emulateMedia({ media: 'screen' })
    expect(consoleErrors.filter((e) => /content security policy/i.test(e))).toEqual([])

    // the server's PDF: units as written and the sign-off on page 1 (issue 17)
    const served = await page.request.get(`${baseURL}/reports/${reportId}/report.pdf`)
    expect(served.status()).toBe(200)
    const served1 = path.join(dir, 'served.pdf')
    writeFileSync(served1, await served.body())
    const all = execFileSync('pdftotext', ['-layout', served1, '-'], { encoding: 'utf8' })
    expect(all).toMatch(/\d µs/)
    expect(all).toContain('kΩ')
    const page1 = execFileSync('pdftotext', ['-f', '1', '-l', '1', '-layout', served1, '-'], { encoding: 'utf8' })
    expect(page1).toMatch(/State\s+signed off/)
    expect(page1).toMatch(/Signed off\s+\d{4}-\d\d-\d\d \d\d:\d\d UTC by Test reviewer/)
    expect(page1).toContain('Reviewer')
  })

  it('the project page shows the link’s latest revision state', async () => {
    const page = browser.page
    await page.goto(`${baseURL}/projects/${projectId}`)
    const row = page.getByRole('row', { name: /Gate-driver telemetry UART/ })
    await row.waitFor()
    await expect(row.textContent()).resolves.toMatch(/r1\s*.*signed off/)
    await screenshot(page, 'project-latest-report')
  })

  it('the engineer imports a link JSON on the project page: problems named, a good file opens the new link', async () => {
    const page = browser.page
    await signIn(page, world.users.engineer.email)
    await page.goto(`${baseURL}/projects/${projectId}`)
    const good = buildLinkSpec('debug', 'Imported debug UART')
    const bad = { ...structuredClone(good), schemaVersion: 3, channels: [] }
    await page.getByTestId('import-json').setInputFiles({ name: 'bad.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify(bad)) })
    const alert = page.getByRole('alert').filter({ hasText: 'The file was not imported' })
    await alert.waitFor()
    await expect(alert.textContent()).resolves.toMatch(/schemaVersion: schemaVersion must be 2/)
    await expect(alert.textContent()).resolves.toMatch(/channels: a link needs at least one channel/)
    await screenshot(page, 'project-import-problems')
    await page.getByTestId('import-json').setInputFiles({ name: 'good.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify(good)) })
    await page.waitForURL(/\/links\/\d+$/)
    await page.getByRole('heading', { level: 1, name: 'Imported debug UART' }).waitFor()
  })

  it('compares the revision with the one before it: verdicts, margins biggest first, changed inputs', async () => {
    const page = browser.page
    const link = (await world.clients.engineer.get(`/api/links/${linkId}`)).data
    const spec = structuredClone(link.spec)
    spec.uart.baud = 9600
    expect((await world.clients.engineer.patch(`/api/links/${linkId}`, { version: link.version, spec })).status).toBe(200)
    const later = await world.clients.engineer.post(`/api/links/${linkId}/reports`, {})
    expect(later.status).toBe(201)
    await signIn(page, world.users.reviewer.email)
    await page.goto(`${baseURL}/reports/${later.data.id}`)
    const compare = page.getByTestId('report-compare')
    await compare.getByTestId('compare-margins').waitFor()
    expect(await compare.getByTestId('compare-with').locator('option:checked').textContent()).toMatch(/^r\d+/)
    const firstRow = compare.getByTestId('compare-margins').locator('tbody tr').first()
    expect(await firstRow.textContent()).toMatch(/UI|Bd/)
    expect(await compare.getByTestId('compare-input-group').filter({ hasText: 'UART settings' }).textContent()).toContain('uart.baud')
    await compare.scrollIntoViewIfNeeded()
    await screenshot(page, 'report-compare')
  })

  it('a link saved after its sign-off says so on the link page, shows what changed and offers the next revision', async () => {
    const page = browser.page
    const revs = (await world.clients.engineer.get(`/api/links/${linkId}/reports`)).data as { id: number; state: string }[]
    const signed = revs.find((r) => r.state === 'signed-off')
    expect(signed, 'the first test signs a revision off').toBeTruthy()
    const link = (await world.clients.engineer.get(`/api/links/${linkId}`)).data
    const spec = structuredClone(link.spec)
    spec.uart.baud = 4800
    expect((await world.clients.engineer.patch(`/api/links/${linkId}`, { version: link.version, spec })).status).toBe(200)
    await signIn(page, world.users.engineer.email)
    await page.goto(`${baseURL}/links/${linkId}`)
    const notice = page.getByTestId('sign-off-notice')
    await notice.waitFor()
    expect(await notice.textContent()).toMatch(/Changed since r\d+ was signed off/)
    await notice.getByTestId('since-sign-off-toggle').click()
    await notice.getByTestId('compare-margins').waitFor()
    expect(await notice.getByTestId('compare-input-group').first().textContent()).toContain('uart.baud')
    await screenshot(page, 'changed-since-sign-off')
    await page.goto(`${baseURL}/projects/${projectId}`)
    await page.getByTestId('changed-since-sign-off').first().waitFor()
  })
})
