import { latestNumber, loadRevision } from '../../domain/reports'
import { presentReport } from '../../presenters/report'

/** One revision: frozen input and result, review steps, comments, what the caller may do. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { reportId } = await validParams(event, idParams('reportId'))
  const { role, user, report } = await requireReport(event, reportId, 'report.read')
  return presentReport(await loadRevision(report.id), role, user.id, await latestNumber(report.linkId))
})
