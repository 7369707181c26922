/** The team's engineering policy: read with its defaults filled in, replaced by an admin with the version. */
import { TeamPolicy, type TeamPolicy as Policy } from '../../shared/schemas/team'
import { Team } from '../db/models'
import { useDb } from '../utils/db'
import { ConflictError, NotFoundError } from '../utils/errors'
import { audit } from './audit'

export interface PolicyDto {
  teamId: number
  version: number
  policy: Policy
}

function present(team: Team): PolicyDto {
  return { teamId: team.id, version: team.version, policy: TeamPolicy.parse(team.policy ?? {}) }
}

export async function readPolicy(teamId: number): Promise<PolicyDto> {
  const team = await Team.findByPk(teamId)
  if (!team) throw new NotFoundError('team')
  return present(team)
}

export async function updatePolicy(teamId: number, userId: number, version: number, policy: Policy): Promise<PolicyDto> {
  return useDb().transaction(async (transaction) => {
    const team = await Team.findByPk(teamId, { transaction, lock: transaction.LOCK.UPDATE })
    if (!team) throw new NotFoundError('team')
    if (team.version !== version) throw new ConflictError('the policy was changed by someone else; reload it', { currentVersion: team.version, current: present(team) })
    const before = TeamPolicy.parse(team.policy ?? {})
    team.policy = policy
    await team.save({ transaction })
    await audit(transaction, { teamId, userId, action: 'policy.update', entity: 'team', entityId: teamId, detail: { before, after: policy } })
    return present(team)
  })
}
