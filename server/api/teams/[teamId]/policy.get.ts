import { readPolicy } from '../../../domain/policy'

/** The team's engineering policy with its version (any member). */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { teamId } = await validParams(event, idParams('teamId'))
  await requireRole(event, teamId, 'policy.read')
  return readPolicy(teamId)
})
