import { linkRevisions } from '../../../../domain/reports'
import { presentReportSummary } from '../../../../presenters/report'

/** One page of the link's revisions, newest first (any member). ?limit=50&offset=0 */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { linkId } = await validParams(event, idParams('linkId'))
  await requireLink(event, linkId, 'report.read')
  const page = await validPage(event, ...PAGE_SIZES.revisions)
  const { rows, count } = await linkRevisions(linkId, page)
  return sendPage(event, rows.map(presentReportSummary), count, page)
})
