import { z } from 'zod'
import { AcceptInvitationBody, MailToken } from '../../../../shared/schemas/auth'
import { membershipsOf } from '../../../domain/accounts'
import { acceptInvitation } from '../../../domain/invitations'
import { presentAuth } from '../../../presenters/account'

/**
 * Accept an invitation and sign in as the invited account. A new address needs
 * {name, password}; an existing account must be signed in or give its password.
 */
export default defineApiHandler(async (event) => {
  const sessionUser = await getSessionUser(event)
  const { token } = await validParams(event, z.object({ token: MailToken }))
  const body = await validBody(event, AcceptInvitationBody)
  const user = await acceptInvitation(token, body, sessionUser)
  await replaceUserSession(event, { user: { id: user.id, name: user.name, email: user.email }, loggedInAt: Date.now() })
  return presentAuth(user, await membershipsOf(user.id))
})
