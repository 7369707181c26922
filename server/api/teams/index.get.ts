import { membershipsOf } from '../../domain/accounts'
import { presentTeams } from '../../presenters/account'

/** The caller's teams with their role in each. */
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  return presentTeams(await membershipsOf(user.id))
})
