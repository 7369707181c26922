import { listCaptures } from '../../../../domain/captures'
import { presentCapture } from '../../../../presenters/captures'

/** The link's captures with status, progress and results (every role). */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { linkId } = await validParams(event, idParams('linkId'))
  const { link } = await requireLink(event, linkId, 'link.read')
  return (await listCaptures(link.id)).map(presentCapture)
})
