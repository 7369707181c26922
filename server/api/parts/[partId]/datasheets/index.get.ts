import { listDatasheets } from '../../../../domain/captures'
import { presentDatasheet } from '../../../../presenters/captures'

/** One page of the part's datasheets, newest first (every role that may read the part). */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { partId } = await validParams(event, idParams('partId'))
  const { part } = await requirePart(event, partId, 'part.read')
  const page = await validPage(event, ...PAGE_SIZES.datasheets)
  const { rows, count } = await listDatasheets(part.id, page)
  return sendPage(event, rows.map(presentDatasheet), count, page)
})
