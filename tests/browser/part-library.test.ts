/**
 * The part library from an engineer's seat: create a team part from the form, edit it (and
 * meet the 409 of a stale save with its reload), duplicate a built-in part, save a link's
 * stage to the library, attach a generated PDF datasheet and see it listed; a viewer reads
 * the same parts and datasheets with no edit control. Screenshots: tests/.artifacts/screenshots.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import type { Page } from 'playwright-core'
import { buildWorld, type World } from '../factories/world'
import { FACTORY_PASSWORD } from '../factories/users'
import { buildLink, buildLinkSpec, buildProject } from '../factories/workspace'
import path from 'node:path'
import { openBrowser, screenshot, SCREENSHOT_DIR, type BrowserSession } from '../support/browser'

const baseURL = inject('baseURL')
let world: World
let linkId: number
let engineer: BrowserSession
let viewer: BrowserSession
let partId = 0

/** The smallest well-formed PDF: one empty page, a correct xref table and trailer. */
function minimalPdf(): Buffer {
  const objects = [
    '<< /Type /Catalog /Pages 2 0 R >>',
    '<< /Type /Pages /Kids [3 0 R] /Count 1 >>',
    '<< /Type /Page /Parent 2 0 R /MediaBox [0 0 200 200] >>',
  ]
  let body = '%PDF-1.4\n'
  const offsets: number[] = []
  objects.forEach((o, i) => {
    offsets.push(Buffer.byteLength(body))
    body += `${i + 1} 0 obj\n${o}\nendobj\n`
  })
  const xref = Buffer.byteLength(body)
  body += `xref\n0 ${objects.length + 1}\n0000000000 65535 f \n`
  for (const off of offsets) body += `${String(off).padStart(10, '0')} 00000 n \n`
  body += `trailer\n<< /Size ${objects.length + 1} /Root 1 0 R >>\nstartxref\n${xref}\n%%EOF\n`
  return Buffer.from(body, 'latin1')
}

async function signIn(page: Page, email: string) {
  const res = await page.request.post(`${baseURL}/api/auth/sign-in`, { data: { email, password: FACTORY_PASSWORD } })
  expect(res.status()).toBe(200)
}

const partsUrl = () => `${baseURL}/teams/${world.teamId}/parts`

beforeAll(async () => {
  world = await buildWorld()
  const project = await buildProject(world.clients.engineer, world.teamId)
  linkId = (await buildLink(world.clients.engineer, project.id, buildLinkSpec('telemetry'))).id
  engineer = await openBrowser()
  viewer = await openBrowser()
  await signIn(engineer.page, world.users.engineer.email)
  await signIn(viewer.page, world.users.viewer.email)
}, 120_000)
afterAll(async () => {
  await engineer?.close()
  await viewer?.close()
})

