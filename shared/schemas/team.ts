/** Request bodies of the team routes (members, invitations). */
import { z } from 'zod'
import { Email } from './auth'
import { Role } from './roles'

export const MemberRoleBody = z.object({ role: Role })
export const InvitationBody = z.object({ email: Email, role: Role })
export type InvitationBody = z.infer<typeof InvitationBody>
