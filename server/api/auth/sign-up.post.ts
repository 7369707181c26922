import { SignUpBody } from '../../../shared/schemas/auth'
import { membershipsOf, signUp } from '../../domain/accounts'
import { presentAuth } from '../../presenters/account'

/** Create an account and its team (the creator is admin), and sign in. 201 {user, teams}. */
export default defineApiHandler(async (event) => {
  const body = await validBody(event, SignUpBody)
  const user = await signUp(body)
  await replaceUserSession(event, { user: { id: user.id, name: user.name, email: user.email }, loggedInAt: Date.now() })
  setResponseStatus(event, 201)
  return presentAuth(user, await membershipsOf(user.id))
})
