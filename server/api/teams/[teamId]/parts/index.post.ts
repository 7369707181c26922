import { PartCreateBody } from '../../../../../shared/schemas/part'
import { createPart } from '../../../../domain/parts'
import { presentPart } from '../../../../presenters/workspace'

/** Add a part to the team's library (engineer, admin). 201. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { teamId } = await validParams(event, idParams('teamId'))
  const { user } = await requireRole(event, teamId, 'part.create')
  const body = await validBody(event, PartCreateBody)
  const part = await createPart(teamId, user.id, body)
  setResponseStatus(event, 201)
  return presentPart(part)
})
