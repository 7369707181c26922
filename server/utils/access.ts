/**
 * Guards that routes call first: the session, then the caller's role in the team that
 * owns the row, checked against the one permission table (shared/permissions.ts).
 * Ownership is in the query: the row is joined to the caller's membership, so a foreign
 * id and a missing id are the same 404.
 */
import type { H3Event } from 'h3'
import { LRUCache } from 'lru-cache'
import type { User as SessionUser } from '#auth-utils'
import { can, type Action } from '../../shared/permissions'
import type { Role } from '../../shared/schemas/roles'
import { Link, Membership, Part, Project, User } from '../db/models'
import { actingRole, type ResolvedToken } from '../domain/api-tokens'
import { createSession, resolveSession } from '../domain/sessions'
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
 * The signed-in user or null (public routes that behave differently when signed in). The
 * cookie's session token is resolved against user_sessions on every request (one indexed
 * lookup): a session that was signed out, expired or idled out is cleared here.
 */
export async function getSessionUser(event: H3Event): Promise<SessionUser | null> {
  if (event.context.sessionUser !== undefined) return event.context.sessionUser as SessionUser | null
  const cookie = getRequestHeader(event, 'cookie')
  const page = renderingPage(event)
  if (page && page.sessionUser !== undefined && page.sessionCookie === cookie) {
    event.context.sessionId = page.sessionId
    event.context.sessionUser = page.sessionUser
    return page.sessionUser as SessionUser | null
  }
  const session = await openedCookie(event, cookie)
  const resolved = session.user ? await resolveSession(session.sid) : null
  if (!resolved && session.user) await clearUserSession(event)
  event.context.sessionId = resolved?.id
  event.context.sessionUser = resolved?.user ?? null
  event.context.sessionCookie = cookie
  return resolved?.user ?? null
}

/**
 * Opened session cookies, by their sealed text. Unsealing costs two key derivations (about
 * 0.6 ms of CPU, more than the engine's analysis of a link), and a browser sends the same
 * cookie with every request. What a cookie holds never changes (any change is a new cookie),
 * and whether its session still stands is read from user_sessions on every request anyway,
 * so a sign-out or a revocation holds at once; entries are dropped after a minute.
 */
const openedCookies = new LRUCache<string, { user?: SessionUser; sid?: string }>({ max: 5000, ttl: 60_000 })

async function openedCookie(event: H3Event, cookieHeader: string | undefined): Promise<{ user?: SessionUser; sid?: string }> {
  const name = (useRuntimeConfig().session as { name?: string } | undefined)?.name ?? 'nuxt-session'
  const sealed = cookieHeader ? parseCookies(event)[name] : undefined
  const cached = sealed ? openedCookies.get(sealed) : undefined
  if (cached) return cached
  const session = await getUserSession(event)
  const opened = { user: session.user, sid: session.secure?.sid }
  if (sealed && opened.user) openedCookies.set(sealed, opened)
  return opened
}

/**
 * The page request a server render is answering, when this request is one it makes in-process
 * (the page's useFetch calls during SSR: Nitro hands the page's context to them, a request from
 * the network never has one). When they carry the page's own cookie, at the same moment, the
 * session resolved for the page holds for them: five data calls of a page cost no unsealing and
 * no session read of their own.
 */
function renderingPage(event: H3Event): Record<string, unknown> | undefined {
  return (event.node.req as { __unenv__?: Record<string, unknown> }).__unenv__
}

/** The id of this request's session row (after requireUser). */
export function currentSessionId(event: H3Event): number | undefined {
  return event.context.sessionId as number | undefined
}

/** Start a server-side session for the user and seal its token into the cookie. */
export async function signInSession(event: H3Event, user: { id: number; name: string; email: string }) {
  const token = await createSession(user.id, getHeader(event, 'user-agent') ?? '', clientIp(event))
  await replaceUserSession(event, { user: { id: user.id, name: user.name, email: user.email }, loggedInAt: Date.now(), secure: { sid: token } })
  event.context.sessionUser = undefined
}

/**
 * The role the caller acts with in a team. A browser session acts with its membership's role;
 * an API token only in its own team (another team's rows read as missing, as for a
 * non-member) and with its scope's role, never more than the owner's role now.
 */
export function scopedRole(event: H3Event, teamId: number, memberRole: Role, what: string): Role {
  const token = event.context.apiToken as ResolvedToken | undefined
  if (!token) return memberRole
  if (token.teamId !== teamId) throw new NotFoundError(what)
  return actingRole(token.scope, memberRole)
}

/** The API token of this request, when it came with one. */
export function requestToken(event: H3Event): ResolvedToken | undefined {
  return event.context.apiToken as ResolvedToken | undefined
}

function allow(role: Role, action: Action) {
  if (!can(role, action)) throw new ForbiddenError(`a ${role} may not do this (${action})`)
}

/** 401 signed out, 404 not a member of the team, 403 the role may not do `action`. */
export async function requireRole(event: H3Event, teamId: number, action: Action): Promise<Access> {
  const user = await requireUser(event)
  const membership = await Membership.findOne({ where: { teamId, userId: user.id } })
  if (!membership) throw new NotFoundError('team')
  const role = scopedRole(event, teamId, membership.role, 'team')
  allow(role, action)
  return { user, role, teamId }
}

const accessJoin = (userId: number) => ({ model: Membership, as: 'access', where: { userId }, required: true, attributes: ['role'] })

/** The project if the caller's team owns it, with the caller's role. */
export async function requireProject(event: H3Event, projectId: number, action: Action) {
  const user = await requireUser(event)
  const project = await Project.findOne({ where: { id: projectId }, include: [accessJoin(user.id)] })
  if (!project?.access) throw new NotFoundError('project')
  const role = scopedRole(event, project.teamId, project.access.role, 'project')
  allow(role, action)
  return { user, role, teamId: project.teamId, project }
}

/** The link if the caller's team owns it, with the caller's role and the last editor. */
export async function requireLink(event: H3Event, linkId: number, action: Action) {
  const user = await requireUser(event)
  const link = await Link.findOne({
    where: { id: linkId },
    include: [accessJoin(user.id), { model: User, as: 'updater', attributes: ['id', 'name'] }],
  })
  if (!link?.access) throw new NotFoundError('link')
  const role = scopedRole(event, link.teamId, link.access.role, 'link')
  allow(role, action)
  return { user, role, teamId: link.teamId, link }
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
  const role = scopedRole(event, part.teamId, part.access.role, 'part')
  allow(role, action)
  return { user, role: role as Role | null, teamId: part.teamId as number | null, part }
}

/** The client's IP for rate limiting (X-Forwarded-For only when trusted). */
export function clientIp(event: H3Event): string {
  if (trustProxy()) {
    // the entry the trusted proxy appended: the last one (entries before it are the client's word)
    const last = getRequestHeader(event, 'x-forwarded-for')?.split(',').map((s) => s.trim()).filter(Boolean).pop()
    if (last) return last.slice(0, 64)
  }
  return getRequestIP(event) || 'unknown'
}
