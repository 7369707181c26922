import { membershipsOf } from '../../domain/accounts'
import { presentTeams } from '../../presenters/account'

/** The caller's teams with their role in each (with an API token: its team, with the role it acts with). */
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const teams = presentTeams(await membershipsOf(user.id))
  const token = requestToken(event)
  return token ? teams.filter((t) => t.id === token.teamId).map((t) => ({ ...t, role: scopedRole(event, t.id, t.role, 'team') })) : teams
})
