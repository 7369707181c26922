/**
 * Server-side sessions (issue 13): a sign-in creates a row; the sealed cookie holds the
 * row's token; every request resolves the token with one indexed lookup and checks the
 * absolute lifetime and the idle timeout; sign-out deletes the row, so the cookie is dead
 * at once on every server process sharing the database. A password reset and a removal
 * from a team end the user's sessions.
 */
import { Op } from 'sequelize'
import type { SessionDto } from '../../shared/types/account'
import { User, UserSession } from '../db/models'
import { NotFoundError } from '../utils/errors'
import { sessionLimits } from '../utils/settings'
import { hashToken, newToken } from '../utils/tokens'

/** last_seen_at is written at most this often per session (a request burst costs one lookup each, no write). */
const TOUCH_EVERY_MS = 60_000

export async function createSession(userId: number, userAgent: string, ip: string): Promise<string> {
  const { token, hash } = newToken()
  await UserSession.create({ userId, tokenHash: hash, userAgent: userAgent.slice(0, 300), ip: ip.slice(0, 64), lastSeenAt: new Date() })
  return token
}

export interface ResolvedSession {
  id: number
  user: { id: number; name: string; email: string }
}

/** The live session of a token (its user as stored now), or null when it ended, expired or idled out. */
export async function resolveSession(token: string | undefined): Promise<ResolvedSession | null> {
  if (!token) return null
  const row = await UserSession.findOne({ where: { tokenHash: hashToken(token) }, include: [{ model: User, as: 'user', attributes: ['id', 'name', 'email'] }] })
  if (!row) return null
  const { maxAgeMs, idleMs } = sessionLimits()
  const now = Date.now()
  const user = (row as UserSession & { user?: User }).user
  if (!user || now - row.createdAt.getTime() > maxAgeMs || now - row.lastSeenAt.getTime() > idleMs) {
    await row.destroy()
    return null
  }
  if (now - row.lastSeenAt.getTime() > TOUCH_EVERY_MS) await row.update({ lastSeenAt: new Date(now) })
  return { id: Number(row.id), user: { id: user.id, name: user.name, email: user.email } }
}

export async function endSession(token: string | undefined): Promise<void> {
  if (token) await UserSession.destroy({ where: { tokenHash: hashToken(token) } })
}

/** End every session of a user (sign out everywhere, a password reset, a removal), except one when given. */
export async function endAllSessions(userId: number, except?: number): Promise<number> {
  return UserSession.destroy({ where: { userId, ...(except !== undefined ? { id: { [Op.ne]: except } } : {}) } })
}

/** End one of the user's own sessions; another user's id reads as missing (404). */
export async function endSessionById(userId: number, id: number): Promise<void> {
  const ended = await UserSession.destroy({ where: { userId, id } })
  if (ended === 0) throw new NotFoundError('session')
}

export async function listSessions(userId: number, currentId: number): Promise<SessionDto[]> {
  const { maxAgeMs, idleMs } = sessionLimits()
  const rows = await UserSession.findAll({ where: { userId }, order: [['lastSeenAt', 'DESC']] })
  return rows.map((r) => ({
    id: Number(r.id),
    userAgent: r.userAgent,
    ip: r.ip,
    createdAt: r.createdAt.toISOString(),
    lastSeenAt: r.lastSeenAt.toISOString(),
    expiresAt: new Date(Math.min(r.createdAt.getTime() + maxAgeMs, r.lastSeenAt.getTime() + idleMs)).toISOString(),
    current: Number(r.id) === currentId,
  }))
}
