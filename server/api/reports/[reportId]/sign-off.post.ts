import { SignOffBody } from '../../../../shared/schemas/report'
import { decideRevision, latestNumber } from '../../../domain/reports'
import { presentReport } from '../../../presenters/report'

/** Sign off a submitted revision (reviewer, admin; never the author: 403); mails the author. 409 when not submitted. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { reportId } = await validParams(event, idParams('reportId'))
  const { role, user, report } = await requireReport(event, reportId, 'report.decide')
  const { comment, version } = await validBody(event, SignOffBody)
  const rev = await decideRevision(report.id, user.id, 'sign-off', comment, version)
  return presentReport(rev, role, user.id, await latestNumber(rev.linkId))
})
