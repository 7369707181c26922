/**
 * Invitations by e-mail: an admin invites an address with a role; the link in the mail
 * (/accept-invitation?token=...) creates the account when the address is new, or adds
 * the membership to the existing account. Tokens are stored hashed, expire, and work once.
 */
import { Op } from 'sequelize'
import type { User as SessionUser } from '#auth-utils'
// hashPassword / verifyPassword: nuxt-auth-utils' scrypt helpers, auto-imported by Nitro (no importable path)
import { NewPassword, PersonName, type AcceptInvitationBody } from '../../shared/schemas/auth'
import type { InvitationBody } from '../../shared/schemas/team'
import { Invitation, Membership, Team, User } from '../db/models'
import { useDb } from '../utils/db'
import { ConflictError, InvalidError, NotFoundError, UnauthorizedError } from '../utils/errors'
import { sendMail } from '../mail/send'
import { invitationMail } from '../mail/templates'
import { appUrl } from '../utils/settings'
import { hashToken, newToken } from '../utils/tokens'
import { audit } from './audit'
import { requireStrongPassword } from '../utils/password-strength'

/** An invitation link is valid this long. */
export const INVITATION_LIFETIME_MS = 7 * 24 * 60 * 60 * 1000

const pending = () => ({ acceptedAt: null, expiresAt: { [Op.gt]: new Date() } })
const withInviter = { model: User, as: 'inviter', attributes: ['id', 'name', 'email'] }

export function listInvitations(teamId: number) {
  return Invitation.findAll({ where: { teamId, ...pending() }, include: [withInviter], order: [['id', 'ASC']] })
}

/** Create (or renew) the invitation of an address and mail it. */
export async function createInvitation(teamId: number, inviter: SessionUser, body: InvitationBody) {
  const { token, hash } = newToken()
  const invitation = await useDb().transaction(async (transaction) => {
    const member = await Membership.findOne({
      where: { teamId },
      include: [{ model: User, as: 'user', where: { email: body.email }, required: true }],
      transaction,
    })
    if (member) throw new ConflictError(`${body.email} is already a member of this team`)
    // inviting the same address again replaces the earlier invitation (a fresh link)
    await Invitation.destroy({ where: { teamId, email: body.email, acceptedAt: null }, transaction })
    const created = await Invitation.create(
      { teamId, email: body.email, role: body.role, tokenHash: hash, invitedBy: inviter.id, expiresAt: new Date(Date.now() + INVITATION_LIFETIME_MS) },
      { transaction },
    )
    await audit(transaction, { teamId, userId: inviter.id, action: 'invitation.create', entity: 'invitation', entityId: created.id, detail: { email: body.email, role: body.role } })
    return created
  })
  const team = await Team.findByPk(teamId)
  await sendMail(invitationMail(body.email, inviter, team?.name ?? null, body.role, `${appUrl()}/accept-invitation?token=${encodeURIComponent(token)}`))
  await invitation.reload({ include: [withInviter] })
  return invitation
}

export async function revokeInvitation(teamId: number, invitationId: number, actorId: number) {
  await useDb().transaction(async (transaction) => {
    const invitation = await Invitation.findOne({ where: { id: invitationId, teamId, acceptedAt: null }, transaction })
    if (!invitation) throw new NotFoundError('invitation')
    await invitation.destroy({ transaction })
    await audit(transaction, { teamId, userId: actorId, action: 'invitation.revoke', entity: 'invitation', entityId: invitationId, detail: { email: invitation.email } })
  })
}

/** The pending invitation of a token, with its team and inviter, or 404. */
export async function findInvitation(token: string) {
  const invitation = await Invitation.findOne({
    where: { tokenHash: hashToken(token), ...pending() },
    include: [{ model: Team, as: 'team' }, withInviter],
  })
  if (!invitation) throw new NotFoundError('invitation')
  const accountExists = (await User.count({ where: { email: invitation.email } })) > 0
  return { invitation, accountExists }
}

/**
 * Accept: a new address gets an account (name and password required); an existing
 * account must be the signed-in user or give its password. Returns the user to sign in.
 */
export async function acceptInvitation(token: string, body: AcceptInvitationBody, sessionUser: SessionUser | null) {
  return useDb().transaction(async (transaction) => {
    const invitation = await Invitation.findOne({
      where: { tokenHash: hashToken(token), ...pending() },
      lock: transaction.LOCK.UPDATE,
      transaction,
    })
    if (!invitation) throw new NotFoundError('invitation')
    let user = await User.findOne({ where: { email: invitation.email }, transaction })
    if (user) {
      const proven =
        sessionUser?.id === user.id || (body.password !== undefined && (await verifyPassword(user.passwordHash, body.password)))
      if (!proven) throw new UnauthorizedError(`sign in as ${invitation.email} (or give its password) to accept this invitation`)
      if (await Membership.findOne({ where: { teamId: invitation.teamId, userId: user.id }, transaction }))
        throw new ConflictError('you are already a member of this team')
    } else {
      const name = PersonName.safeParse(body.name)
      if (!name.success) throw InvalidError.fromZod(name.error, ['name'])
      const password = NewPassword.safeParse(body.password)
      if (!password.success) throw InvalidError.fromZod(password.error, ['password'])
      requireStrongPassword(password.data, [name.data, invitation.email])
      user = await User.create({ name: name.data, email: invitation.email, passwordHash: await hashPassword(password.data) }, { transaction })
    }
    const membership = await Membership.create({ teamId: invitation.teamId, userId: user.id, role: invitation.role }, { transaction })
    await invitation.update({ acceptedAt: new Date(), acceptedBy: user.id }, { transaction })
    await audit(transaction, {
      teamId: invitation.teamId,
      userId: user.id,
      action: 'member.join',
      entity: 'member',
      entityId: membership.id,
      detail: { email: user.email, role: invitation.role, invitationId: invitation.id },
    })
    return user
  })
}
