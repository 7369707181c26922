import { DATASHEET_MAX_BYTES } from '../../../../../shared/schemas/capture'
import { storeDatasheet } from '../../../../domain/captures'
import { presentDatasheet } from '../../../../presenters/captures'

/** Attach a datasheet PDF to a team part (engineer, admin): multipart `file`; 201. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { partId } = await validParams(event, idParams('partId'))
  const { part, user } = await requirePart(event, partId, 'part.update')
  const { file } = await readUpload(event, DATASHEET_MAX_BYTES, 'a datasheet')
  setResponseStatus(event, 201)
  return presentDatasheet(await storeDatasheet(part, user.id, file))
})
