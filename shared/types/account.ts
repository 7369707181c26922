/** Response DTOs of the account and team routes. Dates are ISO 8601 strings. */
import type { Role } from '../schemas/roles'

export interface UserDto {
  id: number
  name: string
  email: string
}

/** A team as its member sees it, with the caller's role in it. */
export interface TeamDto {
  id: number
  name: string
  role: Role
}

/** Answer of sign-up, sign-in, invitation accept and GET /api/auth/me. */
export interface AuthDto {
  user: UserDto
  teams: TeamDto[]
}

export interface MemberDto {
  /** membership id: the `memberId` of /api/teams/[teamId]/members/[memberId] */
  id: number
  userId: number
  name: string
  email: string
  role: Role
  joinedAt: string
}

export interface InvitationDto {
  id: number
  teamId: number
  email: string
  role: Role
  invitedBy: UserDto | null
  expiresAt: string
  createdAt: string
}

/** Public view of an invitation, by its token. */
export interface InvitationPreviewDto {
  teamName: string
  email: string
  role: Role
  /** name of the admin who sent it */
  invitedBy: string | null
  /** true when an account with this e-mail exists (accepting then needs that account) */
  accountExists: boolean
  expiresAt: string
}

export interface AuditEntryDto {
  id: number
  teamId: number
  user: UserDto | null
  /** e.g. 'link.update', 'member.role', 'invitation.create' */
  action: string
  entity: string
  entityId: number | null
  detail: Record<string, unknown>
  at: string
}

export interface ConfigDto {
  /** the local fake's web inbox in demo and development, null in production */
  mailInboxUrl: string | null
}

/** One signed-in browser of the user (account page). */
export interface SessionDto {
  id: number
  userAgent: string
  ip: string
  createdAt: string
  lastSeenAt: string
  /** when it ends unless used again (the earlier of the absolute lifetime and the idle timeout) */
  expiresAt: string
  /** the session of this request */
  current: boolean
}

/** One of the user's API tokens as the account page lists it (never the token itself). */
export interface ApiTokenDto {
  id: number
  name: string
  teamId: number
  teamName: string
  scope: 'read' | 'edit'
  createdAt: string
  expiresAt: string | null
  lastUsedAt: string | null
}

/** Answer of creating a token: the token itself, shown this once. */
export interface CreatedApiTokenDto extends ApiTokenDto {
  token: string
}
