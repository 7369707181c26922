import { listParts } from '../../../../domain/parts'
import { presentPart } from '../../../../presenters/workspace'

/** The part library as the team sees it: built-in parts, then the team's own. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { teamId } = await validParams(event, idParams('teamId'))
  await requireRole(event, teamId, 'part.read')
  return (await listParts(teamId)).map(presentPart)
})
