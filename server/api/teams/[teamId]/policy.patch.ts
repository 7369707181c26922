import { TeamPolicyBody } from '../../../../shared/schemas/team'
import { updatePolicy } from '../../../domain/policy'

/** Replace the team's engineering policy {version, policy} (admin); 409 when `version` is stale. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { teamId } = await validParams(event, idParams('teamId'))
  const { user } = await requireRole(event, teamId, 'policy.update')
  const { version, policy } = await validBody(event, TeamPolicyBody)
  return updatePolicy(teamId, user.id, version, policy)
})
