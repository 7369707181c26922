import { CAPTURE_MAX_BYTES, CaptureUploadFields } from '../../../../../shared/schemas/capture'
import { storeCapture } from '../../../../domain/captures'
import { presentCapture } from '../../../../presenters/captures'

/** Upload a capture to a link (engineer, admin): multipart `file` + fields; 202, extraction queued. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { linkId } = await validParams(event, idParams('linkId'))
  const { link, user } = await requireLink(event, linkId, 'link.update')
  const { file, fields } = await readUpload(event, CAPTURE_MAX_BYTES, 'a capture')
  const parsed = CaptureUploadFields.safeParse(fields)
  if (!parsed.success) throw InvalidError.fromZod(parsed.error)
  setResponseStatus(event, 202)
  return presentCapture(await storeCapture(link, user.id, file, parsed.data))
})
