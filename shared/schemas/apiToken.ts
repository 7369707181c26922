/** API tokens (account page, Authorization: Bearer): what a user asks for when creating one. */
import { z } from 'zod'
import type { Role } from './roles'
import { cleanText } from './text'

/** read: what a viewer may do; edit: analyse and edit, what an engineer may do (never more than the owner's own role). */
export const API_TOKEN_SCOPES = ['read', 'edit'] as const
export const ApiTokenScope = z.enum(API_TOKEN_SCOPES, { error: 'scope must be read or edit' })
export type ApiTokenScope = z.infer<typeof ApiTokenScope>

/** The role a token of this scope acts with. */
export const SCOPE_ROLE: Record<ApiTokenScope, Role> = { read: 'viewer', edit: 'engineer' }

/** The owner's roles that may create a token of each scope. */
export const SCOPE_NEEDS: Record<ApiTokenScope, readonly Role[]> = { read: ['admin', 'engineer', 'reviewer', 'viewer'], edit: ['admin', 'engineer'] }

export const CreateApiTokenBody = z.object({
  name: cleanText(z.string({ error: 'name is required' }).trim().min(1, 'name is required').max(80, 'name is at most 80 characters'), 'name'),
  teamId: z.number({ error: 'teamId must be a team id' }).int('teamId must be a team id').positive('teamId must be a team id'),
  scope: ApiTokenScope,
  /** days until the token stops working; none: until revoked */
  expiresInDays: z.number({ error: 'expiresInDays must be a number of days' }).int('expiresInDays must be whole days').min(1, 'expiresInDays must be at least 1').max(366, 'expiresInDays must be at most 366').nullish(),
})
export type CreateApiTokenBody = z.infer<typeof CreateApiTokenBody>
