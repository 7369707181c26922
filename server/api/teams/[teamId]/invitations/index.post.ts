import { InvitationBody } from '../../../../../shared/schemas/team'
import { createInvitation } from '../../../../domain/invitations'
import { presentInvitation } from '../../../../presenters/account'

/** Invite an address with a role and mail the link (admin). 201; 409 when already a member. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { teamId } = await validParams(event, idParams('teamId'))
  const { user } = await requireRole(event, teamId, 'invitation.manage')
  const body = await validBody(event, InvitationBody)
  const invitation = await createInvitation(teamId, user, body)
  setResponseStatus(event, 201)
  return presentInvitation(invitation)
})
