/** Reading the SMTP fake's mails from a test file (the fake runs in the global setup). */
import { inject } from 'vitest'
import type { FakeMail } from './mail-fake'

const mailURL = () => inject('mailURL')

/** Every mail received so far for `to` (optionally with `subject` in its subject). */
export async function mailsTo(to: string, subject?: string): Promise<FakeMail[]> {
  const q = new URLSearchParams({ to, ...(subject ? { subject } : {}) })
  const res = await fetch(`${mailURL()}/mails?${q}`)
  return (await res.json()) as FakeMail[]
}

/** The first mail for `to`, waiting up to `timeoutMs` for it to arrive; throws when none comes. */
export async function waitForMail(to: string, opts: { subject?: string; timeoutMs?: number } = {}): Promise<FakeMail> {
  const q = new URLSearchParams({ to, wait: String(opts.timeoutMs ?? 5000), ...(opts.subject ? { subject: opts.subject } : {}) })
  const res = await fetch(`${mailURL()}/mails?${q}`)
  const mails = (await res.json()) as FakeMail[]
  if (!mails.length) throw new Error(`no mail to ${to}${opts.subject ? ` about "${opts.subject}"` : ''} arrived`)
  return mails[mails.length - 1]!
}

/** At least `count` mails for `to`, waiting up to `timeoutMs` for them; throws when fewer arrive. */
export async function waitForMails(to: string, count: number, opts: { subject?: string; timeoutMs?: number } = {}): Promise<FakeMail[]> {
  const q = new URLSearchParams({ to, count: String(count), wait: String(opts.timeoutMs ?? 5000), ...(opts.subject ? { subject: opts.subject } : {}) })
  const res = await fetch(`${mailURL()}/mails?${q}`)
  const mails = (await res.json()) as FakeMail[]
  if (mails.length < count) throw new Error(`only ${mails.length} of ${count} mails to ${to} arrived`)
  return mails
}

/** The link in a mail's text whose path is `path` (e.g. '/reset-password'), as a URL. */
export function linkIn(mail: FakeMail, path: string): URL {
  const urls = mail.text.match(/https?:\/\/[^\s<>"]+/g) ?? []
  const found = urls.map((u) => new URL(u)).find((u) => u.pathname === path)
  if (!found) throw new Error(`no ${path} link in the mail "${mail.subject}"`)
  return found
}

/** Take the SMTP fake down (it answers 421, try later) or bring it back. */
export async function setMailService(state: 'down' | 'up'): Promise<void> {
  const res = await fetch(`${mailURL()}/smtp/${state}`, { method: 'POST' })
  if (res.status !== 204) throw new Error(`the mail fake did not go ${state}`)
}
