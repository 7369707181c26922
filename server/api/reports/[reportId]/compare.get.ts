import { z } from 'zod'
import { compareRevisions, previousRevision } from '../../../domain/report-compare'
import { ConflictError, InvalidError } from '../../../utils/errors'

const CompareQuery = z.object({ with: IdParam.optional() })

/**
 * This revision against another revision of the same link (?with=<reportId>; by default the one
 * before it): the changed inputs by stage and settings, the verdicts, every check's margin change,
 * biggest first (any member). 409 for a first revision without `with`.
 */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { reportId } = await validParams(event, idParams('reportId'))
  const { report } = await requireReport(event, reportId, 'report.read')
  const query = await validQuery(event, CompareQuery)
  let other
  if (query.with !== undefined) {
    other = (await requireReport(event, query.with, 'report.read')).report
    if (other.linkId !== report.linkId) throw InvalidError.of(['with'], 'must be a revision of the same link')
  } else {
    other = await previousRevision(report)
    if (!other) throw new ConflictError('this is the link\'s first revision: there is no earlier one to compare with')
  }
  return compareRevisions(other, report)
})
