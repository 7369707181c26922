import { z } from 'zod'
import { MailToken } from '../../../../shared/schemas/auth'
import { confirmSignUp, membershipsOf } from '../../../domain/accounts'
import { throttle } from '../../../domain/throttle'
import { presentAuth } from '../../../presenters/account'

/** Confirm a sign-up with the mailed token: the account and its team are created and signed in. 201 {user, teams}. */
export default defineApiHandler(async (event) => {
  const { token } = await validBody(event, z.object({ token: MailToken }))
  await throttle('sign-up-confirm', clientIp(event), 30, 900)
  const user = await confirmSignUp(token)
  await signInSession(event, user)
  setResponseStatus(event, 201)
  return presentAuth(user, await membershipsOf(user.id))
})
