import { useStorage } from '../../../storage/s3'

/** Download a datasheet PDF (every role of the owning team). */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { datasheetId } = await validParams(event, idParams('datasheetId'))
  const { datasheet } = await requireDatasheet(event, datasheetId, 'part.read')
  const { body, size } = await useStorage().stream(datasheet.objectKey)
  setResponseHeaders(event, {
    'content-type': 'application/pdf',
    'content-length': size,
    'content-disposition': `attachment; filename="${datasheet.fileName.replace(/[^\w.\- ]/g, '_')}"`,
    'x-content-type-options': 'nosniff',
  })
  return sendStream(event, body)
})
