/**
 * Outgoing e-mail through nodemailer over SMTP (settings in server/utils/settings.ts): the
 * local fake in demo, development and tests, the configured server in production. A mail is
 * rendered when it is sent and delivered by the PostgreSQL-backed job queue, so the action
 * that sends it succeeds even while the SMTP server is down.
 */
import nodemailer, { type Transporter } from 'nodemailer'
import { enqueueMail } from '../jobs/queue'
import { smtpSettings } from '../utils/settings'
import { renderMail } from './render'
import type { MailContent, QueuedMail } from './types'

let transport: Transporter | undefined

function useTransport(): { transport: Transporter; from: string } {
  const s = smtpSettings()
  transport ??= nodemailer.createTransport({
    host: s.host,
    port: s.port,
    secure: !s.local && s.port === 465,
    // the local fakes speak plain SMTP on loopback
    ignoreTLS: s.local,
    auth: s.user ? { user: s.user, pass: s.pass ?? '' } : undefined,
  })
  return { transport, from: s.from }
}

/** Send one mail: rendered now, delivered by the job queue with retries (exponential backoff). */
export async function sendMail(m: MailContent): Promise<void> {
  const { text, html } = renderMail(m)
  await enqueueMail({ to: m.to, subject: m.subject, text, html })
}

/** Hand one queued mail to the SMTP server (the queue's worker); a failure throws so the job is retried. */
export async function deliverMail(mail: QueuedMail): Promise<void> {
  const { transport, from } = useTransport()
  try {
    await transport.sendMail({ from, ...mail })
  } catch (err) {
    console.error('[bitslack] mail to', mail.to, 'not delivered yet (will retry):', err instanceof Error ? err.message : err)
    throw err
  }
}
