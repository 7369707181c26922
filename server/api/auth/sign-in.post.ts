import { SignInBody } from '../../../shared/schemas/auth'
import { membershipsOf, signIn } from '../../domain/accounts'
import { presentAuth } from '../../presenters/account'

/** Sign in: {user, teams}; 401 "wrong e-mail or password"; 429 with Retry-After when rate-limited. */
export default defineApiHandler(async (event) => {
  const body = await validBody(event, SignInBody)
  const user = await signIn(body, clientIp(event))
  await signInSession(event, user)
  return presentAuth(user, await membershipsOf(user.id))
})
