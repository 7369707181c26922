import { z } from 'zod'
import { MailToken } from '../../../../shared/schemas/auth'
import { findInvitation } from '../../../domain/invitations'
import { presentInvitationPreview } from '../../../presenters/account'

/** Public: what an invitation link offers {teamName, email, role, invitedBy}; 404 when unknown, used or expired. */
export default defineApiHandler(async (event) => {
  const { token } = await validParams(event, z.object({ token: MailToken }))
  const { invitation, accountExists } = await findInvitation(token)
  return presentInvitationPreview(invitation, accountExists)
})
