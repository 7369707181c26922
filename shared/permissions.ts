/**
 * THE permission table: which team role may do what. The server enforces it in every
 * route (server/utils/access.ts); the UI reads the same table only to hide controls it
 * would refuse anyway. Signed-out callers are refused before this table is consulted.
 *
 * Compute routes (POST /api/analyze...) need a session only: they read no team data.
 * Built-in parts are readable by every signed-in user and writable by nobody.
 */
import type { Role } from './schemas/roles'

export const PERMISSIONS = {
  /** the team's name, its members and their roles */
  'team.read': ['admin', 'engineer', 'reviewer', 'viewer'],
  /** change a member's role, remove a member */
  'member.manage': ['admin'],
  /** list, send and revoke invitations */
  'invitation.manage': ['admin'],
  /** read the team's audit log */
  'audit.read': ['admin'],
  /** read the team's engineering policy (required margins, thin thresholds) */
  'policy.read': ['admin', 'engineer', 'reviewer', 'viewer'],
  /** change it */
  'policy.update': ['admin'],

  'project.read': ['admin', 'engineer', 'reviewer', 'viewer'],
  'project.create': ['admin', 'engineer'],
  'project.update': ['admin', 'engineer'],
  'project.delete': ['admin'],

  'link.read': ['admin', 'engineer', 'reviewer', 'viewer'],
  'link.create': ['admin', 'engineer'],
  'link.update': ['admin', 'engineer'],
  'link.delete': ['admin', 'engineer'],

  'part.read': ['admin', 'engineer', 'reviewer', 'viewer'],
  'part.create': ['admin', 'engineer'],
  'part.update': ['admin', 'engineer'],
  'part.delete': ['admin'],

  /** margin reports (issue 6): read a revision, its PDF, CSV and JSON; the review queue */
  'report.read': ['admin', 'engineer', 'reviewer', 'viewer'],
  /** freeze a link's analysis into a new revision */
  'report.create': ['admin', 'engineer'],
  /** submit a draft revision to a named reviewer */
  'report.submit': ['admin', 'engineer'],
  'report.comment': ['admin', 'engineer', 'reviewer'],
  /** sign off or return a submitted revision (never one's own) */
  'report.decide': ['admin', 'reviewer'],
} as const satisfies Record<string, readonly Role[]>

export type Action = keyof typeof PERMISSIONS

/** True when `role` may perform `action`. */
export function can(role: Role, action: Action): boolean {
  return (PERMISSIONS[action] as readonly Role[]).includes(role)
}
