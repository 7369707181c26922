import { deleteCapture } from '../../domain/captures'

/** Remove a capture and its stored object (engineer, admin). */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { captureId } = await validParams(event, idParams('captureId'))
  const { capture, user } = await requireCapture(event, captureId, 'link.update')
  await deleteCapture(capture, user.id)
  setResponseStatus(event, 204)
  return null
})
