import { User } from '../../db/models'
import { membershipsOf } from '../../domain/accounts'
import { presentAuth } from '../../presenters/account'

/** The signed-in user and their teams with the role in each; 401 when signed out. */
export default defineApiHandler(async (event) => {
  const sessionUser = await requireUser(event)
  const user = await User.findByPk(sessionUser.id)
  if (!user) {
    await clearUserSession(event)
    throw new UnauthorizedError()
  }
  return presentAuth(user, await membershipsOf(user.id))
})
