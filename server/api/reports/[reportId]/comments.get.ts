import { listComments } from '../../../domain/reports'
import { presentComment } from '../../../presenters/report'

/** The revision's comments, oldest first (any member). */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { reportId } = await validParams(event, idParams('reportId'))
  const { report } = await requireReport(event, reportId, 'report.read')
  return (await listComments(report.id)).map(presentComment)
})
