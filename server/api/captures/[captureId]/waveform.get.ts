import { WaveformQuery } from '../../../../shared/schemas/capture'
import { mergeBuckets } from '../../../captures/downsample'
import { ConflictError } from '../../../utils/errors'

/** The capture's display waveform (min/max per bucket, merged to ?width= columns); 409 until the extraction is done. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { captureId } = await validParams(event, idParams('captureId'))
  const { width } = await validQuery(event, WaveformQuery)
  const { capture } = await requireCapture(event, captureId, 'link.read', { waveform: true })
  if (capture.status !== 'done' || !capture.waveform) throw new ConflictError(`the capture is ${capture.status}: no waveform yet`, { status: capture.status })
  return width ? mergeBuckets(capture.waveform, width) : capture.waveform
})
