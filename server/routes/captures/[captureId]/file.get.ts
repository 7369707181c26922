import { useStorage } from '../../../storage/s3'
import { NotFoundError } from '../../../utils/errors'

/** Download the capture as uploaded (every role of the owning team). */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { captureId } = await validParams(event, idParams('captureId'))
  const { capture } = await requireCapture(event, captureId, 'link.read')
  if (capture.status === 'failed') throw new NotFoundError('capture file')
  const { body, size } = await useStorage().stream(capture.objectKey)
  setResponseHeaders(event, {
    'content-type': 'text/csv; charset=utf-8',
    'content-length': size,
    'content-disposition': `attachment; filename="${capture.fileName.replace(/[^\w.\- ]/g, '_')}"`,
    'x-content-type-options': 'nosniff',
  })
  return sendStream(event, body)
})
