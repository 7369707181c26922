/**
 * Accounts: sign-up confirmed by mail (a new team with its creator as admin), sign-in with
 * a back-off that cannot lock the owner out, password reset by e-mailed single-use token.
 *
 * The throttles live in PostgreSQL (domain/throttle.ts), not in memory: they survive a
 * restart and are shared by every server process behind a load balancer. No answer says
 * whether an address has an account: sign-up and reset requests answer alike and do the
 * same work for known and unknown addresses.
 */
import { Op } from 'sequelize'
// hashPassword / verifyPassword: nuxt-auth-utils' scrypt helpers, auto-imported by Nitro (no importable path)
import type { SignInBody, SignUpBody } from '../../shared/schemas/auth'
import { Membership, PasswordResetToken, PendingSignUp, SignInAttempt, Team, User } from '../db/models'
import { endAllSessions } from './sessions'
import { useDb } from '../utils/db'
import { InvalidError, UnauthorizedError } from '../utils/errors'
import { requireStrongPassword } from '../utils/password-strength'
import { sendMail } from '../mail/send'
import { passwordResetMail, signUpConfirmMail, signUpExistingMail } from '../mail/templates'
import { appUrl } from '../utils/settings'
import { hashToken, newToken } from '../utils/tokens'
import { audit } from './audit'
import { overLimit, pruneThrottles, recordSignIn, refuseSignInTooSoon } from './throttle'

/** A password-reset link is valid this long. */
export const RESET_TOKEN_LIFETIME_MS = 60 * 60 * 1000

/** The user's memberships with their teams (for AuthDto). */
export function membershipsOf(userId: number) {
  return Membership.findAll({ where: { userId }, include: [{ model: Team, as: 'team' }] })
}

/** A sign-up waits this long for its confirmation. */
export const SIGN_UP_LIFETIME_MS = 24 * 60 * 60 * 1000

/**
 * Ask for an account: the answer is the same whether or not the address has one (no
 * enumeration). A new address gets a confirmation link; the owner of a known address gets a
 * note that someone tried, with the way to sign in or reset. The password is hashed either
 * way, so both paths take the same time; both mails leave through the queue.
 */
export async function requestSignUp(body: SignUpBody): Promise<void> {
  requireStrongPassword(body.password, [body.name, body.email])
  const passwordHash = await hashPassword(body.password)
  const existing = await User.findOne({ where: { email: body.email } })
  if (existing) {
    await sendMail(signUpExistingMail(existing, `${appUrl()}/sign-in`, `${appUrl()}/forgot-password`))
    return
  }
  const { token, hash } = newToken()
  await PendingSignUp.destroy({ where: { expiresAt: { [Op.lt]: new Date() } } })
  await PendingSignUp.create({ tokenHash: hash, email: body.email, name: body.name, teamName: body.teamName, passwordHash, expiresAt: new Date(Date.now() + SIGN_UP_LIFETIME_MS) })
  await sendMail(signUpConfirmMail({ name: body.name, email: body.email }, `${appUrl()}/confirm-sign-up?token=${encodeURIComponent(token)}`))
}

/** Confirm a sign-up with the mailed token: the account and its team are created (the creator is admin). */
export async function confirmSignUp(token: string) {
  return useDb().transaction(async (transaction) => {
    const pending = await PendingSignUp.findOne({ where: { tokenHash: hashToken(token), expiresAt: { [Op.gt]: new Date() } }, transaction, lock: transaction.LOCK.UPDATE })
    const invalid = () => InvalidError.of(['token'], 'this confirmation link is invalid, already used or expired; sign up again')
    if (!pending) throw invalid()
    await pending.destroy({ transaction })
    // confirmed twice, or the address got an account meanwhile (an invitation): the link is spent
    if (await User.findOne({ where: { email: pending.email }, transaction })) throw invalid()
    const user = await User.create({ name: pending.name, email: pending.email, passwordHash: pending.passwordHash }, { transaction })
    const team = await Team.create({ name: pending.teamName }, { transaction })
    const membership = await Membership.create({ userId: user.id, teamId: team.id, role: 'admin' }, { transaction })
    await audit(transaction, { teamId: team.id, userId: user.id, action: 'team.create', entity: 'team', entityId: team.id, detail: { name: team.name } })
    await audit(transaction, { teamId: team.id, userId: user.id, action: 'member.add', entity: 'member', entityId: membership.id, detail: { email: user.email, role: 'admin' } })
    return user
  })
}

// Verified against when the address is unknown, so both failures take the same time.
let decoyHash: Promise<string> | undefined

/**
 * Check the pair; 401 "wrong e-mail or password" for an unknown address and a wrong
 * password alike; 429 with the seconds to wait while this account and address (or this
 * address over all accounts) is in its back-off.
 */
export async function signIn(body: SignInBody, ip: string) {
  await refuseSignInTooSoon(body.email, ip)
  const user = await User.findOne({ where: { email: body.email } })
  decoyHash ??= hashPassword('decoy password for unknown addresses')
  const ok = await verifyPassword(user?.passwordHash ?? (await decoyHash), body.password)
  const succeeded = ok && !!user
  await recordSignIn(body.email, ip, succeeded)
  await pruneThrottles()
  if (!succeeded) throw new UnauthorizedError('wrong e-mail or password')
  return user!
}

/**
 * Mail a reset link when the address has an account; nothing visible happens otherwise.
 * Runs in the job queue for every request (known or unknown address), so the route answers
 * alike and as fast for both. At most three links per account an hour (a silent limit: more
 * requests send nothing). Earlier unused tokens of the user are revoked.
 */
export async function requestPasswordReset(email: string): Promise<void> {
  const user = await User.findOne({ where: { email } })
  if (!user) return
  if (await overLimit('reset-account', String(user.id), 3, 3600)) return
  const { token, hash } = newToken()
  await useDb().transaction(async (transaction) => {
    await PasswordResetToken.destroy({ where: { userId: user.id, usedAt: null }, transaction })
    await PasswordResetToken.create({ userId: user.id, tokenHash: hash, expiresAt: new Date(Date.now() + RESET_TOKEN_LIFETIME_MS) }, { transaction })
  })
  await sendMail(passwordResetMail(user, `${appUrl()}/reset-password?token=${encodeURIComponent(token)}`))
}

/** Set a new password with a valid, unused, unexpired token; the token is spent and every session signed in before is revoked. */
export async function completePasswordReset(token: string, password: string): Promise<void> {
  requireStrongPassword(password)
  const passwordHash = await hashPassword(password)
  const userId = await useDb().transaction(async (transaction) => {
    const row = await PasswordResetToken.findOne({
      where: { tokenHash: hashToken(token), usedAt: null, expiresAt: { [Op.gt]: new Date() } },
      lock: transaction.LOCK.UPDATE,
      transaction,
    })
    if (!row) throw InvalidError.of(['token'], 'this reset link is invalid, already used or expired; ask for a new one')
    const user = await User.findByPk(row.userId, { transaction, lock: transaction.LOCK.UPDATE })
    if (!user) throw InvalidError.of(['token'], 'this reset link is invalid, already used or expired; ask for a new one')
    await user.update({ passwordHash }, { transaction })
    await row.update({ usedAt: new Date() }, { transaction })
    await PasswordResetToken.destroy({ where: { userId: user.id, usedAt: null }, transaction })
    // a successful reset clears the account's sign-in back-off
    await SignInAttempt.destroy({ where: { email: user.email, succeeded: false }, transaction })
    return user.id
  })
  // every session signed in before the reset ends (a stolen cookie dies with the old password)
  await endAllSessions(userId)
}
