/**
 * Outgoing e-mail through nodemailer over SMTP (settings in server/utils/settings.ts):
 * the local fake in demo, development and tests, the configured server in production.
 * Every mail is multipart: plain text and HTML, with the product's name.
 */
import nodemailer, { type Transporter } from 'nodemailer'
import { enqueueMail } from '../jobs/queue'

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

export interface MailContent {
  to: string
  subject: string
  /** greeting line, e.g. "Hello," */
  greeting: string
  /** paragraphs of plain text */
  paragraphs: string[]
  /** the one action the mail asks for */
  action: { label: string; url: string }
  /** closing note under the action (e.g. expiry) */
  footnote?: string
}

const escapeHtml = (s: string) =>
  s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;')

/** Plain text and HTML bodies of one mail. */
export function renderMail(m: MailContent): { text: string; html: string } {
  const text = [m.greeting, '', ...m.paragraphs.flatMap((p) => [p, '']), `${m.action.label}: ${m.action.url}`, '', ...(m.footnote ? [m.footnote, ''] : []), '-- ', 'Bitslack: timing budgets for isolated serial links'].join('\n')
  const html = `<!doctype html>
<html lang="en"><body style="font-family: Inter, Arial, sans-serif; color: #1f2933; line-height: 1.5">
<p style="font-weight: 600; font-size: 18px; margin: 0 0 16px">Bitslack</p>
<p>${escapeHtml(m.greeting)}</p>
${m.paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`).join('\n')}
<p><a href="${escapeHtml(m.action.url)}" style="display: inline-block; padding: 8px 14px; background: #0f766e; color: #ffffff; text-decoration: none; border-radius: 4px">${escapeHtml(m.action.label)}</a></p>
<p style="font-size: 13px; color: #52606d">Or open this address: ${escapeHtml(m.action.url)}</p>
${m.footnote ? `<p style="font-size: 13px; color: #52606d">${escapeHtml(m.footnote)}</p>` : ''}
<p style="font-size: 12px; color: #7b8794">Bitslack: timing budgets for isolated serial links</p>
</body></html>`
  return { text, html }
}

/** A rendered mail as it waits in the job queue. */
export interface QueuedMail {
  to: string
  subject: string
  text: string
  html: string
}

/**
 * Send one mail: rendered now, delivered by the PostgreSQL-backed job queue
 * (server/jobs/queue.ts), so the action that sends it succeeds even while the SMTP
 * server is down; delivery is retried with exponential backoff until it goes through.
 */
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
