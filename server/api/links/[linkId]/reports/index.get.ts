import { linkRevisions } from '../../../../domain/reports'
import { presentReportSummary } from '../../../../presenters/report'

/** The link's revisions, newest first (any member). */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { linkId } = await validParams(event, idParams('linkId'))
  await requireLink(event, linkId, 'report.read')
  return (await linkRevisions(linkId)).map(presentReportSummary)
})
