import { listInvitations } from '../../../../domain/invitations'
import { presentInvitation } from '../../../../presenters/account'

/** Pending invitations of the team (admin). */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { teamId } = await validParams(event, idParams('teamId'))
  await requireRole(event, teamId, 'invitation.manage')
  return (await listInvitations(teamId)).map(presentInvitation)
})
