import { ReturnBody } from '../../../../shared/schemas/report'
import { decideRevision, latestNumber } from '../../../domain/reports'
import { presentReport } from '../../../presenters/report'

/** Return a submitted revision with a comment (reviewer, admin; never the author); mails the author. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { reportId } = await validParams(event, idParams('reportId'))
  const { role, user, report } = await requireReport(event, reportId, 'report.decide')
  const { comment, version } = await validBody(event, ReturnBody)
  const rev = await decideRevision(report.id, user.id, 'return', comment, version)
  return presentReport(rev, role, user.id, await latestNumber(rev.linkId))
})
