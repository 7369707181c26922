import { revokeInvitation } from '../../../../domain/invitations'

/** Revoke a pending invitation (admin): its link stops working. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { teamId, invitationId } = await validParams(event, idParams('teamId', 'invitationId'))
  const { user } = await requireRole(event, teamId, 'invitation.manage')
  await revokeInvitation(teamId, invitationId, user.id)
  return sendNoContent(event, 204)
})
