import { reviewerOptions } from '../../../domain/reports'

/** Reviewers and admins of the team other than the author: whom the draft can go to (engineer, admin). */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { reportId } = await validParams(event, idParams('reportId'))
  const { report } = await requireReport(event, reportId, 'report.submit')
  return reviewerOptions(report)
})
