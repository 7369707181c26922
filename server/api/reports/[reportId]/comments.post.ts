import { CommentBody } from '../../../../shared/schemas/report'
import { addComment } from '../../../domain/reports'
import { presentComment } from '../../../presenters/report'

/** Comment on the report, one bit, one check or one stage (engineer, reviewer, admin). 201. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { reportId } = await validParams(event, idParams('reportId'))
  const { user, report } = await requireReport(event, reportId, 'report.comment')
  const { body, target } = await validBody(event, CommentBody)
  const comment = await addComment(report, user.id, target, body)
  setResponseStatus(event, 201)
  return presentComment(comment)
})
