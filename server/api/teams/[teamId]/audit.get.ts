import { z } from 'zod'
import { listAudit } from '../../../domain/audit'
import { presentAuditEntry } from '../../../presenters/account'

const AuditQuery = z.object({
  limit: z.coerce.number().int('limit must be an integer').min(1, 'limit must be at least 1').max(500, 'limit must be at most 500').default(100),
  /** page backwards: entries with an id below this one */
  before: IdParam.optional(),
})

/** The team's audit log, newest first (admin). ?limit=100&before=<id> */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { teamId } = await validParams(event, idParams('teamId'))
  await requireRole(event, teamId, 'audit.read')
  const query = await validQuery(event, AuditQuery)
  return (await listAudit(teamId, query)).map(presentAuditEntry)
})
