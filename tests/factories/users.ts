/** Users, teams and memberships, inserted directly, then signed in through the API. */
import { randomUUID } from 'node:crypto'
import { expect } from 'vitest'
import type { Role } from '../../shared/schemas/roles'
import { Membership, Team, User } from '../../server/db/models'
import { hashDemoPassword } from '../../server/db/seeders/demo'
import { apiClient, type ApiClient } from '../support/api'
import { useTestDb } from './db'

/** Every factory user's password. */
export const FACTORY_PASSWORD = 'factory-password-42'
let hash: Promise<string> | undefined

/** A unique address on the reserved example domain. */
export function uniqueEmail(prefix = 'user'): string {
  return `${prefix}-${randomUUID().slice(0, 8)}@bitslack.test`
}

export async function buildTeam(name = `Team ${randomUUID().slice(0, 6)}`) {
  useTestDb()
  return Team.create({ name })
}

export async function buildUser(opts: { name?: string; email?: string; team?: Team; role?: Role } = {}) {
  useTestDb()
  hash ??= hashDemoPassword(FACTORY_PASSWORD)
  const user = await User.create({
    name: opts.name ?? 'Test Engineer',
    email: opts.email ?? uniqueEmail(opts.role ?? 'user'),
    passwordHash: await hash,
  })
  const membership = opts.team ? await Membership.create({ userId: user.id, teamId: opts.team.id, role: opts.role ?? 'viewer' }) : null
  return { user, membership }
}

/** An API client signed in as the user (asserts that sign-in works). */
export async function signedIn(email: string, password = FACTORY_PASSWORD): Promise<ApiClient> {
  const client = apiClient()
  const res = await client.post('/api/auth/sign-in', { email, password })
  expect(res.status, `sign-in of ${email}`).toBe(200)
  return client
}
