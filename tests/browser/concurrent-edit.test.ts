/**
 * Two browsers edit one link: the first save wins, the second gets the 409 with a way
 * to reload or compare, and no update is lost.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { TELEMETRY_LINK } from '../../server/db/seeders/demo-links'
import { buildTeam, buildUser, FACTORY_PASSWORD, signedIn } from '../factories/users'
import { openBrowser, screenshot, type BrowserSession } from '../support/browser'

const baseURL = inject('baseURL')
let first: BrowserSession
let second: BrowserSession
let linkId = 0
const emails: string[] = []

beforeAll(async () => {
  const team = await buildTeam()
  for (const name of ['Edit One', 'Edit Two']) emails.push((await buildUser({ team, role: 'engineer', name })).user.email)
  const api = await signedIn(emails[0]!)
  const project = await api.post(`/api/teams/${team.id}/projects`, { name: 'Concurrent edits' })
  const link = await api.post(`/api/projects/${project.data.id}/links`, { spec: TELEMETRY_LINK })
  expect(link.status).toBe(201)
  linkId = link.data.id
  first = await openBrowser()
  second = await openBrowser()
})

afterAll(async () => {
  await first?.close()
  await second?.close()
})

async function openAs(b: BrowserSession, email: string) {
  const res = await b.page.request.post(`${baseURL}/api/auth/sign-in`, { data: { email, password: FACTORY_PASSWORD } })
  expect(res.status()).toBe(200)
  await b.page.goto(`${baseURL}/links/${linkId}`, { waitUntil: 'networkidle' })
}

describe('two browsers editing one link', () => {
  it('gives the second save a 409 with reload and compare, and loses no update', async () => {
    await openAs(first, emails[0]!)
    await openAs(second, emails[1]!)

    await first.page.getByLabel('Link name').fill('Telemetry, renamed in browser one')
    await second.page.getByLabel('Link name').fill('Telemetry, renamed in browser two')

    await first.page.getByRole('button', { name: 'Save', exact: true }).click()
    await first.page.getByText('All edits saved').waitFor()

    const conflictSave = second.page.waitForResponse((r) => r.url().endsWith(`/api/links/${linkId}`) && r.request().method() === 'PATCH')
    await second.page.getByRole('button', { name: 'Save', exact: true }).click()
    expect((await conflictSave).status()).toBe(409)
    const conflict = second.page.getByTestId('conflict')
    await conflict.waitFor()
    expect(await conflict.textContent()).toContain('Someone else saved this link')

    await conflict.getByRole('button', { name: 'Compare' }).click()
    expect(await conflict.locator('table').textContent()).toContain('Telemetry, renamed in browser one')
    await screenshot(second.page, 'concurrent-edit-conflict')

    // the first save is what the server holds; the second browser's edit is still in its draft
    const stored = await second.page.request.get(`${baseURL}/api/links/${linkId}`)
    expect((await stored.json()).spec.name).toBe('Telemetry, renamed in browser one')
    expect(await second.page.getByLabel('Link name').inputValue()).toBe('Telemetry, renamed in browser two')

    await conflict.getByRole('button', { name: 'Reload their version (discard mine)' }).click()
    expect(await second.page.getByLabel('Link name').inputValue()).toBe('Telemetry, renamed in browser one')
  })
})