describe('the part library', () => {
  it('the engineer creates a team part from the form, validated as they type', async () => {
    const page = engineer.page
    await page.goto(partsUrl(), { waitUntil: 'networkidle' })
    await page.getByRole('button', { name: 'New part' }).click()
    const form = page.getByTestId('part-form')
    await form.waitFor()
    await form.getByLabel('Part name').fill('QX-9 test logic coupler')
    await form.getByLabel('Category').selectOption('logic-output coupler')
    await form.getByLabel('Description', { exact: true }).fill('Invented logic-output coupler for the browser test.')
    await form.getByLabel('Name', { exact: true }).fill('QX-9 channel')

    // the shared schema answers while typing: a negative delay is refused beside its field
    const tplhTyp = form.getByLabel('tPLH typ')
    await tplhTyp.fill('-5 ns')
    await expect(form.getByRole('alert').first().textContent()).resolves.toBeTruthy()
    await expect(form.getByRole('button', { name: 'Create part' }).isDisabled()).resolves.toBe(true)
    // a new part starts blank (issue 17: no invented numbers): every delay corner is entered
    await expect(form.getByRole('button', { name: 'Create part' }).isDisabled()).resolves.toBe(true)
    await form.getByLabel('tPLH min').fill('20 ns')
    await tplhTyp.fill('45 ns')
    await form.getByLabel('tPLH max').fill('80 ns')
    await form.getByLabel('tPHL min').fill('20 ns')
    await form.getByLabel('tPHL typ').fill('40 ns')
    await form.getByLabel('tPHL max').fill('80 ns')
    await screenshot(page, 'part-library-create')

    const created = page.waitForResponse((r) => r.url().endsWith(`/api/teams/${world.teamId}/parts`) && r.request().method() === 'POST')
    await form.getByRole('button', { name: 'Create part' }).click()
    const res = await created
    expect(res.status()).toBe(201)
    const body = await res.json()
    partId = body.id
    expect(body).toMatchObject({ name: 'QX-9 test logic coupler', category: 'logic-output coupler', builtIn: false, version: 1 })
    expect(body.stage).toMatchObject({ kind: 'digital', name: 'QX-9 channel', tplh: { typ: 45e-9, max: 80e-9 } })
    await page.waitForURL(new RegExp(`[?&]part=${partId}`))
    await page.getByText('All edits saved (version 1)').waitFor()
    await expect(page.locator('table').last().textContent()).resolves.toContain('QX-9 test logic coupler')
  })

  it('the engineer edits the part with its version, and a stale save shows the 409 with a reload', async () => {
    const page = engineer.page
    const form = page.getByTestId('part-form')
    await form.getByLabel('tPHL typ').fill('30 ns')
    const patched = page.waitForResponse((r) => r.url().endsWith(`/api/parts/${partId}`) && r.request().method() === 'PATCH')
    await form.getByRole('button', { name: 'Save part' }).click()
    expect((await patched).status()).toBe(200)
    await page.getByText('All edits saved (version 2)').waitFor()

    // a colleague saves version 3 meanwhile; our next save is based on version 2
    const other = await world.clients.admin.patch(`/api/parts/${partId}`, { version: 2, description: 'Changed by a colleague.' })
    expect(other.status).toBe(200)
    await form.getByLabel('Part name').fill('QX-9 logic coupler, renamed')
    const stale = page.waitForResponse((r) => r.url().endsWith(`/api/parts/${partId}`) && r.request().method() === 'PATCH')
    await form.getByRole('button', { name: 'Save part' }).click()
    expect((await stale).status()).toBe(409)
    const conflict = page.getByTestId('part-conflict')
    await conflict.waitFor()
    await expect(conflict.textContent()).resolves.toMatch(/Someone else saved this part.*version 3.*version 2/s)
    await expect(form.getByLabel('Part name').inputValue()).resolves.toBe('QX-9 logic coupler, renamed')
    await screenshot(page, 'part-library-conflict')

    await conflict.getByRole('button', { name: 'Reload their version (discard mine)' }).click()
    await expect(form.getByLabel('Part name').inputValue()).resolves.toBe('QX-9 test logic coupler')
    await expect(form.getByLabel('Description', { exact: true }).inputValue()).resolves.toBe('Changed by a colleague.')
    await form.getByLabel('Part name').fill('QX-9 logic coupler, renamed')
    const again = page.waitForResponse((r) => r.url().endsWith(`/api/parts/${partId}`) && r.request().method() === 'PATCH')
    await form.getByRole('button', { name: 'Save part' }).click()
    expect((await again).status()).toBe(200)
    await page.getByText('All edits saved (version 4)').waitFor()
    const stored = (await world.clients.viewer.get(`/api/parts/${partId}`)).data
    expect(stored).toMatchObject({ name: 'QX-9 logic coupler, renamed', description: 'Changed by a colleague.', version: 4 })
    expect(stored.stage.tphl.typ).toBeCloseTo(30e-9, 15)
  })

  it('the engineer attaches a PDF datasheet and sees it listed; a non-PDF is refused beside the control', async () => {
    const page = engineer.page
    const panel = page.getByTestId('datasheets')
    await expect(panel.textContent()).resolves.toContain('at most 20 MB')

    await page.getByTestId('datasheet-file').setInputFiles({ name: 'not-a-datasheet.pdf', mimeType: 'application/pdf', buffer: Buffer.from('time,v\n0,1\n') })
    await panel.getByRole('button', { name: 'Upload datasheet' }).click()
    await expect(page.getByTestId('datasheet-error').textContent()).resolves.toContain('does not start with %PDF-')

    const pdf = minimalPdf()
    await page.getByTestId('datasheet-file').setInputFiles({ name: 'qx9-datasheet.pdf', mimeType: 'application/pdf', buffer: pdf })
    const uploaded = page.waitForResponse((r) => r.url().endsWith(`/api/parts/${partId}/datasheets`) && r.request().method() === 'POST')
    await panel.getByRole('button', { name: 'Upload datasheet' }).click()
    expect((await uploaded).status()).toBe(201)
    await panel.getByText('Attached qx9-datasheet.pdf.').waitFor()
    const row = panel.locator('tbody tr', { hasText: 'qx9-datasheet.pdf' })
    await expect(row.textContent()).resolves.toContain(`${pdf.length} B`)
    await expect(row.textContent()).resolves.toContain('Test engineer')
    const href = await row.getByRole('link', { name: 'qx9-datasheet.pdf' }).getAttribute('href')
    const download = await page.request.get(`${baseURL}${href}`)
    expect(download.status()).toBe(200)
    expect(Buffer.from(await download.body()).equals(pdf)).toBe(true)
    await screenshot(page, 'part-library-datasheet')
  })

  it('the engineer views a built-in part read-only and duplicates it into a team part', async () => {
    const page = engineer.page
    const builtIns = (await world.clients.engineer.get(`/api/teams/${world.teamId}/parts`)).data.filter((p: { builtIn: boolean }) => p.builtIn)
    const builtIn = builtIns[0]
    expect(builtIn).toBeTruthy()
    await page.goto(`${partsUrl()}?part=${builtIn.id}`, { waitUntil: 'networkidle' })
    const form = page.getByTestId('part-form')
    await form.waitFor()
    expect(await form.locator('input, select, textarea').count()).toBe(0)
    await expect(form.textContent()).resolves.toContain(builtIn.name)
    expect(await page.getByTestId('datasheet-file').count()).toBe(0)
    await screenshot(page, 'part-library-built-in')

    await page.getByRole('button', { name: 'Duplicate as team part' }).click()
    await expect(form.getByLabel('Part name').inputValue()).resolves.toBe(`${builtIn.name} (team copy)`)
    const created = page.waitForResponse((r) => r.url().endsWith(`/api/teams/${world.teamId}/parts`) && r.request().method() === 'POST')
    await form.getByRole('button', { name: 'Create part' }).click()
    const res = await created
    expect(res.status()).toBe(201)
    const copy = await res.json()
    expect(copy).toMatchObject({ builtIn: false, category: builtIn.category, stage: { ...builtIn.stage } })
  })

  it('the engineer saves a link stage to the part library', async () => {
    const page = engineer.page
    await page.goto(`${baseURL}/links/${linkId}`, { waitUntil: 'networkidle' })
    const stage = page.getByTestId('stage-0').first()
    const stageName = await stage.getByLabel('Name', { exact: true }).inputValue()
    await stage.getByRole('button', { name: 'Stage 1: Save to part library' }).click()
    const panel = stage.getByTestId('save-to-library')
    await expect(panel.getByLabel('Part name').inputValue()).resolves.toBe(stageName)
    await panel.getByLabel('Part name').fill('Telemetry coupler as fitted')
    await panel.getByLabel('Description').fill('Saved from the telemetry link.')
    await screenshot(page, 'part-library-save-stage')
    await stage.screenshot({ path: path.join(SCREENSHOT_DIR, 'part-library-save-stage-close.png') })
    const created = page.waitForResponse((r) => r.url().endsWith(`/api/teams/${world.teamId}/parts`) && r.request().method() === 'POST')
    await panel.getByRole('button', { name: 'Save part' }).click()
    const res = await created
    expect(res.status()).toBe(201)
    const part = await res.json()
    await panel.getByText('Saved to the part library as').waitFor()
    const spec = (await world.clients.engineer.get(`/api/links/${linkId}`)).data.spec
    const { partId: _from, ...linkStage } = spec.channels[0].stages[0]
    expect(part).toMatchObject({ name: 'Telemetry coupler as fitted', description: 'Saved from the telemetry link.', stage: linkStage })
    // the new part is offered at once in the channel's "Add a stage" list
    await expect.poll(() => page.locator('select optgroup[label="Part library"]').first().textContent()).toContain('Telemetry coupler as fitted')
    await screenshot(page, 'part-library-stage-saved')
    await stage.screenshot({ path: path.join(SCREENSHOT_DIR, 'part-library-stage-saved-close.png') })
  })

  it('a viewer reads parts and datasheets with no edit control', async () => {
    const page = viewer.page
    await page.goto(partsUrl(), { waitUntil: 'networkidle' })
    await page.getByText('QX-9 logic coupler, renamed').first().waitFor()
    for (const name of ['New part', 'Edit', 'Duplicate', 'Delete']) expect(await page.getByRole('button', { name: new RegExp(`^${name}\\b`) }).count()).toBe(0)
    await page.getByRole('button', { name: 'View QX-9 logic coupler, renamed' }).click()
    const form = page.getByTestId('part-form')
    await form.waitFor()
    expect(await form.locator('input, select, textarea').count()).toBe(0)
    expect(await form.getByRole('button', { name: /Save|Create/ }).count()).toBe(0)
    await expect(page.getByTestId('datasheets').textContent()).resolves.toContain('qx9-datasheet.pdf')
    expect(await page.getByTestId('datasheet-file').count()).toBe(0)
    await screenshot(page, 'part-library-viewer')

    await page.goto(`${baseURL}/links/${linkId}`, { waitUntil: 'networkidle' })
    await page.getByTestId('stage-0').first().waitFor()
    expect(await page.getByRole('button', { name: /to part library/ }).count()).toBe(0)
  })
})
