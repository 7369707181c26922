/** Rendering: every mail is multipart, plain text and HTML, with the product's name. */
import type { MailContent } from './types'

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
