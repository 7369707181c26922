import { z } from 'zod'
import { mergeBuckets } from '../../../captures/downsample'
import { ConflictError } from '../../../utils/errors'

const WaveformQuery = z.object({
  /** the plot's width in pixels: at most this many min/max columns come back */
  width: z.coerce.number().int('width must be an integer').min(50, 'width must be at least 50').max(4000, 'width must be at most 4000').optional(),
})

/** The capture's display waveform (min/max per bucket, merged to ?width= columns); 409 until the extraction is done. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { captureId } = await validParams(event, idParams('captureId'))
  const { width } = await validQuery(event, WaveformQuery)
  const { capture } = await requireCapture(event, captureId, 'link.read', { waveform: true })
  if (capture.status !== 'done' || !capture.waveform) throw new ConflictError(`the capture is ${capture.status}: no waveform yet`, { status: capture.status })
  return width ? mergeBuckets(capture.waveform, width) : capture.waveform
})
