/** Team members and their roles. A team always keeps at least one admin. */
import type { Role } from '../../shared/schemas/roles'
import { Membership, User } from '../db/models'
import { useDb } from '../utils/db'
import { ConflictError, NotFoundError } from '../utils/errors'
import { audit } from './audit'
import { endAllSessions } from './sessions'

export function listMembers(teamId: number) {
  return Membership.findAll({
    where: { teamId },
    include: [{ model: User, as: 'user', attributes: ['id', 'name', 'email'] }],
    order: [['id', 'ASC']],
  })
}

/**
 * Lock the team's admin memberships, so two concurrent demotions or removals cannot
 * both pass the "one admin stays" check (the second waits and sees the first's result).
 */
async function lockAdmins(teamId: number, transaction: import('sequelize').Transaction) {
  return Membership.findAll({ where: { teamId, role: 'admin' }, lock: transaction.LOCK.UPDATE, transaction })
}

export async function changeRole(teamId: number, memberId: number, role: Role, actorId: number) {
  return useDb().transaction(async (transaction) => {
    const admins = await lockAdmins(teamId, transaction)
    const member = await Membership.findOne({ where: { id: memberId, teamId }, transaction, lock: transaction.LOCK.UPDATE })
    if (!member) throw new NotFoundError('member')
    if (member.role === 'admin' && role !== 'admin' && admins.length <= 1)
      throw new ConflictError('a team needs at least one admin: make someone else admin first')
    const from = member.role
    if (from !== role) {
      await member.update({ role }, { transaction })
      await audit(transaction, { teamId, userId: actorId, action: 'member.role', entity: 'member', entityId: member.id, detail: { userId: member.userId, from, to: role } })
    }
    await member.reload({ include: [{ model: User, as: 'user', attributes: ['id', 'name', 'email'] }], transaction })
    return member
  })
}

/** Remove a member; their sessions end (a removed member signs in again and sees only their other teams). */
export async function removeMember(teamId: number, memberId: number, actorId: number) {
  const removedUserId = await useDb().transaction(async (transaction) => {
    const admins = await lockAdmins(teamId, transaction)
    const member = await Membership.findOne({ where: { id: memberId, teamId }, transaction, lock: transaction.LOCK.UPDATE })
    if (!member) throw new NotFoundError('member')
    if (member.role === 'admin' && admins.length <= 1)
      throw new ConflictError('a team needs at least one admin: make someone else admin first')
    await member.destroy({ transaction })
    await audit(transaction, { teamId, userId: actorId, action: 'member.remove', entity: 'member', entityId: member.id, detail: { userId: member.userId, role: member.role } })
    return member.userId
  })
  await endAllSessions(removedUserId)
}
