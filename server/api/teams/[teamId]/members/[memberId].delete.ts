import { removeMember } from '../../../../domain/teams'

/** Remove a member from the team (admin). 409 when it would leave the team without an admin. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { teamId, memberId } = await validParams(event, idParams('teamId', 'memberId'))
  const { user } = await requireRole(event, teamId, 'member.manage')
  await removeMember(teamId, memberId, user.id)
  return sendNoContent(event, 204)
})
