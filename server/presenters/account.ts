/** Account and team DTOs (shared/types/account.ts) from models. */
import type { AuditEntryDto, AuthDto, InvitationDto, InvitationPreviewDto, MemberDto, TeamDto, UserDto } from '../../shared/types/account'
import type { AuditEntry, Invitation, Membership, Team, User } from '../db/models'

export function presentUser(u: Pick<User, 'id' | 'name' | 'email'>): UserDto {
  return { id: u.id, name: u.name, email: u.email }
}

export function presentTeams(memberships: (Membership & { team?: Team })[]): TeamDto[] {
  return memberships
    .filter((m) => m.team)
    .map((m) => ({ id: m.team!.id, name: m.team!.name, role: m.role }))
    .sort((a, b) => a.name.localeCompare(b.name) || a.id - b.id)
}

export function presentAuth(user: Pick<User, 'id' | 'name' | 'email'>, memberships: (Membership & { team?: Team })[]): AuthDto {
  return { user: presentUser(user), teams: presentTeams(memberships) }
}

export function presentMember(m: Membership & { user?: User }): MemberDto {
  return {
    id: m.id,
    userId: m.userId,
    name: m.user?.name ?? '',
    email: m.user?.email ?? '',
    role: m.role,
    joinedAt: m.createdAt.toISOString(),
  }
}

export function presentInvitation(i: Invitation): InvitationDto {
  return {
    id: i.id,
    teamId: i.teamId,
    email: i.email,
    role: i.role,
    invitedBy: i.inviter ? presentUser(i.inviter) : null,
    expiresAt: i.expiresAt.toISOString(),
    createdAt: i.createdAt.toISOString(),
  }
}

export function presentInvitationPreview(i: Invitation, accountExists: boolean): InvitationPreviewDto {
  return {
    teamName: i.team?.name ?? '',
    email: i.email,
    role: i.role,
    invitedBy: i.inviter?.name ?? null,
    accountExists,
    expiresAt: i.expiresAt.toISOString(),
  }
}

export function presentAuditEntry(e: AuditEntry): AuditEntryDto {
  return {
    id: Number(e.id),
    teamId: e.teamId,
    user: e.user ? presentUser(e.user) : null,
    action: e.action,
    entity: e.entity,
    entityId: e.entityId,
    detail: e.detail,
    at: e.at.toISOString(),
  }
}
