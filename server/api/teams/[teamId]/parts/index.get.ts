import { listParts } from '../../../../domain/parts'
import { presentPart } from '../../../../presenters/workspace'

/** One page of the part library as the team sees it: built-in parts, then the team's own. ?limit=200&offset=0 */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { teamId } = await validParams(event, idParams('teamId'))
  await requireRole(event, teamId, 'part.read')
  const page = await validPage(event, ...PAGE_SIZES.parts)
  const { rows, count } = await listParts(teamId, page)
  return sendPage(event, rows.map(presentPart), count, page)
})
