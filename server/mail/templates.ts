/**
 * Every message Bitslack sends, one function each: the words live here, the domain code
 * only says which message to whom. Each returns the content; sendMail renders and queues it.
 */
import type { MailContent } from './types'

type Person = { name: string; email: string }
const article = (role: string) => (role === 'admin' || role === 'engineer' ? 'an' : 'a')

/** A password-reset link (one hour, once). */
export function passwordResetMail(user: Person, url: string): MailContent {
  return {
    to: user.email,
    subject: 'Reset your Bitslack password',
    greeting: `Hello ${user.name},`,
    paragraphs: ['Someone (we hope you) asked to reset the password of your Bitslack account. Choose a new password with the link below.', 'If you did not ask for this, ignore this mail: your password stays as it is.'],
    action: { label: 'Choose a new password', url },
    footnote: 'The link works once and expires in one hour.',
  }
}

/** Confirm a new account (one day, once). */
export function signUpConfirmMail(user: Person, url: string): MailContent {
  return {
    to: user.email,
    subject: 'Confirm your Bitslack account',
    greeting: `Hello ${user.name},`,
    paragraphs: ['Someone (we hope you) asked for a Bitslack account with this address. Confirm it with the link below: your team is created and you are signed in.', 'If you did not ask for this, ignore this mail: no account is created.'],
    action: { label: 'Confirm my account', url },
    footnote: 'The link works once and expires in one day.',
  }
}

/** Someone tried to sign up with an address that already has an account: tell its owner, nobody else. */
export function signUpExistingMail(user: Person, signInUrl: string, resetUrl: string): MailContent {
  return {
    to: user.email,
    subject: 'Your Bitslack account already exists',
    greeting: `Hello ${user.name},`,
    paragraphs: [
      'Someone (perhaps you) asked for a new Bitslack account with this address, which already has one. Nothing was changed.',
      `If it was you, sign in at ${signInUrl}; if you forgot the password, choose a new one at ${resetUrl}.`,
    ],
    action: { label: 'Sign in', url: signInUrl },
    footnote: 'If it was not you, ignore this mail.',
  }
}

/** An invitation to join a team (seven days, once). */
export function invitationMail(to: string, inviter: { name: string }, teamName: string | null, role: string, url: string): MailContent {
  return {
    to,
    subject: `${inviter.name} invited you to ${teamName ?? 'a team'} on Bitslack`,
    greeting: 'Hello,',
    paragraphs: [
      `${inviter.name} invited you to join the team "${teamName ?? ''}" on Bitslack as ${article(role)} ${role}.`,
      'Bitslack is where the team works out the timing budgets of its isolated UART and SPI links.',
    ],
    action: { label: 'Accept the invitation', url },
    footnote: 'The link works once and expires in seven days.',
  }
}

export interface RevisionRef {
  id: number
  label: string
  linkName: string
  projectName: string
  verdict: string
}

/** A margin report submitted to its reviewer. */
export function reportSubmittedMail(reviewer: Person, actor: { name: string }, rev: RevisionRef, url: string): MailContent {
  return {
    to: reviewer.email,
    subject: `Margin report to review: ${rev.linkName} ${rev.label}`,
    greeting: `Hello ${reviewer.name},`,
    paragraphs: [
      `${actor.name} submitted the margin report ${rev.label} of "${rev.linkName}" (project ${rev.projectName}) for your review.`,
      `Verdict at freeze time: ${rev.verdict}. Read it, comment on any bit, check or stage, then sign it off or return it.`,
    ],
    action: { label: 'Open the margin report', url },
  }
}

/** A margin report signed off or returned, to its author. */
export function reportDecidedMail(author: Person, actor: { name: string }, rev: RevisionRef, decision: 'sign-off' | 'return', note: string | null, url: string): MailContent {
  return {
    to: author.email,
    subject: decision === 'sign-off' ? `Margin report signed off: ${rev.linkName} ${rev.label}` : `Margin report returned: ${rev.linkName} ${rev.label}`,
    greeting: `Hello ${author.name},`,
    paragraphs:
      decision === 'sign-off'
        ? [`${actor.name} signed off the margin report ${rev.label} of "${rev.linkName}" (project ${rev.projectName}).`, ...(note ? [`Note: ${note}`] : [])]
        : [
            `${actor.name} returned the margin report ${rev.label} of "${rev.linkName}" (project ${rev.projectName}) with this comment:`,
            note ?? '',
            'Address the comments, then freeze and submit a new revision.',
          ],
    action: { label: 'Open the margin report', url },
  }
}
