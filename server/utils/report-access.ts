/**
 * The margin report guard, in the manner of server/utils/access.ts: the revision joined to
 * the caller's membership of its team, so a foreign id and a missing id are the same 404;
 * then the caller's role against the permission table.
 */
import type { H3Event } from 'h3'
import { can, type Action } from '../../shared/permissions'
import { Membership, ReportRevision } from '../db/models'
import { ForbiddenError, NotFoundError } from './errors'

/** 401 signed out, 404 not the caller's team, 403 the role may not do `action`. */
export async function requireReport(event: H3Event, reportId: number, action: Action) {
  const user = await requireUser(event)
  const report = await ReportRevision.findOne({
    where: { id: reportId },
    include: [{ model: Membership, as: 'access', where: { userId: user.id }, required: true, attributes: ['role'] }],
  })
  if (!report?.access) throw new NotFoundError('report')
  const role = scopedRole(event, report.teamId, report.access.role, 'report')
  if (!can(role, action)) throw new ForbiddenError(`a ${role} may not do this (${action})`)
  return { user, role, teamId: report.teamId, report }
}
