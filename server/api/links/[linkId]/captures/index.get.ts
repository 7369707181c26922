import { listCaptures } from '../../../../domain/captures'
import { presentCapture } from '../../../../presenters/captures'

/** One page of the link's captures, newest first: status, progress and the measurement's summary (every role). ?limit=20&offset=0 */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { linkId } = await validParams(event, idParams('linkId'))
  const { link } = await requireLink(event, linkId, 'link.read')
  const page = await validPage(event, ...PAGE_SIZES.captures)
  const { rows, count } = await listCaptures(link.id, page)
  return sendPage(event, rows.map(presentCapture), count, page)
})
