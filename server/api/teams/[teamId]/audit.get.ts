import { z } from 'zod'
import { listAudit } from '../../../domain/audit'
import { presentAuditEntry } from '../../../presenters/account'

const AuditQuery = z.object({
  limit: z.coerce.number().int('limit must be an integer').min(1, 'limit must be at least 1').max(500, 'limit must be at most 500').default(100),
  /** page backwards: entries with an id below this one */
  before: IdParam.optional(),
  /** only the entries about one link: the link, its captures and its report revisions */
  linkId: IdParam.optional(),
  /** one event ('report.sign-off') or a family ('report') */
  action: z.string().regex(/^[a-z-]{1,40}(\.[a-z-]{1,40})?$/, 'action: an event such as report.sign-off, or a family such as report').optional(),
})

/** The team's audit log, newest first (admin). ?limit=100&before=<id>&linkId=<id>&action=report */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { teamId } = await validParams(event, idParams('teamId'))
  await requireRole(event, teamId, 'audit.read')
  const query = await validQuery(event, AuditQuery)
  return (await listAudit(teamId, query)).map(presentAuditEntry)
})
