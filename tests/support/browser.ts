/**
 * playwright-core driving Debian's Chromium (never a downloaded browser). Every page
 * gets a fresh profile folder; screenshots go to tests/.artifacts/screenshots (ignored).
 */
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import path from 'node:path'
import { chromium, type BrowserContext, type Page } from 'playwright-core'

const ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
]

export const SCREENSHOT_DIR = path.resolve('tests/.artifacts/screenshots')

export interface BrowserSession {
  context: BrowserContext
  page: Page
  close(): Promise<void>
}

export async function openBrowser(): Promise<BrowserSession> {
  const profile = mkdtempSync(path.join(tmpdir(), 'bitslack-chromium-'))
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: process.env.CHROMIUM_PATH || '/usr/bin/chromium',
    headless: true,
    args: ARGS,
    viewport: { width: 1366, height: 900 },
  })
  const page = context.pages()[0] ?? (await context.newPage())
  return {
    context,
    page,
    async close() {
      await context.close()
      rmSync(profile, { recursive: true, force: true })
    },
  }
}

export async function screenshot(page: Page, name: string) {
  mkdirSync(SCREENSHOT_DIR, { recursive: true })
  const file = path.join(SCREENSHOT_DIR, `${name}.png`)
  await page.screenshot({ path: file, fullPage: true })
  return file
}

/** Sign in through the form as a user does, in a fresh session (earlier cookies cleared); returns on the team page. */
export async function signInWithForm(page: Page, baseURL: string, email: string, password: string) {
  await page.context().clearCookies()
  await page.goto(`${baseURL}/sign-in`)
  await page.getByLabel('E-mail').fill(email)
  await page.getByLabel('Password').fill(password)
  await page.getByRole('button', { name: 'Sign in' }).click()
  await page.waitForURL(/\/teams\/\d+/)
}
