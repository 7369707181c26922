import { SubmitBody } from '../../../../shared/schemas/report'
import { latestNumber, submitRevision } from '../../../domain/reports'
import { presentReport } from '../../../presenters/report'

/** Submit a draft to a named reviewer of the team (engineer, admin); mails the reviewer. 409 when not a draft. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { reportId } = await validParams(event, idParams('reportId'))
  const { role, user, report } = await requireReport(event, reportId, 'report.submit')
  const { reviewerId, version } = await validBody(event, SubmitBody)
  const rev = await submitRevision(report.id, user.id, reviewerId, version)
  return presentReport(rev, role, user.id, await latestNumber(rev.linkId))
})
