import { listDatasheets } from '../../../../domain/captures'
import { presentDatasheet } from '../../../../presenters/captures'

/** The part's datasheets (every role that may read the part). */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { partId } = await validParams(event, idParams('partId'))
  const { part } = await requirePart(event, partId, 'part.read')
  return (await listDatasheets(part.id)).map(presentDatasheet)
})
