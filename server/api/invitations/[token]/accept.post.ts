import { z } from 'zod'
import { AcceptInvitationBody, MailToken } from '../../../../shared/schemas/auth'
import { membershipsOf } from '../../../domain/accounts'
import { acceptInvitation } from '../../../domain/invitations'
import { presentAuth } from '../../../presenters/account'
import { throttle } from '../../../domain/throttle'
import { hashToken } from '../../../utils/tokens'

/**
 * Accept an invitation and sign in as the invited account. A new address needs
 * {name, password}; an existing account must be signed in or give its password.
 */
export default defineApiHandler(async (event) => {
  const sessionUser = await getSessionUser(event)
  const { token } = await validParams(event, z.object({ token: MailToken }))
  const body = await validBody(event, AcceptInvitationBody)
  // wrong passwords cannot be tried without end: per invitation and per client address
  await throttle('invite-accept', hashToken(token), 10, 900)
  await throttle('invite-accept-ip', clientIp(event), 30, 900)
  const user = await acceptInvitation(token, body, sessionUser)
  await signInSession(event, user)
  return presentAuth(user, await membershipsOf(user.id))
})
