import { listMembers } from '../../../../domain/teams'
import { presentMember } from '../../../../presenters/account'

/** The team's members with their roles (any member). */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { teamId } = await validParams(event, idParams('teamId'))
  await requireRole(event, teamId, 'team.read')
  return (await listMembers(teamId)).map(presentMember)
})
