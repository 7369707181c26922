import { recompute } from '../../../domain/reports'
import { presentRecompute } from '../../../presenters/report'

/** Recompute the revision from its stored input with today's engine: same answer, or what changed. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { reportId } = await validParams(event, idParams('reportId'))
  const { report } = await requireReport(event, reportId, 'report.read')
  return presentRecompute(report, recompute(report))
})
