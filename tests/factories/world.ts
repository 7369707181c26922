/**
 * A team with one signed-in member per role, plus an outsider: the admin of another team
 * (signed in, a member elsewhere, so a 404 here is ownership, not a missing session).
 */
import type { Role } from '../../shared/schemas/roles'
import type { ApiClient } from '../support/api'
import { apiClient } from '../support/api'
import { buildTeam, buildUser, signedIn } from './users'

export const CALLERS = ['signedOut', 'viewer', 'engineer', 'reviewer', 'admin', 'outsider'] as const
export type Caller = (typeof CALLERS)[number]

export interface World {
  teamId: number
  otherTeamId: number
  clients: Record<Caller, ApiClient>
  users: Record<Role | 'outsider', { id: number; email: string; memberId: number }>
}

export async function buildWorld(): Promise<World> {
  const team = await buildTeam()
  const other = await buildTeam()
  const roles: Role[] = ['admin', 'engineer', 'reviewer', 'viewer']
  const users = {} as World['users']
  const clients = { signedOut: apiClient() } as World['clients']
  for (const role of roles) {
    const { user, membership } = await buildUser({ team, role, name: `Test ${role}` })
    users[role] = { id: user.id, email: user.email, memberId: membership!.id }
    clients[role] = await signedIn(user.email)
  }
  const { user, membership } = await buildUser({ team: other, role: 'admin', name: 'Test outsider' })
  users.outsider = { id: user.id, email: user.email, memberId: membership!.id }
  clients.outsider = await signedIn(user.email)
  return { teamId: team.id, otherTeamId: other.id, clients, users }
}
