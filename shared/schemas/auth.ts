/** Request bodies of the account routes (sign-up, sign-in, password reset, invitations). */
import { z } from 'zod'
import { cleanText } from './text'

/** An e-mail address, trimmed and lower-cased (addresses are unique case-insensitively). */
export const Email = z
  .string({ error: 'email is required' })
  .trim()
  .toLowerCase()
  .max(254, 'email is at most 254 characters')
  .pipe(z.email('email must be an e-mail address'))

/**
 * A new password (ASVS 2.1.1, 2.1.2): at least 12 characters, up to 128 (any characters,
 * spaces included). The server also checks it against common passwords and patterns
 * (server/utils/password-strength.ts) and says why it refuses one.
 */
export const NewPassword = z
  .string({ error: 'password is required' })
  .min(12, 'password must be at least 12 characters')
  .max(128, 'password is at most 128 characters')

export const PersonName = cleanText(z.string({ error: 'name is required' }).trim().min(1, 'name is required').max(120, 'name is at most 120 characters'), 'name')

export const TeamName = cleanText(z.string({ error: 'teamName is required' }).trim().min(1, 'teamName is required').max(120, 'teamName is at most 120 characters'), 'teamName')

/** Opaque token from an e-mailed link (base64url). */
export const MailToken = z
  .string({ error: 'token is required' })
  .regex(/^[A-Za-z0-9_-]{20,128}$/, 'token is malformed')

export const SignUpBody = z.object({ name: PersonName, email: Email, password: NewPassword, teamName: TeamName })
export type SignUpBody = z.infer<typeof SignUpBody>

/** Sign-in takes any string as password: the rules apply to new passwords only. */
export const SignInBody = z.object({
  email: Email,
  password: z.string({ error: 'password is required' }).min(1, 'password is required').max(200, 'password is at most 200 characters'),
})
export type SignInBody = z.infer<typeof SignInBody>

export const PasswordResetBody = z.object({ email: Email })
export const PasswordResetCompleteBody = z.object({ token: MailToken, password: NewPassword })

/** Accepting an invitation: a new account needs name and password; an existing one may prove itself with its password. */
export const AcceptInvitationBody = z.object({
  name: PersonName.optional(),
  password: z.string().min(1, 'password is required').max(200, 'password is at most 200 characters').optional(),
})
export type AcceptInvitationBody = z.infer<typeof AcceptInvitationBody>
