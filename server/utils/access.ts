/**
 * Guards that routes call first: the session, then the caller's role in the team that
 * owns the row, checked against the one permission table (shared/permissions.ts).
 * Ownership is in the query: the row is joined to the caller's membership, so a foreign
 * id and a missing id are the same 404.
 */
import type { H3Event } from 'h3'
import type { User as SessionUser } from '#auth-utils'
import { can, type Action } from '../../shared/permissions'
import type { Role } from '../../shared/schemas/roles'
import { Link, Membership, Part, Project, User } from '../db/models'
import { ForbiddenError, NotFoundError, UnauthorizedError } from './errors'

export interface Access {
  user: SessionUser
  role: Role
  teamId: number
}

/** The signed-in user, or 401. */
export async function requireUser(event: H3Event): Promise<SessionUser> {
  const user = await getSessionUser(event)
  if (!user) throw new UnauthorizedError()
  return user
}

/**
 * When each user's sessions became invalid (password reset), cached for a few seconds per
 * process so that a burst of requests costs one query; another instance sees a reset
 * within that time.
 */
const REVOCATION_TTL_MS = 5000
const revocations = new Map<number, { validAfter: number; readAt: number }>()

async function sessionsValidAfter(userId: number): Promise<number> {
  const cached = revocations.get(userId)
  if (cached && Date.now() - cached.readAt < REVOCATION_TTL_MS) return cached.validAfter
  const row = await User.findByPk(userId, { attributes: ['id', 'sessionsValidAfter'] })
  // a deleted account has no valid session at all
  const validAfter = row ? (row.sessionsValidAfter?.getTime() ?? 0) : Number.POSITIVE_INFINITY
  if (revocations.size > 10_000) revocations.clear()
  revocations.set(userId, { validAfter, readAt: Date.now() })
  return validAfter
}

/** Forget the cached revocation instant of a user (this process just changed it). */
export function forgetSessionRevocation(userId: number) {
  revocations.delete(userId)
}

/** The signed-in user or null (public routes that behave differently when signed in); a revoked session is cleared. */
export async function getSessionUser(event: H3Event): Promise<SessionUser | null> {
  const session = await getUserSession(event)
  if (!session.user) return null
  const loggedInAt = typeof session.loggedInAt === 'number' ? session.loggedInAt : 0
  if (loggedInAt < (await sessionsValidAfter(session.user.id))) {
    await clearUserSession(event)
    return null
  }
  return session.user
}

function allow(role: Role, action: Action) {
  if (!can(role, action)) throw new ForbiddenError(`a ${role} may not do this (${action})`)
}

/** 401 signed out, 404 not a member of the team, 403 the role may not do `action`. */
export async function requireRole(event: H3Event, teamId: number, action: Action): Promise<Access> {
  const user = await requireUser(event)
  const membership = await Membership.findOne({ where: { teamId, userId: user.id } })
  if (!membership) throw new NotFoundError('team')
  allow(membership.role, action)
  return { user, role: membership.role, teamId }
}

const accessJoin = (userId: number) => ({ model: Membership, as: 'access', where: { userId }, required: true, attributes: ['role'] })

/** The project if the caller's team owns it, with the caller's role. */
export async function requireProject(event: H3Event, projectId: number, action: Action) {
  const user = await requireUser(event)
  const project = await Project.findOne({ where: { id: projectId }, include: [accessJoin(user.id)] })
  if (!project?.access) throw new NotFoundError('project')
  allow(project.access.role, action)
  return { user, role: project.access.role, teamId: project.teamId, project }
}

/** The link if the caller's team owns it, with the caller's role and the last editor. */
export async function requireLink(event: H3Event, linkId: number, action: Action) {
  const user = await requireUser(event)
  const link = await Link.findOne({
    where: { id: linkId },
    include: [accessJoin(user.id), { model: User, as: 'updater', attributes: ['id', 'name'] }],
  })
  if (!link?.access) throw new NotFoundError('link')
  allow(link.access.role, action)
  return { user, role: link.access.role, teamId: link.teamId, link }
}

/**
 * A team part of the caller's team, or a built-in part (readable by every signed-in
 * user, writable by nobody: 403).
 */
export async function requirePart(event: H3Event, partId: number, action: Action) {
  const user = await requireUser(event)
  const part = await Part.findOne({
    where: { id: partId },
    include: [{ model: Membership, as: 'access', where: { userId: user.id }, required: false, attributes: ['role'] }],
  })
  if (!part) throw new NotFoundError('part')
  if (part.teamId === null) {
    if (action !== 'part.read') throw new ForbiddenError('built-in parts are read-only')
    return { user, role: null, teamId: null, part }
  }
  if (!part.access) throw new NotFoundError('part')
  allow(part.access.role, action)
  return { user, role: part.access.role as Role | null, teamId: part.teamId as number | null, part }
}

/** The client's IP for rate limiting (X-Forwarded-For only when trusted). */
export function clientIp(event: H3Event): string {
  return getRequestIP(event, { xForwardedFor: trustProxy() }) || 'unknown'
}
