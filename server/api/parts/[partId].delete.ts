import { deletePart } from '../../domain/parts'

/** Delete a team part (admin); built-ins are read-only (403). */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { partId } = await validParams(event, idParams('partId'))
  const { part, user } = await requirePart(event, partId, 'part.delete')
  await deletePart(part, user.id)
  return sendNoContent(event, 204)
})
