/**
 * Accounts: sign-up (a new team with its creator as admin), sign-in with rate limiting,
 * password reset by e-mailed single-use token.
 *
 * Rate limiting lives in PostgreSQL (table sign_in_attempts), not in memory: the count
 * survives a restart and is shared by every server process behind a load balancer, and
 * an attacker cannot reset it by crashing or waiting out a deploy. The cost is one insert
 * and two indexed counts per attempt, small beside the scrypt verification itself.
 */
import { Op } from 'sequelize'
// hashPassword / verifyPassword: nuxt-auth-utils' scrypt helpers, auto-imported by Nitro (no importable path)
import type { SignInBody, SignUpBody } from '../../shared/schemas/auth'
import { Membership, PasswordResetToken, SignInAttempt, Team, User } from '../db/models'
import { forgetSessionRevocation } from '../utils/access'
import { useDb } from '../utils/db'
import { ConflictError, InvalidError, RateLimitedError, UnauthorizedError } from '../utils/errors'
import { sendMail } from '../mail/send'
import { passwordResetMail } from '../mail/templates'
import { appUrl, signInLimits } from '../utils/settings'
import { hashToken, newToken } from '../utils/tokens'
import { audit } from './audit'

/** A password-reset link is valid this long. */
export const RESET_TOKEN_LIFETIME_MS = 60 * 60 * 1000

/** The user's memberships with their teams (for AuthDto). */
export function membershipsOf(userId: number) {
  return Membership.findAll({ where: { userId }, include: [{ model: Team, as: 'team' }] })
}

export async function signUp(body: SignUpBody) {
  const passwordHash = await hashPassword(body.password)
  return useDb().transaction(async (transaction) => {
    if (await User.findOne({ where: { email: body.email }, transaction }))
      throw new ConflictError('an account with this e-mail already exists; sign in or reset the password')
    const user = await User.create({ name: body.name, email: body.email, passwordHash }, { transaction })
    const team = await Team.create({ name: body.teamName }, { transaction })
    const membership = await Membership.create({ userId: user.id, teamId: team.id, role: 'admin' }, { transaction })
    await audit(transaction, { teamId: team.id, userId: user.id, action: 'team.create', entity: 'team', entityId: team.id, detail: { name: team.name } })
    await audit(transaction, { teamId: team.id, userId: user.id, action: 'member.add', entity: 'member', entityId: membership.id, detail: { email: user.email, role: 'admin' } })
    return user
  })
}

/** Seconds until the oldest failure inside the window leaves it. */
function retryAfter(oldest: Date, windowSeconds: number): number {
  return Math.max(1, Math.ceil((oldest.getTime() + windowSeconds * 1000 - Date.now()) / 1000))
}

async function refuseWhenLimited(email: string, ip: string) {
  const { perAddress, perIp, windowSeconds } = signInLimits()
  const since = new Date(Date.now() - windowSeconds * 1000)
  for (const [key, value, limit] of [['email', email, perAddress], ['ip', ip, perIp]] as const) {
    const failures = await SignInAttempt.findAll({
      where: { [key]: value, succeeded: false, at: { [Op.gt]: since } },
      order: [['at', 'DESC']],
      limit,
      attributes: ['at'],
    })
    if (failures.length >= limit) throw new RateLimitedError(retryAfter(failures[failures.length - 1]!.at, windowSeconds))
  }
}

// Verified against when the address is unknown, so both failures take the same time.
let decoyHash: Promise<string> | undefined

/**
 * Check the pair; 401 "wrong e-mail or password" for an unknown address and a wrong
 * password alike; 429 once the address or the IP has too many recent failures.
 */
export async function signIn(body: SignInBody, ip: string) {
  await refuseWhenLimited(body.email, ip)
  const user = await User.findOne({ where: { email: body.email } })
  decoyHash ??= hashPassword('decoy password for unknown addresses')
  const ok = await verifyPassword(user?.passwordHash ?? (await decoyHash), body.password)
  const succeeded = ok && !!user
  await SignInAttempt.create({ email: body.email, ip, succeeded })
  // keep the table small: attempts older than a day count for nothing
  await SignInAttempt.destroy({ where: { at: { [Op.lt]: new Date(Date.now() - 86_400_000) } } })
  if (!succeeded) throw new UnauthorizedError('wrong e-mail or password')
  await SignInAttempt.destroy({ where: { email: body.email, succeeded: false } })
  return user!
}

/**
 * Mail a reset link when the address has an account; nothing happens otherwise (the
 * route answers 202 either way). Earlier unused tokens of the user are revoked.
 * Returns the mail to send (undefined when there is no account) so the route can send
 * it without making the answer slower for existing addresses.
 */
export async function requestPasswordReset(email: string): Promise<(() => Promise<void>) | undefined> {
  const user = await User.findOne({ where: { email } })
  if (!user) return undefined
  const { token, hash } = newToken()
  await useDb().transaction(async (transaction) => {
    await PasswordResetToken.destroy({ where: { userId: user.id, usedAt: null }, transaction })
    await PasswordResetToken.create({ userId: user.id, tokenHash: hash, expiresAt: new Date(Date.now() + RESET_TOKEN_LIFETIME_MS) }, { transaction })
  })
  const url = `${appUrl()}/reset-password?token=${encodeURIComponent(token)}`
  return () => sendMail(passwordResetMail(user, url))
}

/** Set a new password with a valid, unused, unexpired token; the token is spent and every session signed in before is revoked. */
export async function completePasswordReset(token: string, password: string): Promise<void> {
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
    await user.update({ passwordHash, sessionsValidAfter: new Date() }, { transaction })
    await row.update({ usedAt: new Date() }, { transaction })
    await PasswordResetToken.destroy({ where: { userId: user.id, usedAt: null }, transaction })
    // a successful reset lifts the address's sign-in lockout
    await SignInAttempt.destroy({ where: { email: user.email, succeeded: false }, transaction })
    return user.id
  })
  forgetSessionRevocation(userId)
}
