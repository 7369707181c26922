/**
 * API tokens for scripts and CI: a user creates named tokens on their account page, each for
 * one team they belong to and a scope no higher than their own role there (read: what a viewer
 * may do; edit: analyse and edit, what an engineer may do), with an optional expiry. The token
 * is shown once; only its SHA-256 is stored. A request with `Authorization: Bearer <token>`
 * acts as the owner narrowed to the token's team and scope (server/utils/access.ts), and
 * every use is written to the team's audit log.
 */
import { Op } from 'sequelize'
import { SCOPE_NEEDS, SCOPE_ROLE, type ApiTokenScope, type CreateApiTokenBody } from '../../shared/schemas/apiToken'
import type { Role } from '../../shared/schemas/roles'
import type { ApiTokenDto, CreatedApiTokenDto } from '../../shared/types/account'
import { ApiToken, Membership, Team, User } from '../db/models'
import { useDb } from '../utils/db'
import { ForbiddenError, NotFoundError } from '../utils/errors'
import { hashToken, newToken } from '../utils/tokens'
import { audit } from './audit'

/** Tokens carry this prefix, so a leaked one is recognisable in a log or a secret scanner. */
export const TOKEN_PREFIX = 'bsk_'

const DAY_MS = 86_400_000

function present(t: ApiToken): ApiTokenDto {
  return {
    id: t.id,
    name: t.name,
    teamId: t.teamId,
    teamName: t.team?.name ?? '',
    scope: t.scope,
    createdAt: t.createdAt.toISOString(),
    expiresAt: t.expiresAt?.toISOString() ?? null,
    lastUsedAt: t.lastUsedAt?.toISOString() ?? null,
  }
}

export async function createApiToken(userId: number, body: CreateApiTokenBody): Promise<CreatedApiTokenDto> {
  const membership = await Membership.findOne({ where: { userId, teamId: body.teamId }, include: [{ model: Team, as: 'team' }] })
  if (!membership) throw new NotFoundError('team')
  if (!SCOPE_NEEDS[body.scope].includes(membership.role))
    throw new ForbiddenError(`a ${membership.role} may create read tokens only: an edit token acts as an engineer`)
  const { token } = newToken()
  const full = `${TOKEN_PREFIX}${token}`
  const row = await useDb().transaction(async (transaction) => {
    const created = await ApiToken.create(
      {
        userId,
        teamId: body.teamId,
        name: body.name,
        scope: body.scope,
        tokenHash: hashToken(full),
        expiresAt: body.expiresInDays ? new Date(Date.now() + body.expiresInDays * DAY_MS) : null,
      },
      { transaction },
    )
    await audit(transaction, { teamId: body.teamId, userId, action: 'token.create', entity: 'token', entityId: created.id, detail: { name: body.name, scope: body.scope, expiresAt: created.expiresAt?.toISOString() ?? null } })
    return created
  })
  row.team = membership.team
  return { ...present(row), token: full }
}

export async function listApiTokens(userId: number): Promise<ApiTokenDto[]> {
  const rows = await ApiToken.findAll({ where: { userId }, include: [{ model: Team, as: 'team', attributes: ['id', 'name'] }], order: [['id', 'DESC']] })
  return rows.map(present)
}

/** Revoke one of the user's own tokens; another user's id reads as missing (404). */
export async function revokeApiToken(userId: number, tokenId: number): Promise<void> {
  await useDb().transaction(async (transaction) => {
    const row = await ApiToken.findOne({ where: { id: tokenId, userId }, transaction, lock: transaction.LOCK.UPDATE })
    if (!row) throw new NotFoundError('token')
    await row.destroy({ transaction })
    await audit(transaction, { teamId: row.teamId, userId, action: 'token.revoke', entity: 'token', entityId: row.id, detail: { name: row.name } })
  })
}

export interface ResolvedToken {
  id: number
  teamId: number
  scope: ApiTokenScope
  /** the role the token acts with: its scope's, never more than the owner's role in the team now */
  role: Role
  user: { id: number; name: string; email: string }
}

/** The owner's role now narrowed to the token's scope: an edit token of a member who became a viewer reads only. */
export function actingRole(scope: ApiTokenScope, memberRole: Role): Role {
  return SCOPE_NEEDS[scope].includes(memberRole) ? SCOPE_ROLE[scope] : 'viewer'
}

/** The live token behind a bearer string, or null (unknown, revoked, expired, or its owner left the team). */
export async function resolveApiToken(bearer: string): Promise<ResolvedToken | null> {
  if (!bearer.startsWith(TOKEN_PREFIX) || bearer.length > 200) return null
  const row = await ApiToken.findOne({
    where: { tokenHash: hashToken(bearer), [Op.or]: [{ expiresAt: null }, { expiresAt: { [Op.gt]: new Date() } }] },
    include: [{ model: User, as: 'user', attributes: ['id', 'name', 'email'] }],
  })
  if (!row?.user) return null
  const membership = await Membership.findOne({ where: { userId: row.userId, teamId: row.teamId }, attributes: ['role'] })
  if (!membership) return null
  return { id: row.id, teamId: row.teamId, scope: row.scope, role: actingRole(row.scope, membership.role), user: { id: row.user.id, name: row.user.name, email: row.user.email } }
}

/** One use of a token: its last use, and a row in the team's audit log with the request and its answer. */
export async function recordTokenUse(t: ResolvedToken, use: { method: string; path: string; status: number; ip: string }): Promise<void> {
  await useDb().transaction(async (transaction) => {
    await ApiToken.update({ lastUsedAt: new Date() }, { where: { id: t.id }, transaction })
    await audit(transaction, { teamId: t.teamId, userId: t.user.id, action: 'token.use', entity: 'token', entityId: t.id, detail: { ...use, path: use.path.slice(0, 300) } })
  })
}
