import { PartPatchBody } from '../../../shared/schemas/part'
import { updatePart } from '../../domain/parts'
import { presentPart } from '../../presenters/workspace'

/** Edit a team part (engineer, admin), based on `version`: 409 when stale; built-ins are read-only (403). */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { partId } = await validParams(event, idParams('partId'))
  const { part, user } = await requirePart(event, partId, 'part.update')
  const body = await validBody(event, PartPatchBody)
  return presentPart(await updatePart(part, user.id, body))
})
