import { MemberRoleBody } from '../../../../../shared/schemas/team'
import { changeRole } from '../../../../domain/teams'
import { presentMember } from '../../../../presenters/account'

/** Change a member's role (admin). 409 when it would leave the team without an admin. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { teamId, memberId } = await validParams(event, idParams('teamId', 'memberId'))
  const { user } = await requireRole(event, teamId, 'member.manage')
  const { role } = await validBody(event, MemberRoleBody)
  return presentMember(await changeRole(teamId, memberId, role, user.id))
})
