import { presentCaptureDetail } from '../../presenters/captures'

/** One capture: status, progress, error and the measured result (every role). */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { captureId } = await validParams(event, idParams('captureId'))
  const { capture } = await requireCapture(event, captureId, 'link.read')
  return presentCaptureDetail(capture)
})
